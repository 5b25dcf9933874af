package logbook_test

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

// readBoth reads one log with the ward's reader and the history reader,
// and returns the ward's beds, the history's beds and the damage summary
// of each.
func readBoth(t *testing.T, lines ...string) (ward, hist []string, wardSum, histSum logbook.LogSummary) {
	t.Helper()
	path := writeLog(t, filepath.Join(t.TempDir(), "edited.jsonl"), strings.Join(lines, "\n")+"\n")
	rows, wardSum, err := logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	for _, r := range rows {
		ward = append(ward, r.Bed)
	}
	hs, histSum, err := logbook.ReadHistories([]string{path}, "", 0)
	require.NoError(t, err)
	for _, h := range hs {
		hist = append(hist, h.Bed)
	}
	return ward, hist, wardSum, histSum
}

// requireDamaged says the edited line (the last one) is damaged in both
// readers with a reason holding want, and that only the beds of the
// other lines are shown.
func requireDamaged(t *testing.T, want string, beds []string, lines ...string) {
	t.Helper()
	ward, hist, ws, hs := readBoth(t, lines...)
	require.Equal(t, beds, ward, "ward rows")
	require.Equal(t, beds, hist, "history beds")
	for _, s := range []logbook.LogSummary{ws, hs} {
		require.Equal(t, 1, s.Damaged)
		require.Contains(t, s.Problems[0].Reason, want)
		require.Equal(t, len(lines), s.Problems[0].Line)
	}
}

// The attack of issue 22: an edit to bed B9's STOP record adds a key
// "bed" in another case; encoding/json takes the last, so B9's check
// read as B4's. Any duplicate key, in any case, at any depth, makes the
// line damaged (as the profile reader refuses a key given twice).
func TestADuplicateKeyInAnyCaseMakesTheLineDamaged(t *testing.T) {
	b9 := recordLine(t, wardRecord(t, "B9", at(10, 0), 21, setup.Stop))
	b1 := recordLine(t, wardRecord(t, "B1", at(9, 0), 21, 0))
	cases := []struct{ name, line, want string }{
		{"BED added", strings.TrimSuffix(b9, "}") + `,"BED":"B4"}`, `key "BED" is the writer's "bed" in another case`},
		{"bed twice", strings.Replace(b9, `"bed":"B9"`, `"bed":"B9","bed":"B4"`, 1), `key "bed" appears twice in one object`},
		{"Bed in place", strings.Replace(b9, `"bed":"B9"`, `"Bed":"B4"`, 1), `key "Bed" is the writer's "bed" in another case`},
		{"nested HOLE", strings.Replace(b9, `"setting":{"hole":"8"`, `"setting":{"hole":"8","HOLE":"7"`, 1), `key "HOLE" is the writer's "hole"`},
		{"level twice", strings.Replace(b9, `"level":"stop"`, `"level":"stop","Level":"note"`, 1), `key "Level" is the writer's "level"`},
		{"unknown key twice", strings.TrimSuffix(b9, "}") + `,"x":1,"X":2}`, `key "X" appears twice in one object`},
		{"escaped key", strings.Replace(b9, `"bed":"B9"`, `"b\u0065d":"B9"`, 1), `key "b\\u0065d" is written escaped`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			require.NotEqual(t, b9, c.line, "the edit must apply")
			requireDamaged(t, c.want, []string{"B1"}, b1, c.line)
		})
	}
	// Unedited, the line is B9's check: the test above fails for the edit.
	ward, _, ws, _ := readBoth(t, b1, b9)
	require.Equal(t, []string{"B9", "B1"}, ward)
	require.Zero(t, ws.Damaged)
	// A key the record does not have, once, is what the decoder ignores:
	// the line stays B9's (a newer program's field must not hide a bed).
	ward, _, ws, _ = readBoth(t, b1, strings.TrimSuffix(b9, "}")+`,"x":1}`)
	require.Equal(t, []string{"B9", "B1"}, ward)
	require.Zero(t, ws.Damaged)
}

// Labels and initials the writer refuses, each shown as "B4" on a
// terminal, are damaged, escaped in the reason, never a bed.
func TestLookAlikeLabelsAreDamagedAndShownEscaped(t *testing.T) {
	b4 := recordLine(t, wardRecord(t, "B4", at(9, 0), 21, 0))
	edit := func(label string) string {
		return strings.Replace(recordLine(t, wardRecord(t, "B5", at(10, 0), 21, 0)), `"bed":"B5"`, `"bed":"`+label+`"`, 1)
	}
	for _, c := range []struct{ label, shown string }{
		{"B4 ", `"B4 "`},
		{"B4\u00a0", `"B4\u00a0"`},
		{"B\u03014", `"B\u03014"`},
		{"\u04124", `"\u04124"`}, // Cyrillic capital Ve
		{"B4\u200b", `"B4\u200b"`},
	} {
		t.Run(c.shown, func(t *testing.T) {
			requireDamaged(t, "bed label "+c.shown+" is not one the writer accepts", []string{"B4"}, b4, edit(c.label))
		})
	}
	// The writer refuses the same labels (one set of rules).
	for _, label := range []string{"B4 ", "B4\u00a0", "\u04124"} {
		_, err := setup.NewRecord(setup.Check{}, label, "ab", at(10, 0))
		require.Error(t, err, label)
	}
	initials := strings.Replace(recordLine(t, wardRecord(t, "B5", at(10, 0), 21, 0)), `"initials":"AB"`, `"initials":"A\u0412"`, 1)
	requireDamaged(t, `initials "A\u0412" are not ones the writer accepts`, []string{"B4"}, b4, initials)
	second := strings.Replace(recordLine(t, wardRecord(t, "B5", at(10, 0), 21, 0)), `"initials":"AB"`, `"initials":"AB","second_initials":"C\u00a0"`, 1)
	requireDamaged(t, `second initials "C\u00a0" are not ones the writer accepts`, []string{"B4"}, b4, second)
}

// Figures outside what the entries accept, or that disagree with one
// another, are damaged: 1e308 mL/kg and -6.5 mL/kg are not WARN rows.
func TestOutOfRangeFiguresAreDamaged(t *testing.T) {
	good := wardRecord(t, "B5", at(10, 0), 21, 0)
	b4 := recordLine(t, wardRecord(t, "B4", at(9, 0), 21, 0))
	line := recordLine(t, good)
	cases := []struct{ name, from, to, want string }{
		// derived: ml_per_kg must be delivered_vt_ml / pbw_kg
		{"1e308 mL/kg", `"ml_per_kg":`, `"ml_per_kg":1e308,"x_ml_per_kg":`, "ml_per_kg 1e+308 is not delivered_vt_ml"},
		{"-6.5 mL/kg", `"ml_per_kg":`, `"ml_per_kg":-6.5,"x_ml_per_kg":`, "ml_per_kg -6.5 is not delivered_vt_ml"},
		// physiology.HeightMaxCm = 230 (the height entry's range)
		{"height 231", `"height_cm":175`, `"height_cm":231`, "height_cm 231 cm is outside 130-230 cm"},
		// ARDS Network 2000: PBW male 50 + 0.91 (175 - 152.4) = 70.566 kg
		{"pbw edited", `"pbw_kg":70.566`, `"pbw_kg":80`, "is not the PBW of 175 cm male (70.566 kg)"},
		// physiology.PEEPMax = 25 cmH2O (the PEEP entry's range)
		{"PEEP 26", `"peep_cmh2o":5,"o2`, `"peep_cmh2o":26,"o2`, "PEEP 26 cmH2O is outside 0-25 cmH2O"},
		{"sex", `"sex":"male"`, `"sex":"MALE"`, `sex "MALE" is not male or female`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			edited := strings.Replace(line, c.from, c.to, 1)
			require.NotEqual(t, line, edited, "the edit must apply")
			requireDamaged(t, c.want, []string{"B4"}, b4, edited)
		})
	}
	// A delivered volume over RecordMaxVtML with mL/kg that agrees.
	big := good
	big.DeliveredVtML, big.MLPerKg = 4000.5, 4000.5/good.PBWKg
	requireDamaged(t, "delivered_vt_ml 4000.5 mL is outside 0-4000 mL", []string{"B4"}, b4, recordLine(t, big))
	big.DeliveredVtML, big.MLPerKg = 4000, 4000/good.PBWKg
	big.Cautions = []setup.Caution{{ID: "tidal-volume-high", Level: setup.Stop}}
	ward, _, ws, _ := readBoth(t, b4, recordLine(t, big))
	require.Equal(t, []string{"B5", "B4"}, ward, "4000 mL is inside the bound")
	require.Zero(t, ws.Damaged)
	// The writer refuses what the reader would.
	bad := good
	bad.MLPerKg = 1e308
	err := logbook.AppendRecord(filepath.Join(t.TempDir(), "w.jsonl"), bad)
	require.ErrorContains(t, err, "nothing was written")
	require.ErrorContains(t, err, "ml_per_kg 1e+308")
}

// A record whose cautions were removed reads calm in the ward while its
// readings say STOP: the cautions its own figures call for are
// recomputed, and a record lacking one is damaged.
func TestRemovedCautionsMakeTheLineDamaged(t *testing.T) {
	b4 := recordLine(t, wardRecord(t, "B4", at(9, 0), 21, 0))
	ck := unexplainedCheck(t, false)
	rec, err := setup.NewRecord(ck, "B9", "ab", at(10, 0))
	require.NoError(t, err)
	ward, _, ws, _ := readBoth(t, b4, recordLine(t, rec))
	require.Equal(t, []string{"B9", "B4"}, ward, "as written, the record is read")
	require.Zero(t, ws.Damaged)
	rec.Cautions = nil
	// MHRA RMVS001 2020: a measured peak of 120 cmH2O is above 40.
	requireDamaged(t, "its figures call for caution measured-peak-high at stop, the record has none", []string{"B4"}, b4, recordLine(t, rec))
	rec.Cautions = []setup.Caution{{ID: "measured-peak-high", Level: setup.Warn}}
	requireDamaged(t, "measured-peak-high at stop, the record has warn", []string{"B4"}, b4, recordLine(t, rec))

	// An explained record: ARDS Network 2000, above 8 mL/kg is a warning
	// and (this program's stop) 10 or more a stop; a figure within
	// 0.001 of a limit is taken on its calm side (the log keeps 4 decimals).
	good := wardRecord(t, "B5", at(10, 0), 21, 0)
	at := func(mlkg float64, cs ...setup.Caution) string {
		r := good
		r.MLPerKg, r.DeliveredVtML = mlkg, mlkg*good.PBWKg
		r.Cautions = cs
		return recordLine(t, r)
	}
	warn := setup.Caution{ID: "tidal-volume-high", Level: setup.Warn}
	stop := setup.Caution{ID: "tidal-volume-high", Level: setup.Stop}
	requireDamaged(t, "tidal-volume-high at stop, the record has warn", []string{"B4"}, b4, at(10.01, warn))
	requireDamaged(t, "tidal-volume-high at warn, the record has none", []string{"B4"}, b4, at(8.01))
	for _, line := range []string{at(10, warn), at(10.01, stop), at(8, setup.Caution{ID: "other", Level: setup.Note}), at(8.01, warn)} {
		ward, _, ws, _ := readBoth(t, b4, line)
		require.Len(t, ward, 2, line)
		require.Zero(t, ws.Damaged)
	}
	// common practice: below 2 mL/kg the breath barely passes the dead space
	requireDamaged(t, "tidal-volume-low at stop, the record has warn", []string{"B4"}, b4,
		at(1.99, setup.Caution{ID: "tidal-volume-low", Level: setup.Warn}))
}
