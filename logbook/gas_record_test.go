package logbook_test

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/report"
	"crankside/setup"
)

// gasCheck runs a check of demo-a at hole 8, 21 rpm, dwell 1.4 s (invented
// scenario) with the gas entries given.
func gasCheck(t *testing.T, gas setup.Entries) setup.Check {
	t.Helper()
	e := setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21", "dwell-s": "1.4"}
	for k, v := range gas {
		e[k] = v
	}
	req, problems := setup.BuildCheckRequest(e, today)
	require.Empty(t, problems)
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	return ck
}

func gasCautionOf(cs []setup.Caution, id setup.CautionID) *setup.Caution {
	for i := range cs {
		if cs[i].ID == id {
			return &cs[i]
		}
	}
	return nil
}

// REFERENCES.md (version 3): pH 7.60 with PaCO2 100 mmHg implies HCO3
// 94.9 mmol/L (derived: 0.03 x 100 x 10^1.5): the readings disagree. The
// check carries the stop, the step reads only the SpO2, and the record of
// it reads back in the history and the ward, text and JSON.
func TestABadGasIsAStopInTheRecordTheHistoryAndTheWard(t *testing.T) {
	ck := gasCheck(t, setup.Entries{"ph": "7.60", "paco2": "100", "spo2": "93"})
	c := gasCautionOf(ck.Current.Cautions, "gas-readings-disagree")
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	require.Equal(t, setup.Stop, ck.Current.Cautions[0].Level, "most serious first")
	require.NotNil(t, gasCautionOf(ck.Current.Cautions, "ph-high"), "pH 7.60 is above 7.45 (ARDSNet), judged on its own")
	require.NotNil(t, ck.Protocol, "the SpO2 is still read")
	require.Nil(t, ck.Protocol.Readings.PH, "the pH is refused")
	require.Contains(t, ck.Protocol.Notes, "the gas readings disagree (gas-readings-disagree): pH and PaCO2 not used by the step")
	j := ck.JSON()
	require.Equal(t, "no-reading", j.ProtocolRuleStatus["ph"])

	rec, err := setup.NewRecord(ck, "B4", "ab", today)
	require.NoError(t, err)
	path := writeLog(t, filepath.Join(t.TempDir(), "gas.jsonl"), recordLine(t, rec)+"\n")

	hist, sum, err := logbook.ReadHistories([]string{path}, "", 0)
	require.NoError(t, err)
	require.Zero(t, sum.Damaged)
	require.Len(t, hist, 1)
	line := report.HistoryLine(hist[0].Entries[0].Record)
	require.Contains(t, line, "highest STOP")
	require.Contains(t, line, "gas: STOP gas readings disagree, WARN pH 7.60 high")
	// derived: SpO2 93 % / FiO2 0.21 (no bleed) = 442.9 -> 443, above 315.
	require.Contains(t, line, "S/F 443 none")

	rows, _, err := logbook.WardRows([]string{path}, today.Add(time.Hour), 0)
	require.NoError(t, err)
	require.Len(t, rows, 1)
	require.Equal(t, setup.Stop, rows[0].HighestLevel)
	// The plateau is in goal with Vt 6.6 above 6: the card's step towards
	// 6 mL/kg PBW is proposed whatever the gas says (ARDS Network card).
	require.Contains(t, report.WardLine(rows[0]), ": 6.6 mL/kg, STOP, change proposed; gas: STOP gas readings disagree")
	b, err := json.Marshal(rows[0])
	require.NoError(t, err)
	var obj struct {
		HighestLevel string `json:"highest_level"`
		GasReadings  struct {
			PH    float64 `json:"ph"`
			PaCO2 float64 `json:"paco2_mmhg"`
			SpO2  float64 `json:"spo2_pct"`
		} `json:"gas_readings"`
		GasCautions []struct {
			ID    string  `json:"id"`
			Level string  `json:"level"`
			Value float64 `json:"value"`
		} `json:"gas_cautions"`
		SFRatio      *float64 `json:"sf_ratio"`
		PFRatio      *float64 `json:"pf_ratio"`
		ARDSSeverity *string  `json:"ards_severity"`
	}
	require.NoError(t, json.Unmarshal(b, &obj))
	require.Equal(t, "stop", obj.HighestLevel)
	require.Equal(t, 7.6, obj.GasReadings.PH)
	require.Equal(t, 100.0, obj.GasReadings.PaCO2)
	require.Equal(t, "gas-readings-disagree", obj.GasCautions[0].ID)
	require.Equal(t, "stop", obj.GasCautions[0].Level)
	require.InDelta(t, 94.9, obj.GasCautions[0].Value, 0.05, "derived: 0.03 x 100 x 10^1.5")
	require.Nil(t, obj.PFRatio)
	require.Equal(t, 443.0, *obj.SFRatio, "derived: 93 / 0.21")
	require.Equal(t, "none", *obj.ARDSSeverity)
}

// With only the disagreeing pair there is nothing left for the step.
func TestOnlyADisagreeingPairGivesNoStep(t *testing.T) {
	ck := gasCheck(t, setup.Entries{"ph": "7.60", "paco2": "100"})
	require.Nil(t, ck.Protocol)
	require.Contains(t, ck.ProtocolProblem, "no protocol step: the gas readings disagree")
	require.Nil(t, ck.Proposed, "no step, no proposal")
	require.NotNil(t, gasCautionOf(ck.Current.Cautions, "gas-readings-disagree"))
}

// The case: SpO2 87 %, pH 7.24, PaCO2 61 mmHg at room air.
// ARDSNet: SpO2 below 88 and pH below 7.30 are each a warn; HCO3 is 25.3
// mmol/L (derived: 1.83 x 10^1.14 = 1.83 x 13.80), plausible; S/F =
// 87 / 0.21 = 414.3 -> 414, above 315: none (Rice 2007).
func TestTheHypoxicAcidoticBedSaysSo(t *testing.T) {
	ck := gasCheck(t, setup.Entries{"spo2": "87", "ph": "7.24", "paco2": "61"})
	require.Equal(t, setup.Warn, gasCautionOf(ck.Current.Cautions, "oxygenation-low").Level)
	require.Equal(t, setup.Warn, gasCautionOf(ck.Current.Cautions, "ph-low").Level)
	require.Nil(t, gasCautionOf(ck.Current.Cautions, "gas-readings-disagree"))
	j := ck.JSON()
	require.Equal(t, 414.0, *j.SFRatio)
	require.Nil(t, j.PFRatio)
	require.Equal(t, "none", *j.ARDSSeverity)
	b, err := json.Marshal(j)
	require.NoError(t, err)
	var keys map[string]any
	require.NoError(t, json.Unmarshal(b, &keys))
	for _, k := range []string{"pf_ratio", "sf_ratio", "ards_severity"} {
		require.Contains(t, keys, k)
	}
	// Without any gas entry the keys are absent, as the gas readings are.
	b, err = json.Marshal(gasCheck(t, nil).JSON())
	require.NoError(t, err)
	keys = nil
	require.NoError(t, json.Unmarshal(b, &keys))
	require.NotContains(t, keys, "pf_ratio")
}

// A ward sorted by urgency ranks a ph-low stop with the other stops, ahead
// of an overdue bed; among warns, the bed whose gas warns comes before the
// bed whose only warn is the machine's calibration.
func TestTheWardRanksGasCautions(t *testing.T) {
	mk := func(bed string, when time.Time, gas setup.Entries) string {
		rec, err := setup.NewRecord(gasCheck(t, gas), bed, "ab", when)
		require.NoError(t, err)
		return recordLine(t, rec) + "\n"
	}
	path := writeLog(t, filepath.Join(t.TempDir(), "ward.jsonl"),
		mk("B1", at(9, 0), nil),                         // warn: calibration only
		mk("B2", at(2, 0), nil),                         // overdue at 4 h
		mk("B3", at(9, 0), setup.Entries{"spo2": "87"}), // warn: oxygenation-low
		mk("B9", at(9, 0), setup.Entries{"ph": "7.10", "paco2": "75", "spo2": "92"}), // stop: ph-low below 7.15
	)
	rows, _, err := logbook.WardRows([]string{path}, at(9, 30), 4*time.Hour)
	require.NoError(t, err)
	var order []string
	for _, r := range rows {
		order = append(order, r.Bed)
	}
	require.Equal(t, []string{"B9", "B2", "B3", "B1"}, order)
	require.Contains(t, report.WardLine(rows[0]), "gas: STOP pH 7.10 low")
}

// The log's reader keeps the writer's gas rules: a record whose gas STOP
// was edited out, or whose pH was edited outside the entry's range, is
// damaged, never a calm bed.
func TestAnEditedGasRecordIsDamaged(t *testing.T) {
	b4 := recordLine(t, wardRecord(t, "B4", at(9, 0), 21, 0))
	rec, err := setup.NewRecord(gasCheck(t, setup.Entries{"ph": "7.10", "paco2": "75"}), "B9", "ab", at(10, 0))
	require.NoError(t, err)
	ward, _, ws, _ := readBoth(t, b4, recordLine(t, rec))
	require.Equal(t, []string{"B9", "B4"}, ward, "as written, the record is read")
	require.Zero(t, ws.Damaged)
	calm := rec
	calm.Cautions = nil
	// ARDS Network protocol card: pH below 7.15 is the severe branch.
	requireDamaged(t, "its figures call for caution ph-low at stop, the record has none", []string{"B4"}, b4, recordLine(t, calm))
	// physiology.PHMin = 6.8: the pH entry's range.
	line := strings.Replace(recordLine(t, rec), `"ph":7.1,`, `"ph":6.5,`, 1)
	require.Contains(t, line, `"ph":6.5,`)
	requireDamaged(t, "gas reading ph: pH 6.5 is outside", []string{"B4"}, b4, line)
	// REFERENCES.md: pH 7.60 with PaCO2 100 -> HCO3 94.9: the disagreement
	// stop cannot be edited away either.
	bad, err := setup.NewRecord(gasCheck(t, setup.Entries{"ph": "7.60", "paco2": "100"}), "B9", "ab", at(10, 0))
	require.NoError(t, err)
	bad.Cautions = []setup.Caution{{ID: "ph-high", Level: setup.Warn}}
	requireDamaged(t, "gas-readings-disagree at stop, the record has none", []string{"B4"}, b4, recordLine(t, bad))
}
