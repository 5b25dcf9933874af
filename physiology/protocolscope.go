package physiology

import (
	"fmt"
	"math"
)

// The ARDS Network protocol's table and rules are for ARDS. For another
// lung the step says so and offers only the oxygenation goal, met by FiO2
// alone with the PEEP the clinician set for this lung, and the lung's own
// strategy for the pH: an obstructive lung needs time to exhale, so its
// rate is not raised (a faster rate traps gas).

const (
	// OtherLungFiO2Step is the FiO2 step towards the oxygenation goal for a
	// lung outside the protocol (common practice: FiO2 in tenths, as the
	// card's table moves it).
	OtherLungFiO2Step = 0.1

	alveolarHoldGoal  = "alveolar ventilation held while Vt changes (this tool's own rule, not the card's)"
	srcAlveolarChoice = "this tool's choice, not the protocol card's: switch it off with --hold-alveolar-ventilation=false"
	srcOtherLung      = srcProtocolCard + ": the protocol is for ARDS"
	srcOtherLungOx    = srcProtocolCard + ": PaO2 55-80 mmHg or SpO2 88-95 %; FiO2 in 0.1 steps, PEEP as set for this lung: common practice"
)

// unstatedLungRule says that the lung condition was not given and the
// protocol's rules are applied as for ARDS.
func unstatedLungRule() RuleResult {
	return RuleResult{ID: "protocol-scope", Reading: "lung condition not entered", Goal: "the protocol is for ARDS",
		Status: RuleInGoal, Source: srcOtherLung,
		Action: "lung condition not entered: the ARDS Network rules are applied; enter the lung (normal or obstructive) if it is not ARDS"}
}

// otherLungStep is the step for a normal or obstructive lung: the scope
// said, FiO2 alone towards the oxygenation goal, the plateau and pH
// reported with this lung's own strategy and no Vt or rate step.
func otherLungStep(st ProtocolState, g GasReadings, step ProtocolStep) ProtocolStep {
	strategy := "lung-protective volumes, PEEP and rate as the clinician sets them"
	if st.Lung == Obstructive {
		strategy = "low rate and long expiration; accept a higher PaCO2 while the pH allows; watch intrinsic PEEP"
	}
	scope := RuleResult{ID: "protocol-scope", Reading: "lung condition " + st.Lung.String(), Goal: "the protocol is for ARDS", Status: RuleNoStep, Source: srcOtherLung,
		Action: fmt.Sprintf("this lung is %s: the ARDS Network table, plateau and pH rules are not applied; only the oxygenation goal is offered, with this lung's own strategy (%s)", st.Lung, strategy)}
	ox, fio2 := otherLungOxygenation(st, g)
	if ox.Status == RuleFired {
		step.FiO2, step.FiO2Changed = fio2, true
	}
	plat := RuleResult{ID: "plateau", Reading: "plateau cmH2O", Value: st.PlateauCmH2O, HasValue: true, Goal: "plateau <= 30 cmH2O",
		Source: srcOtherLung, Status: RuleInGoal, Action: fmt.Sprintf("in goal: Vt stays %.1f mL/kg PBW", st.MLPerKg)}
	if st.PlateauCmH2O > PlateauGoalMaxCmH2O+1e-9 {
		plat.Status = RuleNoStep
		plat.Action = fmt.Sprintf("above 30 with Vt %.1f mL/kg PBW: the clinician decides the volume for this lung (the plateau caution stands)", st.MLPerKg)
	}
	step.Rules = []RuleResult{scope, ox, plat, otherLungPH(st, g)}
	return step
}

// otherLungOxygenation moves FiO2 alone one step towards the goal.
func otherLungOxygenation(st ProtocolState, g GasReadings) (RuleResult, float64) {
	r, _ := oxygenationRule(st, g)
	r.Source = srcOtherLungOx
	if !r.HasValue {
		return r, st.FiO2
	}
	lo, hi := SpO2GoalLowPct, SpO2GoalHighPct
	if g.PaO2MmHg != nil {
		lo, hi = PaO2GoalLowMmHg, PaO2GoalHighMmHg
	}
	now := fmt.Sprintf("FiO2 %.2f, PEEP %.0f cmH2O kept", st.FiO2, st.PEEPCmH2O)
	switch goalSide(r.Value, lo, hi) {
	case 0:
		r.Status, r.Action = RuleInGoal, "in goal: "+now
		return r, st.FiO2
	case -1:
		if st.FiO2 >= FiO2Max-tableFiO2Tol {
			r.Status, r.Action = RuleNoStep, "below goal at FiO2 1.00: no further oxygen step; call the clinician"
			return r, st.FiO2
		}
		next := math.Min(FiO2Max, round1(st.FiO2+OtherLungFiO2Step))
		r.Status, r.Action = RuleFired, fmt.Sprintf("below goal: FiO2 %.2f -> %.1f (0.1 up), PEEP %.0f cmH2O kept for this lung", st.FiO2, next, st.PEEPCmH2O)
		return r, next
	}
	if st.FiO2 <= RoomAirFiO2+tableFiO2Tol {
		r.Status, r.Action = RuleNoStep, "above goal on room air: no oxygen to take away"
		return r, st.FiO2
	}
	next := math.Max(RoomAirFiO2, round1(st.FiO2-OtherLungFiO2Step))
	r.Status, r.Action = RuleFired, fmt.Sprintf("above goal: FiO2 %.2f -> %.2f (0.1 down), PEEP %.0f cmH2O kept for this lung", st.FiO2, next, st.PEEPCmH2O)
	return r, next
}

// otherLungPH reports the pH with this lung's strategy and proposes no
// rate.
func otherLungPH(st ProtocolState, g GasReadings) RuleResult {
	r := RuleResult{ID: "ph", Reading: "pH", Goal: "pH 7.30-7.45", Source: srcOtherLung}
	if g.PH == nil {
		r.Status, r.Action = RuleNoReading, "no pH"
		return r
	}
	pH := *g.PH
	r.Value, r.HasValue = pH, true
	switch {
	case pH >= PHGoalLow-1e-9 && pH <= PHGoalHigh+1e-9:
		r.Status, r.Action = RuleInGoal, fmt.Sprintf("in goal: rate stays %.1f /min", st.RateBPM)
		return r
	case pH > PHGoalHigh:
		r.Status, r.Action = RuleNoStep, fmt.Sprintf("above goal: the rate for this lung is the clinician's (rate now %.1f /min)", st.RateBPM)
		return r
	}
	r.Status = RuleNoStep
	if st.Lung == Obstructive {
		r.Action = fmt.Sprintf("below goal: for an obstructive lung the rate stays %.1f /min (a faster rate shortens expiration and traps gas); accept a higher PaCO2 while the pH allows and watch intrinsic PEEP", st.RateBPM)
	} else {
		r.Action = fmt.Sprintf("below goal: the ARDS rate rule is not applied to this lung; the clinician decides the rate (now %.1f /min)", st.RateBPM)
	}
	if pH < PHSevere-1e-9 {
		r.Action += "; below 7.15: call the clinician now"
	}
	return r
}

// severeAcidKeepsVt holds the tidal volume when the plateau rule would
// only bring it towards 6 mL/kg PBW while the pH is below 7.15: there the
// card allows Vt up, never down, unless the plateau is above 30.
func severeAcidKeepsVt(st ProtocolState, g GasReadings, plat RuleResult, mlkg float64) (RuleResult, float64) {
	towardsSix := plat.Status == RuleFired && mlkg < st.MLPerKg && st.PlateauCmH2O <= PlateauGoalMaxCmH2O+1e-9
	if !towardsSix || g.PH == nil || *g.PH >= PHSevere-1e-9 {
		return plat, mlkg
	}
	plat.Status = RuleNoStep
	plat.Action = fmt.Sprintf("in goal with Vt %.1f mL/kg PBW above 6, but pH %.2f is below 7.15: Vt stays (the card allows Vt up there, not down)", st.MLPerKg, *g.PH)
	return plat, st.MLPerKg
}
