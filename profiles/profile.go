package profiles

import "strings"

// FormatV1 is the format string of version 1 files.
const FormatV1 = "crankside-profile/1"

// FormatV2 is the format string of version 2 files: version 1 plus the
// optional fields cylinder.clearance_cm and circuit.leak_l_min_at_20_cmh2o.
const FormatV2 = "crankside-profile/2"

// FormatV3 is the format string of version 3 files: version 2 plus the
// optional field oxygen.max_flow_l_min. Marshal and Save write it.
const FormatV3 = "crankside-profile/3"

// FormatCurrent is the format that Marshal and Save write.
const FormatCurrent = FormatV3

// Profile is one built machine.
type Profile struct {
	Format      string       `json:"format"`
	ID          string       `json:"id"`
	Label       string       `json:"label"`
	Cylinder    Cylinder     `json:"cylinder"`
	Crank       Crank        `json:"crank"`
	Motor       Motor        `json:"motor"`
	Controller  Controller   `json:"controller"`
	Circuit     Circuit      `json:"circuit"`
	Oxygen      Oxygen       `json:"oxygen"`
	Calibration *Calibration `json:"calibration,omitempty"`

	// Defaults lists the paths of the optional fields that the file did not
	// have and that Parse filled with the format's default (for example
	// "cylinder.clearance_cm"), in the order of the format, so that a
	// summary can say so. It is never written to a file.
	Defaults []string `json:"-"`
}

// Cylinder is the piston's cylinder.
type Cylinder struct {
	BoreCm        float64 `json:"bore_cm"`
	RingFrictionN float64 `json:"ring_friction_n"`
	// ClearanceCm is how far the cylinder head sits beyond the top dead
	// centre of the largest hole (format /2; DefaultClearanceCm when absent).
	ClearanceCm float64 `json:"clearance_cm"`
}

// Crank is the wheel, its holes and the connecting rod.
type Crank struct {
	RodCm    float64 `json:"rod_cm"`
	OffsetCm float64 `json:"offset_cm"`
	Holes    []Hole  `json:"holes"`
}

// Hole is one place the pin can be set.
type Hole struct {
	Label    string  `json:"label"`
	RadiusCm float64 `json:"radius_cm"`
}

// Motor kinds.
const (
	MotorVariable = "variable"
	MotorFixed    = "fixed"
)

// Motor is the drive. A variable motor uses MinRPM, MaxRPM and RPMStep; a
// fixed one uses RPM.
type Motor struct {
	Kind          string  `json:"kind"`
	MinRPM        float64 `json:"min_rpm,omitempty"`
	MaxRPM        float64 `json:"max_rpm,omitempty"`
	RPMStep       float64 `json:"rpm_step,omitempty"`
	RPM           float64 `json:"rpm,omitempty"`
	RatedTorqueNm float64 `json:"rated_torque_nm"`
}

// Controller is the dwell timer.
type Controller struct {
	DwellStepS float64 `json:"dwell_step_s"`
	MaxDwellS  float64 `json:"max_dwell_s"`
}

// Circuit is the patient circuit: tubing compliance (with the gas it holds),
// the expiratory valve's resistance and the relief valve's opening pressure.
type Circuit struct {
	ComplianceMLPerCmH2O           float64 `json:"compliance_ml_per_cmh2o"`
	ExpiratoryResistanceCmH2OPerLS float64 `json:"expiratory_resistance_cmh2o_per_l_s"`
	ReliefCmH2O                    float64 `json:"relief_cmh2o"`
	// LeakLMinAt20CmH2O is the leak flow of machine and circuit at 20 cmH2O,
	// linear in pressure (format /2; DefaultLeakLMinAt20CmH2O when absent).
	LeakLMinAt20CmH2O float64 `json:"leak_l_min_at_20_cmh2o"`
}

// Oxygen is what the oxygen supply beside the machine can give (format /3).
type Oxygen struct {
	// MaxFlowLMin is the highest flow the flowmeter feeding the intake can
	// be set to (DefaultMaxO2FlowLMin, 15 L/min, when absent).
	MaxFlowLMin float64 `json:"max_flow_l_min"`
}

// Calibration is the bench calibration: its date and the points measured.
type Calibration struct {
	Date   string       `json:"date"`
	Points []BenchPoint `json:"points"`
}

// BenchPoint is one bench breath into a test lung, delivered from rest.
type BenchPoint struct {
	Hole                         string  `json:"hole"`
	TestLungComplianceMLPerCmH2O float64 `json:"test_lung_compliance_ml_per_cmh2o"`
	TestLungResistanceCmH2OPerLS float64 `json:"test_lung_resistance_cmh2o_per_l_s"`
	RPM                          float64 `json:"rpm"`
	MeasuredML                   float64 `json:"measured_ml"`
}

// HoleByLabel returns the hole with that label.
func (p Profile) HoleByLabel(label string) (Hole, bool) {
	for _, h := range p.Crank.Holes {
		if h.Label == label {
			return h, true
		}
	}
	return Hole{}, false
}

// HoleByLabelFold finds a hole as a person types its label: the exact label
// first, else the one hole whose label matches ignoring case. ambiguous is
// true (and found false) when several holes match ignoring case and none
// exactly, so the caller can ask which one is meant.
func (p Profile) HoleByLabelFold(label string) (h Hole, found, ambiguous bool) {
	if h, ok := p.HoleByLabel(label); ok {
		return h, true, false
	}
	n := 0
	for _, c := range p.Crank.Holes {
		if strings.EqualFold(c.Label, label) {
			h = c
			n++
		}
	}
	switch n {
	case 0:
		return Hole{}, false, false
	case 1:
		return h, true, false
	}
	return Hole{}, false, true
}

// Defaulted reports whether the field at path was absent from the file and
// filled with the format's default.
func (p Profile) Defaulted(path string) bool {
	for _, d := range p.Defaults {
		if d == path {
			return true
		}
	}
	return false
}

// Fixed reports whether the motor has one speed.
func (m Motor) Fixed() bool { return m.Kind == MotorFixed }
