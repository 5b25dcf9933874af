package logbook

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// bedRecord is a real check of demo-a as this program writes one, then
// given the bed label as it stands (as an older version wrote what was
// typed, lower case included) and a time.
func bedRecord(t *testing.T, bed string, at time.Time) []byte {
	t.Helper()
	p, _, err := profiles.Open("demo-a", "")
	require.NoError(t, err)
	ck, err := setup.RunCheck(setup.CheckRequest{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: "8", RPM: 21, DwellS: 1.4, PEEPCmH2O: 5}, Now: at}, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B4", "AB", at)
	require.NoError(t, err)
	rec.Bed = bed
	b, err := json.Marshal(rec)
	require.NoError(t, err)
	return b
}

// Design rule (the review's finding): a bed label typed b4 or B4 is one
// bed. New records are written upper case.
func TestNewRecordWritesTheBedUpperCase(t *testing.T) {
	p, _, err := profiles.Open("demo-a", "")
	require.NoError(t, err)
	ck, err := setup.RunCheck(setup.CheckRequest{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: "8", RPM: 21, DwellS: 1.4, PEEPCmH2O: 5}, Now: time.Now()}, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "ward3-b12", "ab", time.Now())
	require.NoError(t, err)
	require.Equal(t, "WARD3-B12", rec.Bed)
}

// Old lower-case records join their bed in the history, its filter and
// the ward.
func TestBedLabelsAreOneBedWhateverTheirCase(t *testing.T) {
	t0 := time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC)
	dir := t.TempDir()
	path := filepath.Join(dir, "h.jsonl")
	lines := []string{string(bedRecord(t, "b4", t0)), string(bedRecord(t, "B4", t0.Add(time.Hour))),
		string(bedRecord(t, "b4", t0.Add(2*time.Hour))), string(bedRecord(t, "B5", t0))}
	require.NoError(t, os.WriteFile(path, []byte(strings.Join(lines, "\n")+"\n"), 0o600))

	hs, _, err := ReadHistories([]string{path}, "", 0)
	require.NoError(t, err)
	require.Len(t, hs, 2, "B4 and B5, not b4 beside them")
	require.Equal(t, "B4", hs[0].Bed)
	require.Len(t, hs[0].Entries, 3)
	require.Equal(t, 3, hs[0].Total)

	for _, asked := range []string{"B4", "b4"} {
		h, _, err := ReadBedHistory([]string{path}, asked, 0)
		require.NoError(t, err)
		require.Len(t, h.Entries, 3, "--bed %s finds every check of the bed", asked)
		require.True(t, h.Entries[0].Record.Time.Equal(t0.Add(2*time.Hour)), "newest first")
	}

	rows, _, err := WardRows([]string{path}, t0.Add(3*time.Hour), 0)
	require.NoError(t, err)
	require.Len(t, rows, 2)
	for _, r := range rows {
		if r.Bed == "B4" {
			require.True(t, r.CheckedAt.Equal(t0.Add(2*time.Hour)), "the bed's newest check, written b4")
		} else {
			require.Equal(t, "B5", r.Bed)
		}
	}
}

// The pre-check before decoding never skips a line that could hold the
// label, whatever its case, and allocates nothing.
func TestMayHoldLabelIgnoresCase(t *testing.T) {
	cases := []struct {
		line, label string
		want        bool
	}{
		{`{"bed":"b4"}`, "B4", true},
		{`{"bed":"B4"}`, "B4", true},
		{`{"bed":"Ward3-b12"}`, "WARD3-B12", true},
		{`{"bed":"\u0062\u0034"}`, "B4", true}, // escaped b and 4: only decoding can tell
		{`{"bed":"B5"}`, "B4", false},
		{`{"bed":"c4"}`, "B4", false},
		// Exact: --bed B2 does not decode the lines of B20-B29.
		{`{"bed":"B20"}`, "B2", false},
		{`{"bed":"b29","hole":"AB2"}`, "B2", false},
		{`{"bed":"B20","x":"b2"}`, "B2", true},
	}
	for _, c := range cases {
		require.Equal(t, c.want, mayHoldLabel([]byte(c.line), []byte(c.label)), "%s in %s", c.label, c.line)
	}
	label := []byte("B4")
	line := []byte(`{"format":"crankside-check/1","bed":"b4","x":"` + strings.Repeat("a", 200) + `"}`)
	allocs := testing.AllocsPerRun(100, func() { mayHoldLabel(line, label) })
	require.Zero(t, allocs)
}
