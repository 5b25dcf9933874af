package profiles

// FormatV1 is the format string of version 1 files.
const FormatV1 = "crankside-profile/1"

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
	Calibration *Calibration `json:"calibration,omitempty"`
}

// Cylinder is the piston's cylinder.
type Cylinder struct {
	BoreCm        float64 `json:"bore_cm"`
	RingFrictionN float64 `json:"ring_friction_n"`
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

// Fixed reports whether the motor has one speed.
func (m Motor) Fixed() bool { return m.Kind == MotorFixed }
