package setup

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func gp(v float64) *float64 { return &v }

// gasCase is one gas input just outside or just inside a limit.
type gasCase struct {
	id     CautionID
	source string
	g      GasReadings
	ctx    GasContext
	level  Level    // the level wanted, 0: absent
	limit  float64  // the limit the caution must report (when present)
	says   []string // numbers the message must hold
}

// roomAir is a setting breathing air at PEEP 5 (FiO2 0.21: no bleed, by
// the bleed formula 0.21 + 0.79 x 0).
var roomAir = GasContext{FiO2: 0.21, FiO2Known: true, PEEPCmH2O: 5}

// Each gas limit just outside and just inside, against its source's number
// (not the code's constant), with the numbers in the message.
func TestGasCautionsAtTheirLimits(t *testing.T) {
	onO2 := GasContext{FiO2: 0.5, FiO2Known: true, O2LPerMin: 6, PEEPCmH2O: 5}
	cases := []gasCase{
		// ARDS Network protocol card: oxygenation goal SpO2 88-95 %, PaO2 55-80 mmHg.
		{CautionOxygenationLow, "ARDSNet: SpO2 below 88 %", GasReadings{SpO2Pct: gp(87.9)}, roomAir, Warn, 88, []string{"SpO2 87.9 %", "88 %"}},
		{CautionOxygenationLow, "ARDSNet: SpO2 88 % is in goal", GasReadings{SpO2Pct: gp(88)}, roomAir, 0, 0, nil},
		{CautionOxygenationLow, "ARDSNet: PaO2 below 55 mmHg", GasReadings{PaO2MmHg: gp(54.9)}, roomAir, Warn, 55, []string{"PaO2 54.9 mmHg", "55 mmHg"}},
		{CautionOxygenationLow, "ARDSNet: PaO2 55 mmHg is in goal", GasReadings{PaO2MmHg: gp(55)}, roomAir, 0, 0, nil},
		// Common practice, severe hypoxaemia: SpO2 below 85 %, PaO2 below 50
		// mmHg (the two agree on Severinghaus's curve: S(50) = 85.0 %, derived).
		{CautionOxygenationLow, "common practice: SpO2 below 85 % is a stop", GasReadings{SpO2Pct: gp(84.9)}, roomAir, Stop, 85, []string{"SpO2 84.9 %", "below 85 %", "severe hypoxaemia"}},
		{CautionOxygenationLow, "common practice: SpO2 85 % is a warn", GasReadings{SpO2Pct: gp(85)}, roomAir, Warn, 88, []string{"SpO2 85 %"}},
		{CautionOxygenationLow, "common practice: PaO2 below 50 mmHg is a stop", GasReadings{PaO2MmHg: gp(49.9)}, roomAir, Stop, 50, []string{"PaO2 49.9 mmHg", "below 50 mmHg"}},
		{CautionOxygenationLow, "common practice: PaO2 50 mmHg is a warn", GasReadings{PaO2MmHg: gp(50)}, roomAir, Warn, 55, []string{"PaO2 50 mmHg"}},
		// ARDSNet goal tops (SpO2 95 %, PaO2 80 mmHg), with FiO2 above 0.4 or PEEP above 8.
		{CautionOxygenationHigh, "ARDSNet: PaO2 above 80 at FiO2 0.5", GasReadings{PaO2MmHg: gp(80.1)}, onO2, Note, 80, []string{"PaO2 80.1 mmHg", "80 mmHg", "FiO2 0.50", "6.0 L/min"}},
		{CautionOxygenationHigh, "ARDSNet: PaO2 80 is in goal", GasReadings{PaO2MmHg: gp(80)}, onO2, 0, 0, nil},
		{CautionOxygenationHigh, "ARDSNet: SpO2 above 95 at FiO2 0.5", GasReadings{SpO2Pct: gp(95.1)}, onO2, Note, 95, []string{"SpO2 95.1 %", "95 %"}},
		{CautionOxygenationHigh, "ARDSNet: SpO2 95 is in goal", GasReadings{SpO2Pct: gp(95)}, onO2, 0, 0, nil},
		{CautionOxygenationHigh, "ARDSNet table: FiO2 0.41 has a pair below", GasReadings{SpO2Pct: gp(99)}, GasContext{FiO2: 0.41, FiO2Known: true, PEEPCmH2O: 5}, Note, 95, []string{"FiO2 0.41", "above 0.4"}},
		{CautionOxygenationHigh, "ARDSNet table: FiO2 0.4 at PEEP 8 is where the table starts", GasReadings{SpO2Pct: gp(99)}, GasContext{FiO2: 0.4, FiO2Known: true, PEEPCmH2O: 8}, 0, 0, nil},
		{CautionOxygenationHigh, "ARDSNet table: PEEP 8.5 has a pair below", GasReadings{SpO2Pct: gp(99)}, GasContext{FiO2: 0.3, FiO2Known: true, PEEPCmH2O: 8.5}, Note, 95, []string{"PEEP 8.5 cmH2O above 8"}},
		{CautionOxygenationHigh, "the FiO2 of a form still waiting is not known", GasReadings{SpO2Pct: gp(99)}, GasContext{FiO2: 0.9, PEEPCmH2O: 5}, 0, 0, nil},
		// ARDSNet: PaO2 decides over SpO2; PaO2 in goal keeps the note quiet.
		{CautionOxygenationHigh, "ARDSNet: PaO2 decides over SpO2", GasReadings{PaO2MmHg: gp(75), SpO2Pct: gp(97)}, onO2, 0, 0, nil},
		// ARDS Network protocol card: pH goal 7.30-7.45, below 7.15 severe.
		{CautionPHLow, "ARDSNet: pH below 7.30", GasReadings{PH: gp(7.29)}, roomAir, Warn, 7.30, []string{"pH 7.29", "7.30"}},
		{CautionPHLow, "ARDSNet: pH 7.30 is in goal", GasReadings{PH: gp(7.30)}, roomAir, 0, 0, nil},
		{CautionPHLow, "ARDSNet: pH below 7.15 is the severe branch", GasReadings{PH: gp(7.14)}, roomAir, Stop, 7.15, []string{"pH 7.14", "7.15", "severe acidaemia"}},
		{CautionPHLow, "ARDSNet: pH 7.15 is the moderate branch", GasReadings{PH: gp(7.15)}, roomAir, Warn, 7.30, []string{"pH 7.15"}},
		{CautionPHHigh, "ARDSNet: pH above 7.45", GasReadings{PH: gp(7.46)}, roomAir, Warn, 7.45, []string{"pH 7.46", "7.45"}},
		{CautionPHHigh, "ARDSNet: pH 7.45 is in goal", GasReadings{PH: gp(7.45)}, roomAir, 0, 0, nil},
		// Henderson-Hasselbalch, HCO3 = 0.03 x PaCO2 x 10^(pH - 6.1),
		// plausible 5-60 mmol/L (from memory); each derived by hand:
		// 0.6 x 10^0.91 = 0.6 x 8.128 = 4.88 < 5; 0.6 x 10^0.93 = 5.11.
		{CautionGasReadingsDisagree, "H-H: pH 7.01, PaCO2 20 -> HCO3 4.88", GasReadings{PH: gp(7.01), PaCO2MmHg: gp(20)}, roomAir, Stop, 5, []string{"pH 7.01", "PaCO2 20 mmHg", "4.9 mmol/L", "outside 5-60"}},
		{CautionGasReadingsDisagree, "H-H: pH 7.03, PaCO2 20 -> HCO3 5.11", GasReadings{PH: gp(7.03), PaCO2MmHg: gp(20)}, roomAir, 0, 0, nil},
		// 2.4 x 10^1.41 = 2.4 x 25.70 = 61.7 > 60; 2.4 x 10^1.39 = 58.9.
		{CautionGasReadingsDisagree, "H-H: pH 7.51, PaCO2 80 -> HCO3 61.7", GasReadings{PH: gp(7.51), PaCO2MmHg: gp(80)}, roomAir, Stop, 60, []string{"pH 7.51", "PaCO2 80 mmHg", "61.7 mmol/L"}},
		{CautionGasReadingsDisagree, "H-H: pH 7.49, PaCO2 80 -> HCO3 58.9", GasReadings{PH: gp(7.49), PaCO2MmHg: gp(80)}, roomAir, 0, 0, nil},
		// Severinghaus 1979 with PO2 x 0.5-2 and +/- 6 %: PaO2 30 allows
		// SpO2 up to S(60) + 6 = 96.58 %; PaO2 200 down to S(100) - 6 =
		// 91.75 % (derived in TestSpO2RangeForPaO2AtDerivedEdges).
		{CautionGasReadingsDisagree, "Severinghaus: SpO2 96.7 with PaO2 30", GasReadings{SpO2Pct: gp(96.7), PaO2MmHg: gp(30)}, roomAir, Stop, 96.58, []string{"SpO2 96.7 %", "PaO2 30 mmHg", "13-97 %"}},
		{CautionGasReadingsDisagree, "Severinghaus: SpO2 96.5 with PaO2 30", GasReadings{SpO2Pct: gp(96.5), PaO2MmHg: gp(30)}, roomAir, 0, 0, nil},
		{CautionGasReadingsDisagree, "Severinghaus: SpO2 91.7 with PaO2 200", GasReadings{SpO2Pct: gp(91.7), PaO2MmHg: gp(200)}, roomAir, Stop, 91.75, []string{"SpO2 91.7 %", "PaO2 200 mmHg", "92-100 %"}},
		{CautionGasReadingsDisagree, "Severinghaus: SpO2 91.8 with PaO2 200", GasReadings{SpO2Pct: gp(91.8), PaO2MmHg: gp(200)}, roomAir, 0, 0, nil},
	}
	for _, c := range cases {
		got := find(GasCautions(c.g, c.ctx), c.id)
		if c.level == 0 {
			require.Nil(t, got, "%s (%s): want no %s, got %+v", c.id, c.source, c.id, got)
			continue
		}
		require.NotNil(t, got, "%s (%s): want %v", c.id, c.source, c.level)
		require.Equal(t, c.level, got.Level, "%s (%s): %s", c.id, c.source, got.Message)
		require.InDelta(t, c.limit, got.Limit, 0.01, "%s (%s): limit", c.id, c.source)
		require.NotEmpty(t, got.Source, c.id)
		require.NotEmpty(t, got.Advice, c.id)
		for _, s := range c.says {
			require.Contains(t, got.Message, s, "%s (%s)", c.id, c.source)
		}
	}
}

// Every gas rule of the table has a case above, a source and a ward
// wording: a rule added without them fails here.
func TestEveryGasRuleIsTested(t *testing.T) {
	seen := map[CautionID]bool{}
	for _, g := range []GasReadings{{SpO2Pct: gp(80)}, {PaO2MmHg: gp(90)}, {PH: gp(7.1)}, {PH: gp(7.5)},
		{PH: gp(7.6), PaCO2MmHg: gp(100)}} {
		for _, c := range GasCautions(g, GasContext{FiO2: 0.6, FiO2Known: true, PEEPCmH2O: 10}) {
			seen[c.ID] = true
			require.NotEmpty(t, c.Source, c.ID)
			require.NotEmpty(t, GasWardWords([]Caution{c}), c.ID)
		}
	}
	for _, r := range gasRules() {
		require.True(t, seen[r.id], "gas rule %s raised by no input", r.id)
		require.True(t, IsGasCaution(r.id))
	}
	require.False(t, IsGasCaution(CautionCalibrationMissing))
}

// REFERENCES.md (version 3): pH 7.60 with PaCO2 100 mmHg implies HCO3
// 94.9 mmol/L (derived: 0.03 x 100 x 10^1.5 = 3 x 31.62 = 94.87): the
// readings disagree, and the step reads neither. The worked example of a
// physiology text, pH 7.40 and PaCO2 40 -> HCO3 23.9 mmol/L (derived: 1.2
// x 10^1.3 = 1.2 x 19.95), is plausible.
func TestHendersonHasselbalchPlausibility(t *testing.T) {
	cs := GasCautions(GasReadings{PH: gp(7.60), PaCO2MmHg: gp(100), SpO2Pct: gp(93)}, roomAir)
	c := find(cs, CautionGasReadingsDisagree)
	require.NotNil(t, c)
	require.Equal(t, Stop, c.Level)
	require.InDelta(t, 94.9, c.Value, 0.05, "derived: 0.03 x 100 x 10^1.5")
	require.Contains(t, c.Message, "94.9 mmol/L")
	require.Contains(t, c.Source, "Henderson-Hasselbalch")
	fed, refused := gasForStep(GasReadings{PH: gp(7.60), PaCO2MmHg: gp(100), SpO2Pct: gp(93)})
	require.Nil(t, fed.PH)
	require.Nil(t, fed.PaCO2MmHg)
	require.NotNil(t, fed.SpO2Pct, "the oximeter is another instrument: still read")
	require.Contains(t, refused, "pH and PaCO2")

	require.Nil(t, find(GasCautions(GasReadings{PH: gp(7.40), PaCO2MmHg: gp(40)}, roomAir), CautionGasReadingsDisagree), "derived: HCO3 23.9")
	fed, refused = gasForStep(GasReadings{PH: gp(7.40), PaCO2MmHg: gp(40)})
	require.Equal(t, "", refused)
	require.NotNil(t, fed.PH)
}

// An SpO2 and a PaO2 that cannot both be true are both refused, and the
// Berlin band is not graded from them.
func TestOximetryDisagreementRefusesBoth(t *testing.T) {
	g := GasReadings{SpO2Pct: gp(99), PaO2MmHg: gp(30), PH: gp(7.35), PaCO2MmHg: gp(45)}
	fed, refused := gasForStep(g)
	require.Nil(t, fed.SpO2Pct)
	require.Nil(t, fed.PaO2MmHg)
	require.NotNil(t, fed.PH, "pH and PaCO2 agree: still read")
	require.Contains(t, refused, "SpO2 and PaO2")
	o := oxygenationOf(g, roomAir)
	require.Nil(t, o.ARDSSeverity)
	require.Contains(t, o.ARDSSeverityNote, "disagree")
}

// Both readings low: the worse level, both named.
func TestOxygenationLowNamesBothReadings(t *testing.T) {
	c := find(GasCautions(GasReadings{SpO2Pct: gp(87), PaO2MmHg: gp(48)}, roomAir), CautionOxygenationLow)
	require.NotNil(t, c)
	require.Equal(t, Stop, c.Level, "PaO2 48 is below 50 (common practice)")
	require.Equal(t, 48.0, c.Value)
	require.Contains(t, c.Message, "PaO2 48 mmHg is below 50 mmHg")
	require.Contains(t, c.Message, "SpO2 87 % is below the goal's 88 %")
	require.Nil(t, find(GasCautions(GasReadings{SpO2Pct: gp(87), PaO2MmHg: gp(120)}, GasContext{FiO2: 0.6, FiO2Known: true, PEEPCmH2O: 10}), CautionOxygenationHigh),
		"never 'less oxygen' beside a low reading")
}

// P/F and S/F with the band, at the Berlin edges (JAMA 2012) and Rice et
// al.'s (Chest 2007); each ratio derived by hand.
func TestOxygenationIndices(t *testing.T) {
	fio2 := func(f float64, peep float64) GasContext { return GasContext{FiO2: f, FiO2Known: true, PEEPCmH2O: peep} }
	cases := []struct {
		name     string
		g        GasReadings
		ctx      GasContext
		pf, sf   float64 // 0: null
		severity string  // "": not graded
		basis    string
		note     string
	}{
		// derived: 150 / 0.5 = 300, mild (Berlin: 200 < P/F <= 300).
		{"P/F 300", GasReadings{PaO2MmHg: gp(150)}, fio2(0.5, 5), 300, 0, "mild", BasisPF, "P/F above 200 up to 300"},
		// derived: 150.5 / 0.5 = 301, above 300.
		{"P/F 301", GasReadings{PaO2MmHg: gp(150.5)}, fio2(0.5, 5), 301, 0, "none", BasisPF, "P/F above 300"},
		// derived: 60 / 0.6 = 100, severe (Berlin: P/F <= 100).
		{"P/F 100", GasReadings{PaO2MmHg: gp(60)}, fio2(0.6, 10), 100, 0, "severe", BasisPF, "P/F 100 or less"},
		// derived: 94.5 / 0.3 = 315 (Rice: S/F 315 ~ P/F 300), mild.
		{"S/F 315", GasReadings{SpO2Pct: gp(94.5)}, fio2(0.3, 5), 0, 315, "mild", BasisSF, "Rice"},
		// derived: 94 / 0.4 = 235 (Rice: S/F 235 ~ P/F 200), moderate.
		{"S/F 235", GasReadings{SpO2Pct: gp(94)}, fio2(0.4, 8), 0, 235, "moderate", BasisSF, "S/F above 148 up to 235"},
		// derived: 88.8 / 0.6 = 148 (64 + 0.84 x 100), severe.
		{"S/F 148", GasReadings{SpO2Pct: gp(88.8)}, fio2(0.6, 10), 0, 148, "severe", BasisSF, "S/F 148 or less"},
		// PaO2 decides the band when both are given: 80 / 0.4 = 200; 92 / 0.4 = 230.
		{"both", GasReadings{PaO2MmHg: gp(80), SpO2Pct: gp(92)}, fio2(0.4, 8), 200, 230, "moderate", BasisPF, "P/F above 100 up to 200"},
		// Berlin grades only at PEEP >= 5.
		{"PEEP 4", GasReadings{PaO2MmHg: gp(80)}, fio2(0.4, 4), 200, 0, "", "", "PEEP 4 cmH2O is below the 5 cmH2O"},
		{"PEEP 5", GasReadings{PaO2MmHg: gp(80)}, fio2(0.4, 5), 200, 0, "moderate", BasisPF, ""},
		// Rice: S/F stands for P/F only up to SpO2 97 %.
		{"SpO2 98", GasReadings{SpO2Pct: gp(98)}, fio2(0.21, 5), 0, 0, "", "", "SpO2 above 97 %"},
		// derived: 97 / 0.21 = 461.9 -> 462.
		{"SpO2 97", GasReadings{SpO2Pct: gp(97)}, fio2(0.21, 5), 0, 462, "none", BasisSF, ""},
		{"no oxygenation reading", GasReadings{PH: gp(7.3)}, fio2(0.21, 5), 0, 0, "", "", "no PaO2 or SpO2"},
	}
	for _, c := range cases {
		o := oxygenationOf(c.g, c.ctx)
		ratio := func(v *float64) float64 {
			if v == nil {
				return 0
			}
			return *v
		}
		require.Equal(t, c.pf, ratio(o.PFRatio), c.name)
		require.Equal(t, c.sf, ratio(o.SFRatio), c.name)
		if c.severity == "" {
			require.Nil(t, o.ARDSSeverity, c.name)
		} else {
			require.NotNil(t, o.ARDSSeverity, c.name)
			require.Equal(t, c.severity, *o.ARDSSeverity, c.name)
			require.Equal(t, c.basis, *o.ARDSSeverityBasis, c.name)
		}
		require.Contains(t, o.ARDSSeverityNote, c.note, c.name)
		if c.severity != "" || c.pf != 0 || c.sf != 0 {
			require.True(t, strings.HasPrefix(OxygenationText(o), "P/F") || strings.HasPrefix(OxygenationText(o), "S/F"), c.name)
		}
	}
}

// The log's reader calls for a disagreement only when it holds by more
// than 0.01 (a record keeps four decimals). Henderson-Hasselbalch (derived
// by hand): pH 7.02, PaCO2 20: 0.6 x 10^0.92 = 4.9906 mmol/L, below 5 by
// less than 0.01; pH 7.01: 4.88, below by more. On the high side, pH 7.4
// and PaCO2 95.5: 2.865 x 10^1.3 = 57.16, inside; the check itself and
// the reader agree.
func TestRecordGasCautionsKeepAMargin(t *testing.T) {
	rec := func(ph, co2 float64) *Record {
		return &Record{CheckJSON: CheckJSON{GasReadings: &GasReadings{PH: gp(ph), PaCO2MmHg: gp(co2)}}}
	}
	require.NotNil(t, find(GasCautions(GasReadings{PH: gp(7.02), PaCO2MmHg: gp(20)}, roomAir), CautionGasReadingsDisagree), "the check: 4.9906 < 5")
	require.Nil(t, find(RecordGasCautions(rec(7.02, 20)), CautionGasReadingsDisagree), "the reader: within 0.01")
	require.NotNil(t, find(RecordGasCautions(rec(7.01, 20)), CautionGasReadingsDisagree), "the reader: 4.88")
	// 0.03 x 40 x 10^(7.8 - 6.1) = 1.2 x 50.12 = 60.14 > 60.01; PaCO2
	// 39.93: 60.04, still above; 39.9: 59.98 below 60.
	require.NotNil(t, find(RecordGasCautions(rec(7.8, 40)), CautionGasReadingsDisagree))
	require.Nil(t, find(RecordGasCautions(rec(7.8, 39.9)), CautionGasReadingsDisagree))
	// SpO2 and PaO2 by Severinghaus (see TestGasCautionsAtTheirLimits):
	// PaO2 30 allows up to 96.58 %: 96.585 is within 0.01, 96.6 beyond.
	ox := func(spo2 float64) *Record {
		return &Record{CheckJSON: CheckJSON{GasReadings: &GasReadings{SpO2Pct: gp(spo2), PaO2MmHg: gp(30)}}}
	}
	require.Nil(t, find(RecordGasCautions(ox(96.585)), CautionGasReadingsDisagree))
	require.NotNil(t, find(RecordGasCautions(ox(96.6)), CautionGasReadingsDisagree))
	require.Nil(t, RecordGasCautions(&Record{}), "no gas, nothing called for")
	// oxygenation-high is judged on the record's PEEP alone (its FiO2 is
	// an estimate the reader does not take): PEEP 12 above 8 calls for it,
	// PEEP 8 does not.
	hi := &Record{CheckJSON: CheckJSON{GasReadings: &GasReadings{PaO2MmHg: gp(120)}}}
	hi.Setting.PEEPCmH2O = 12
	require.NotNil(t, find(RecordGasCautions(hi), CautionOxygenationHigh))
	hi.Setting.PEEPCmH2O = 8
	require.Nil(t, find(RecordGasCautions(hi), CautionOxygenationHigh))
}

// A FiO2 of 0 is not known (a form still waiting); the bleed is echoed.
func TestNewGasContext(t *testing.T) {
	require.False(t, NewGasContext(0, 2, 5).FiO2Known)
	c := NewGasContext(0.35, 4.5, 8)
	require.True(t, c.FiO2Known)
	require.Equal(t, "FiO2 0.35 (estimated from the O2 bleed, 4.5 L/min)", c.fio2Text())
	require.Equal(t, 8.0, c.PEEPCmH2O)
}

// A pH and PaCO2 that disagree take the PaO2 of the same sample with them
// out of the step; with the oximetry disagreeing too, both pairs go.
func TestGasForStepSaysWhatItLeavesOut(t *testing.T) {
	g := GasReadings{PH: gp(7.01), PaCO2MmHg: gp(20), PaO2MmHg: gp(70)}
	fed, refused := gasForStep(g)
	require.Nil(t, fed.PaO2MmHg)
	require.Equal(t, "the gas readings disagree (gas-readings-disagree): pH, PaCO2 and the PaO2 of the same sample not used by the step", refused)
	g.SpO2Pct = gp(99) // PaO2 70 allows at most S(140) + 6: above 100, so 99 agrees
	g.PaO2MmHg = gp(30)
	fed, refused = gasForStep(g)
	require.Nil(t, fed.SpO2Pct)
	require.Equal(t, "the gas readings disagree (gas-readings-disagree): pH and PaCO2, and SpO2 and PaO2 not used by the step", refused)
}
