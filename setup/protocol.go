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

// ProtocolProposal computes the protocol's next step from the readings at
// the check's current setting, and the setting of this machine that makes
// it: the hole nearest the new volume, the speed and dwell for the new rate
// at the same I:E, the PEEP valve, and the O2 flow for the new FiO2 (held
// FiO2 when only the minute ventilation changes). Any proposal in req is
// replaced by the step's. The step's setting is evaluated with the same
// lung as the current one (fitted to the readings when they fit) and with
// its cautions, the machine's reach included.
func ProtocolProposal(req CheckRequest, readings GasReadings, p profiles.Profile) (ProtocolStepResult, error) {
	if bad := CheckGasEntries(readings); len(bad) > 0 {
		return ProtocolStepResult{}, bad[0]
	}
	req.Proposal = Proposal{}
	ck, err := RunCheck(req, p)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	u, err := newUnitV(p, orNow(req.Now), req.v1Gas)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	u.gas = ck.Gas // the check's room, cylinder, leak and relief valve
	u.cylinderReserveBar = ck.Current.Figures.CylinderReserveBar
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
		// The readings were checked above: what is left is the setting.
		return ProtocolStepResult{}, &InputError{Field: "setting", Reason: "no protocol step at this setting: " + err.Error()}
	}
	res := ProtocolStepResult{Readings: readings, Step: step, Check: ck,
		TargetMLPerKg: step.MLPerKg, TargetVtML: step.MLPerKg * ck.PBWKg}
	lung := machine.Lung{ComplianceMLPerCmH2O: ck.Mechanics.Value, ResistanceCmH2OPerLS: ck.Resistance.Value}
	ls := lungState{lung: lung, peep: step.PEEPCmH2O, pbwKg: ck.PBWKg}
	if err := res.placeOnMachine(u, st, ls); err != nil {
		return ProtocolStepResult{}, err
	}
	if err := checkSetting(u, res.Proposed, "propose-"); err != nil {
		return ProtocolStepResult{}, err
	}
	ev, err := res.evaluateProposed(u, ls, req)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	res.RateBPM, res.FiO2 = ev.Figures.Timing.RateBPM, ev.Figures.FiO2
	if res.Proposed != cur.Setting {
		res.Check.Proposed = &ev
		res.Check.Differences = differences(cur.Figures, ev.Figures)
	}
	if !finiteFigures(ev.Figures) {
		return ProtocolStepResult{}, &InputError{Field: "readings", Reason: "the model gave no finite figures for the protocol's step"}
	}
	return res, nil
}

// placeOnMachine chooses the hole, speed, dwell and O2 flow for the step.
// The hole and the timing settle together, as in MakePlan: with an offset
// crank the delivery angle, and so the speed for a Ti, depends on the hole.
func (res *ProtocolStepResult) placeOnMachine(u unit, st physiology.ProtocolState, ls lungState) error {
	cur := res.Check.Current
	hole, _ := u.p.HoleByLabel(cur.Setting.Hole)
	rpm, dwell := cur.Setting.RPM, cur.Setting.DwellS
	ie := cur.Figures.Timing.IE
	if res.Step.RateChanged && ie < physiology.IEMin {
		res.note(fmt.Sprintf("I:E now 1:%.2f is inverse; the new rate is planned at 1:1", ie))
		ie = physiology.IEMin
	}
	want := res.Step.RateBPM
	for pass := 0; pass < 4 && res.Step.VtChanged; pass++ {
		if res.Step.RateChanged {
			tp, err := machine.PlanTiming(u.motor, u.controller, u.crank(hole).DeliveryAngle(), want, ie)
			if err != nil {
				return &InputError{Field: "rate", Reason: err.Error()}
			}
			rpm = tp.RPM
		}
		next, err := res.holeForStep(u, st, ls, rpm)
		if err != nil {
			return err
		}
		moved := next.Label != hole.Label
		hole = next
		if res.rateScalesWithVt() {
			hf, err := deliveredFromRest(u, hole, rpm, ls)
			if err != nil {
				return &InputError{Field: "profile " + u.p.ID, Reason: err.Error()}
			}
			if w := res.rateForVolume(hf.DeliveredML); math.Abs(w-want) > 0.05 {
				want, moved = w, true
			}
		}
		if !moved || !res.Step.RateChanged {
			break // settled, or the speed does not depend on the hole
		}
	}
	if res.Step.RateChanged {
		tp, err := machine.PlanTiming(u.motor, u.controller, u.crank(hole).DeliveryAngle(), want, ie)
		if err != nil {
			return &InputError{Field: "rate", Reason: err.Error()}
		}
		res.Timing = &tp
	}
	if res.Timing != nil {
		res.keepRateInProtocol(u, hole)
		rpm, dwell = res.Timing.RPM, res.Timing.DwellS
		res.Changes = append(res.Changes, res.stepTimingChanges()...)
		res.timingNotes(u)
	}
	hf, err := deliveredFromRest(u, hole, rpm, ls)
	if err != nil {
		return &InputError{Field: "profile " + u.p.ID, Reason: err.Error()}
	}
	if res.Timing != nil && res.rateScalesWithVt() && math.Abs(res.Timing.WantedRateBPM-res.Step.RateBPM) > 0.05 {
		res.note(fmt.Sprintf("the hole delivers %.0f mL, not the step's %.0f mL: the rate this machine sets keeps the step's alveolar ventilation (dead space %.0f mL) with this hole",
			hf.DeliveredML, res.TargetVtML, res.Step.DeadSpaceML))
	}
	if res.Step.VtChanged && math.Abs(hf.DeliveredML-res.TargetVtML) > 0.5 {
		res.Changes = append(res.Changes, Change{What: "tidal volume", Wanted: res.TargetVtML, Got: hf.DeliveredML, Unit: "mL"})
	}
	res.Proposed = Setting{Hole: hole.Label, RPM: rpm, DwellS: dwell, PEEPCmH2O: res.Step.PEEPCmH2O, O2LPerMin: cur.Setting.O2LPerMin}
	res.setO2Flow(hf, st)
	return nil
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
func (res *ProtocolStepResult) rateForVolume(deliveredML float64) float64 {
	w, err := physiology.RateForPaCO2(res.Step.RateBPM, res.TargetVtML, deliveredML, res.Step.DeadSpaceML, 1, 1)
	if err != nil {
		return res.Step.RateBPM
	}
	lo := math.Min(physiology.ProtocolRateFloorBPM, res.Step.RateBPM)
	hi := math.Max(physiology.ProtocolRateMaxBPM, res.Step.RateBPM)
	return math.Round(math.Min(hi, math.Max(lo, w))*10) / 10
}

// holeForStep is the hole whose delivered volume at rpm is nearest the
// step's volume (MakePlan's rule). When that is the hole in use, a plateau
// step down takes the next smaller hole if it keeps 4 mL/kg PBW or more, so
// that the step takes effect; a step up stays and says so.
func (res *ProtocolStepResult) holeForStep(u unit, st physiology.ProtocolState, ls lungState, rpm float64) (profiles.Hole, error) {
	holes := make([]HoleFigure, 0, len(u.p.Crank.Holes))
	curIdx := 0
	for i, h := range u.p.Crank.Holes {
		hf, err := deliveredFromRest(u, h, rpm, ls)
		if err != nil {
			return profiles.Hole{}, &InputError{Field: "profile " + u.p.ID, Reason: err.Error()}
		}
		holes = append(holes, hf)
		if h.Label == res.Check.Current.Setting.Hole {
			curIdx = i
		}
	}
	chosen := nearestHole(holes, res.TargetVtML)
	if chosen == curIdx {
		below, _ := neighbours(holes, curIdx)
		// Only the plateau above its goal forces the next smaller hole; a
		// step towards 6 mL/kg does not go below 6 for want of a hole.
		down := res.Step.MLPerKg < st.MLPerKg && st.PlateauCmH2O > physiology.PlateauGoalMaxCmH2O+1e-9
		if down && below != nil && below.MLPerKg >= physiology.VtFloorMLPerKg-0.05 {
			for i := range holes {
				if holes[i].Label == below.Label {
					chosen = i
				}
			}
			res.note(fmt.Sprintf("the hole nearest %.0f mL is the one in use (%s); the next smaller hole %s (%.0f mL, %.1f mL/kg PBW) is taken so that the plateau step takes effect",
				res.TargetVtML, holes[curIdx].Label, below.Label, below.DeliveredML, below.MLPerKg))
		} else {
			res.note(fmt.Sprintf("the hole nearest %.0f mL is the one in use (%s): the tidal volume does not change on this machine", res.TargetVtML, holes[curIdx].Label))
		}
	}
	return u.p.Crank.Holes[chosen], nil
}

// keepRateInProtocol lengthens the dwell one controller step when the
// controller's rounding took the rate above the protocol's 35 /min.
func (res *ProtocolStepResult) keepRateInProtocol(u unit, hole profiles.Hole) {
	tp := res.Timing
	if tp.RateBPM <= physiology.ProtocolRateMaxBPM+0.05 || res.Step.RateBPM > physiology.ProtocolRateMaxBPM+1e-9 {
		return
	}
	d := math.Round((tp.DwellS+u.controller.DwellStepS)*1e9) / 1e9
	if d > u.controller.MaxSettableDwellS()+1e-9 {
		return
	}
	was := tp.RateBPM
	tp.Timing = machine.TimingOf(tp.RPM, d, u.crank(hole).DeliveryAngle())
	res.note(fmt.Sprintf("the dwell's step gave %.1f /min, above the protocol's 35: the dwell is one step longer, %.1f s, giving %.1f /min", was, d, tp.RateBPM))
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

// setO2Flow is the oxygen bled into the intake for the step's FiO2 at the
// piston's proposed intake; with FiO2 unchanged it holds the FiO2 now.
func (res *ProtocolStepResult) setO2Flow(hf HoleFigure, st physiology.ProtocolState) {
	cur := res.Check.Current.Setting
	s := &res.Proposed
	sameBreath := s.Hole == cur.Hole && s.RPM == cur.RPM && s.DwellS == cur.DwellS
	if !res.Step.FiO2Changed && sameBreath {
		return
	}
	rate := 60 / (60/s.RPM + s.DwellS)
	fio2 := st.FiO2
	if res.Step.FiO2Changed {
		fio2 = res.Step.FiO2
	}
	// Version 2: the oxygen mixes into what the piston draws (effective
	// swept x rate). A flowmeter is set to a tenth of a litre: rounded up,
	// so that the FiO2 is never below the step's.
	flow := math.Max(0, math.Ceil(physiology.O2FlowForFiO2AtPistonIntake(fio2, hf.EffectiveSweptML, rate)*10-1e-9)/10)
	if fio2 >= 1 && cur.O2LPerMin > flow {
		flow = cur.O2LPerMin // already all oxygen: keep the larger flow
	}
	s.O2LPerMin = flow
	if math.Abs(flow-cur.O2LPerMin) < 0.005 {
		return
	}
	why := fmt.Sprintf("for FiO2 %.2f", fio2)
	if !res.Step.FiO2Changed {
		why = fmt.Sprintf("to hold FiO2 %.2f", fio2)
	}
	res.note(fmt.Sprintf("O2 flow %.1f -> %.1f L/min %s at the piston's proposed intake %.1f L/min (bled into the intake; rounded up to 0.1 L/min)", cur.O2LPerMin, flow, why, physiology.PistonIntakeLPerMin(hf.EffectiveSweptML, rate)))
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
