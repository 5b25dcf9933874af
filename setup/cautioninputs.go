package setup

import "crankside/machine"

// holeTarget is the volume a setting's hole was chosen for: the wanted
// tidal volume (mL/kg PBW) and how far the hole's delivered volume is
// from it (%). A setting observed at a check has none (nil).
type holeTarget struct {
	mlPerKg      float64
	offTargetPct float64
}

// targetOf is the target of a hole chosen for mlPerKg (wantedML at this
// PBW) that delivers deliveredML.
func targetOf(mlPerKg, wantedML, deliveredML float64) *holeTarget {
	return &holeTarget{mlPerKg: mlPerKg, offTargetPct: 100 * (deliveredML - wantedML) / wantedML}
}

// newAssessment is the one constructor of a setting's caution inputs,
// used by a plan, a check and the protocol's step. Everything the machine
// decides (the relief valve, the calibration, the motor's rating and
// whether it is fixed, a defaulted cylinder clearance) is read from the
// unit u, so that no caller can leave one at zero and silently switch a
// caution off; the rest is positional: the patient (height), the PBW, the
// setting's figures, the timing plan (nil for a setting observed at a
// check, whose speed and dwell were read off the machine), the hole's
// target (nil when there is none) and the hazards (planHazards,
// checkHazards).
func newAssessment(u unit, pt Patient, pbwKg float64, f Figures, timing *machine.TimingPlan, target *holeTarget, hz hazards) assessment {
	a := assessment{
		heightCm:      pt.HeightCm,
		pbwKg:         pbwKg,
		f:             f,
		reliefCmH2O:   u.p.Circuit.ReliefCmH2O,
		timing:        timing,
		cal:           u.cal,
		ratedTorque:   u.p.Motor.RatedTorqueNm,
		fixedMotor:    u.p.Motor.Fixed(),
		clearanceNote: u.gas.ClearanceNote(),
		hz:            hz,
	}
	if target != nil {
		a.targetMLPerK, a.offTargetPct = target.mlPerKg, target.offTargetPct
	}
	return a
}
