package logbook_test

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

// The ward decodes only the lines that can decide a row; these are the
// cases where a line it does not decode, or decodes last, could have made
// it wrong. Each is the read of every line's answer (the rows a person
// would get from the records themselves), written out by hand.

// A bed's newest line is damaged (a figure edited out of range): it is
// decoded, counted and named, and the bed shows its newest good check,
// never the damaged one and never nothing.
func TestWardNamesADamagedNewestLineAndShowsTheCheckBefore(t *testing.T) {
	good := wardRecord(t, "B4", at(10, 0), 21, setup.Warn)
	bad := strings.Replace(recordLine(t, wardRecord(t, "B4", at(11, 0), 22, 0)), `"ml_per_kg":`, `"ml_per_kg":9`, 1)
	other := wardRecord(t, "B5", at(11, 30), 21, 0)
	path := writeLog(t, filepath.Join(t.TempDir(), "a.jsonl"), recordLine(t, good)+"\n", bad+"\n", recordLine(t, other)+"\n")
	rows, sum, err := logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	require.Len(t, rows, 2)
	require.Equal(t, "B4", rows[0].Bed, "WARN before a calm bed")
	require.True(t, rows[0].CheckedAt.Equal(at(10, 0)), "the good check before the damaged line")
	require.Equal(t, 21.0, rows[0].MotorRPM)
	require.Equal(t, 1, sum.Damaged)
	require.Equal(t, 2, sum.Problems[0].Line)
	require.Contains(t, sum.Problems[0].Reason, "ml_per_kg")
}

// A line whose first "bed" is B9 and whose later duplicate "bed" says B4
// (a decoder keeps the last) is damaged: it is never B4's check, however
// new, nor B9's. It is B9's line (the first "bed" is where the writer puts
// it), decoded and counted while it is B9's newest.
func TestALineWhoseHeaderAndDecodedBedDifferIsNeitherBed(t *testing.T) {
	b4 := wardRecord(t, "B4", at(9, 0), 21, 0)
	b9 := wardRecord(t, "B9", at(8, 0), 20, setup.Warn)
	for _, dup := range []string{`,"bed":"B4"}`, `,"BED":"B4"}`} {
		forged := recordLine(t, wardRecord(t, "B9", at(11, 0), 22, 0))
		forged = forged[:len(forged)-1] + dup
		path := writeLog(t, filepath.Join(t.TempDir(), "a.jsonl"), recordLine(t, b4)+"\n", recordLine(t, b9)+"\n", forged+"\n")
		rows, sum, err := logbook.WardRows([]string{path}, at(12, 0), 0)
		require.NoError(t, err)
		require.Len(t, rows, 2, dup)
		byBed := map[string]logbook.WardRow{rows[0].Bed: rows[0], rows[1].Bed: rows[1]}
		require.True(t, byBed["B4"].CheckedAt.Equal(at(9, 0)), "%s: B4's own check stands", dup)
		require.True(t, byBed["B9"].CheckedAt.Equal(at(8, 0)), "%s: B9's good check stands", dup)
		require.Equal(t, setup.Warn, byBed["B9"].HighestLevel)
		require.Equal(t, 1, sum.Damaged, dup)
		require.Equal(t, 3, sum.Problems[0].Line, dup)
	}
}

// When every line held for a bed is damaged, an older good line may lie
// further back: the ward reads every line again and shows it.
func TestEveryNewestLineDamagedFindsTheGoodOneFurtherBack(t *testing.T) {
	oldest := wardRecord(t, "B4", at(6, 0), 19, setup.Stop)
	lines := []string{recordLine(t, oldest) + "\n"}
	for i := range 4 {
		l := recordLine(t, wardRecord(t, "B4", at(7+i, 0), 21, 0))
		lines = append(lines, strings.Replace(l, `"initials":"AB"`, `"initials":"A1"`, 1)+"\n")
	}
	path := writeLog(t, filepath.Join(t.TempDir(), "a.jsonl"), lines...)
	rows, sum, err := logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	require.Len(t, rows, 1)
	require.True(t, rows[0].CheckedAt.Equal(at(6, 0)))
	require.Equal(t, setup.Stop, rows[0].HighestLevel, "the STOP of the one good check is not lost behind damaged lines")
	require.Equal(t, 4, sum.Damaged, "every line read again: the four damaged ones")
}

// Four checks of B4 within five minutes, three of them from one terminal:
// the STOP from the other terminal is still in the conflict, and shown as
// the louder. (A ward that held only a bed's three newest lines missed it,
// and showed a calm row.)
func TestAConflictBeyondABedsThreeNewestLinesIsFound(t *testing.T) {
	dir := t.TempDir()
	a := writeLog(t, filepath.Join(dir, "a.jsonl"),
		recordLine(t, wardRecord(t, "B4", at(14, 4), 23, 0))+"\n",
		recordLine(t, wardRecord(t, "B4", at(14, 5), 21, 0))+"\n",
		recordLine(t, wardRecord(t, "B4", at(14, 5), 22, 0))+"\n")
	b := writeLog(t, filepath.Join(dir, "b.jsonl"), recordLine(t, wardRecord(t, "B4", at(14, 2), 20, setup.Stop))+"\n")
	for _, order := range [][]string{{a, b}, {b, a}} {
		rows, _, err := logbook.WardRows(order, at(14, 10), 0)
		require.NoError(t, err)
		require.Len(t, rows, 1)
		require.Equal(t, setup.Stop, rows[0].HighestLevel, "the louder check of the conflict is shown")
		require.Equal(t, b, rows[0].Source)
		// derived: the newest check of a.jsonl (14:05, the later line) and
		// b.jsonl's 14:02 are three minutes apart, within the 5 min window.
		require.Equal(t, "conflict: two checks within 5 min: 14:05 UTC from "+a+" and 14:02 UTC from "+b, rows[0].Conflict)
	}
}
