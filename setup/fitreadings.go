package setup

import (
	"fmt"
	"math"
	"sort"

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
	u.pressuresOnly = true // the fit and its ranges read no torque
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
	model := rf.model()
	relief := rf.u.p.Circuit.ReliefCmH2O
	switch {
	case relief > 0 && rd.PeakCmH2O > relief+rf.halfStep:
		return physiology.Mechanics{}, &physiology.ReadingError{Retake: "peak", Reason: fmt.Sprintf(
			"peak %.1f cmH2O is above this machine's relief valve at %s cmH2O: the valve vents above it, so no lung gives that reading", rd.PeakCmH2O, plain(relief))}
	case PeakAtRelief(rd.PeakCmH2O, relief, rf.halfStep) && !(rd.EndCmH2O > rd.PeakCmH2O):
		return rf.fitAtRelief(rd, relief, near, model)
	case near != nil:
		return physiology.FitMechanicsNear(rd, rf.s.PEEPCmH2O, *near, model)
	}
	return rf.fitCoarseFirst(rd, model)
}

// model is the breath model's peak and end-inspiratory pressures for a
// trial lung at this setting, trapped gas included.
func (rf readingsFit) model() physiology.PressureModel {
	h, _ := rf.u.p.HoleByLabel(rf.s.Hole)
	t := machine.TimingOf(rf.s.RPM, rf.s.DwellS, rf.u.crank(h).DeliveryAngle())
	return func(c, r float64) (float64, float64, error) {
		f, err := evaluate(rf.u, h, t, lungState{lung: machine.Lung{ComplianceMLPerCmH2O: c, ResistanceCmH2OPerLS: r}, peep: rf.s.PEEPCmH2O, pbwKg: rf.pbw}, 0, 0, 0)
		if err != nil {
			return 0, 0, err
		}
		return f.PeakCmH2O, f.EndInspCmH2O, nil
	}
}

// fitCoarseFirst fits the readings on the model at ScanStepS (a tenth of
// the steps; its pressures are within about 1e-3 cmH2O of the 1 ms
// model's), then from that lung on the model itself, to the same residual
// as a fit from the physical start: the lung is the same to the fit's own
// tolerance, found in a third of the full-step strokes. When the coarse
// fit finds no lung, or the fine one fails from it, the readings are
// fitted from the physical start as before, so that a refusal is always
// the full-step model's.
func (rf readingsFit) fitCoarseFirst(rd physiology.Readings, model physiology.PressureModel) (physiology.Mechanics, error) {
	if rf.u.stepS != ScanStepS {
		coarse := rf
		coarse.u.stepS = ScanStepS
		if cm, err := physiology.FitMechanics(rd, rf.s.PEEPCmH2O, coarse.model()); err == nil {
			if m, err := physiology.FitMechanicsFrom(rd, rf.s.PEEPCmH2O, cm, model); err == nil {
				return m, nil
			}
		}
	}
	return physiology.FitMechanics(rd, rf.s.PEEPCmH2O, model)
}

// reliefMarginCmH2O is how far under the relief pressure a fit at the
// relief aims the peak: the model's peak never exceeds the relief, and
// 0.01 cmH2O is far below any manometer's step (derived).
const reliefMarginCmH2O = 0.01

// fitAtRelief fits a breath whose peak sat at the relief valve: the end
// pressure still tells the compliance; the peak tells only that the
// resistance is at least the one that brings the model's peak to the
// relief pressure (RAtLeast). When no lung reaches it, the compliance is
// fitted to the end pressure at the assumed resistance.
func (rf readingsFit) fitAtRelief(rd physiology.Readings, relief float64, near *physiology.Mechanics, model physiology.PressureModel) (physiology.Mechanics, error) {
	at := physiology.Readings{PeakCmH2O: relief - reliefMarginCmH2O, EndCmH2O: rd.EndCmH2O}
	var m physiology.Mechanics
	var err error
	if near != nil {
		m, err = physiology.FitMechanicsNear(at, rf.s.PEEPCmH2O, *near, model)
	} else {
		m, err = physiology.FitMechanics(at, rf.s.PEEPCmH2O, model)
	}
	if err == nil {
		m.EndOnly, m.RAtLeast = true, true
		return m, nil
	}
	return physiology.FitComplianceFromEnd(rd.EndCmH2O, rf.s.PEEPCmH2O, rf.assumedR, model)
}

// Where a fitted lung's figures come from.
const (
	srcFitted        = "fitted to the manometer readings"
	srcFittedEndOnly = "fitted to the end pressure alone (the peak is at the relief valve)"
)

// fittedValues are a fit's compliance and resistance with their sources:
// a fit to the end pressure alone keeps the assumed resistance, said so.
func fittedValues(m physiology.Mechanics, assumedR physiology.Value) (physiology.Value, physiology.Value) {
	if m.RAtLeast {
		return physiology.Value{Value: m.ComplianceMLPerCmH2O, Source: srcFittedEndOnly},
			physiology.Value{Value: m.ResistanceCmH2OPerLS, Source: "at least this: the least resistance that brings the peak to the relief valve; the peak cannot tell more"}
	}
	if m.EndOnly {
		return physiology.Value{Value: m.ComplianceMLPerCmH2O, Source: srcFittedEndOnly},
			physiology.Value{Value: assumedR.Value, Source: "assumed, " + assumedR.Source + ": the peak at the relief valve cannot tell it"}
	}
	return physiology.Value{Value: m.ComplianceMLPerCmH2O, Source: srcFitted}, physiology.Value{Value: m.ResistanceCmH2OPerLS, Source: srcFitted}
}

// withFitCautions adds what the fit says (fitCautions) to the check's
// current cautions, most serious first, the readings' own order kept.
func withFitCautions(ck Check, req CheckRequest, reliefCmH2O float64) []Caution {
	step := manometerStep(req)
	add := fitCautions(ck.Readings, ck.Fitted, reliefCmH2O, step.Value/2, ck.Current.Figures.Hole.DeliveredML, step)
	if len(add) == 0 {
		return ck.Current.Cautions
	}
	out := append(add, ck.Current.Cautions...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Level > out[j].Level })
	return out
}
