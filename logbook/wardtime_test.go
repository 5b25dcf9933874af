package logbook_test

import (
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/report"
	"crankside/setup"
)

// A record dated 2099 (a terminal's clock gone wrong, or an edit) is shown
// with its year and never hides the bed's real later checks.
func TestARecordFromTheFutureNeverHidesLaterChecks(t *testing.T) {
	dir := t.TempDir()
	future := wardRecord(t, "B4", time.Date(2099, 1, 2, 10, 0, 0, 0, time.UTC), 20, 0)
	real1 := wardRecord(t, "B4", at(10, 0), 21, 0)
	real2 := wardRecord(t, "B4", at(11, 0), 22, setup.Warn)
	// Within FutureSkew (5 min) of now, a record is a check of now.
	skewed := wardRecord(t, "B5", at(12, 4), 21, 0)
	path := writeLog(t, filepath.Join(dir, "a.jsonl"), recordLine(t, future)+"\n", recordLine(t, real1)+"\n", recordLine(t, real2)+"\n", recordLine(t, skewed)+"\n")

	check := func(rows []logbook.WardRow) {
		require.Len(t, rows, 2)
		b4 := rows[0]
		require.Equal(t, "B4", b4.Bed)
		require.True(t, b4.CheckedAt.Equal(at(11, 0)), "the newest real check stands: %v", b4.CheckedAt)
		require.Equal(t, 22.0, b4.MotorRPM)
		require.True(t, b4.FutureAt.Equal(time.Date(2099, 1, 2, 10, 0, 0, 0, time.UTC)))
		line := report.WardLine(b4)
		require.Contains(t, line, "a record dated 2099-01-02 10:00 UTC, in the future, from "+path)
		require.Contains(t, line, "(60 min ago)", "derived: 12:00 - 11:00")
		require.True(t, rows[1].CheckedAt.Equal(at(12, 4)), "4 min ahead is within the skew")
		require.True(t, rows[1].FutureAt.IsZero())
	}
	rows, _, err := logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	check(rows)
	// Three records from the future do not push the real ones out of the
	// few lines the ward holds per bed.
	more := []string{recordLine(t, future) + "\n"}
	for i := 1; i <= 3; i++ {
		f := future
		f.Time = f.Time.Add(time.Duration(i) * time.Hour)
		more = append(more, recordLine(t, f)+"\n")
	}
	path = writeLog(t, filepath.Join(dir, "b.jsonl"), append(append(more, recordLine(t, real1)+"\n", recordLine(t, real2)+"\n", recordLine(t, skewed)+"\n"), more...)...)
	rows, _, err = logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	require.True(t, rows[0].CheckedAt.Equal(at(11, 0)))
	require.True(t, rows[0].FutureAt.Equal(time.Date(2099, 1, 2, 13, 0, 0, 0, time.UTC)), "the newest future record is named")
	// The slow path (a line that misleads the quick look) says the same.
	odd := strings.Replace(recordLine(t, real1), `"bed":"B4"`, `"bed":"B4","x":{"bed":"B9"}`, 1)
	path = writeLog(t, filepath.Join(dir, "c.jsonl"), odd+"\n", recordLine(t, future)+"\n", recordLine(t, real2)+"\n", recordLine(t, skewed)+"\n")
	rows, _, err = logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	check(rows)

	// A bed whose only record is from the future shows it, with its year.
	only := writeLog(t, filepath.Join(dir, "d.jsonl"), recordLine(t, future)+"\n")
	rows, _, err = logbook.WardRows([]string{only}, at(12, 0), 0)
	require.NoError(t, err)
	require.Len(t, rows, 1)
	require.Contains(t, report.WardLine(rows[0]), "2099-01-02 10:00 UTC (IN THE FUTURE")
}

// Two terminals record the same bed in the same second: the ward row does
// not depend on the order the logs are named in, it shows the louder
// check, and it says there is a conflict.
func TestSameSecondChecksFromTwoLogsAreAConflict(t *testing.T) {
	dir := t.TempDir()
	calm := wardRecord(t, "B4", at(14, 5), 21, 0)
	stop := wardRecord(t, "B4", at(14, 5), 20, setup.Stop)
	a := writeLog(t, filepath.Join(dir, "a.jsonl"), recordLine(t, calm)+"\n")
	b := writeLog(t, filepath.Join(dir, "b.jsonl"), recordLine(t, stop)+"\n")
	var lines []string
	for _, order := range [][]string{{a, b}, {b, a}, {dir}} {
		rows, _, err := logbook.WardRows(order, at(14, 10), 0)
		require.NoError(t, err)
		require.Len(t, rows, 1)
		require.Equal(t, setup.Stop, rows[0].HighestLevel, "the louder check is shown")
		require.Equal(t, b, rows[0].Source)
		require.Equal(t, "conflict: two checks at 14:05 UTC from "+a+" and "+b, rows[0].Conflict)
		lines = append(lines, report.WardLine(rows[0]))

		h, _, err := logbook.ReadBedHistory(order, "B4", 0)
		require.NoError(t, err)
		require.Len(t, h.Entries, 2)
		for _, e := range h.Entries {
			require.Equal(t, rows[0].Conflict, e.Conflict)
		}
	}
	require.Equal(t, lines[0], lines[1], "the order of the logs changes nothing")
	require.Equal(t, lines[0], lines[2])

	// The same record copied into both logs is no conflict; and two
	// checks six minutes apart (beyond ConflictWindow, 5 min) are not one.
	c := writeLog(t, filepath.Join(dir, "c.jsonl"), recordLine(t, calm)+"\n")
	later := wardRecord(t, "B4", at(14, 11), 21, 0)
	d := writeLog(t, filepath.Join(dir, "d.jsonl"), recordLine(t, calm)+"\n", recordLine(t, later)+"\n")
	rows, _, err := logbook.WardRows([]string{c, d}, at(14, 20), 0)
	require.NoError(t, err)
	require.Empty(t, rows[0].Conflict)
	near := wardRecord(t, "B4", at(14, 10), 21, 0)
	e := writeLog(t, filepath.Join(dir, "e.jsonl"), recordLine(t, near)+"\n")
	rows, _, err = logbook.WardRows([]string{e, d}, at(14, 20), 0)
	require.NoError(t, err)
	require.Equal(t, "conflict: two checks within 5 min: 14:11 UTC from "+d+" and 14:10 UTC from "+e, rows[0].Conflict)
}

// A byte order mark at the start of a log, as some editors save one, is
// read: the first record is not a damaged line.
func TestAByteOrderMarkIsRead(t *testing.T) {
	path := writeLog(t, filepath.Join(t.TempDir(), "bom.jsonl"), "\ufeff"+recordLine(t, wardRecord(t, "B4", at(10, 0), 21, 0))+"\n")
	rows, sum, err := logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	require.Zero(t, sum.Damaged)
	require.Len(t, rows, 1)
	h, sum, err := logbook.ReadBedHistory([]string{path}, "B4", 0)
	require.NoError(t, err)
	require.Zero(t, sum.Damaged)
	require.Len(t, h.Entries, 1)
	// Only at the start of the file: a mark before a later line is junk.
	path = writeLog(t, filepath.Join(t.TempDir(), "bom2.jsonl"), recordLine(t, wardRecord(t, "B4", at(10, 0), 21, 0))+"\n\ufeff{}\n")
	_, sum, err = logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	require.Equal(t, 1, sum.Damaged)
}
