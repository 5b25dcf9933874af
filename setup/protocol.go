package setup

import (
	"fmt"
	"math"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// CheckGasEntries finds every gas entry outside its plausible range, each
// as an *InputError naming its field ("spo2", "pao2", "ph", "paco2",
// "dead-space-ml"), so that a form can mark all of them at once.
func CheckGasEntries(g GasReadings) []*InputError {
	var out []*InputError
	one := func(field string, r physiology.GasReadings) {
		if err := r.Validate(); err != nil {
			out = append(out, inputErr(field, err).(*InputError))
		}
	}
	one("spo2", physiology.GasReadings{SpO2Pct: g.SpO2Pct})
	one("pao2", physiology.GasReadings{PaO2MmHg: g.PaO2MmHg})
	one("ph", physiology.GasReadings{PH: g.PH})
	one("paco2", physiology.GasReadings{PaCO2MmHg: g.PaCO2MmHg})
	if d := g.ApparatusDeadSpaceML; d != nil {
		if err := checkRange("dead-space-ml", "apparatus dead space", *d, 0, physiology.ApparatusDeadSpaceMaxML, "mL"); err != nil {
			out = append(out, err.(*InputError))
		}
	}
	return out
}

// ProtocolStepResult is the protocol's next step turned into a setting of
// this machine, evaluated beside the current one.
type ProtocolStepResult struct {
	Readings GasReadings
	Step     physiology.ProtocolStep
	// Check has the current setting, and in Proposed and Differences the
	// step's setting beside it (Proposed nil when the step changes nothing
	// on this machine).
	Check    Check
	Proposed Setting
	// RateBPM and FiO2 are what the proposed setting gives on this machine.
	RateBPM       float64
	FiO2          float64
	TargetMLPerKg float64 // the step's tidal volume per kg PBW
	TargetVtML    float64
	// Timing is the speed and dwell for the new rate at the same I:E; nil
	// when the rate did not change (speed and dwell kept as they are).
	Timing *machine.TimingPlan
	// Changes are what the machine's steps changed from what the protocol
	// wanted: the rate, the speed, the dwell, Ti, I:E, the tidal volume.
	Changes []Change
	// Notes say in words what a fixed motor, a hole step or the oxygen flow
	// did to the step.
	Notes []string
}

// The protocol's next step at a check runs in four parts, each once:
//
//   - choose: physiology.NextProtocolStep reads the gas at the current
//     setting and chooses the step (chooseStep);
//   - place: setup puts the step on this machine, the hole and the rate
//     settling together, then the speed and dwell, then the O2 flow for the
//     placed breath (stepPlacer.place, giving a stepPlace);
//   - evaluate: the placed setting is predicted with its cautions, the
//     machine's reach and the hole's distance from the step's volume
//     included (evaluateProposed);
//   - describe: the machine's changes to the step, and notes that say in
//     words what it did (describe).
//
// The check's request is read for the step's state (the lung, the
// alveolar hold), the unit (the clock, the version 1 limit) and the
// evaluation (the patient, the cylinder, the hazards); the check itself
// is not run again.

// protocolStep is the protocol's next step at ck, the check of req's
// current setting, from gas readings already checked (CheckGasEntries).
// A proposal ck carries is left out: the step is the proposal.
func protocolStep(ck Check, req CheckRequest, readings GasReadings, p profiles.Profile) (ProtocolStepResult, error) {
	ck.Proposed, ck.Differences = nil, nil
	st, step, err := chooseStep(ck, req, readings)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	u, err := newUnitV(p, orNow(req.Now), req.v1Gas)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	u.gas = ck.Gas // the check's room, cylinder, leak and relief valve
	u.cylinderReserveBar = ck.Current.Figures.CylinderReserveBar
	res := ProtocolStepResult{Readings: readings, Step: step, Check: ck,
		TargetMLPerKg: step.MLPerKg, TargetVtML: step.MLPerKg * ck.PBWKg}
	ls := lungState{lung: machine.Lung{ComplianceMLPerCmH2O: ck.Mechanics.Value, ResistanceCmH2OPerLS: ck.Resistance.Value},
		peep: step.PEEPCmH2O, pbwKg: ck.PBWKg}

	pl, err := res.placer(u, st, ls).place()
	if err != nil {
		return ProtocolStepResult{}, err
	}
	res.Proposed, res.Timing = pl.setting, pl.timing
	if err := checkSetting(u, res.Proposed, "propose-"); err != nil {
		return ProtocolStepResult{}, err
	}
	ev, err := res.evaluateProposed(u, ls, req)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	if !finiteFigures(ev.Figures) {
		return ProtocolStepResult{}, &InputError{Field: "readings", Reason: "the model gave no finite figures for the protocol's step"}
	}
	res.describe(u, pl)

	res.RateBPM, res.FiO2 = ev.Figures.Timing.RateBPM, ev.Figures.FiO2
	if res.Proposed != ck.Current.Setting {
		res.Check.Proposed = &ev
		res.Check.Differences = differences(ck.Current.Figures, ev.Figures)
	}
	return res, nil
}

// chooseStep is the physiology's part: the state now (the check's
// current figures, its plateau predicted or fitted to the readings) and
// the step the protocol's rules choose from the readings.
func chooseStep(ck Check, req CheckRequest, readings GasReadings) (physiology.ProtocolState, physiology.ProtocolStep, error) {
	cur := ck.Current
	plateauSrc := "predicted; compliance " + ck.Mechanics.Source
	if ck.Fitted != nil {
		plateauSrc = ck.Mechanics.Source
	}
	st := physiology.ProtocolState{
		PBWKg: ck.PBWKg, MLPerKg: cur.Figures.Hole.MLPerKg, RateBPM: cur.Figures.Timing.RateBPM,
		PEEPCmH2O: cur.Setting.PEEPCmH2O, FiO2: cur.Figures.FiO2,
		PlateauCmH2O: cur.Figures.PlateauCmH2O, PlateauSource: plateauSrc,
		ApparatusDeadSpaceML: readings.ApparatusDeadSpaceML,
		Lung:                 req.Lung, NoAlveolarHold: req.NoAlveolarHold,
	}
	step, err := physiology.NextProtocolStep(st, readings)
	if err != nil {
		// The readings were checked before: what is left is the setting.
		return st, step, &InputError{Field: "setting", Reason: "no protocol step at this setting: " + err.Error()}
	}
	return st, step, nil
}

// stepPlacer puts a chosen step on this machine.
type stepPlacer struct {
	u        unit
	cur      Setting
	curIE    float64 // I:E now (E of 1:E)
	step     physiology.ProtocolStep
	st       physiology.ProtocolState
	ls       lungState // the step's PEEP on the check's lung
	targetML float64   // the step's tidal volume at this PBW
	// scales: the step's rate was computed for the step's volume, so that
	// a hole delivering another volume needs another rate
	// (rateScalesWithVt).
	scales bool
}

func (res *ProtocolStepResult) placer(u unit, st physiology.ProtocolState, ls lungState) stepPlacer {
	cur := res.Check.Current
	return stepPlacer{u: u, cur: cur.Setting, curIE: cur.Figures.Timing.IE, step: res.Step, st: st, ls: ls,
		targetML: res.TargetVtML, scales: res.rateScalesWithVt()}
}

// stepPlace is the step on this machine, and what the machine did to it
// on the way, for describe to say.
type stepPlace struct {
	setting Setting
	timing  *machine.TimingPlan // nil when the rate did not change: speed and dwell kept
	breath  HoleFigure          // the placed hole's breath from rest at the placed speed
	// inverseIE: the I:E now is inverse and the new rate is planned at 1:1.
	inverseIE bool
	hole      holePick
	// lengthenedFrom is the rate above the protocol's 35 /min that the
	// dwell's rounding gave before the dwell was made one step longer; 0
	// when it was not.
	lengthenedFrom float64
	o2             o2Pick
}

// holePick is why the step's hole is the one it is, when that is not
// simply the hole nearest the step's volume.
type holePick struct {
	inUse   string // the hole in use, when it is the nearest the step's volume ("" otherwise)
	smaller bool   // the next smaller hole is taken so that a plateau step takes effect
	// belowFloor is the hole nearest the step's volume when it is below 4
	// mL/kg PBW and not in use: not taken. floorKept is the index of the
	// hole taken instead (the nearest at or above the floor, or the hole in
	// use when no hole keeps it).
	belowFloor *HoleFigure
	floorKept  int
}

// nearestAtOrAbove is the index of the hole nearest targetML among those
// delivering at least floorMLPerKg per kg PBW, or -1 when none does.
func nearestAtOrAbove(holes []HoleFigure, targetML, floorMLPerKg float64) int {
	best := -1
	for i, h := range holes {
		if h.MLPerKg < floorMLPerKg-1e-9 {
			continue
		}
		if best < 0 || math.Abs(h.DeliveredML-targetML) < math.Abs(holes[best].DeliveredML-targetML)-1e-9 {
			best = i
		}
	}
	return best
}

// o2Pick is the O2 flow of the placed breath.
type o2Pick struct {
	flow float64 // L/min
	set  bool    // set for the placed breath (false: the breath and FiO2 are unchanged, the flow kept)
	fio2 float64 // the FiO2 the flow was set for
	// intake is the piston's intake of the placed breath, L/min.
	intake float64
}

// place puts the step on the machine: the hole and the rate first, then
// the speed and dwell for that rate at the same I:E, then the O2 flow for
// the FiO2 at the placed breath's intake.
func (pc stepPlacer) place() (stepPlace, error) {
	var pl stepPlace
	ie := pc.curIE
	if pc.step.RateChanged && ie < physiology.IEMin {
		pl.inverseIE, ie = true, physiology.IEMin
	}
	hole, pick, want, err := pc.holeAndRate(ie)
	if err != nil {
		return pl, err
	}
	pl.hole = pick
	pl.setting = Setting{Hole: hole.Label, RPM: pc.cur.RPM, DwellS: pc.cur.DwellS, PEEPCmH2O: pc.step.PEEPCmH2O, O2LPerMin: pc.cur.O2LPerMin}
	if pc.step.RateChanged {
		tp, err := machine.PlanTiming(pc.u.motor, pc.u.controller, pc.u.crank(hole).DeliveryAngle(), want, ie)
		if err != nil {
			return pl, &InputError{Field: "rate", Reason: err.Error()}
		}
		pl.lengthenedFrom = pc.keepRateInProtocol(&tp, hole)
		pl.timing = &tp
		pl.setting.RPM, pl.setting.DwellS = tp.RPM, tp.DwellS
	}
	if pl.breath, err = deliveredFromRest(pc.u, hole, pl.setting.RPM, pc.ls); err != nil {
		return pl, &InputError{Field: "profile " + pc.u.p.ID, Reason: err.Error()}
	}
	pl.o2 = pc.o2Flow(pl.setting, pl.breath)
	pl.setting.O2LPerMin = pl.o2.flow
	return pl, nil
}

// holeAndRate settles the step's hole and wanted rate together, as
// MakePlan settles its hole and timing: the speed for the new rate at the
// same I:E sets what each hole delivers (and with an offset crank the hole
// sets the speed for a Ti), and when the rate was computed for the step's
// volume (scales), the placed hole's volume sets the rate. Without a
// volume step the hole stays; with a rate that does not depend on the hole
// one pass settles.
func (pc stepPlacer) holeAndRate(ie float64) (profiles.Hole, holePick, float64, error) {
	hole, _ := pc.u.p.HoleByLabel(pc.cur.Hole)
	rpm, want := pc.cur.RPM, pc.step.RateBPM
	var pick holePick
	for pass := 0; pass < 4 && pc.step.VtChanged; pass++ {
		if pc.step.RateChanged {
			tp, err := machine.PlanTiming(pc.u.motor, pc.u.controller, pc.u.crank(hole).DeliveryAngle(), want, ie)
			if err != nil {
				return hole, pick, want, &InputError{Field: "rate", Reason: err.Error()}
			}
			rpm = tp.RPM
		}
		next, p, err := pc.pickHole(rpm)
		if err != nil {
			return hole, pick, want, err
		}
		moved := next.Label != hole.Label
		hole, pick = next, p
		if pc.scales {
			hf, err := deliveredFromRest(pc.u, hole, rpm, pc.ls)
			if err != nil {
				return hole, pick, want, &InputError{Field: "profile " + pc.u.p.ID, Reason: err.Error()}
			}
			if w := pc.rateForVolume(hf.DeliveredML); math.Abs(w-want) > 0.05 {
				want, moved = w, true
			}
		}
		if !moved || !pc.step.RateChanged {
			break // settled, or the speed does not depend on the hole
		}
	}
	return hole, pick, want, nil
}

// rateScalesWithVt reports whether the step's rate was computed for the
// step's tidal volume (the pH rule from 7.15 up, or the alveolar
// ventilation held), so that a hole delivering another volume needs another
// rate. Below pH 7.15 the rate is 35 whatever the volume.
func (res *ProtocolStepResult) rateScalesWithVt() bool {
	if !res.Step.RateChanged || !res.Step.VtChanged {
		return false
	}
	severe := res.Readings.PH != nil && *res.Readings.PH < physiology.PHSevere-1e-9
	return !severe
}

// rateForVolume is the step's rate rescaled so that rate x (Vt - dead
// space) is what the step wanted when the hole delivers deliveredML
// instead of the step's volume, within the protocol's rates.
func (pc stepPlacer) rateForVolume(deliveredML float64) float64 {
	w, err := physiology.RateForPaCO2(pc.step.RateBPM, pc.targetML, deliveredML, pc.step.DeadSpaceML, 1, 1)
	if err != nil {
		return pc.step.RateBPM
	}
	lo := math.Min(physiology.ProtocolRateFloorBPM, pc.step.RateBPM)
	hi := math.Max(physiology.ProtocolRateMaxBPM, pc.step.RateBPM)
	return math.Round(math.Min(hi, math.Max(lo, w))*10) / 10
}

// pickHole is the hole whose delivered volume at rpm is nearest the
// step's volume (MakePlan's rule), never a hole below the ARDS Network
// floor of 4 mL/kg PBW that is not already in use (chooseStepHole).
func (pc stepPlacer) pickHole(rpm float64) (profiles.Hole, holePick, error) {
	holes := make([]HoleFigure, 0, len(pc.u.p.Crank.Holes))
	curIdx := 0
	for i, h := range pc.u.p.Crank.Holes {
		hf, err := deliveredFromRest(pc.u, h, rpm, pc.ls)
		if err != nil {
			return profiles.Hole{}, holePick{}, &InputError{Field: "profile " + pc.u.p.ID, Reason: err.Error()}
		}
		holes = append(holes, hf)
		if h.Label == pc.cur.Hole {
			curIdx = i
		}
	}
	i, pick := chooseStepHole(holes, curIdx, pc.targetML, plateauTookVtDown(pc.step.MLPerKg, pc.st.MLPerKg, pc.st.PlateauCmH2O))
	return pc.u.p.Crank.Holes[i], pick, nil
}

// plateauTookVtDown says that the step's Vt is below the Vt now with the
// plateau above its goal of 30 cmH2O (ARDS Network protocol card): the
// plateau rule took it down.
func plateauTookVtDown(stepMLPerKg, nowMLPerKg, plateauCmH2O float64) bool {
	return stepMLPerKg < nowMLPerKg && plateauCmH2O > physiology.PlateauGoalMaxCmH2O+1e-9
}

// chooseStepHole is pickHole's rule on the holes' figures at the speed
// set, holes[cur] the hole in use: the hole nearest targetML; when that is
// below 4 mL/kg PBW and not in use, the nearest at or above it (or the
// hole in use when none keeps it). When the nearest is the hole in use, a
// plateau step down (down: the plateau above its goal took Vt down) takes
// the next smaller hole if it keeps 4 mL/kg PBW or more, so that the step
// takes effect; otherwise the hole stays (describe says so). Only the
// plateau forces the smaller hole: a step towards 6 mL/kg does not go
// below 6 for want of a hole.
func chooseStepHole(holes []HoleFigure, cur int, targetML float64, down bool) (int, holePick) {
	chosen := nearestHole(holes, targetML)
	if chosen != cur && holes[chosen].MLPerKg < physiology.VtFloorMLPerKg-1e-9 {
		floor := holePick{belowFloor: &holes[chosen], floorKept: cur}
		if i := nearestAtOrAbove(holes, targetML, physiology.VtFloorMLPerKg); i >= 0 {
			floor.floorKept = i
		}
		return floor.floorKept, floor
	}
	if chosen != cur {
		return chosen, holePick{}
	}
	pick := holePick{inUse: holes[cur].Label}
	below, _ := neighbours(holes, cur)
	if down && below != nil && below.MLPerKg >= physiology.VtFloorMLPerKg-1e-9 {
		for i := range holes {
			if holes[i].Label == below.Label {
				chosen = i
			}
		}
		pick.smaller = true
	}
	return chosen, pick
}

// keepRateInProtocol lengthens the dwell one controller step when the
// controller's rounding took the rate above the protocol's 35 /min, and
// returns the rate it had (0 when the dwell was kept).
func (pc stepPlacer) keepRateInProtocol(tp *machine.TimingPlan, hole profiles.Hole) float64 {
	if tp.RateBPM <= physiology.ProtocolRateMaxBPM+0.05 || pc.step.RateBPM > physiology.ProtocolRateMaxBPM+1e-9 {
		return 0
	}
	d := math.Round((tp.DwellS+pc.u.controller.DwellStepS)*1e9) / 1e9
	if d > pc.u.controller.MaxSettableDwellS()+1e-9 {
		return 0
	}
	was := tp.RateBPM
	tp.Timing = machine.TimingOf(tp.RPM, d, pc.u.crank(hole).DeliveryAngle())
	return was
}

// o2Flow is the oxygen bled into the intake for the step's FiO2 at the
// piston's placed intake; with FiO2 unchanged it holds the FiO2 now, and
// with the breath unchanged too it keeps the flow.
func (pc stepPlacer) o2Flow(s Setting, breath HoleFigure) o2Pick {
	sameBreath := s.Hole == pc.cur.Hole && s.RPM == pc.cur.RPM && s.DwellS == pc.cur.DwellS
	if !pc.step.FiO2Changed && sameBreath {
		return o2Pick{flow: pc.cur.O2LPerMin}
	}
	rate := 60 / (60/s.RPM + s.DwellS)
	fio2 := pc.st.FiO2
	if pc.step.FiO2Changed {
		fio2 = pc.step.FiO2
	}
	// Version 2: the oxygen mixes into what the piston draws (effective
	// swept x rate). A flowmeter is set to a tenth of a litre: rounded up,
	// so that the FiO2 is never below the step's.
	flow := math.Max(0, math.Ceil(physiology.O2FlowForFiO2AtPistonIntake(fio2, breath.EffectiveSweptML, rate)*10-1e-9)/10)
	if fio2 >= 1 && pc.cur.O2LPerMin > flow {
		flow = pc.cur.O2LPerMin // already all oxygen: keep the larger flow
	}
	return o2Pick{flow: flow, set: true, fio2: fio2, intake: physiology.PistonIntakeLPerMin(breath.EffectiveSweptML, rate)}
}

// describe says what the machine did to the step, in the order it was
// placed: the changes to the step's rate, timing and volume, and a note
// for each thing a person would otherwise wonder about.
func (res *ProtocolStepResult) describe(u unit, pl stepPlace) {
	cur := res.Check.Current
	if pl.inverseIE {
		res.note(fmt.Sprintf("I:E now 1:%.2f is inverse; the new rate is planned at 1:1", cur.Figures.Timing.IE))
	}
	switch h := pl.hole; {
	case h.smaller:
		// The smaller hole is the placed one: its volume at the speed set.
		res.note(fmt.Sprintf("the hole nearest %.0f mL is the one in use (%s); the next smaller hole %s (%.0f mL, %.1f mL/kg PBW) is taken so that the plateau step takes effect",
			res.TargetVtML, h.inUse, pl.breath.Label, pl.breath.DeliveredML, pl.breath.MLPerKg))
	case h.belowFloor != nil && pl.breath.Label == cur.Setting.Hole:
		res.note(fmt.Sprintf("the hole nearest %.0f mL, %s (%.1f mL/kg PBW), is below the ARDS Network floor of 4 mL/kg PBW and no hole nearer keeps it: the hole in use (%s) stays and the tidal volume does not change on this machine",
			res.TargetVtML, h.belowFloor.Label, h.belowFloor.MLPerKg, pl.breath.Label))
	case h.belowFloor != nil:
		res.note(fmt.Sprintf("the hole nearest %.0f mL, %s (%.1f mL/kg PBW), is below the ARDS Network floor of 4 mL/kg PBW: the nearest hole at or above it, %s (%.0f mL, %.1f mL/kg PBW), is taken",
			res.TargetVtML, h.belowFloor.Label, h.belowFloor.MLPerKg, pl.breath.Label, pl.breath.DeliveredML, pl.breath.MLPerKg))
	case h.inUse != "":
		res.note(fmt.Sprintf("the hole nearest %.0f mL is the one in use (%s): the tidal volume does not change on this machine", res.TargetVtML, h.inUse))
	}
	if res.Timing != nil {
		if pl.lengthenedFrom > 0 {
			res.note(fmt.Sprintf("the dwell's step gave %.1f /min, above the protocol's 35: the dwell is one step longer, %.1f s, giving %.1f /min",
				pl.lengthenedFrom, res.Timing.DwellS, res.Timing.RateBPM))
		}
		res.Changes = append(res.Changes, res.stepTimingChanges()...)
		res.timingNotes(u)
		if res.rateScalesWithVt() && math.Abs(res.Timing.WantedRateBPM-res.Step.RateBPM) > 0.05 {
			res.note(fmt.Sprintf("the hole delivers %.0f mL, not the step's %.0f mL: the rate this machine sets keeps the step's alveolar ventilation (dead space %.0f mL) with this hole",
				pl.breath.DeliveredML, res.TargetVtML, res.Step.DeadSpaceML))
		}
	}
	if res.Step.VtChanged && math.Abs(pl.breath.DeliveredML-res.TargetVtML) > 0.5 {
		res.Changes = append(res.Changes, Change{What: "tidal volume", Wanted: res.TargetVtML, Got: pl.breath.DeliveredML, Unit: "mL"})
	}
	if o := pl.o2; o.set && math.Abs(o.flow-cur.Setting.O2LPerMin) >= 0.005 {
		why := fmt.Sprintf("for FiO2 %.2f", o.fio2)
		if !res.Step.FiO2Changed {
			why = fmt.Sprintf("to hold FiO2 %.2f", o.fio2)
		}
		res.note(fmt.Sprintf("O2 flow %.1f -> %.1f L/min %s at the piston's proposed intake %.1f L/min (bled into the intake; rounded up to 0.1 L/min)",
			cur.Setting.O2LPerMin, o.flow, why, o.intake))
	}
}

// timingNotes say in words what the motor did to the new rate.
func (res *ProtocolStepResult) timingNotes(u unit) {
	tp := res.Timing
	if u.motor.Fixed() {
		res.note(fmt.Sprintf("this motor has one speed (%.1f rpm): the rate changes only through the dwell, so Ti stays %.2f s and I:E becomes 1:%.1f",
			tp.RPM, tp.TiS, tp.IE))
	} else if tp.Speed == machine.SpeedLimited {
		res.note(fmt.Sprintf("the same I:E at %.1f /min needs %.1f rpm, outside this motor's %g-%g rpm: set to %.1f rpm, I:E 1:%.1f",
			tp.WantedRateBPM, tp.WantedRPM, u.motor.MinRPM, u.motor.TopRPM(), tp.RPM, tp.IE))
	}
	switch tp.Rate {
	case machine.TooFast:
		res.note(fmt.Sprintf("this motor cannot reach %.1f /min: its fastest turn with no dwell gives %.1f /min", tp.WantedRateBPM, tp.RateBPM))
	case machine.TooSlow:
		res.note(fmt.Sprintf("the controller's longest dwell gives %.1f /min, not %.1f", tp.RateBPM, tp.WantedRateBPM))
	}
}

func (res *ProtocolStepResult) note(s string) {
	for _, n := range res.Notes {
		if n == s {
			return
		}
	}
	res.Notes = append(res.Notes, s)
}

// evaluateProposed predicts the proposed setting with its cautions, the
// machine's reach and the hole's distance from the new volume included.
func (res *ProtocolStepResult) evaluateProposed(u unit, ls lungState, req CheckRequest) (Evaluation, error) {
	s := res.Proposed
	h, _ := u.p.HoleByLabel(s.Hole)
	t := machine.TimingOf(s.RPM, s.DwellS, u.crank(h).DeliveryAngle())
	f, err := evaluate(u, h, t, ls, s.O2LPerMin, req.CylinderWaterL, req.CylinderBar)
	if err != nil {
		return Evaluation{}, &InputError{Field: "readings", Reason: "the protocol's step: " + err.Error()}
	}
	var tp *machine.TimingPlan
	if res.Timing != nil {
		c := *res.Timing
		c.Timing = t
		tp = &c
	}
	var target *holeTarget
	if res.Step.VtChanged {
		target = targetOf(res.Step.MLPerKg, res.TargetVtML, f.Hole.DeliveredML)
	}
	a := newAssessment(u, req.Patient, ls.pbwKg, f, tp, target, checkHazards(u, s, req))
	return Evaluation{Setting: s, Figures: f, Cautions: res.bestReachable(assess(a))}, nil
}

// ProtocolRuleJSON is one rule's finding; value is null when the reading
// was not taken.
type ProtocolRuleJSON struct {
	ID      string   `json:"id"`
	Reading string   `json:"reading"`
	Value   *float64 `json:"value"`
	Goal    string   `json:"goal"`
	Action  string   `json:"action"`
	Source  string   `json:"source"`
}

// ProtocolProposedJSON is the step's setting on this machine.
type ProtocolProposedJSON struct {
	Hole          string  `json:"hole"`
	MotorRPM      float64 `json:"motor_rpm"`
	DwellS        float64 `json:"dwell_s"`
	RateBPM       float64 `json:"rate_bpm"`
	PEEPCmH2O     float64 `json:"peep_cmh2o"`
	FiO2          float64 `json:"fio2"`
	O2FlowLMin    float64 `json:"o2_flow_l_min"`
	TargetMLPerKg float64 `json:"target_ml_per_kg"`
}

// ProtocolStepJSON is the `protocol_step` object of a check's JSON.
type ProtocolStepJSON struct {
	Rules    []ProtocolRuleJSON   `json:"rules"`
	Proposed ProtocolProposedJSON `json:"proposed"`
}

// JSON is the step as its JSON object, rounded for printing.
func (res ProtocolStepResult) JSON() ProtocolStepJSON {
	out := ProtocolStepJSON{Rules: make([]ProtocolRuleJSON, 0, len(res.Step.Rules))}
	for _, r := range res.Step.Rules {
		j := ProtocolRuleJSON{ID: r.ID, Reading: r.Reading, Goal: r.Goal, Action: r.Action, Source: r.Source}
		if r.HasValue {
			v := r4(r.Value)
			j.Value = &v
		}
		out.Rules = append(out.Rules, j)
	}
	s := res.Proposed
	out.Proposed = ProtocolProposedJSON{Hole: s.Hole, MotorRPM: r4(s.RPM), DwellS: r4(s.DwellS), RateBPM: r4(res.RateBPM),
		PEEPCmH2O: r4(s.PEEPCmH2O), FiO2: r4(res.FiO2), O2FlowLMin: r4(s.O2LPerMin), TargetMLPerKg: r4(res.TargetMLPerKg)}
	return out
}

// ChangesJSON are the machine's changes to the step, rounded as a plan's.
func (res ProtocolStepResult) ChangesJSON() []Change { return roundChanges(res.Changes) }
