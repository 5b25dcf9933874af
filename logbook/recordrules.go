package logbook

import (
	"fmt"
	"math"
	"strconv"

	"crankside/physiology"
	"crankside/setup"
)

// The rules of a record, one set for the writer and the reader. A record
// the writer refuses is never written (AppendRecord); a line the reader
// finds breaking them is damaged, never a bed's check. They hold what the
// writer could have written: a bed label and initials it accepts (see
// CheckBedLabel, CheckInitials), the patient's entries in their ranges,
// figures that agree with one another, and cautions that agree with the
// figures: a record whose STOP was edited out must not read calm in the
// ward. The keys of a line are held to the writer's too (recordkeys.go).

// Bounds of a record's figures that no entry states: generous, only to
// refuse what no check of an adult on this kind of machine can give.
const (
	// RecordMaxVtML bounds a recorded tidal volume: derived: an adult's
	// total lung capacity is about 6-8 L (common practice), and no
	// bedside piston of this kind sweeps half of it.
	RecordMaxVtML = 4000.0
	// RecordMaxRPM and RecordMaxDwellS bound a recorded setting: derived:
	// 200 rpm is a breath every 0.3 s, far beyond any rate a person is
	// ventilated at; a 60 s dwell is one breath a minute.
	RecordMaxRPM    = 200.0
	RecordMaxDwellS = 60.0
	// RecordMaxO2LPerMin is the oxygen entry's own limit (checkSetting).
	RecordMaxO2LPerMin = 60.0
	// recordFigureTol is how far a recorded figure may be from a limit
	// and still be taken as on the calm side of it: the log keeps four
	// decimals (r4), the cautions were judged on the unrounded figure.
	recordFigureTol = 1e-3
	// recordMaxMagnitude bounds every caution's value and limit.
	recordMaxMagnitude = 1e6
)

// recordProblem says why a decoded record is not one the writer could
// have written, or is "". The reasons name the field and the value, the
// value quoted in ASCII (a look-alike letter or an invisible space shows
// as its \u escape).
func recordProblem(r *setup.Record) string {
	if r.Format != setup.RecordFormat {
		return fmt.Sprintf("format %s is not %s", strconv.QuoteToASCII(r.Format), setup.RecordFormat)
	}
	version, p := writerOf(r)
	if p != "" {
		return p
	}
	if m := missingFromRecord(*r); m != "" {
		return "lacks " + m
	}
	if m := writerLacks(r, version); m != "" {
		return "lacks " + m
	}
	if setup.CheckBedLabel(r.Bed) != nil {
		return fmt.Sprintf("bed label %s is not one the writer accepts (letters A-Z, digits, - _ . /)", strconv.QuoteToASCII(r.Bed))
	}
	if setup.CheckInitials(r.Initials) != nil {
		return fmt.Sprintf("initials %s are not ones the writer accepts (1-4 letters A-Z)", strconv.QuoteToASCII(r.Initials))
	}
	if setup.CheckInitials(r.SecondInitials) != nil || (r.SecondInitials != "" && r.Initials == "") {
		return fmt.Sprintf("second initials %s are not ones the writer accepts (1-4 letters A-Z, after the first's)", strconv.QuoteToASCII(r.SecondInitials))
	}
	if p := patientProblem(r); p != "" {
		return p
	}
	if p := settingProblem(r.Setting, ""); p != "" {
		return p
	}
	if r.Proposed != nil {
		if p := settingProblem(r.Proposed.Setting, "proposed "); p != "" {
			return p
		}
	}
	if p := figuresProblem(r); p != "" {
		return p
	}
	return cautionsProblem(r, version)
}

func outside(v, lo, hi float64) bool { return math.IsNaN(v) || v < lo || v > hi }

func rangeProblem(field string, v, lo, hi float64, unit string) string {
	return fmt.Sprintf("%s %s %s is outside %s-%s %s", field, exact(v), unit, physiology.PlainNumber(lo), physiology.PlainNumber(hi), unit)
}

// exact is a recorded number as the line holds it (1e+308 stays short).
func exact(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// r4 is a figure rounded to four decimals, as the log keeps it.
func r4(v float64) float64 { return math.Round(v*1e4) / 1e4 }

// patientProblem holds height and sex to the entries' ranges, and the
// PBW to the one formula (ARDS Network 2000, Devine).
func patientProblem(r *setup.Record) string {
	if outside(r.HeightCm, physiology.HeightMinCm, physiology.HeightMaxCm) {
		return rangeProblem("height_cm", r.HeightCm, physiology.HeightMinCm, physiology.HeightMaxCm, "cm")
	}
	sex, err := physiology.ParseSex(r.Sex)
	if err != nil || sex.String() != r.Sex {
		return fmt.Sprintf("sex %s is not male or female", strconv.QuoteToASCII(r.Sex))
	}
	pbw, err := physiology.PredictedBodyWeightKg(r.HeightCm, sex)
	if err != nil || math.Abs(pbw-r.PBWKg) > 0.01 {
		return fmt.Sprintf("pbw_kg %s kg is not the PBW of %s cm %s (%s kg)", exact(r.PBWKg), exact(r.HeightCm), r.Sex, exact(r4(pbw)))
	}
	return ""
}

func settingProblem(s setup.Setting, prefix string) string {
	switch {
	case outside(s.RPM, 0, RecordMaxRPM) || s.RPM == 0:
		return rangeProblem(prefix+"motor speed", s.RPM, 0, RecordMaxRPM, "rpm")
	case outside(s.DwellS, 0, RecordMaxDwellS):
		return rangeProblem(prefix+"dwell", s.DwellS, 0, RecordMaxDwellS, "s")
	case outside(s.PEEPCmH2O, physiology.PEEPMin, physiology.PEEPMax):
		return rangeProblem(prefix+"PEEP", s.PEEPCmH2O, physiology.PEEPMin, physiology.PEEPMax, "cmH2O")
	case outside(s.O2LPerMin, 0, RecordMaxO2LPerMin):
		return rangeProblem(prefix+"O2 flow", s.O2LPerMin, 0, RecordMaxO2LPerMin, "L/min")
	}
	return ""
}

// figuresProblem holds the figures shown (readings, volume, mL/kg) to
// their ranges, and mL/kg to the volume over the PBW.
func figuresProblem(r *setup.Record) string {
	if rd := r.Readings; rd != nil {
		for _, v := range []float64{rd.PeakCmH2O, rd.EndCmH2O} {
			if outside(v, setup.ManometerMinCmH2O, setup.ManometerMaxCmH2O) {
				return rangeProblem("manometer reading", v, setup.ManometerMinCmH2O, setup.ManometerMaxCmH2O, "cmH2O")
			}
		}
	}
	if p := setup.GasRecordProblem(r); p != "" {
		return p
	}
	if r.Unexplained() {
		return "" // no lung figure is kept (LungFiguresJSON withheld)
	}
	if outside(r.DeliveredVtML, 0, RecordMaxVtML) {
		return rangeProblem("delivered_vt_ml", r.DeliveredVtML, 0, RecordMaxVtML, "mL")
	}
	want := r.DeliveredVtML / r.PBWKg
	if outside(r.MLPerKg, 0, math.Inf(1)) || math.Abs(r.MLPerKg-want) > 0.01+1e-3*want {
		return fmt.Sprintf("ml_per_kg %s is not delivered_vt_ml %s mL over pbw_kg %s kg (%s mL/kg)", exact(r.MLPerKg), exact(r.DeliveredVtML), exact(r.PBWKg), exact(r4(want)))
	}
	return ""
}

// cautionsProblem recomputes the cautions a record's own figures call for
// (tidal volume, predicted pressures, intrinsic PEEP, rate, the manometer
// readings, unexplained readings) and refuses the record when it lacks
// one of them at its level or above: its level is then not its figures'.
// Only what the record's writer version always wrote is required
// (writerCautions). Each recorded caution's level, value and limit must be
// sound too.
func cautionsProblem(r *setup.Record, version int) string {
	all := r.Cautions
	if r.Proposed != nil {
		all = append(append([]setup.Caution(nil), all...), r.Proposed.Cautions...)
	}
	for _, c := range all {
		if c.Level < setup.Note || c.Level > setup.Stop {
			return fmt.Sprintf("caution %s has no level", strconv.QuoteToASCII(string(c.ID)))
		}
		if math.Abs(c.Value) > recordMaxMagnitude || math.Abs(c.Limit) > recordMaxMagnitude {
			return fmt.Sprintf("caution %s has a value or limit beyond %s", strconv.QuoteToASCII(string(c.ID)), physiology.PlainNumber(recordMaxMagnitude))
		}
	}
	for _, want := range writerCautions(version, figureCautions(r)) {
		if got := recordLevelOf(r.Cautions, want.ID); got < want.Level {
			have := "none"
			if got != 0 {
				have = got.String()
			}
			return fmt.Sprintf("its figures call for caution %s at %s, the record has %s", want.ID, want.Level, have)
		}
	}
	return ""
}

// recordLevelOf is the highest level of the cautions with that id, or 0.
func recordLevelOf(cs []setup.Caution, id setup.CautionID) setup.Level {
	var l setup.Level
	for _, c := range cs {
		if c.ID == id && c.Level > l {
			l = c.Level
		}
	}
	return l
}

// figureCautions are the ids and levels the record's figures call for, as
// assess and ReadingCautions judge them (by the limits of setup's table of
// cautions), each figure taken recordFigureTol towards the calm side of
// its limit.
func figureCautions(r *setup.Record) []setup.Caution {
	var out []setup.Caution
	add := func(id setup.CautionID, l setup.Level) { out = append(out, setup.Caution{ID: id, Level: l}) }
	if rd := r.Readings; rd != nil {
		for _, c := range setup.ReadingCautions(physiology.Readings{PeakCmH2O: rd.PeakCmH2O, EndCmH2O: rd.EndCmH2O}, r.Setting.PEEPCmH2O, 0) {
			add(c.ID, c.Level)
		}
	}
	out = append(out, setup.RecordGasCautions(r)...)
	if r.Unexplained() {
		add(setup.CautionReadingsUnexplained, setup.Stop)
		return out
	}
	for _, fig := range []struct {
		id setup.CautionID
		v  float64
	}{
		{setup.CautionTidalVolumeHigh, r.MLPerKg}, {setup.CautionTidalVolumeLow, r.MLPerKg},
		{setup.CautionPlateauHigh, r.PlateauPressureCmH2O}, {setup.CautionPeakHigh, r.PeakPressureCmH2O},
		{setup.CautionIntrinsicPEEP, r.IntrinsicPEEPCmH2O}, {setup.CautionRateHigh, r.RateBPM}, {setup.CautionRateLow, r.RateBPM},
	} {
		rule, _ := setup.CautionRuleOf(fig.id)
		if l, ok := rule.JudgeCalm(fig.v, recordFigureTol); ok {
			add(fig.id, l.Level)
		}
	}
	return out
}
