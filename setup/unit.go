package setup

import (
	"fmt"
	"math"
	"time"

	"crankside/machine"
	"crankside/profiles"
)

// unit is a profile turned into the machine package's terms, with its
// calibration fitted once.
type unit struct {
	p          profiles.Profile
	motor      machine.Motor
	controller machine.Controller
	cal        CalibrationStatus
	// gas is the version 2 breath's room, cylinder, leak and relief valve;
	// sim runs every stroke of one plan or check (never shared).
	gas GasModel
	sim *machine.Simulator
	// stepS is the time step of every stroke evaluate runs (0: the model's
	// 1 ms); the fit ranges' corners use ScanStepS.
	stepS float64
	// pressuresOnly marks a unit whose evaluations serve a fit's trial
	// lungs: their torque is left out (PeakTorqueNm 0), every other
	// figure is the same.
	pressuresOnly bool
	// cylinderReserveBar is where an oxygen cylinder's time runs to
	// (cautions_hazards.go); set with the request's cylinder.
	cylinderReserveBar float64
}

// CalibrationStatus is what the profile's bench calibration says.
type CalibrationStatus struct {
	machine.Calibration
	Date      string // YYYY-MM-DD, or "" when there is none
	AgeDays   int    // whole days from Date to now; meaningless without Date
	Points    int
	Holes     int // distinct holes measured
	Fit       *machine.Fit
	BenchRows []profiles.BenchPoint
	// Residuals are the bench rows with their residuals, row by row.
	Residuals []BenchResidual
	// Outside counts bench points outside +/-(4 mL + 15%) of the fitted model.
	Outside int
	// SweptMinML and SweptMaxML are the smallest and largest geometric
	// swept volumes of the machine's holes (the calibration is linear, so
	// these two tell whether any hole's effective volume exceeds its own).
	SweptMinML, SweptMaxML float64
}

// BenchResidual is one bench row's hole and how far the fitted line is
// from what was measured there (mL), and whether that is within
// +/-(4 mL + 15%).
type BenchResidual struct {
	Hole       string
	ResidualML float64
	Within     bool
}

func newUnit(p profiles.Profile, now time.Time) (unit, error) { return newUnitV(p, now, false) }

// newUnitV is newUnit; v1 (tests only) leaves the cylinder's gas out of the
// bench fit too.
func newUnitV(p profiles.Profile, now time.Time, v1 bool) (unit, error) {
	u := unit{p: p, controller: machine.Controller{DwellStepS: p.Controller.DwellStepS, MaxDwellS: p.Controller.MaxDwellS},
		gas: gasModelOf(p), sim: &machine.Simulator{}}
	u.gas.noCylinderGas = v1
	if p.Motor.Fixed() {
		u.motor = machine.FixedMotor(p.Motor.RPM)
	} else {
		u.motor = machine.Motor{MinRPM: p.Motor.MinRPM, MaxRPM: p.Motor.MaxRPM, StepRPM: p.Motor.RPMStep}
	}
	for _, h := range p.Crank.Holes {
		if err := u.crank(h).Validate(); err != nil {
			return u, &InputError{Field: "profile " + p.ID, Reason: fmt.Sprintf("hole %q: %v", h.Label, err)}
		}
	}
	if !(p.Cylinder.BoreCm > 0) || !(p.Circuit.ComplianceMLPerCmH2O > 0) || !(u.controller.DwellStepS > 0) || !(u.motor.MinRPM > 0) {
		return u, &InputError{Field: "profile " + p.ID, Reason: "bore, circuit compliance, dwell step and motor speed must be positive; validate the profile file"}
	}
	cal, err := fitCalibration(u, now)
	if err != nil {
		return u, err
	}
	u.cal = cal
	return u, nil
}

func (u unit) crank(h profiles.Hole) machine.Crank {
	return machine.Crank{RadiusCm: h.RadiusCm, RodCm: u.p.Crank.RodCm, OffsetCm: u.p.Crank.OffsetCm}
}

func (u unit) stroke(h profiles.Hole, rpm float64, cal machine.Calibration) machine.Stroke {
	s := machine.Stroke{Crank: u.crank(h), BoreCm: u.p.Cylinder.BoreCm, RPM: rpm, Scale: 1}
	if swept := s.SweptML(); swept > 0 {
		s.Scale = cal.EffectiveSweptML(swept) / swept
	}
	return s
}

// fitCalibration fits k and b to the profile's bench points. Each point was
// delivered from rest into a test lung through this circuit, so the model's
// gain for that lung and speed turns the measured volume into an effective
// swept volume.
func fitCalibration(u unit, now time.Time) (CalibrationStatus, error) {
	st := CalibrationStatus{Calibration: machine.Identity}
	st.SweptMinML, st.SweptMaxML = sweptRange(u.p)
	c := u.p.Calibration
	if c == nil {
		return st, nil
	}
	st.Date = c.Date
	if d, err := time.Parse(time.DateOnly, c.Date); err == nil {
		st.AgeDays = int(math.Floor(now.Sub(d).Hours() / 24))
	}
	if len(c.Points) == 0 {
		return st, nil
	}
	pts, err := benchGains(u, c.Points)
	if err != nil {
		return st, err
	}
	fit, err := machine.FitCalibration(pts)
	if err != nil {
		return st, &InputError{Field: "profile " + u.p.ID + " calibration", Reason: err.Error()}
	}
	st.Calibration, st.Fit, st.Points, st.BenchRows = fit.Calibration, &fit, len(c.Points), c.Points
	holes := map[string]bool{}
	for i, p := range c.Points {
		holes[p.Hole] = true
		within := machine.WithinISOTolerance(p.MeasuredML, fit.Residuals[i].PredictedML)
		if !within {
			st.Outside++
		}
		st.Residuals = append(st.Residuals, BenchResidual{Hole: p.Hole, ResidualML: fit.Residuals[i].ResidualML, Within: within})
	}
	st.Holes = len(holes)
	return st, nil
}

// sweptRange is the smallest and largest geometric swept volume of p's holes.
func sweptRange(p profiles.Profile) (minML, maxML float64) {
	for i, h := range p.Crank.Holes {
		v := machine.SweptVolumeML(p.Cylinder.BoreCm, machine.Crank{RadiusCm: h.RadiusCm, RodCm: p.Crank.RodCm, OffsetCm: p.Crank.OffsetCm})
		if i == 0 || v < minML {
			minML = v
		}
		if i == 0 || v > maxML {
			maxML = v
		}
	}
	return minML, maxML
}

func benchGains(u unit, points []profiles.BenchPoint) ([]machine.BenchPoint, error) {
	p := u.p
	out := make([]machine.BenchPoint, len(points))
	for i, bp := range points {
		h, ok := p.HoleByLabel(bp.Hole)
		if !ok {
			return nil, &InputError{Field: fmt.Sprintf("calibration point %d", i+1), Reason: fmt.Sprintf("hole %q is not on this machine", bp.Hole)}
		}
		s := u.stroke(h, bp.RPM, machine.Identity)
		r, err := u.sim.SimulateStroke(benchInput(u, s, bp))
		if err != nil {
			return nil, &InputError{Field: fmt.Sprintf("calibration point %d", i+1), Reason: err.Error()}
		}
		swept := s.SweptML()
		out[i] = machine.BenchPoint{SweptML: swept, Gain: r.DeliveredML / swept, MeasuredML: bp.MeasuredML}
	}
	return out, nil
}

// benchInput is the stroke of one bench point through the model.
func benchInput(u unit, s machine.Stroke, bp profiles.BenchPoint) machine.StrokeInput {
	return machine.StrokeInput{
		Stroke:            s,
		Lung:              machine.Lung{ComplianceMLPerCmH2O: bp.TestLungComplianceMLPerCmH2O, ResistanceCmH2OPerLS: bp.TestLungResistanceCmH2OPerLS},
		CircuitMLPerCmH2O: u.p.Circuit.ComplianceMLPerCmH2O,
		Gas:               u.gas.benchPath(),
	}
}
