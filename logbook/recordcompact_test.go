package logbook_test

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

// The compact record (version 3) round trip: what AppendRecord writes
// reads back as the record it was given, every key and value, but for
// the watch band and the timing check it leaves out (reproducible from the
// entries on the profile; older records lack them too). Checks of every
// shape: calm, a proposal, readings no lung explains with a proposal, a
// blood gas with the protocol's step, a stopwatch-timed setting, readings
// in other units, a second checker.
func TestTheCompactRecordReadsBackAsWritten(t *testing.T) {
	checks := map[string]setup.Check{
		"unexplained, proposal": unexplainedCheck(t, true),
		"gas and step":          gasCheck(t, setup.Entries{"lung": "ards", "spo2": "92", "ph": "7.22", "paco2": "58"}),
		"readings, proposal":    gasCheck(t, setup.Entries{"peak": "17", "end-pressure": "14", "propose-hole": "7"}),
		"kPa and hPa":           gasCheck(t, setup.Entries{"gas-unit": "kpa", "paco2": "6", "pressure-unit": "hpa", "peak": "17", "end-pressure": "14"}),
		"cylinder and O2":       gasCheck(t, setup.Entries{"o2-flow": "2", "cylinder-l": "10", "cylinder-bar": "150"}),
	}
	sw := setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "turn-s": "2.86", "pause-s": "1.4"}
	req, problems := setup.BuildCheckRequest(sw, today)
	require.Empty(t, problems)
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	checks["stopwatch"] = ck

	dir := t.TempDir()
	for name, ck := range checks {
		rec, err := setup.NewRecord(ck, "B4", "ab", today)
		require.NoError(t, err, name)
		rec.SecondInitials = "CD"
		path := filepath.Join(dir, strings.ReplaceAll(name, " ", "-")+".jsonl")
		require.NoError(t, logbook.AppendRecord(path, rec), name)
		line, err := os.ReadFile(path)
		require.NoError(t, err)
		for _, never := range []string{`"clinical_caution"`, `"watch"`, `"timing_check"`, `"figures_withheld"`, `:null`} {
			require.NotContains(t, string(line), never, name)
		}
		h, sum, err := logbook.ReadBedHistory([]string{path}, "B4", 0)
		require.NoError(t, err)
		require.Zero(t, sum.Damaged, "%s: %v", name, sum.Problems)
		require.Len(t, h.Entries, 1, name)
		got := h.Entries[0].Record

		want := rec
		want.WriterVersion = logbook.RecordV3
		want.Watch, want.TimingCheck = nil, nil
		wb, err := json.Marshal(want)
		require.NoError(t, err)
		gb, err := json.Marshal(got)
		require.NoError(t, err)
		require.JSONEq(t, string(wb), string(gb), "%s: round trip", name)
		// The ward shows it as the full record would be shown.
		rows, _, err := logbook.WardRows([]string{path}, today, 0)
		require.NoError(t, err)
		require.Len(t, rows, 1)
		require.Equal(t, setup.Highest(rec.Cautions), rows[0].HighestLevel, name)
		require.Equal(t, rec.Setting.Hole, rows[0].Hole, name)
	}
}

// A compact line with its "record" key taken out reads as a record of the
// first writers, which always wrote the clinical caution: it is damaged,
// never a bed's check read by the wrong rules.
func TestACompactLineReadsOnlyAsItsWriterWroteIt(t *testing.T) {
	line := recordLine(t, wardRecord(t, "B4", at(10, 0), 21, setup.Warn))
	require.Contains(t, line, `"record":3,`)
	noVersion := strings.Replace(line, `"record":3,`, "", 1)
	path := writeLog(t, filepath.Join(t.TempDir(), "a.jsonl"), noVersion+"\n")
	_, sum, err := logbook.ReadBedHistory([]string{path}, "B4", 0)
	require.NoError(t, err)
	require.Equal(t, 1, sum.Damaged)
	require.Contains(t, sum.Problems[0].Reason, "lacks clinical_caution")
}
