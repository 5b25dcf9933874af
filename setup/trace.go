package setup

import (
	"math"

	"crankside/machine"
	"crankside/profiles"
)

// Trace is one breath at steady state, sampled for drawing: the delivery
// as simulated, then passive expiration through the airway and the
// expiratory valve.
type Trace struct {
	TimeS          []float64
	CircuitCmH2O   []float64 // what the circuit manometer reads
	PatientLPerMin []float64 // into the patient (+) and out (-)
	TiS, PeriodS   float64
	PEEPCmH2O      float64
	PlateauCmH2O   float64
	PeakCmH2O      float64
	// ReliefCmH2O is the profile's relief valve: the circuit pressure
	// never rises above it.
	ReliefCmH2O float64
	// EndExpiratoryLPerMin is the flow still leaving when the next breath
	// starts: zero when exhalation finishes.
	EndExpiratoryLPerMin float64
}

// BreathTrace simulates the plan's setting once more, recording it, and
// adds the expiration. During expiration the lung empties through the
// airway and valve resistances in series, so the circuit reads
// PEEP + (V/C) x Rvalve / (R + Rvalve).
func BreathTrace(pl Plan, p profiles.Profile) (Trace, error) {
	h, ok := p.HoleByLabel(pl.Hole.Label)
	if !ok {
		return Trace{}, &InputError{Field: "hole", Reason: "the plan's hole is not on this profile"}
	}
	u := unit{p: p}
	u.cal = pl.Calibration
	c, r := pl.ComplianceMLPerCmH2O, pl.ResistanceCmH2OPerLS
	tr := Trace{TiS: pl.Timing.TiS, PeriodS: pl.Timing.PeriodS, PEEPCmH2O: pl.PEEPCmH2O,
		PlateauCmH2O: pl.PlateauCmH2O, PeakCmH2O: pl.PeakCmH2O, ReliefCmH2O: p.Circuit.ReliefCmH2O}
	var endV float64
	_, err := machine.SimulateStroke(machine.StrokeInput{
		Stroke: u.stroke(h, pl.Timing.RPM, pl.Calibration.Calibration),
		Lung:   machine.Lung{ComplianceMLPerCmH2O: c, ResistanceCmH2OPerLS: r}, CircuitMLPerCmH2O: p.Circuit.ComplianceMLPerCmH2O,
		PEEPCmH2O: pl.PEEPCmH2O, StartVolumeML: pl.TrappedML, StepS: 0.005, Gas: pl.Gas.patientPath(),
		Observe: func(t, pc, q, v float64) {
			tr.TimeS = append(tr.TimeS, t)
			tr.CircuitCmH2O = append(tr.CircuitCmH2O, pc)
			tr.PatientLPerMin = append(tr.PatientLPerMin, q*60/1000)
			endV = v
		},
	})
	if err != nil {
		return Trace{}, err
	}
	rv := p.Circuit.ExpiratoryResistanceCmH2OPerLS
	tau := pl.TauS
	const steps = 200
	for i := 1; i <= steps; i++ {
		t := pl.Timing.TeS * float64(i) / steps
		v := endV * math.Exp(-t/tau)
		flowMLs := v / tau
		tr.TimeS = append(tr.TimeS, pl.Timing.TiS+t)
		tr.CircuitCmH2O = append(tr.CircuitCmH2O, pl.PEEPCmH2O+v/c*rv/(r+rv))
		tr.PatientLPerMin = append(tr.PatientLPerMin, -flowMLs*60/1000)
	}
	tr.EndExpiratoryLPerMin = -tr.PatientLPerMin[len(tr.PatientLPerMin)-1]
	return tr, nil
}
