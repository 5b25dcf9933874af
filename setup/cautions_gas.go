package setup

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"crankside/physiology"
)

// The patient's own numbers as cautions: the blood gas and the oximeter
// are judged on their own, as the manometer's readings are (before and
// without any fit, whatever the machine's figures), and a pair of readings
// that cannot both be true is refused: a stop, and the protocol's step does
// not read them.

// Limits of the gas cautions, with their sources.
const (
	// The ARDS Network oxygenation goal: PaO2 55-80 mmHg or SpO2 88-95 %.
	OxygenationLowSpO2Pct   = physiology.SpO2GoalLowPct
	OxygenationLowPaO2MmHg  = physiology.PaO2GoalLowMmHg
	OxygenationHighSpO2Pct  = physiology.SpO2GoalHighPct
	OxygenationHighPaO2MmHg = physiology.PaO2GoalHighMmHg
	// Below these, severe hypoxaemia: a stop (common practice). The two
	// agree on the standard curve: Severinghaus 1979 gives PaO2 50 mmHg ->
	// SO2 85.0 % (derived: 100 / (23400 / (125000 + 7500) + 1)).
	OxygenationStopSpO2Pct  = 85.0
	OxygenationStopPaO2MmHg = 50.0
	// Above the goal, the oxygen given is worth lowering only when there is
	// some to lower: FiO2 above 0.4 or PEEP above 8, where the lower-PEEP
	// table has pairs below (ARDS Network protocol card: 0.4/5, 0.4/8).
	OxygenationHighFiO2      = 0.4
	OxygenationHighPEEPCmH2O = 8.0
	// The ARDS Network pH goal 7.30-7.45; below 7.15 its severe branch.
	PHLowWarn  = physiology.PHGoalLow
	PHLowStop  = physiology.PHSevere
	PHHighWarn = physiology.PHGoalHigh
)

const (
	srcOxGoal   = "ARDS Network protocol card: oxygenation goal PaO2 55-80 mmHg or SpO2 88-95 %"
	srcOxStop   = "common practice (severe hypoxaemia); SpO2 85 % and PaO2 50 mmHg agree on Severinghaus's 1979 curve (derived)"
	srcOxHigh   = srcOxGoal + "; FiO2 > 0.4 or PEEP > 8: the lower-PEEP/FiO2 table has a pair below"
	srcPHGoal   = "ARDS Network protocol card: pH goal 7.30-7.45"
	srcPHSevere = "ARDS Network protocol card: below pH 7.15 rate 35, Vt may rise, NaHCO3 may be given"
	srcHCO3     = "Henderson-Hasselbalch (pH = 6.1 + log10(HCO3 / (0.03 x PaCO2))); plausible 5-60 mmol/L (from memory)"
)

// GasContext is what the gas cautions read beside the readings: the FiO2
// the patient breathes and the PEEP valve. Build it with NewGasContext.
type GasContext struct {
	// FiO2 is the estimate from the oxygen bled into the piston's intake;
	// FiO2Known is false where no setting gives it yet (a form still
	// waiting), and then only PEEP can make oxygenation-high speak.
	FiO2      float64
	FiO2Known bool
	O2LPerMin float64
	PEEPCmH2O float64
}

// NewGasContext is the context of a setting whose FiO2 is estimated from
// the bleed (o2LPerMin into the piston's intake); fio2 <= 0 means not
// known.
func NewGasContext(fio2, o2LPerMin, peepCmH2O float64) GasContext {
	return GasContext{FiO2: fio2, FiO2Known: fio2 > 0, O2LPerMin: o2LPerMin, PEEPCmH2O: peepCmH2O}
}

func (c GasContext) fio2Text() string {
	return fmt.Sprintf("FiO2 %.2f (estimated from the O2 bleed, %.1f L/min)", c.FiO2, c.O2LPerMin)
}

// gasRule is one gas caution: its id (its level rule, limits, source and
// ward words are its entry in the table of cautions, cautiontable.go) and
// how it judges the readings (nil when it does not speak).
type gasRule struct {
	id    CautionID
	judge func(g GasReadings, ctx GasContext) *Caution
}

// gasRules are the gas cautions, in the order they are judged.
func gasRules() []gasRule {
	return []gasRule{
		{id: CautionGasReadingsDisagree, judge: gasDisagreeCaution},
		{id: CautionOxygenationLow, judge: oxygenationLowCaution},
		{id: CautionOxygenationHigh, judge: oxygenationHighCaution},
		{id: CautionPHLow, judge: phLowCaution},
		{id: CautionPHHigh, judge: phHighCaution},
	}
}

// GasCautions judge the blood gas and the oximeter on their own, most
// serious first. Readings outside the entries' ranges are refused before
// this (CheckGasEntries); a nil reading is not judged.
func GasCautions(g GasReadings, ctx GasContext) []Caution {
	var out []Caution
	for _, r := range gasRules() {
		if c := r.judge(g, ctx); c != nil {
			out = append(out, *c)
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Level > out[j].Level })
	return out
}

// IsGasCaution reports whether a caution id is one of the gas cautions.
func IsGasCaution(id CautionID) bool {
	for _, r := range gasRules() {
		if r.id == id {
			return true
		}
	}
	return false
}

// below is v < limit, with the protocol's own tolerance (goalSide): a
// reading on the limit is in the goal.
func below(v, limit float64) bool { return v < limit-1e-9 }
func above(v, limit float64) bool { return v > limit+1e-9 }

// oxygenationLowCaution: either reading below the goal speaks (a low
// reading is never hidden by the other); its level is the worse of the
// two, and the message names both when both are low.
func oxygenationLowCaution(g GasReadings, _ GasContext) *Caution {
	type low struct {
		level        Level
		value, limit float64
		unit, text   string
	}
	var lows []low
	judge := func(v *float64, name, unit string, stop, warn float64) {
		switch {
		case v == nil:
		case below(*v, stop):
			lows = append(lows, low{Stop, *v, stop, unit, fmt.Sprintf("%s %s %s is below %s %s: severe hypoxaemia", name, plain(*v), unit, plain(stop), unit)})
		case below(*v, warn):
			lows = append(lows, low{Warn, *v, warn, unit, fmt.Sprintf("%s %s %s is below the goal's %s %s", name, plain(*v), unit, plain(warn), unit)})
		}
	}
	judge(g.PaO2MmHg, "PaO2", "mmHg", OxygenationStopPaO2MmHg, OxygenationLowPaO2MmHg)
	judge(g.SpO2Pct, "SpO2", "%", OxygenationStopSpO2Pct, OxygenationLowSpO2Pct)
	if len(lows) == 0 {
		return nil
	}
	sort.SliceStable(lows, func(i, j int) bool { return lows[i].level > lows[j].level })
	texts := make([]string, len(lows))
	for i, l := range lows {
		texts[i] = l.text
	}
	w := lows[0]
	c := Caution{ID: CautionOxygenationLow, Level: w.level, Value: w.value, Limit: w.limit, Unit: w.unit,
		Message: strings.Join(texts, "; ") + " (goal PaO2 55-80 mmHg or SpO2 88-95 %)",
		Advice:  "check the patient, the tube, the circuit, the oxygen supply and the bleed; the protocol's step is the next PEEP/FiO2 pair up",
		Source:  srcOxGoal}
	if w.level == Stop {
		c.Advice = "act now: call the clinician; check the patient, the tube, the circuit and the oxygen supply; bag with oxygen if in doubt"
		c.Source = srcOxStop
	}
	return &c
}

// oxygenationHighCaution: above the goal while there is oxygen or PEEP to
// take away. The reading that decides is the protocol's (PaO2 over SpO2),
// so that this note and the step say the same; it is silent when a
// reading is below the goal (oxygenation-low speaks then).
func oxygenationHighCaution(g GasReadings, ctx GasContext) *Caution {
	if oxygenationLowCaution(g, ctx) != nil {
		return nil
	}
	var v, limit float64
	var name, unit string
	switch {
	case g.PaO2MmHg != nil:
		v, limit, name, unit = *g.PaO2MmHg, OxygenationHighPaO2MmHg, "PaO2", "mmHg"
	case g.SpO2Pct != nil:
		v, limit, name, unit = *g.SpO2Pct, OxygenationHighSpO2Pct, "SpO2", "%"
	default:
		return nil
	}
	fio2High := ctx.FiO2Known && above(ctx.FiO2, OxygenationHighFiO2)
	peepHigh := above(ctx.PEEPCmH2O, OxygenationHighPEEPCmH2O)
	if !above(v, limit) || !(fio2High || peepHigh) {
		return nil
	}
	var given []string
	if fio2High {
		given = append(given, ctx.fio2Text()+" above 0.4")
	}
	if peepHigh {
		given = append(given, fmt.Sprintf("PEEP %s cmH2O above 8", plain(ctx.PEEPCmH2O)))
	}
	return &Caution{ID: CautionOxygenationHigh, Level: Note, Value: v, Limit: limit, Unit: unit,
		Message: fmt.Sprintf("%s %s %s is above the goal's %s %s with %s", name, plain(v), unit, plain(limit), unit, strings.Join(given, " and ")),
		Advice:  "more oxygen or PEEP than the goal needs: the protocol's step is the pair below on the PEEP/FiO2 table",
		Source:  srcOxHigh}
}

func phLowCaution(g GasReadings, _ GasContext) *Caution {
	if g.PH == nil || !below(*g.PH, PHLowWarn) {
		return nil
	}
	ph := *g.PH
	if below(ph, PHLowStop) {
		return &Caution{ID: CautionPHLow, Level: Stop, Value: ph, Limit: PHLowStop, Unit: "pH",
			Message: fmt.Sprintf("pH %.2f is below %.2f: severe acidaemia", ph, PHLowStop),
			Advice:  "call the clinician now: the protocol raises the rate to 35, then Vt may rise and bicarbonate may be given; recheck the gas",
			Source:  srcPHSevere}
	}
	return &Caution{ID: CautionPHLow, Level: Warn, Value: ph, Limit: PHLowWarn, Unit: "pH",
		Message: fmt.Sprintf("pH %.2f is below the goal's %.2f", ph, PHLowWarn),
		Advice:  "the protocol raises the rate (at most 35 /min) while the PaCO2 stays above 25 mmHg; recheck the gas",
		Source:  srcPHGoal}
}

func phHighCaution(g GasReadings, _ GasContext) *Caution {
	if g.PH == nil || !above(*g.PH, PHHighWarn) {
		return nil
	}
	ph := *g.PH
	return &Caution{ID: CautionPHHigh, Level: Warn, Value: ph, Limit: PHHighWarn, Unit: "pH",
		Message: fmt.Sprintf("pH %.2f is above the goal's %.2f", ph, PHHighWarn),
		Advice:  "the protocol lowers the rate if it can; check for over-ventilation and recheck the gas",
		Source:  srcPHGoal}
}

// gasDisagreement is what makes a set of readings impossible: the
// bicarbonate that pH and PaCO2 imply, and the SpO2 range a PaO2 allows.
type gasDisagreement struct {
	acidBase, oximetry bool
	hco3               float64
	spo2Lo, spo2Hi     float64
}

func disagreementOf(g GasReadings) gasDisagreement { return disagreementBeyond(g, 0) }

// disagreementBeyond is disagreementOf with each plausible range widened
// by margin (mmol/L, or points of SpO2): the log's reader uses it, as a
// record keeps the readings to four decimals and what they imply may
// move by a hair.
func disagreementBeyond(g GasReadings, margin float64) gasDisagreement {
	var d gasDisagreement
	if g.PH != nil && g.PaCO2MmHg != nil {
		// The same formula as BicarbonateMmolL, without its range checks:
		// the entries' own ranges were checked before, and this rule must
		// judge whatever it is given.
		d.hco3 = physiology.CO2SolubilityMmolLPerMmHg * *g.PaCO2MmHg * math.Pow(10, *g.PH-physiology.BicarbonatePKa)
		d.acidBase = below(d.hco3, physiology.BicarbonatePlausibleMinMmolL-margin) || above(d.hco3, physiology.BicarbonatePlausibleMaxMmolL+margin)
	}
	if g.SpO2Pct != nil && g.PaO2MmHg != nil {
		d.spo2Lo, d.spo2Hi = physiology.SpO2RangeForPaO2(*g.PaO2MmHg)
		d.oximetry = below(*g.SpO2Pct, d.spo2Lo-margin) || above(*g.SpO2Pct, d.spo2Hi+margin)
	}
	return d
}

// gasDisagreeCaution is the stop for readings that cannot all be true.
func gasDisagreeCaution(g GasReadings, _ GasContext) *Caution {
	d := disagreementOf(g)
	if !d.acidBase && !d.oximetry {
		return nil
	}
	c := Caution{ID: CautionGasReadingsDisagree, Level: Stop,
		Advice: "re-take the gas (an arterial sample? this patient's? the unit: kPa or mmHg?) and check the oximeter's probe; the protocol's step does not use these readings"}
	var texts, sources []string
	if d.oximetry {
		spo2 := *g.SpO2Pct
		c.Value, c.Limit, c.Unit = spo2, ternary(spo2 < d.spo2Lo, d.spo2Lo, d.spo2Hi), "%"
		texts = append(texts, fmt.Sprintf("SpO2 %s %% cannot go with PaO2 %s mmHg, which allows SpO2 %.0f-%.0f %%",
			plain(spo2), plain(*g.PaO2MmHg), d.spo2Lo, d.spo2Hi))
		sources = append(sources, physiology.SpO2PaO2RuleSource)
	}
	if d.acidBase {
		limit := ternary(d.hco3 < physiology.BicarbonatePlausibleMinMmolL, physiology.BicarbonatePlausibleMinMmolL, physiology.BicarbonatePlausibleMaxMmolL)
		c.Value, c.Limit, c.Unit = d.hco3, limit, "mmol/L"
		texts = append([]string{fmt.Sprintf("pH %.2f and PaCO2 %s mmHg imply a bicarbonate of %.1f mmol/L, outside %.0f-%.0f",
			*g.PH, plain(*g.PaCO2MmHg), d.hco3, physiology.BicarbonatePlausibleMinMmolL, physiology.BicarbonatePlausibleMaxMmolL)}, texts...)
		sources = append([]string{srcHCO3}, sources...)
	}
	c.Message = strings.Join(texts, "; ") + ": the readings cannot all be true"
	c.Source = strings.Join(sources, "; ")
	return &c
}

// gasForStep is what the protocol's step may read: a pair that disagrees
// is refused whole (which of the two is wrong is not known), and with pH
// and PaCO2 the PaO2 of the same sample too. refused says what was left
// out, or is "".
func gasForStep(g GasReadings) (fed GasReadings, refused string) {
	d := disagreementOf(g)
	fed = g
	var out []string
	if d.acidBase {
		what := "pH and PaCO2"
		if g.PaO2MmHg != nil && !d.oximetry {
			what = "pH, PaCO2 and the PaO2 of the same sample"
		}
		fed.PH, fed.PaCO2MmHg, fed.PaO2MmHg = nil, nil, nil
		out = append(out, what)
	}
	if d.oximetry {
		fed.SpO2Pct, fed.PaO2MmHg = nil, nil
		out = append(out, "SpO2 and PaO2")
	}
	if len(out) == 0 {
		return g, ""
	}
	return fed, "the gas readings disagree (" + string(CautionGasReadingsDisagree) + "): " + strings.Join(out, ", and ") + " not used by the step"
}

// GasWardWords are a record's gas cautions in a few words each, with their
// level words ("WARN low O2 (SpO2 87 %), WARN pH 7.24 low"), or "".
func GasWardWords(cs []Caution) string {
	var out []string
	for _, c := range cs {
		if IsGasCaution(c.ID) {
			out = append(out, WardWords(c))
		}
	}
	return strings.Join(out, ", ")
}

// judgeGas adds the gas cautions of the readings g to the check's current
// cautions, most serious first, and its oxygenation indices. The FiO2 is
// the setting's, estimated from the oxygen bled into the piston's intake
// (it does not depend on the lung).
func (ck *Check) judgeGas(g GasReadings) {
	cur := &ck.Current
	ctx := NewGasContext(cur.Figures.FiO2, cur.Setting.O2LPerMin, cur.Setting.PEEPCmH2O)
	cur.Cautions = append(GasCautions(g, ctx), cur.Cautions...)
	sort.SliceStable(cur.Cautions, func(i, j int) bool { return cur.Cautions[i].Level > cur.Cautions[j].Level })
	ck.Oxygenation = oxygenationOf(g, ctx)
}

// GasRecordText is a record's gas in a few words for a ward row or a
// history line: its gas cautions with their level words and the graded
// oxygenation index ("gas: WARN low O2 (SpO2 87 %), WARN pH 7.24 low;
// S/F 414 none"), or "" for a record without a gas or oximeter reading.
func GasRecordText(r Record) string { return GasCheckText(r.CheckJSON) }

// GasCheckText is GasRecordText for a check's JSON body, as the screen
// holds it.
func GasCheckText(j CheckJSON) string {
	if j.GasReadings == nil || j.GasReadings.Empty() {
		return ""
	}
	words := GasWardWords(j.Cautions)
	if words == "" {
		words = "no gas caution"
	}
	out := "gas: " + words
	if o := OxygenationShort(j.OxygenationJSON); o != "" {
		out += "; " + o
	}
	return out
}

// recordGasReadings are a record's gas readings as a check's, or false
// when it has none.
func recordGasReadings(r *Record) (GasReadings, bool) {
	j := r.GasReadings
	if j == nil || j.Empty() {
		return GasReadings{}, false
	}
	return *j, true
}

// GasRecordProblem holds a record's gas readings to the entries' ranges,
// as the log's reader keeps the writer's rules; "" when they are in them.
func GasRecordProblem(r *Record) string {
	g, ok := recordGasReadings(r)
	if !ok {
		return ""
	}
	if bad := CheckGasEntries(g); len(bad) > 0 {
		return "gas reading " + bad[0].Error()
	}
	return ""
}

// RecordGasCautions are the gas cautions a record's readings call for,
// for the log's reader: a record whose gas STOP was edited out must not
// read calm in the ward. The FiO2 (an estimate) is not taken, so
// oxygenation-high is called for by the record's PEEP alone (above 8
// cmH2O); a disagreement is called for only when it holds with a margin
// of 0.01 (see disagreementBeyond).
func RecordGasCautions(r *Record) []Caution {
	g, ok := recordGasReadings(r)
	if !ok {
		return nil
	}
	var out []Caution
	for _, c := range GasCautions(g, GasContext{PEEPCmH2O: r.Setting.PEEPCmH2O}) {
		if c.ID == CautionGasReadingsDisagree {
			if d := disagreementBeyond(g, 0.01); !d.acidBase && !d.oximetry {
				continue
			}
		}
		out = append(out, Caution{ID: c.ID, Level: c.Level})
	}
	return out
}
