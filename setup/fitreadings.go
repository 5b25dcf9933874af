package setup

import (
	"fmt"
	"math"

	"crankside/machine"
	"crankside/physiology"
)

// readingsFit is how a check fits its readings at one setting: the unit,
// the setting, the patient's PBW, the manometer's half step and the
// resistance assumed when the peak tells nothing of it.
type readingsFit struct {
	u        unit
	s        Setting
	pbw      float64
	halfStep float64 // cmH2O: half the manometer's step
	assumedR float64 // cmH2O/(L/s): the check's assumed resistance
}

func newReadingsFit(u unit, s Setting, pbw float64, req CheckRequest, assumedR float64) readingsFit {
	return readingsFit{u: u, s: s, pbw: pbw, halfStep: manometerStep(req).Value / 2, assumedR: assumedR}
}

// PeakAtRelief reports whether a measured peak sits at the relief valve:
// within half a manometer step (halfStepCmH2O) of the relief pressure, on
// either side. reliefCmH2O 0 is no relief valve stated.
func PeakAtRelief(peakCmH2O, reliefCmH2O, halfStepCmH2O float64) bool {
	return reliefCmH2O > 0 && math.Abs(peakCmH2O-reliefCmH2O) <= halfStepCmH2O
}

// fit solves for the lung that gives the readings at this setting under
// the breath model, trapped gas included, starting from near when it is
// set. A peak at the relief valve tells nothing of the resistance (the
// valve flattens it): the compliance is then fitted to the end pressure
// alone at the assumed resistance (EndOnly). A peak or end above the
// relief valve by more than half a step is no breath the model vents at
// that pressure can give.
func (rf readingsFit) fit(rd physiology.Readings, near *physiology.Mechanics) (physiology.Mechanics, error) {
	h, _ := rf.u.p.HoleByLabel(rf.s.Hole)
	t := machine.TimingOf(rf.s.RPM, rf.s.DwellS, rf.u.crank(h).DeliveryAngle())
	model := func(c, r float64) (float64, float64, error) {
		f, err := evaluate(rf.u, h, t, lungState{lung: machine.Lung{ComplianceMLPerCmH2O: c, ResistanceCmH2OPerLS: r}, peep: rf.s.PEEPCmH2O, pbwKg: rf.pbw}, 0, 0, 0)
		if err != nil {
			return 0, 0, err
		}
		return f.PeakCmH2O, f.EndInspCmH2O, nil
	}
	relief := rf.u.p.Circuit.ReliefCmH2O
	switch {
	case relief > 0 && rd.PeakCmH2O > relief+rf.halfStep:
		return physiology.Mechanics{}, &physiology.ReadingError{Retake: "peak", Reason: fmt.Sprintf(
			"peak %.1f cmH2O is above this machine's relief valve at %s cmH2O: the valve vents above it, so no lung gives that reading", rd.PeakCmH2O, plain(relief))}
	case PeakAtRelief(rd.PeakCmH2O, relief, rf.halfStep) && !(rd.EndCmH2O > rd.PeakCmH2O):
		return physiology.FitComplianceFromEnd(rd.EndCmH2O, rf.s.PEEPCmH2O, rf.assumedR, model)
	case near != nil:
		return physiology.FitMechanicsNear(rd, rf.s.PEEPCmH2O, *near, model)
	}
	return physiology.FitMechanics(rd, rf.s.PEEPCmH2O, model)
}
