package physiology

import (
	"errors"
	"fmt"
	"math"
)

// The next step of the ARDS Network protocol from the blood gas, the
// oximeter and the plateau pressure.
//
// How the rules combine ("one step at a time"):
//   - Oxygenation moves PEEP and FiO2 only, one pair along the
//     lower-PEEP/FiO2 table; the plateau and pH rules move the tidal volume
//     and the rate only. The two groups work independent knobs and are
//     applied together. A PEEP step changes the plateau too: the plateau
//     rule looks at the plateau now, and the proposal's own figures show
//     the plateau after the step.
//   - When both PaO2 and SpO2 are given, PaO2 decides (it is the measured
//     arterial value; the oximeter reads through skin and perfusion). When
//     the two disagree about the goal the step says so.
//   - Only the plateau rule moves the tidal volume. Below pH 7.15 the
//     protocol allows Vt up in 1 mL/kg steps once the rate is at 35; this is
//     said as a note for the clinician and never applied here, and when the
//     plateau is above 30 the plateau rule's Vt step down wins.
//   - The pH rule's rate is computed for the tidal volume after the plateau
//     rule's step, dead space included. When the tidal volume changes and
//     the pH rule does not set the rate, the rate is scaled to hold the
//     alveolar ventilation (rule "alveolar-ventilation"), so that a Vt step
//     does not move the PaCO2 by itself.

// Plausible ranges for the readings (common practice: a value outside is
// almost always a typing or sampling error, not a patient). Outside them a
// reading is refused and the person asked to check it.
const (
	SpO2MinPct   = 50.0
	SpO2MaxPct   = 100.0
	PaO2MinMmHg  = 20.0
	PaO2MaxMmHg  = 600.0
	PHMin        = 6.8
	PHMax        = 7.8
	PaCO2MinMmHg = 10.0
	PaCO2MaxMmHg = 150.0
)

// The protocol's goals and limits (ARDS Network protocol card).
const (
	PaO2GoalLowMmHg      = 55.0
	PaO2GoalHighMmHg     = 80.0
	SpO2GoalLowPct       = 88.0
	SpO2GoalHighPct      = 95.0
	PlateauGoalMaxCmH2O  = 30.0
	PlateauLowCmH2O      = 25.0 // below it, with Vt under 6, Vt goes up
	VtStepMLPerKg        = 1.0
	VtFloorMLPerKg       = 4.0
	VtUpToMLPerKg        = 6.0
	PHGoalLow            = 7.30
	PHGoalHigh           = 7.45
	PHSevere             = 7.15
	ProtocolRateMaxBPM   = 35.0
	ProtocolPaCO2MinMmHg = 25.0 // the rate is not raised to take PaCO2 below it
	// PHAimAcid is where the rate step aims from pH 7.15-7.30: inside the
	// goal with a margin of 0.05, rather than on its edge.
	PHAimAcid = 7.35
	// PHAimAlkaline is where the rate step aims above pH 7.45: the middle of
	// the goal, the same margin of 0.05 from its edge as PHAimAcid.
	PHAimAlkaline = 7.40
	// ProtocolRateFloorBPM is the lowest rate the alkalaemia step goes to:
	// the lower end of the emergency specification's range (MHRA RMVS001
	// 2020: rate 10-30).
	ProtocolRateFloorBPM = 10.0
)

// Tolerances for finding the patient on the table. The FiO2 of a bleed is
// an estimate from a flowmeter set to a tenth of a litre: 0.1 L/min moves
// it by 0.79 x 0.1 / MV, 0.013 at 6 L/min (derived from the bleed
// formula), so a patient within 0.015 of a pair is at that pair (the
// table's FiO2 steps are 0.1 apart, so no two pairs are confused). A PEEP
// valve is set to about the nearest cmH2O (common practice).
const (
	tableFiO2Tol = 0.015
	tablePEEPTol = 0.5
)

const (
	srcProtocolCard = "ARDS Network protocol card (NIH NHLBI ARDS Clinical Network)"
	srcProtocolOx   = srcProtocolCard + ": PaO2 55-80 mmHg or SpO2 88-95 %, lower-PEEP/FiO2 table"
	srcProtocolPlat = srcProtocolCard + ": plateau <= 30; Vt down 1 mL/kg to 4; up 1 mL/kg when plateau < 25 and Vt < 6; above 6, 1 mL/kg steps to 6"
	srcProtocolPH   = srcProtocolCard + ": pH 7.30-7.45; rate at most 35; Henderson-Hasselbalch; alveolar ventilation equation"
	srcAlveolar     = "derived: alveolar ventilation equation, PaCO2 proportional to 1 / (rate x (Vt - Vd))"
)

// GasReadings are the blood gas and the oximeter at handover, with the
// apparatus dead space the rate step needs when the tidal volume changes:
// the one type of these readings, from the entries to the protocol step,
// the cautions, a check's JSON and its record (keys with their units). A
// nil field was not taken (or, for the dead space, not entered: 0 mL is
// then assumed and said so).
type GasReadings struct {
	SpO2Pct              *float64 `json:"spo2_pct"`                // %
	PaO2MmHg             *float64 `json:"pao2_mmhg"`               // mmHg
	PH                   *float64 `json:"ph"`                      //
	PaCO2MmHg            *float64 `json:"paco2_mmhg"`              // mmHg
	ApparatusDeadSpaceML *float64 `json:"apparatus_dead_space_ml"` // mL: tube, filter, connectors
}

// Empty reports whether no reading was taken; the apparatus dead space
// alone is not a reading.
func (g GasReadings) Empty() bool {
	return g.SpO2Pct == nil && g.PaO2MmHg == nil && g.PH == nil && g.PaCO2MmHg == nil
}

// Validate returns every reading outside its plausible range, each as a
// *RangeError naming the reading, the value and the range (joined with
// errors.Join), or nil.
func (g GasReadings) Validate() error {
	var errs []error
	check := func(name string, v *float64, lo, hi float64, unit string) {
		if v != nil {
			if err := CheckRange(name, *v, lo, hi, unit); err != nil {
				errs = append(errs, err)
			}
		}
	}
	check("SpO2", g.SpO2Pct, SpO2MinPct, SpO2MaxPct, "%")
	check("PaO2", g.PaO2MmHg, PaO2MinMmHg, PaO2MaxMmHg, "mmHg")
	check("pH", g.PH, PHMin, PHMax, "")
	check("PaCO2", g.PaCO2MmHg, PaCO2MinMmHg, PaCO2MaxMmHg, "mmHg")
	return errors.Join(errs...)
}

// ProtocolState is where the patient is now.
type ProtocolState struct {
	PBWKg     float64
	MLPerKg   float64 // tidal volume the patient gets now, per kg PBW
	RateBPM   float64
	PEEPCmH2O float64
	FiO2      float64
	// PlateauCmH2O is the plateau now: predicted, or fitted to the
	// manometer's readings; PlateauSource says which.
	PlateauCmH2O  float64
	PlateauSource string
	// ApparatusDeadSpaceML is the tube, filter and connectors; nil when not
	// entered (0 mL is then assumed and the step says so).
	ApparatusDeadSpaceML *float64
	// Lung is the lung condition: the protocol's table and rules are for
	// ARDS. 0 (not stated) applies them and says so; Normal and Obstructive
	// get the oxygenation goal only, with the lung's own strategy
	// (protocolscope.go).
	Lung Lung
	// NoAlveolarHold switches off this tool's own rule that scales the
	// rate to hold the alveolar ventilation when the tidal volume changes
	// (it is not the card's).
	NoAlveolarHold bool
}

// RuleStatus is what a rule did.
type RuleStatus int

const (
	// RuleInGoal: the reading is inside the goal; nothing to change.
	RuleInGoal RuleStatus = iota + 1
	// RuleFired: the rule proposes a step.
	RuleFired
	// RuleNoStep: outside the goal, but the protocol has no further step
	// here (or this one cannot be computed); the clinician decides.
	RuleNoStep
	// RuleNoReading: the rule cannot fire without a reading not taken.
	RuleNoReading
)

func (s RuleStatus) String() string {
	switch s {
	case RuleInGoal:
		return "in-goal"
	case RuleFired:
		return "fired"
	case RuleNoStep:
		return "no-step"
	case RuleNoReading:
		return "no-reading"
	}
	return "unknown"
}

// RuleResult is one rule's finding: which reading it looked at, its value
// (HasValue false when not taken), the goal, what it proposes and why, and
// the source of the rule.
type RuleResult struct {
	ID       string // "oxygenation", "plateau", "ph", "alveolar-ventilation"
	Reading  string // the reading with its unit, like "PaO2 mmHg"
	Value    float64
	HasValue bool
	Goal     string
	Action   string
	Source   string
	Status   RuleStatus
}

// ProtocolStep is the next step: every rule's finding and the new targets.
// A target that no rule changed keeps the value it has now.
type ProtocolStep struct {
	Rules     []RuleResult
	PEEPCmH2O float64
	FiO2      float64
	MLPerKg   float64
	RateBPM   float64

	PEEPChanged, FiO2Changed, VtChanged, RateChanged bool

	// DeadSpaceML is anatomic (2.2 mL/kg PBW) plus apparatus; it matters
	// only when the tidal volume changes.
	DeadSpaceML     float64
	DeadSpaceSource string
}

// Changed reports whether any target changed.
func (s ProtocolStep) Changed() bool {
	return s.PEEPChanged || s.FiO2Changed || s.VtChanged || s.RateChanged
}

// NextProtocolStep applies the protocol's rules to the readings at the
// state now. A reading outside its plausible range, or a state that is not
// a patient on a ventilator (PBW, Vt or rate not positive, PEEP or FiO2
// outside their ranges), is refused with an error naming it.
func NextProtocolStep(st ProtocolState, g GasReadings) (ProtocolStep, error) {
	if err := g.Validate(); err != nil {
		return ProtocolStep{}, err
	}
	if err := st.validate(); err != nil {
		return ProtocolStep{}, err
	}
	step := ProtocolStep{PEEPCmH2O: st.PEEPCmH2O, FiO2: st.FiO2, MLPerKg: st.MLPerKg, RateBPM: st.RateBPM}
	step.DeadSpaceML, step.DeadSpaceSource = deadSpace(st)
	if st.Lung == Normal || st.Lung == Obstructive {
		return otherLungStep(st, g, step), nil
	}

	ox, pair := oxygenationRule(st, g)
	if ox.Status == RuleFired {
		step.FiO2, step.PEEPCmH2O = pair.FiO2, pair.PEEPCmH2O
		step.FiO2Changed = math.Abs(pair.FiO2-st.FiO2) > 1e-9
		step.PEEPChanged = math.Abs(pair.PEEPCmH2O-st.PEEPCmH2O) > 1e-9
	}
	plat, mlkg := plateauRule(st)
	plat, mlkg = severeAcidKeepsVt(st, g, plat, mlkg)
	if plat.Status == RuleFired {
		step.MLPerKg, step.VtChanged = mlkg, true
	}
	ph, rate := phRule(st, g, step.MLPerKg, step.DeadSpaceML, plat.Status == RuleFired && mlkg < st.MLPerKg && st.PlateauCmH2O > PlateauGoalMaxCmH2O+1e-9)
	step.Rules = []RuleResult{ox, plat, ph}
	if st.Lung == 0 {
		step.Rules = append([]RuleResult{unstatedLungRule()}, step.Rules...)
	}
	if ph.Status == RuleFired {
		step.RateBPM, step.RateChanged = rate, true
	} else if step.VtChanged && st.NoAlveolarHold {
		step.Rules = append(step.Rules, RuleResult{ID: "alveolar-ventilation", Reading: "tidal volume mL/kg PBW", Value: step.MLPerKg, HasValue: true,
			Goal: alveolarHoldGoal, Status: RuleNoStep, Source: srcAlveolarChoice,
			Action: fmt.Sprintf("switched off: the rate stays %.1f /min and PaCO2 will move with the Vt step; re-check the gas", st.RateBPM)})
	} else if step.VtChanged {
		hold, rate := holdVentilationRule(st, step.MLPerKg, step.DeadSpaceML, step.DeadSpaceSource)
		step.Rules = append(step.Rules, hold)
		if hold.Status == RuleFired {
			step.RateBPM, step.RateChanged = rate, true
		}
	}
	return step, nil
}

func (st ProtocolState) validate() error {
	for _, v := range []struct {
		name, unit string
		v          float64
	}{{"predicted body weight", "kg", st.PBWKg}, {"tidal volume", "mL/kg PBW", st.MLPerKg}, {"rate", "/min", st.RateBPM}, {"plateau", "cmH2O", st.PlateauCmH2O}} {
		if math.IsNaN(v.v) || math.IsInf(v.v, 0) || v.v <= 0 {
			return fmt.Errorf("%s %v %s must be a positive number", v.name, v.v, v.unit)
		}
	}
	if err := CheckRange("PEEP", st.PEEPCmH2O, PEEPMin, PEEPMax, "cmH2O"); err != nil {
		return err
	}
	if err := CheckRange("FiO2 (a fraction: 40% is 0.4)", st.FiO2, FiO2Min, FiO2Max, ""); err != nil {
		return err
	}
	if d := st.ApparatusDeadSpaceML; d != nil {
		if err := CheckRange("apparatus dead space", *d, 0, ApparatusDeadSpaceMaxML, "mL"); err != nil {
			return err
		}
	}
	return nil
}

// ApparatusDeadSpaceMaxML bounds the apparatus dead space a person may
// enter: a tube, a filter and a catheter mount come to well under this
// (common practice).
const ApparatusDeadSpaceMaxML = 300.0

func deadSpace(st ProtocolState) (float64, string) {
	anat, err := AnatomicDeadSpaceML(st.PBWKg)
	if err != nil {
		// validate refused such a PBW before any rule ran.
		anat = 0
	}
	src := fmt.Sprintf("anatomic %.0f mL (%.1f mL/kg PBW; Radford 1955, from memory)", anat, AnatomicDeadSpaceMLPerKg)
	if st.ApparatusDeadSpaceML == nil {
		return anat, src + " + apparatus not entered, 0 mL assumed: enter the tube, filter and connectors"
	}
	return anat + *st.ApparatusDeadSpaceML, src + fmt.Sprintf(" + apparatus %.0f mL entered", *st.ApparatusDeadSpaceML)
}

// holdVentilationRule scales the rate so that rate x (Vt - Vd) stays as it
// is when the plateau rule moves the tidal volume, within the protocol's
// rates.
func holdVentilationRule(st ProtocolState, newMLPerKg, vdML float64, vdSource string) (RuleResult, float64) {
	r := RuleResult{ID: "alveolar-ventilation", Reading: "tidal volume mL/kg PBW", Value: newMLPerKg, HasValue: true,
		Goal: alveolarHoldGoal, Source: srcAlveolarChoice + "; " + srcAlveolar + "; dead space " + vdSource}
	rate, err := RateForPaCO2(st.RateBPM, st.MLPerKg*st.PBWKg, newMLPerKg*st.PBWKg, vdML, 1, 1)
	if err != nil {
		r.Status, r.Action = RuleNoStep, "rate not scaled: "+err.Error()+"; the clinician decides"
		return r, st.RateBPM
	}
	hi := math.Max(ProtocolRateMaxBPM, st.RateBPM)
	lo := math.Min(ProtocolRateFloorBPM, st.RateBPM)
	// Rounded first, then held to the limits: a rate already above 35 /min
	// (hi is then the rate itself) must not round up past where it was.
	rate = math.Min(hi, math.Max(lo, round1(rate)))
	if math.Abs(rate-st.RateBPM) < 0.05 {
		r.Status = RuleNoStep
		r.Action = fmt.Sprintf("rate stays %.1f /min (limits %.0f-%.0f): PaCO2 will move with the Vt step; re-check the gas", st.RateBPM, lo, hi)
		return r, st.RateBPM
	}
	r.Status = RuleFired
	r.Action = fmt.Sprintf("rate %.1f -> %.1f /min so that Vt %.1f -> %.1f mL/kg PBW keeps rate x (Vt - dead space %.0f mL)",
		st.RateBPM, rate, st.MLPerKg, newMLPerKg, vdML)
	return r, rate
}

func round1(v float64) float64 { return math.Round(v*10) / 10 }

// samePair reports whether the patient is at pair p, within the
// tolerances.
func samePair(p PEEPFiO2Pair, fio2, peep float64) bool {
	return math.Abs(p.FiO2-fio2) <= tableFiO2Tol && math.Abs(p.PEEPCmH2O-peep) <= tablePEEPTol
}

// nextPairUp is the first pair of the table that lowers neither FiO2 nor
// PEEP and is not where the patient is. The table rises in both, so for a
// pair on the table this is the next column; from room air at PEEP 5 it is
// the first column.
func nextPairUp(fio2, peep float64) (PEEPFiO2Pair, bool) {
	for _, p := range lowerPEEPTable {
		if p.FiO2 >= fio2-tableFiO2Tol && p.PEEPCmH2O >= peep-tablePEEPTol && !samePair(p, fio2, peep) {
			return p, true
		}
	}
	return PEEPFiO2Pair{}, false
}

// nextPairDown is the last pair that raises neither FiO2 nor PEEP and is
// not where the patient is: for a pair on the table, the column before.
func nextPairDown(fio2, peep float64) (PEEPFiO2Pair, bool) {
	for i := len(lowerPEEPTable) - 1; i >= 0; i-- {
		p := lowerPEEPTable[i]
		if p.FiO2 <= fio2+tableFiO2Tol && p.PEEPCmH2O <= peep+tablePEEPTol && !samePair(p, fio2, peep) {
			return p, true
		}
	}
	return PEEPFiO2Pair{}, false
}

func onTable(fio2, peep float64) bool {
	for _, p := range lowerPEEPTable {
		if samePair(p, fio2, peep) {
			return true
		}
	}
	return false
}

// oxygenationRule moves one pair along the lower-PEEP/FiO2 table. PaO2,
// when given, decides over SpO2.
func oxygenationRule(st ProtocolState, g GasReadings) (RuleResult, PEEPFiO2Pair) {
	r := RuleResult{ID: "oxygenation", Source: srcProtocolOx}
	var v, lo, hi float64
	var disagree string
	switch {
	case g.PaO2MmHg != nil:
		v, lo, hi = *g.PaO2MmHg, PaO2GoalLowMmHg, PaO2GoalHighMmHg
		r.Reading, r.Goal = "PaO2 mmHg", "PaO2 55-80 mmHg (decides over SpO2)"
		if s := g.SpO2Pct; s != nil && goalSide(*s, SpO2GoalLowPct, SpO2GoalHighPct) != goalSide(v, lo, hi) {
			disagree = fmt.Sprintf("; SpO2 %.0f %% disagrees with the PaO2 about the goal: check the oximeter probe and the sample", *s)
		}
	case g.SpO2Pct != nil:
		v, lo, hi = *g.SpO2Pct, SpO2GoalLowPct, SpO2GoalHighPct
		r.Reading, r.Goal = "SpO2 %", "SpO2 88-95 %"
	default:
		r.Reading, r.Goal, r.Status = "PaO2 mmHg or SpO2 %", "PaO2 55-80 mmHg or SpO2 88-95 %", RuleNoReading
		r.Action = "no PaO2 or SpO2: the oxygenation rule cannot fire; enter one"
		return r, PEEPFiO2Pair{}
	}
	r.Value, r.HasValue = v, true
	now := fmt.Sprintf("FiO2 %.2f, PEEP %.0f", st.FiO2, st.PEEPCmH2O)
	switch {
	case st.FiO2 <= RoomAirFiO2+tableFiO2Tol:
		now += " (room air)"
	case !onTable(st.FiO2, st.PEEPCmH2O):
		now += " (not a pair of the table)"
	}
	var pair PEEPFiO2Pair
	var ok bool
	switch goalSide(v, lo, hi) {
	case 0:
		r.Status, r.Action = RuleInGoal, "in goal: PEEP and FiO2 stay at "+now+disagree
		return r, pair
	case -1:
		pair, ok = nextPairUp(st.FiO2, st.PEEPCmH2O)
		if !ok {
			r.Status = RuleNoStep
			r.Action = "below goal at " + now + ": no further step up the table (its last pair is FiO2 1.0, PEEP 24); call the clinician" + disagree
			return r, pair
		}
		r.Action = fmt.Sprintf("below goal: next pair up the table, FiO2 %.1f, PEEP %.0f cmH2O (from %s)%s", pair.FiO2, pair.PEEPCmH2O, now, disagree)
	default:
		pair, ok = nextPairDown(st.FiO2, st.PEEPCmH2O)
		if !ok {
			r.Status = RuleNoStep
			r.Action = "above goal at " + now + ": no lower pair in the table; lowering FiO2 toward room air, PEEP at least 5, is the clinician's decision" + disagree
			if st.FiO2 <= RoomAirFiO2+tableFiO2Tol {
				r.Action = "above goal at " + now + ": no oxygen to take away; the protocol keeps PEEP at 5 or more" + disagree
			}
			return r, pair
		}
		r.Action = fmt.Sprintf("above goal: the pair below on the table, FiO2 %.1f, PEEP %.0f cmH2O (from %s)%s", pair.FiO2, pair.PEEPCmH2O, now, disagree)
	}
	r.Status = RuleFired
	return r, pair
}

// goalSide is -1 below lo, 0 inside [lo, hi], +1 above hi.
func goalSide(v, lo, hi float64) int {
	switch {
	case v < lo-1e-9:
		return -1
	case v > hi+1e-9:
		return 1
	}
	return 0
}

// plateauRule steps the tidal volume 1 mL/kg PBW. The tidal volume is
// compared at the 0.1 mL/kg it is shown with, so a hole delivering 5.96
// mL/kg counts as 6.
func plateauRule(st ProtocolState) (RuleResult, float64) {
	p := st.PlateauCmH2O
	src := st.PlateauSource
	if src == "" {
		src = "predicted"
	}
	r := RuleResult{ID: "plateau", Reading: "plateau cmH2O (" + src + ")", Value: p, HasValue: true,
		Goal: "plateau <= 30 cmH2O; below 25 with Vt under 6 mL/kg PBW: Vt up", Source: srcProtocolPlat}
	vt := round1(st.MLPerKg)
	switch {
	case p > PlateauGoalMaxCmH2O+1e-9:
		if vt <= VtFloorMLPerKg {
			r.Status = RuleNoStep
			r.Action = fmt.Sprintf("above goal with Vt already %.1f mL/kg PBW, the protocol's lowest: no further step; call the clinician", st.MLPerKg)
			return r, st.MLPerKg
		}
		next := math.Max(VtFloorMLPerKg, st.MLPerKg-VtStepMLPerKg)
		r.Status = RuleFired
		r.Action = fmt.Sprintf("above goal: Vt %.1f -> %.1f mL/kg PBW (1 mL/kg down, not below 4)", st.MLPerKg, next)
		return r, next
	case p < PlateauLowCmH2O-1e-9 && vt < VtUpToMLPerKg:
		next := math.Min(VtUpToMLPerKg, st.MLPerKg+VtStepMLPerKg)
		r.Status = RuleFired
		r.Action = fmt.Sprintf("below 25 with Vt under 6: Vt %.1f -> %.1f mL/kg PBW (1 mL/kg up, to 6 at most)", st.MLPerKg, next)
		return r, next
	case vt > VtUpToMLPerKg:
		// The card brings the tidal volume to 6 mL/kg PBW in 1 mL/kg
		// steps; the plateau goal is met, so nothing holds it higher.
		next := math.Max(VtUpToMLPerKg, st.MLPerKg-VtStepMLPerKg)
		r.Status = RuleFired
		r.Action = fmt.Sprintf("in goal with Vt %.1f mL/kg PBW above 6: Vt %.1f -> %.1f mL/kg PBW (1 mL/kg towards 6)", st.MLPerKg, st.MLPerKg, next)
		return r, next
	}
	r.Status = RuleInGoal
	r.Action = fmt.Sprintf("in goal: Vt stays %.1f mL/kg PBW", st.MLPerKg)
	return r, st.MLPerKg
}

// phRule sets the rate from the pH, holding the bicarbonate. newMLPerKg is
// the tidal volume after the plateau rule; plateauLowered says that rule
// took it down this step (and so wins over the protocol's Vt up below pH
// 7.15).
func phRule(st ProtocolState, g GasReadings, newMLPerKg, vdML float64, plateauLowered bool) (RuleResult, float64) {
	r := RuleResult{ID: "ph", Reading: "pH", Goal: "pH 7.30-7.45", Source: srcProtocolPH}
	if g.PH == nil {
		r.Status = RuleNoReading
		r.Action = "no pH: the pH rule cannot fire; enter pH and PaCO2"
		return r, st.RateBPM
	}
	pH := *g.PH
	r.Value, r.HasValue = pH, true
	switch {
	case pH >= PHGoalLow-1e-9 && pH <= PHGoalHigh+1e-9:
		r.Status, r.Action = RuleInGoal, fmt.Sprintf("in goal: no rate step for the pH (rate now %.1f /min)", st.RateBPM)
		return r, st.RateBPM
	case pH < PHSevere-1e-9:
		return severeAcidRule(r, st, plateauLowered)
	}
	if g.PaCO2MmHg == nil {
		r.Status = RuleNoReading
		r.Action = "outside goal, but the new rate needs PaCO2 (to hold the bicarbonate): enter PaCO2"
		return r, st.RateBPM
	}
	paco2 := *g.PaCO2MmHg
	hco3, err := BicarbonateMmolL(pH, paco2)
	if err != nil {
		r.Status, r.Action = RuleNoStep, err.Error()
		return r, st.RateBPM
	}
	aim := PHAimAcid
	if pH > PHGoalHigh {
		aim = PHAimAlkaline
	}
	target, err := PaCO2ForPH(aim, hco3)
	if err != nil {
		r.Status, r.Action = RuleNoStep, err.Error()
		return r, st.RateBPM
	}
	gas := fmt.Sprintf("PaCO2 %.0f mmHg, HCO3 %.1f mmol/L held", paco2, hco3)
	if pH < PHGoalLow {
		switch {
		case paco2 < ProtocolPaCO2MinMmHg:
			r.Status = RuleNoStep
			r.Action = fmt.Sprintf("below goal with PaCO2 %.0f mmHg already under 25: the protocol raises the rate no further; call the clinician", paco2)
			return r, st.RateBPM
		case st.RateBPM >= ProtocolRateMaxBPM-0.05:
			r.Status = RuleNoStep
			r.Action = fmt.Sprintf("below goal with the rate already %.1f /min, the protocol's most: no further rate step; call the clinician", st.RateBPM)
			return r, st.RateBPM
		}
		target = math.Max(target, ProtocolPaCO2MinMmHg)
	} else if st.RateBPM <= ProtocolRateFloorBPM+0.05 {
		r.Status = RuleNoStep
		r.Action = fmt.Sprintf("above goal with the rate already %.1f /min: no lower rate (floor %.0f); call the clinician", st.RateBPM, ProtocolRateFloorBPM)
		return r, st.RateBPM
	}
	rate, err := RateForPaCO2(st.RateBPM, st.MLPerKg*st.PBWKg, newMLPerKg*st.PBWKg, vdML, paco2, target)
	if err != nil {
		r.Status, r.Action = RuleNoStep, "no rate step: "+err.Error()+"; call the clinician"
		return r, st.RateBPM
	}
	rate = round1(math.Min(ProtocolRateMaxBPM, math.Max(ProtocolRateFloorBPM, rate)))
	if math.Abs(rate-st.RateBPM) < 0.05 {
		r.Status = RuleNoStep
		r.Action = fmt.Sprintf("%s: the rate for pH %.2f within %.0f-%.0f /min is the rate now, %.1f /min; call the clinician",
			gas, aim, ProtocolRateFloorBPM, ProtocolRateMaxBPM, st.RateBPM)
		return r, st.RateBPM
	}
	r.Status = RuleFired
	r.Action = fmt.Sprintf("%s: rate %.1f -> %.1f /min aiming at pH %.2f (PaCO2 %.1f mmHg at Vt %.1f mL/kg PBW)",
		gas, st.RateBPM, rate, aim, target, newMLPerKg)
	switch {
	case pH < PHGoalLow && rate >= ProtocolRateMaxBPM-0.05:
		r.Action += "; capped at the protocol's 35 /min"
	case pH > PHGoalHigh && paco2 >= 45:
		r.Action += fmt.Sprintf("; PaCO2 %.0f mmHg is already 45 or more: the alkalaemia is not from over-ventilation and a lower rate raises the CO2 further: the clinician decides", paco2)
	}
	return r, rate
}

// severeAcidRule is pH below 7.15: rate 35, and the protocol's note that
// the tidal volume may then rise.
func severeAcidRule(r RuleResult, st ProtocolState, plateauLowered bool) (RuleResult, float64) {
	note := "if pH stays below 7.15 at rate 35 the protocol allows Vt up in 1 mL/kg steps and the plateau goal of 30 may be exceeded: the clinician decides; not applied here"
	if plateauLowered {
		note += "; this step the plateau rule (plateau above 30) took Vt down, and it wins"
	}
	if st.RateBPM >= ProtocolRateMaxBPM-0.05 {
		r.Status = RuleNoStep
		r.Action = fmt.Sprintf("below 7.15 with the rate already %.1f /min: no further rate step; %s", st.RateBPM, note)
		return r, st.RateBPM
	}
	r.Status = RuleFired
	r.Action = fmt.Sprintf("below 7.15: rate %.1f -> 35 /min; %s", st.RateBPM, note)
	return r, ProtocolRateMaxBPM
}
