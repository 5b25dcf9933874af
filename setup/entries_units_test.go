package setup_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

func checkEntries(extra setup.Entries) setup.Entries {
	e := setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21", "dwell-s": "1.4"}
	for k, v := range extra {
		e[k] = v
	}
	return e
}

// A blood gas in kPa is read with the published factor, 1 kPa = 7.50062
// mmHg (NIST SP 811), and echoed.
func TestGasUnitKPaIsConverted(t *testing.T) {
	req, problems := setup.BuildCheckRequest(checkEntries(setup.Entries{"gas-unit": "kpa", "pao2": "25", "paco2": "10.5", "ph": "7.2"}), today)
	require.Empty(t, problems)
	require.InDelta(t, 187.5, *req.Gas.PaO2MmHg, 0.05, "NIST SP 811: 25 kPa x 7.50062 = 187.52 mmHg")
	require.InDelta(t, 78.8, *req.Gas.PaCO2MmHg, 0.05, "NIST SP 811: 10.5 kPa x 7.50062 = 78.76 mmHg")
	require.Equal(t, "PaO2 25 kPa = 187.5 mmHg; PaCO2 10.5 kPa = 78.8 mmHg", setup.ConversionLine(req.Converted))
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	j := ck.JSON()
	require.Len(t, j.EntriesConverted, 2)
	require.Equal(t, "paco2", j.EntriesConverted[1].Entry)
	require.Equal(t, "kPa", j.EntriesConverted[1].EnteredUnit)
	require.InDelta(t, 78.7565, j.EntriesConverted[1].Value, 1e-4, "derived: 10.5 x 7.50062")
}

// Each "looks like the other unit" limit just inside and just outside:
// plausible adult PaO2 30-600 mmHg (4-80 kPa) and PaCO2 15-150 mmHg (2-20
// kPa), from memory (REFERENCES.md, "The patient's numbers").
func TestGasInTheOtherUnitIsRefusedWithTheConversion(t *testing.T) {
	for _, c := range []struct {
		unit, field, value string
		refused            bool
		msg                string
	}{
		{"", "pao2", "29.9", true, "29.9 looks like kPa (= 224.3 mmHg)"}, // derived: 29.9 x 7.50062 = 224.27
		{"", "pao2", "30", false, ""},
		{"mmhg", "pao2", "7.7", true, "7.7 looks like kPa (= 57.8 mmHg): say the unit"}, // derived: 7.7 x 7.50062 = 57.75
		{"", "paco2", "14.9", true, "14.9 looks like kPa (= 111.8 mmHg)"},               // derived: 14.9 x 7.50062 = 111.76
		{"", "paco2", "15", false, ""},
		{"", "paco2", "10.5", true, "10.5 looks like kPa (= 78.8 mmHg)"},   // REFERENCES: 10.5 kPa -> 78.8 mmHg
		{"kpa", "pao2", "80.1", true, "80.1 looks like mmHg (= 10.7 kPa)"}, // derived: 80.1 / 7.50062 = 10.68
		{"kpa", "pao2", "79.9", false, ""},
		{"kpa", "paco2", "20.1", true, "20.1 looks like mmHg (= 2.7 kPa)"}, // derived: 20.1 / 7.50062 = 2.68
		{"kpa", "paco2", "19.9", false, ""},
	} {
		e := checkEntries(setup.Entries{c.field: c.value, "ph": "7.35"})
		if c.unit != "" {
			e["gas-unit"] = c.unit
		}
		_, problems := setup.BuildCheckRequest(e, today)
		p := problems.Field(c.field)
		if !c.refused {
			require.Nil(t, p, "%s %s %s", c.field, c.value, c.unit)
			continue
		}
		require.NotNil(t, p, "%s %s %s", c.field, c.value, c.unit)
		require.Contains(t, p.Reason, c.msg)
		require.Contains(t, p.Reason, "say the unit")
	}
}

// The kPa range's top ends (80 kPa PaO2, 20 kPa PaCO2) are 600.05 and
// 150.01 mmHg (derived: x 7.50062), just above the mmHg ranges' 600 and
// 150: refused as out of range, saying what was typed.
func TestGasRangeProblemSaysWhatWasTyped(t *testing.T) {
	_, problems := setup.BuildCheckRequest(checkEntries(setup.Entries{"gas-unit": "kpa", "pao2": "80"}), today)
	p := problems.Field("pao2")
	require.NotNil(t, p)
	require.Contains(t, p.Reason, "(entered 80 kPa)")
}

func TestBadUnitWordsAreRefused(t *testing.T) {
	_, problems := setup.BuildCheckRequest(checkEntries(setup.Entries{"gas-unit": "torr", "pao2": "70"}), today)
	require.NotNil(t, problems.Field("gas-unit"))
	require.Contains(t, problems.Field("gas-unit").Reason, `"torr"`)
	require.Nil(t, problems.Field("pao2"), "a bad unit is one problem, not two")
	_, problems = setup.BuildCheckRequest(checkEntries(setup.Entries{"pressure-unit": "psi", "peep": "5"}), today)
	require.NotNil(t, problems.Field("pressure-unit"))
}

// Manometer, PEEP and proposal pressures in hPa or mbar: 1 hPa = 1 mbar =
// 100 Pa = 100 / 98.0665 cmH2O = 1.01972 cmH2O (derived from NIST SP 811 B.8).
func TestPressureUnitIsConverted(t *testing.T) {
	for _, unit := range []string{"hpa", "mbar", "HPa"} {
		req, problems := setup.BuildCheckRequest(checkEntries(setup.Entries{"pressure-unit": unit, "peak": "17", "end-pressure": "14",
			"peep": "5", "propose-peep": "8", "manometer-step": "1"}), today)
		require.Empty(t, problems, unit)
		require.InDelta(t, 17.34, req.Readings.PeakCmH2O, 0.005, "REFERENCES: 17 hPa -> 17.34 cmH2O")
		require.InDelta(t, 14.28, req.Readings.EndCmH2O, 0.005, "derived: 14 x 1.019716 = 14.276")
		require.InDelta(t, 5.10, req.Setting.PEEPCmH2O, 0.005, "derived: 5 x 1.019716 = 5.099")
		require.InDelta(t, 8.16, *req.Proposal.PEEPCmH2O, 0.005, "derived: 8 x 1.019716 = 8.158")
		require.InDelta(t, 1.02, req.ManometerStepCmH2O, 0.005, "derived: 1 x 1.019716")
		require.Contains(t, setup.ConversionLine(req.Converted), "peak reading 17 ")
		require.Contains(t, setup.ConversionLine(req.Converted), " = 17.34 cmH2O")
	}
	// In cmH2O nothing is converted or echoed.
	req, problems := setup.BuildCheckRequest(checkEntries(setup.Entries{"pressure-unit": "cmh2o", "peak": "17", "end-pressure": "14"}), today)
	require.Empty(t, problems)
	require.Equal(t, 17.0, req.Readings.PeakCmH2O)
	require.Empty(t, req.Converted)
	// A converted reading out of range names the entry and what was typed:
	// 148 hPa = 150.92 cmH2O (derived), above the manometer's 150.
	_, problems = setup.BuildCheckRequest(checkEntries(setup.Entries{"pressure-unit": "hpa", "peak": "148", "end-pressure": "14"}), today)
	require.NotNil(t, problems.Field("peak"))
	require.Contains(t, problems.Field("peak").Reason, "(entered 148 hPa)")
	// 147 hPa = 149.90 cmH2O (derived): inside.
	_, problems = setup.BuildCheckRequest(checkEntries(setup.Entries{"pressure-unit": "hpa", "peak": "147", "end-pressure": "14"}), today)
	require.Nil(t, problems.Field("peak"))
}

func TestPlanPEEPInHPa(t *testing.T) {
	req, problems := setup.BuildRequest(setup.Entries{"height-cm": "175", "sex": "male", "peep": "10", "pressure-unit": "mbar"}, today)
	require.Empty(t, problems)
	require.InDelta(t, 10.20, *req.Targets.PEEPCmH2O, 0.005, "derived: 10 x 1.019716 = 10.197")
	pl, err := setup.MakePlan(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.Equal(t, "PEEP 10 mbar = 10.20 cmH2O", setup.ConversionLine(pl.JSON().EntriesConverted))
}

// Height in inches: 1 in = 2.54 cm exactly; 70 in -> 177.8 cm (REFERENCES).
func TestHeightInInches(t *testing.T) {
	for _, e := range []setup.Entries{{"height-in": "70"}, {"height-cm": `5'10"`}, {"height-cm": "70in"}} {
		e["sex"] = "male"
		req, problems := setup.BuildRequest(e, today)
		require.Empty(t, problems, e)
		require.InDelta(t, 177.8, req.Patient.HeightCm, 1e-9, "70 x 2.54 = 177.8")
		require.Equal(t, "height 70 in = 177.8 cm", setup.ConversionLine(req.Converted))
		pl, err := setup.MakePlan(req, profile(t, "demo-a"))
		require.NoError(t, err)
		require.InDelta(t, 73.1, pl.PBWKg, 0.05, "ARDS Network 2000 card row: male 70 in -> 73 kg (73.1 from the cm form)")
	}
	// A height in cm with its unit said is not a conversion.
	req, problems := setup.BuildRequest(setup.Entries{"height-cm": "178cm", "sex": "male"}, today)
	require.Empty(t, problems)
	require.Equal(t, 178.0, req.Patient.HeightCm)
	require.Empty(t, req.Converted)
}

func TestHeightProblems(t *testing.T) {
	_, problems := setup.BuildRequest(setup.Entries{"height-cm": "175", "height-in": "70", "sex": "male"}, today)
	require.NotNil(t, problems.Field("height-in"))
	require.Contains(t, problems.Field("height-in").Reason, "not both")
	// 51 in = 129.54 cm, under the 130 cm the PBW formula is taken to
	// (derived: 51 x 2.54); 51.2 in = 130.05 cm is inside.
	_, problems = setup.BuildRequest(setup.Entries{"height-in": "51", "sex": "male"}, today)
	require.NotNil(t, problems.Field("height-in"))
	require.Nil(t, problems.Field("height-cm"), "the height's problem is the entry typed, not a missing height")
	require.Contains(t, problems.Field("height-in").Reason, "(entered 51 in)")
	_, problems = setup.BuildRequest(setup.Entries{"height-in": "51.2", "sex": "male"}, today)
	require.Empty(t, problems)
	_, problems = setup.BuildRequest(setup.Entries{"height-in": "tall", "sex": "male"}, today)
	require.NotNil(t, problems.Field("height-in"))
	require.Nil(t, problems.Field("height-cm"), "one problem for one bad entry")
	_, problems = setup.BuildRequest(setup.Entries{"height-cm": `5'13"`, "sex": "male"}, today)
	require.NotNil(t, problems.Field("height-cm"))
	require.Contains(t, problems.Field("height-cm").Reason, "under 12")
	require.Len(t, problems, 1)
}

// The barometer in hPa: 1013.25 hPa = 760.0 mmHg (standard atmosphere).
func TestBarometerInHPa(t *testing.T) {
	req, problems := setup.BuildCheckRequest(checkEntries(setup.Entries{"barometric-hpa": "1013.25"}), today)
	require.Empty(t, problems)
	require.InDelta(t, 760.0, *req.Room.BarometricMmHg, 0.05, "1 atm = 1013.25 hPa = 760 mmHg")
	require.Equal(t, "barometer 1013.25 hPa = 760.0 mmHg", setup.ConversionLine(req.Converted))
	_, problems = setup.BuildCheckRequest(checkEntries(setup.Entries{"barometric-hpa": "1000", "barometric-mmhg": "750"}), today)
	require.NotNil(t, problems.Field("barometric-hpa"))
	// 500 hPa = 375.0 mmHg (derived: 50 x 7.50062), under the 450 mmHg
	// the barometer entry takes: refused naming the entry typed.
	_, problems = setup.BuildCheckRequest(checkEntries(setup.Entries{"barometric-hpa": "500"}), today)
	require.NotNil(t, problems.Field("barometric-hpa"))
	require.Contains(t, problems.Field("barometric-hpa").Reason, "(entered 500 hPa)")
}

// A plan's form has no gas readings, so no gas unit: one typed beside it
// is not read (and not refused), while a check reads and judges it.
func TestAPlanReadsNoGasUnit(t *testing.T) {
	_, problems := setup.BuildRequest(setup.Entries{"height-cm": "175", "sex": "male", "gas-unit": "furlongs"}, today)
	require.Empty(t, problems)
	_, problems = setup.BuildCheckRequest(setup.Entries{"height-cm": "175", "sex": "male", "hole": "7", "rpm": "20", "dwell-s": "1", "gas-unit": "furlongs"}, today)
	require.NotNil(t, problems.Field("gas-unit"))
}
