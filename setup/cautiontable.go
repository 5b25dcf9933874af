package setup

import (
	"fmt"

	"crankside/physiology"
)

// CautionID is a caution's stable kebab-case id: scripts, records and the
// ward read it. Every id is one of the constants below, and each has one
// entry in the table of cautions (cautionRule).
type CautionID string

// The cautions of a setting (assess and its hooks).
const (
	CautionPatientTriggering       CautionID = "patient-triggering"
	CautionHeightBelowFormula      CautionID = "height-below-formula"
	CautionTidalVolumeHigh         CautionID = "tidal-volume-high"
	CautionTidalVolumeLow          CautionID = "tidal-volume-low"
	CautionPlateauHigh             CautionID = "plateau-high"
	CautionDrivingPressureHigh     CautionID = "driving-pressure-high"
	CautionPeakAboveRelief         CautionID = "peak-above-relief"
	CautionPeakHigh                CautionID = "peak-high"
	CautionIntrinsicPEEP           CautionID = "intrinsic-peep"
	CautionLeakShareOfStroke       CautionID = "leak-share-of-stroke"
	CautionPEEPLow                 CautionID = "peep-low"
	CautionRateHigh                CautionID = "rate-high"
	CautionRateLow                 CautionID = "rate-low"
	CautionRateOutside10To30       CautionID = "rate-outside-10-30"
	CautionIEOutside               CautionID = "ie-outside-1-1-to-1-3"
	CautionRateUnreachable         CautionID = "rate-unreachable"
	CautionTiNotReachable          CautionID = "ti-not-reachable"
	CautionMinuteVentilationLow    CautionID = "minute-ventilation-low"
	CautionAlveolarVentilationLow  CautionID = "alveolar-ventilation-low"
	CautionReliefAbove40           CautionID = "relief-above-40"
	CautionNoSuitableHole          CautionID = "no-suitable-hole"
	CautionHoleOffTarget           CautionID = "hole-off-target"
	CautionCalibrationMissing      CautionID = "calibration-missing"
	CautionCalibrationOld          CautionID = "calibration-old"
	CautionCalibrationFuture       CautionID = "calibration-future"
	CautionCalibrationResidual     CautionID = "calibration-residual"
	CautionCalibrationKImplausible CautionID = "calibration-k-implausible"
	CautionCalibrationAboveSwept   CautionID = "calibration-above-swept"
	CautionCalibrationThin         CautionID = "calibration-thin"
	CautionClearanceDefault        CautionID = "clearance-default"
	CautionO2FlowAboveFlowmeter    CautionID = "o2-flow-above-flowmeter"
	CautionO2CylinderLow           CautionID = "o2-cylinder-low"
	CautionTorqueHigh              CautionID = "torque-high"
)

// The cautions of a check's readings, its fit and the protocol's step.
const (
	CautionReadingsNotNumbers       CautionID = "readings-not-numbers"
	CautionMeasuredPeakHigh         CautionID = "measured-peak-high"
	CautionMeasuredPeakAboveRelief  CautionID = "measured-peak-above-relief"
	CautionMeasuredEndAtOrBelowPEEP CautionID = "measured-end-at-or-below-peep"
	CautionMeasuredPeakBelowEnd     CautionID = "measured-peak-below-end"
	CautionReadingsUnexplained      CautionID = "readings-unexplained"
	CautionProposalOnAssumedLung    CautionID = "proposal-on-assumed-lung"
	CautionMeasuredPeakAtRelief     CautionID = "measured-peak-at-relief"
	CautionReadingsSuggestLeak      CautionID = "readings-suggest-leak"
	CautionRangeCrossesVt8          CautionID = "range-crosses-vt-8"
	CautionRangeCrossesVt10         CautionID = "range-crosses-vt-10"
	CautionRangeCrossesVt4          CautionID = "range-crosses-vt-4"
	CautionRangeCrossesPlateau30    CautionID = "range-crosses-plateau-30"
	CautionRangeCrossesPlateau35    CautionID = "range-crosses-plateau-35"
	CautionProtocolRateNotReached   CautionID = "protocol-rate-not-reached"
)

// The blood gas's and the oximeter's cautions (cautions_gas.go).
const (
	CautionGasReadingsDisagree CautionID = "gas-readings-disagree"
	CautionOxygenationLow      CautionID = "oxygenation-low"
	CautionOxygenationHigh     CautionID = "oxygenation-high"
	CautionPHLow               CautionID = "ph-low"
	CautionPHHigh              CautionID = "ph-high"
)

// Limit is one fixed limit of a caution: a value beyond it (above it, or
// below it when Below is set; at it too when AtLimit is set) raises the
// caution to Level. Value is in Unit, the unit the caution compares in.
type Limit struct {
	Level   Level
	Value   float64
	Unit    string
	Below   bool
	AtLimit bool
	Source  string
}

// crossed reports whether v is beyond the limit. NaN crosses nothing.
func (l Limit) crossed(v float64) bool {
	switch {
	case l.Below && l.AtLimit:
		return v <= l.Value
	case l.Below:
		return v < l.Value
	case l.AtLimit:
		return v >= l.Value
	}
	return v > l.Value
}

// CautionRule is one caution's entry in the table of cautions.
type CautionRule struct {
	ID CautionID
	// Levels says in words when the caution speaks and at which level.
	Levels string
	// Limits are its fixed limits (none when the limit is the machine's
	// or the readings' own: the relief valve, the PEEP set, the wanted
	// rate). A hook judges by them with Judge (judged).
	Limits []Limit
	// Source is the source of the limit, or of the finding when it has no
	// fixed limit (each Limit names its own).
	Source string
	// AssumedLung: the caution judges a figure the lung model predicts
	// (volume, pressures, trapped gas, ventilation, torque), so a check
	// whose readings no lung explains withholds it with those figures
	// (withoutAssumedLungFigures). When in doubt a caution is shown: false.
	AssumedLung bool
	// Ward is the caution in a few words for a ward row or a history
	// line, with its number ("peak 52 cmH2O above 40").
	Ward func(c Caution) string
}

// Judge is the most serious of the rule's limits that v crosses.
func (r CautionRule) Judge(v float64) (Limit, bool) { return r.JudgeCalm(v, 0) }

// JudgeCalm is Judge with v taken tol towards the calm side of each limit
// (below an upper limit, above a lower one): the log's reader judges a
// record's figures so, as the record keeps them to four decimals.
func (r CautionRule) JudgeCalm(v, tol float64) (Limit, bool) {
	var out Limit
	found := false
	for _, l := range r.Limits {
		calm := v - tol
		if l.Below {
			calm = v + tol
		}
		if l.crossed(calm) && (!found || l.Level > out.Level) {
			out, found = l, true
		}
	}
	return out, found
}

// limit is the rule's limit at level l; a programmer's mistake (a level
// the table does not give the rule) panics.
func (r CautionRule) limit(l Level) Limit {
	for _, x := range r.Limits {
		if x.Level == l {
			return x
		}
	}
	panic(fmt.Sprintf("setup: caution %s has no %s limit", r.ID, l))
}

// WardWords is a caution in a few words with its level word, for a ward
// row or a history line ("WARN pH 7.24 low"). A caution read from a log
// may carry an id this version does not know: its id stands for its
// words.
func WardWords(c Caution) string {
	words := string(c.ID)
	if r, ok := CautionRuleOf(c.ID); ok {
		words = r.Ward(c)
	}
	return LevelWord(c.Level) + " " + words
}

// ward words: the caution's number and limit after a name.
func wardAbove(name, unit string) func(Caution) string {
	return func(c Caution) string { return name + " " + plain(c.Value) + unit + " above " + plain(c.Limit) }
}

func wardBelow(name, unit string) func(Caution) string {
	return func(c Caution) string { return name + " " + plain(c.Value) + unit + " below " + plain(c.Limit) }
}

func wardSays(words string) func(Caution) string { return func(Caution) string { return words } }

// over is a warn or stop above a limit; atOrOver, under, atOrUnder the
// others.
func over(l Level, v float64, unit, src string) Limit {
	return Limit{Level: l, Value: v, Unit: unit, Source: src}
}

func atOrOver(l Level, v float64, unit, src string) Limit {
	return Limit{Level: l, Value: v, Unit: unit, AtLimit: true, Source: src}
}

func under(l Level, v float64, unit, src string) Limit {
	return Limit{Level: l, Value: v, Unit: unit, Below: true, Source: src}
}

func atOrUnder(l Level, v float64, unit, src string) Limit {
	return Limit{Level: l, Value: v, Unit: unit, Below: true, AtLimit: true, Source: src}
}

// cautionRule is the table's entry of id. An id not in the table is a
// programmer's mistake and panics (TestEveryCautionHasOneEntry walks every
// id); an id read from a record goes through CautionRuleOf.
func cautionRule(id CautionID) CautionRule {
	r, ok := CautionRuleOf(id)
	if !ok {
		panic(fmt.Sprintf("setup: caution %q is not in the table of cautions", id))
	}
	return r
}

// CautionRuleOf is the table of cautions: one entry for each id, with its
// level rule, its limits, its source, whether it judges the assumed lung
// and its ward words; false for an id the table does not have (a record
// from a later version, or a damaged one).
func CautionRuleOf(id CautionID) (CautionRule, bool) {
	r := cautionRuleOf(id)
	return r, r.ID == id && id != ""
}

func cautionRuleOf(id CautionID) CautionRule {
	const vt, cm, bpm = "mL/kg PBW", "cmH2O", "/min"
	switch id {
	case CautionPatientTriggering:
		return CautionRule{ID: id, Levels: "stop when the patient breathes against the unit (a handover entry)",
			Source: srcPassive, Ward: wardSays("breathing against the unit")}
	case CautionHeightBelowFormula:
		return CautionRule{ID: id, Levels: "warn below 152.4 cm (60 in): the PBW formula is extrapolated",
			Limits: []Limit{under(Warn, physiology.DevineBaseCm, "cm", srcDevine)}, Source: srcDevine, Ward: wardBelow("height", " cm")}
	case CautionTidalVolumeHigh:
		return CautionRule{ID: id, Levels: "warn above 8 mL/kg PBW; stop at or above 10",
			Limits: []Limit{over(Warn, VtWarnMLPerKg, vt, srcARDSNet), atOrOver(Stop, VtStopMLPerKg, vt, srcARDSNet)},
			Source: srcARDSNet, AssumedLung: true, Ward: wardAbove("Vt", " mL/kg")}
	case CautionTidalVolumeLow:
		return CautionRule{ID: id, Levels: "warn below 4 mL/kg PBW; stop below 2 (little or no gas passes the dead space)",
			Limits: []Limit{under(Warn, VtLowMLPerKg, vt, srcARDSNet), under(Stop, VtStopLowMLPerKg, vt, srcVtStopLow)},
			Source: srcARDSNet, AssumedLung: true, Ward: wardBelow("Vt", " mL/kg")}
	case CautionPlateauHigh:
		return CautionRule{ID: id, Levels: "warn above 30 cmH2O; stop above 35",
			Limits: []Limit{over(Warn, PlateauMaxCmH2O, cm, srcARDSNet), over(Stop, PlateauStopCmH2O, cm, srcMHRA)},
			Source: srcARDSNet, AssumedLung: true, Ward: wardAbove("plateau", " cmH2O")}
	case CautionDrivingPressureHigh:
		return CautionRule{ID: id, Levels: "warn above 15 cmH2O",
			Limits: []Limit{over(Warn, DrivingMaxCmH2O, cm, srcAmato)}, Source: srcAmato, AssumedLung: true, Ward: wardAbove("driving pressure", " cmH2O")}
	case CautionPeakAboveRelief:
		return CautionRule{ID: id, Levels: "stop when the predicted breath reaches the profile's relief valve (pressure-limited, or a peak above it)",
			Source: srcProfile, AssumedLung: true, Ward: func(c Caution) string { return "breath at the relief valve " + plain(c.Limit) + " cmH2O" }}
	case CautionPeakHigh:
		return CautionRule{ID: id, Levels: "stop above 40 cmH2O",
			Limits: []Limit{over(Stop, PeakMaxCmH2O, cm, srcMHRA)}, Source: srcMHRA, AssumedLung: true, Ward: wardAbove("peak", " cmH2O")}
	case CautionIntrinsicPEEP:
		return CautionRule{ID: id, Levels: "warn above 2 cmH2O; stop above 5",
			Limits: []Limit{over(Warn, IntrinsicPEEPMax, cm, srcCommon), over(Stop, IntrinsicPEEPStop, cm, srcCommon)},
			Source: srcCommon, AssumedLung: true, Ward: wardAbove("intrinsic PEEP", " cmH2O")}
	case CautionLeakShareOfStroke:
		return CautionRule{ID: id, Levels: "warn above 0.1 of the stroke; stop above 0.3",
			Limits: []Limit{over(Warn, LeakShareWarn, "share of the stroke", srcLeakShare), over(Stop, LeakShareStop, "share of the stroke", srcLeakShare)},
			Source: srcLeakShare, Ward: wardAbove("leak", " % of the stroke")}
	case CautionPEEPLow:
		return CautionRule{ID: id, Levels: "warn below 5 cmH2O",
			Limits: []Limit{under(Warn, PEEPMinCmH2O, cm, srcARDSNet)}, Source: srcARDSNet, Ward: wardBelow("PEEP", " cmH2O")}
	case CautionRateHigh:
		return CautionRule{ID: id, Levels: "warn above 35 /min",
			Limits: []Limit{over(Warn, RateMaxBPM, bpm, srcARDSNet)}, Source: srcARDSNet, Ward: wardAbove("rate", " /min")}
	case CautionRateLow:
		return CautionRule{ID: id, Levels: "warn below 8 /min",
			Limits: []Limit{under(Warn, RateMinBPM, bpm, srcCommon)}, Source: srcCommon, Ward: wardBelow("rate", " /min")}
	case CautionRateOutside10To30:
		return CautionRule{ID: id, Levels: "note below 10 or above 30 /min, where neither rate-low (8) nor rate-high (35) speaks",
			Limits: []Limit{under(Note, RateNoteMinBPM, bpm, srcMHRA), over(Note, RateNoteMaxBPM, bpm, srcMHRA)},
			Source: srcMHRA, Ward: func(c Caution) string { return "rate " + plain(c.Value) + " /min outside 10-30" }}
	case CautionIEOutside:
		return CautionRule{ID: id, Levels: "warn when I:E is outside 1:1-1:3 (E of 1:E below 1 or above 3)",
			Limits: []Limit{under(Warn, IEMinE, "E of 1:E", srcIE), over(Warn, IEMaxE, "E of 1:E", srcIE)},
			Source: srcIE, Ward: func(c Caution) string { return "I:E 1:" + plain(c.Value) + " outside 1:1-1:3" }}
	case CautionRateUnreachable:
		return CautionRule{ID: id, Levels: "stop when a planned rate is beyond the motor's fastest turn or the controller's longest dwell",
			Source: srcProfile, Ward: func(c Caution) string { return "rate " + plain(c.Value) + " /min not reachable" }}
	case CautionTiNotReachable:
		return CautionRule{ID: id, Levels: "warn when the motor's speed changes a planned Ti; on a fixed-speed motor a note while the change is under 20 %",
			Limits: []Limit{under(Note, TiChangeFixedNotePct, "% change of Ti, fixed-speed motor", srcProfile)},
			Source: srcProfile, Ward: func(c Caution) string { return "Ti " + plain(c.Value) + " s, wanted " + plain(c.Limit) }}
	case CautionMinuteVentilationLow:
		return CautionRule{ID: id, Levels: "warn below 60 mL/kg PBW/min",
			Limits: []Limit{under(Warn, MinuteVentLowMLPerKgMin, "mL/kg PBW/min", srcMinuteVent)},
			Source: srcMinuteVent, AssumedLung: true, Ward: wardBelow("minute ventilation", " mL/kg/min")}
	case CautionAlveolarVentilationLow:
		return CautionRule{ID: id, Levels: "warn below 40 mL/kg PBW/min; stop below 20, or when Vt does not exceed the dead space of 2.2 mL/kg PBW (at or below 0)",
			Limits: []Limit{atOrUnder(Stop, 0, "mL/kg PBW/min", srcRadford), under(Stop, AlveolarVentStopMLPerKgMin, "mL/kg PBW/min", srcAlveolarStop),
				under(Warn, AlveolarVentLowMLPerKgMin, "mL/kg PBW/min", srcRadford)},
			Source: srcRadford, AssumedLung: true, Ward: wardBelow("alveolar ventilation", " mL/kg/min")}
	case CautionReliefAbove40:
		return CautionRule{ID: id, Levels: "warn when the profile's relief valve opens above 40 cmH2O",
			Limits: []Limit{over(Warn, ReliefMaxCmH2O, cm, srcMHRA)}, Source: srcMHRA, Ward: wardAbove("relief valve", " cmH2O")}
	case CautionNoSuitableHole:
		return CautionRule{ID: id, Levels: "stop when the nearest hole is more than 20 % off the target volume, or the smallest hole gives more than 8 mL/kg PBW",
			Limits: []Limit{over(Stop, NoSuitableHolePct, "%", srcNoSuitableHole), over(Stop, VtWarnMLPerKg, "mL/kg PBW", srcNoSuitableHole)},
			Source: srcNoSuitableHole, Ward: wardSays("no hole suits this patient")}
	case CautionHoleOffTarget:
		return CautionRule{ID: id, Levels: "warn when the nearest hole is more than 10 % off the target volume (no-suitable-hole above 20 %)",
			Limits: []Limit{over(Warn, HoleOffTargetPct, "%", srcCommon)}, Source: srcCommon,
			Ward: func(c Caution) string { return "hole " + plain(c.Value) + " % off target" }}
	}
	return cautionRuleMore(id)
}

// cautionRuleMore is the rest of the table: the machine's own cautions,
// the readings', the fit's, the protocol step's and the gas's.
func cautionRuleMore(id CautionID) CautionRule {
	const cm = "cmH2O"
	switch id {
	case CautionCalibrationMissing:
		return CautionRule{ID: id, Levels: "warn when the profile has no bench calibration", Source: srcCommon, Ward: wardSays("no calibration")}
	case CautionCalibrationOld:
		return CautionRule{ID: id, Levels: "warn when the calibration is more than 30 days old",
			Limits: []Limit{over(Warn, CalibrationMaxDays, "days", srcCommon)}, Source: srcCommon, Ward: wardAbove("calibration", " days old")}
	case CautionCalibrationFuture:
		return CautionRule{ID: id, Levels: "warn when the calibration is dated in the future", Source: srcCommon, Ward: wardSays("calibration dated in the future")}
	case CautionCalibrationResidual:
		return CautionRule{ID: id, Levels: "warn when a bench point is outside +/-(4 mL + 15 %) of the fitted calibration", Source: srcISO,
			Ward: func(c Caution) string { return plain(c.Value) + " bench point(s) off the calibration" }}
	case CautionCalibrationKImplausible:
		return CautionRule{ID: id, Levels: "warn when the calibration's k is outside 0.7-1.1",
			Limits: []Limit{under(Warn, CalKMin, "k", srcCalK), over(Warn, CalKMax, "k", srcCalK)}, Source: srcCalK,
			Ward: func(c Caution) string { return "calibration k " + plain(c.Value) + " outside 0.7-1.1" }}
	case CautionCalibrationAboveSwept:
		return CautionRule{ID: id, Levels: "warn when the calibration gives a hole more than its geometric swept volume",
			Source: srcCommon + " (derived: effective volume cannot exceed geometric)", Ward: wardSays("calibration above the swept volume")}
	case CautionCalibrationThin:
		return CautionRule{ID: id, Levels: "note when the calibration measured fewer than 3 holes",
			Limits: []Limit{under(Note, 3, "holes", srcCommon)}, Source: srcCommon, Ward: wardBelow("calibration holes", "")}
	case CautionClearanceDefault:
		return CautionRule{ID: id, Levels: "note when the profile does not give cylinder.clearance_cm (the format /2 default is assumed)",
			Source: srcProfile + " (format /2 default)", Ward: wardSays("cylinder clearance assumed")}
	case CautionO2FlowAboveFlowmeter:
		return CautionRule{ID: id, Levels: "stop when the O2 bleed for the FiO2 is above the flowmeter's maximum (the profile's oxygen.max_flow_l_min, or 15 L/min)",
			Source: srcFlowmeter, Ward: wardAbove("O2", " L/min")}
	case CautionO2CylinderLow:
		return CautionRule{ID: id, Levels: "warn when the cylinder reaches its reserve in under 120 min",
			Limits: []Limit{under(Warn, CylinderMinMinutes, "min", srcCylinderResv)}, Source: srcCylinderResv, Ward: wardBelow("cylinder", " min to reserve")}
	case CautionTorqueHigh:
		return CautionRule{ID: id, Levels: "warn above 0.8 of the motor's rated torque; stop above 1",
			Limits: []Limit{over(Warn, TorqueWarnShare, "share of rating", srcCommon), over(Stop, TorqueStopShare, "share of rating", srcProfile)},
			Source: srcProfile, AssumedLung: true, Ward: wardAbove("torque", " % of rating")}
	case CautionReadingsNotNumbers:
		return CautionRule{ID: id, Levels: "stop when a manometer reading is not a number", Source: srcCommon, Ward: wardSays("a reading is not a number")}
	case CautionMeasuredPeakHigh:
		return CautionRule{ID: id, Levels: "stop when the manometer's peak is above 40 cmH2O, whatever the fit",
			Limits: []Limit{over(Stop, PeakMaxCmH2O, cm, srcMeasuredPeak)}, Source: srcMeasuredPeak,
			Ward: func(c Caution) string { return "peak " + plain(c.Value) + " cmH2O above " + plain(c.Limit) }}
	case CautionMeasuredPeakAboveRelief:
		return CautionRule{ID: id, Levels: "stop when the manometer's peak is above the profile's relief valve", Source: srcProfile + " (relief pressure)",
			Ward: func(c Caution) string { return "peak " + plain(c.Value) + " cmH2O above relief " + plain(c.Limit) }}
	case CautionMeasuredEndAtOrBelowPEEP:
		return CautionRule{ID: id, Levels: "stop when the end-inspiratory reading is at or below the PEEP set", Source: srcMHRA + " (pressure not reached: disconnection)",
			Ward: func(c Caution) string { return "end " + plain(c.Value) + " cmH2O at or below PEEP" }}
	case CautionMeasuredPeakBelowEnd:
		return CautionRule{ID: id, Levels: "stop when the peak reading is below the end reading", Source: srcCommon,
			Ward: func(c Caution) string { return "peak " + plain(c.Value) + " below end " + plain(c.Limit) + " cmH2O" }}
	case CautionReadingsUnexplained:
		return CautionRule{ID: id, Levels: "stop when no lung explains the readings at this setting", Source: srcCommon, Ward: wardSays("readings unexplained")}
	case CautionProposalOnAssumedLung:
		return CautionRule{ID: id, Levels: "stop on a proposal while no lung explains the readings at the current setting",
			Source: srcCommon + ": a figure from an assumed lung never stands in for what the manometer shows", Ward: wardSays("proposal on an assumed lung")}
	case CautionMeasuredPeakAtRelief:
		return CautionRule{ID: id, Levels: "stop when the manometer's peak is within half a manometer step of the relief valve", Source: srcProfile + " (relief pressure)",
			Ward: func(c Caution) string { return "peak " + plain(c.Value) + " cmH2O at the relief valve" }}
	case CautionReadingsSuggestLeak:
		return CautionRule{ID: id, Levels: "warn when the readings fit a compliance above 100 mL/cmH2O; stop above 150",
			Limits: []Limit{over(Warn, LeakComplianceWarn, "mL/cmH2O", srcLeakCompliance), over(Stop, LeakComplianceStop, "mL/cmH2O", srcLeakCompliance)},
			Source: srcLeakCompliance, Ward: wardAbove("compliance", " mL/cmH2O (leak?)")}
	case CautionRangeCrossesVt8, CautionRangeCrossesVt10, CautionRangeCrossesVt4, CautionRangeCrossesPlateau30, CautionRangeCrossesPlateau35:
		return rangeCrossesRule(id)
	case CautionProtocolRateNotReached:
		return CautionRule{ID: id, Levels: "warn (in place of rate-unreachable) when the protocol step's rate is beyond this machine: the step is its best reachable setting",
			Source: srcProfile + "; ARDS Network protocol card", Ward: func(c Caution) string { return "step rate " + plain(c.Value) + " /min not reachable" }}
	}
	return gasCautionRule(id)
}

// rangeCrossesRule is the entry of a range that the manometer's step
// allows crossing a limit (rangeCautions).
func rangeCrossesRule(id CautionID) CautionRule {
	lim := map[CautionID]Limit{
		CautionRangeCrossesVt8:       over(Warn, VtWarnMLPerKg, "mL/kg PBW", srcARDSNet),
		CautionRangeCrossesVt10:      over(Warn, VtStopMLPerKg, "mL/kg PBW", srcARDSNet),
		CautionRangeCrossesVt4:       over(Warn, VtLowMLPerKg, "mL/kg PBW", srcARDSNet),
		CautionRangeCrossesPlateau30: over(Warn, PlateauMaxCmH2O, "cmH2O", srcARDSNet),
		CautionRangeCrossesPlateau35: over(Warn, PlateauStopCmH2O, "cmH2O", srcMHRA),
	}[id]
	return CautionRule{ID: id, Levels: fmt.Sprintf("warn when the range the manometer's step allows has %s %s inside it", plain(lim.Value), lim.Unit),
		Limits: []Limit{lim}, Source: lim.Source + "; range from the manometer's resolution",
		Ward: func(c Caution) string { return "range crosses " + plain(c.Limit) }}
}

// gasCautionRule is the gas's part of the table.
func gasCautionRule(id CautionID) CautionRule {
	reading := func(c Caution) string {
		if c.Unit == "%" {
			return "SpO2 " + plain(c.Value) + " %"
		}
		return "PaO2 " + plain(c.Value) + " mmHg"
	}
	switch id {
	case CautionGasReadingsDisagree:
		return CautionRule{ID: id, Levels: "stop when pH and PaCO2 imply a bicarbonate outside 5-60 mmol/L, or the SpO2 is outside what the PaO2 allows",
			Source: srcHCO3 + "; " + physiology.SpO2PaO2RuleSource, Ward: wardSays("gas readings disagree")}
	case CautionOxygenationLow:
		return CautionRule{ID: id, Levels: "warn below PaO2 55 mmHg or SpO2 88 %; stop below 50 mmHg or 85 %",
			Limits: []Limit{under(Warn, OxygenationLowPaO2MmHg, "mmHg", srcOxGoal), under(Warn, OxygenationLowSpO2Pct, "%", srcOxGoal),
				under(Stop, OxygenationStopPaO2MmHg, "mmHg", srcOxStop), under(Stop, OxygenationStopSpO2Pct, "%", srcOxStop)},
			Source: srcOxGoal, Ward: func(c Caution) string { return "low O2 (" + reading(c) + ")" }}
	case CautionOxygenationHigh:
		return CautionRule{ID: id, Levels: "note above PaO2 80 mmHg (or SpO2 95 % without a PaO2) while FiO2 is above 0.4 or PEEP above 8 cmH2O",
			Limits: []Limit{over(Note, OxygenationHighPaO2MmHg, "mmHg", srcOxHigh), over(Note, OxygenationHighSpO2Pct, "%", srcOxHigh)},
			Source: srcOxHigh, Ward: func(c Caution) string { return "O2 above goal (" + reading(c) + ")" }}
	case CautionPHLow:
		return CautionRule{ID: id, Levels: "warn below pH 7.30; stop below 7.15",
			Limits: []Limit{under(Warn, PHLowWarn, "pH", srcPHGoal), under(Stop, PHLowStop, "pH", srcPHSevere)},
			Source: srcPHGoal, Ward: func(c Caution) string { return "pH " + fmt.Sprintf("%.2f", c.Value) + " low" }}
	case CautionPHHigh:
		return CautionRule{ID: id, Levels: "warn above pH 7.45",
			Limits: []Limit{over(Warn, PHHighWarn, "pH", srcPHGoal)}, Source: srcPHGoal,
			Ward: func(c Caution) string { return "pH " + fmt.Sprintf("%.2f", c.Value) + " high" }}
	}
	return CautionRule{}
}

// judged is the rule of id and the most serious of its limits that v
// crosses.
func judged(id CautionID, v float64) (CautionRule, Limit, bool) {
	r := cautionRule(id)
	l, ok := r.Judge(v)
	return r, l, ok
}

// caution is the rule's caution at the limit l for the value v, in the
// limit's unit with its source.
func (r CautionRule) caution(l Limit, v float64, message, advice string) Caution {
	return Caution{ID: r.ID, Level: l.Level, Value: v, Limit: l.Value, Unit: l.Unit, Message: message, Advice: advice, Source: l.Source}
}
