package logbook_test

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

// at is a clock time on the test day (invented data).
func at(hh, mm int) time.Time {
	return today.Add(time.Duration(hh)*time.Hour + time.Duration(mm)*time.Minute - 9*time.Hour)
}

// wardRecord is a real check re-stamped with a bed, a time, a motor
// speed and, when level is not 0, a single caution of that level in
// place of the check's own.
func wardRecord(t testing.TB, bed string, when time.Time, rpm float64, level setup.Level) setup.Record {
	return restamp(sampleRecord(t, bed, 0), bed, when, rpm, level)
}

// restamp is wardRecord on a record already made.
func restamp(rec setup.Record, bed string, when time.Time, rpm float64, level setup.Level) setup.Record {
	rec.Bed = bed
	rec.Time = when
	rec.Setting.RPM = rpm
	switch level {
	case 0:
		rec.Cautions = nil
	default:
		rec.Cautions = []setup.Caution{{ID: setup.CautionID("test-" + level.String()), Level: level, Message: "invented"}}
	}
	return rec
}

// recordLine is rec as this program's writer writes it (its version).
func recordLine(t testing.TB, rec setup.Record) string {
	b, err := logbook.EncodeRecordLine(rec)
	require.NoError(t, err)
	return string(b)
}

// writeLog writes lines as given (the caller adds newlines), owner-only.
func writeLog(t testing.TB, path string, lines ...string) string {
	require.NoError(t, os.WriteFile(path, []byte(strings.Join(lines, "")), 0o600))
	return path
}

func TestWardRowsFromSeveralBedsWithATornAndADamagedLine(t *testing.T) {
	dir := t.TempDir()
	b1old := wardRecord(t, "B1", at(6, 0), 20, setup.Warn)
	b1new := wardRecord(t, "B1", at(10, 0), 21, setup.Warn)
	b2 := wardRecord(t, "B2", at(11, 0), 22, setup.Stop)
	b3 := wardRecord(t, "B3", at(7, 0), 20, 0)
	b10 := wardRecord(t, "B10", at(11, 30), 20, setup.Warn)
	b4 := wardRecord(t, "B4", at(11, 45), 20, setup.Note)
	b4.Proposed = &setup.ProposedJSON{Setting: b4.Setting}
	// A newer B1 line that has the shape and header of a record but whose
	// body does not decode (an unknown caution level): B1's row must come
	// from the record before it.
	damaged := `{"format":"crankside-check/1","time":"2026-12-01T11:50:00Z","bed":"B1","cautions":[{"level":"loud"}]}`
	// A B3 record cut short by a crash, then a fresh line after it.
	full := recordLine(t, wardRecord(t, "B3", at(11, 55), 30, setup.Stop))
	torn := full[:len(full)/2]
	path := writeLog(t, filepath.Join(dir, "ward.jsonl"),
		recordLine(t, b1old)+"\n", recordLine(t, b3)+"\n", recordLine(t, b1new)+"\n", damaged+"\n",
		recordLine(t, b2)+"\n", torn+"\n", recordLine(t, b10)+"\n", recordLine(t, b4)+"\n", torn)

	now := at(12, 0)
	rows, sum, err := logbook.WardRows([]string{path}, now, 0) // 0: the default 4 hours
	require.NoError(t, err)
	var got []string
	for _, r := range rows {
		got = append(got, r.Bed)
	}
	// derived: B2 has a stop; B3 was checked 5 h ago (> 4 h); B1 and B10
	// warn (B1 before B10, numbers compared as numbers); B4 only a note.
	require.Equal(t, []string{"B2", "B3", "B1", "B10", "B4"}, got)

	byBed := map[string]logbook.WardRow{}
	for _, r := range rows {
		byBed[r.Bed] = r
	}
	require.Equal(t, at(10, 0), byBed["B1"].CheckedAt, "the damaged newer line is skipped, the good one before it is shown")
	require.Equal(t, 21.0, byBed["B1"].MotorRPM)
	require.Equal(t, 120.0, byBed["B1"].AgeMinutes, "derived: 12:00 - 10:00 = 120 min")
	require.Equal(t, at(7, 0), byBed["B3"].CheckedAt, "the torn B3 line is not a check")
	require.Equal(t, 300.0, byBed["B3"].AgeMinutes, "derived: 12:00 - 07:00 = 300 min")
	require.True(t, byBed["B3"].Overdue)
	require.False(t, byBed["B1"].Overdue)
	require.Equal(t, setup.Stop, byBed["B2"].HighestLevel)
	require.Equal(t, setup.Level(0), byBed["B3"].HighestLevel)
	require.True(t, byBed["B4"].Proposed)
	require.False(t, byBed["B1"].Proposed)
	require.Equal(t, "8", byBed["B2"].Hole)
	require.Equal(t, path, byBed["B2"].Source)
	require.NotNil(t, byBed["B2"].MLPerKg, "B2's readings are explained: its mL/kg is given")
	require.Equal(t, b2.MLPerKg, *byBed["B2"].MLPerKg)
	require.Equal(t, 5.0, byBed["B2"].PEEPCmH2O, "the check was made at PEEP 5")
	require.Equal(t, 1.4, byBed["B2"].DwellS)

	require.Equal(t, 3, sum.Damaged, "the damaged line, the torn line inside, the torn last line")
	var lines []int
	for _, p := range sum.Problems {
		lines = append(lines, p.Line)
	}
	sort.Ints(lines)
	require.Equal(t, []int{4, 6, 9}, lines)
}

func TestWardRowJSONKeys(t *testing.T) {
	path := writeLog(t, filepath.Join(t.TempDir(), "w.jsonl"), recordLine(t, wardRecord(t, "B7", at(8, 0), 20, 0))+"\n")
	rows, _, err := logbook.WardRows([]string{path}, at(9, 0), time.Hour)
	require.NoError(t, err)
	b, err := json.Marshal(rows)
	require.NoError(t, err)
	var objs []map[string]any
	require.NoError(t, json.Unmarshal(b, &objs))
	require.Len(t, objs, 1)
	var keys []string
	for k := range objs[0] {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	// The keys issue 14 lists, plus proposal_made and log, and issue 19's
	// gas: the readings, their cautions, P/F, S/F and the Berlin band.
	require.Equal(t, []string{"age_minutes", "ards_severity", "bed", "checked_at", "dwell_s", "gas_cautions", "gas_readings",
		"highest_level", "hole", "log", "ml_per_kg", "motor_rpm", "overdue", "peep_cmh2o", "pf_ratio", "profile_id",
		"proposal_made", "sf_ratio"}, keys)
	require.Nil(t, objs[0]["gas_readings"], "no gas was entered")
	require.Equal(t, []any{}, objs[0]["gas_cautions"])
	require.Equal(t, "none", objs[0]["highest_level"])
	require.Equal(t, "2026-12-01T08:00:00Z", objs[0]["checked_at"])
	require.Equal(t, 60.0, objs[0]["age_minutes"], "derived: 09:00 - 08:00")
	require.Equal(t, false, objs[0]["overdue"], "an age equal to the interval is not overdue")
}

func TestOverdueAtTheBoundary(t *testing.T) {
	// The documented boundary: overdue when the age is strictly greater
	// than the interval (4 h, common practice): at exactly 4 h the check
	// is due, one second later it is overdue.
	checked := at(8, 0)
	path := writeLog(t, filepath.Join(t.TempDir(), "w.jsonl"), recordLine(t, wardRecord(t, "B1", checked, 20, 0))+"\n")
	for _, c := range []struct {
		now     time.Time
		every   time.Duration
		overdue bool
	}{
		{checked.Add(4 * time.Hour), 0, false},
		{checked.Add(4*time.Hour + time.Second), 0, true},
		{checked.Add(4*time.Hour - time.Second), 0, false},
		{checked.Add(2 * time.Hour), 2 * time.Hour, false},
		{checked.Add(2*time.Hour + time.Second), 2 * time.Hour, true},
	} {
		rows, _, err := logbook.WardRows([]string{path}, c.now, c.every)
		require.NoError(t, err)
		require.Len(t, rows, 1)
		require.Equal(t, c.overdue, rows[0].Overdue, "age %v, every %v", c.now.Sub(checked), c.every)
	}
	require.Equal(t, 4*time.Hour, setup.DefaultCheckEvery, "common practice: a check every 4 hours")
	_, _, err := logbook.WardRows([]string{path}, at(9, 0), -time.Hour)
	require.ErrorContains(t, err, "every")
}

func TestBedHistoryNewestFirstWithTheCountAndChanges(t *testing.T) {
	path := filepath.Join(t.TempDir(), "h.jsonl")
	var lines []string
	for i := 0; i < 30; i++ {
		// Check i at 00:00 + i hours; the motor alternates 20, 21 rpm.
		lines = append(lines, recordLine(t, wardRecord(t, "B4", at(0, 0).Add(time.Duration(i)*time.Hour), float64(20+i%2), setup.Warn))+"\n")
		lines = append(lines, recordLine(t, wardRecord(t, "B5", at(0, 0).Add(time.Duration(i)*time.Hour), 20, setup.Warn))+"\n")
	}
	// Written newest first, so the order shown cannot come from the file.
	for i, j := 0, len(lines)-1; i < j; i, j = i+1, j-1 {
		lines[i], lines[j] = lines[j], lines[i]
	}
	writeLog(t, path, lines...)
	h, sum, err := logbook.ReadBedHistory([]string{path}, "B4", 12)
	require.NoError(t, err)
	require.Equal(t, "B4", h.Bed)
	require.Equal(t, 30, h.Total)
	require.Len(t, h.Entries, 12)
	for i, e := range h.Entries {
		// derived: entry i is check 29-i, at (29-i) hours.
		require.Equal(t, at(0, 0).Add(time.Duration(29-i)*time.Hour), e.Record.Time, "entry %d", i)
		require.Equal(t, "B4", e.Record.Bed)
		require.Equal(t, path, e.Log)
	}
	// Check 29 (odd) ran 21 rpm after check 28's 20; the oldest shown
	// (check 18, 20 rpm) still says what changed from check 17 (21 rpm).
	require.Equal(t, []string{"motor speed 20 -> 21 rpm"}, h.Entries[0].Changes)
	require.Equal(t, []string{"motor speed 21 -> 20 rpm"}, h.Entries[11].Changes)
	require.Equal(t, 30, sum.Records, "only B4's records are counted")
	require.Zero(t, sum.Damaged)

	all, _, err := logbook.ReadBedHistory([]string{path}, "B4", 0)
	require.NoError(t, err)
	require.Len(t, all.Entries, 30)
	require.Nil(t, all.Entries[29].Changes, "the first check has nothing before it")

	none, _, err := logbook.ReadBedHistory([]string{path}, "B9", 0)
	require.NoError(t, err)
	require.Equal(t, "B9", none.Bed)
	require.Empty(t, none.Entries)
}

func TestSeveralLogsMergeByTimeAndCountACopiedRecordOnce(t *testing.T) {
	dir := t.TempDir()
	b1early := recordLine(t, wardRecord(t, "B1", at(8, 0), 20, 0))
	b2 := recordLine(t, wardRecord(t, "B2", at(9, 0), 20, 0))
	b1late := recordLine(t, wardRecord(t, "B1", at(10, 0), 21, 0))
	// The same B1 08:00 record written otherwise: other spacing, its bed
	// escaped, a field this program does not read, a key moved to the
	// end. It decodes to the same record (the same canonical JSON), so it
	// is the same record.
	respaced := strings.Replace(strings.Replace(b1early, `"bed":"B1"`, `"bed": "\u0042\u0031", "from_a_later_version": true`, 1), `"time":`, `"time" : `, 1)
	respaced = strings.Replace(respaced, `"format":"crankside-check/1",`, ``, 1)
	respaced = strings.TrimSuffix(respaced, `}`) + `,"format":"crankside-check/1"}`
	require.NotEqual(t, b1early, respaced)
	a := writeLog(t, filepath.Join(dir, "a.jsonl"), b1early+"\n", b2+"\n")
	b := writeLog(t, filepath.Join(dir, "b.jsonl"), b1late+"\n", b2+"\n", respaced+"\n")
	// Not logs: another extension, and a sub-folder (not read).
	writeLog(t, filepath.Join(dir, "notes.txt"), "not a log\n")
	require.NoError(t, os.Mkdir(filepath.Join(dir, "old"), 0o700))
	writeLog(t, filepath.Join(dir, "old", "c.jsonl"), recordLine(t, wardRecord(t, "B1", at(11, 0), 25, 0))+"\n")

	for _, paths := range [][]string{{a, b}, {dir}, {a, b, a, dir}} {
		h, sum, err := logbook.ReadBedHistory(paths, "B1", 0)
		require.NoError(t, err, "%v", paths)
		require.Len(t, h.Entries, 2, "%v: B1 08:00 counted once, the sub-folder not read", paths)
		require.Equal(t, 2, h.Total)
		require.Equal(t, at(10, 0), h.Entries[0].Record.Time)
		require.Equal(t, b, h.Entries[0].Log)
		require.Equal(t, at(8, 0), h.Entries[1].Record.Time)
		require.Equal(t, a, h.Entries[1].Log, "a copy is shown from the first log that holds it")
		require.Equal(t, 1, sum.Duplicates, "%v", paths)
		require.Equal(t, []string{a, b}, sum.Logs, "each file read once")

		hs, sum, err := logbook.ReadHistories(paths, "", 0)
		require.NoError(t, err)
		require.Len(t, hs, 2)
		require.Len(t, hs[1].Entries, 1, "B2 is in both logs, counted once")
		require.Equal(t, 2, sum.Duplicates)
		require.Equal(t, 3, sum.Records)

		rows, _, err := logbook.WardRows(paths, at(12, 0), 0)
		require.NoError(t, err)
		require.Len(t, rows, 2)
		require.Equal(t, "B1", rows[0].Bed)
		require.Equal(t, b, rows[0].Source)
		require.Equal(t, 21.0, rows[0].MotorRPM)
		require.Equal(t, a, rows[1].Source, "B2's copy: the first log listed")
	}
	_, _, err := logbook.WardRows([]string{filepath.Join(dir, "old", "nothing")}, at(12, 0), 0)
	require.ErrorContains(t, err, "no such file")
	empty := t.TempDir()
	_, _, err = logbook.WardRows([]string{empty}, at(12, 0), 0)
	require.ErrorContains(t, err, "holds no *.jsonl log")
}

func TestWardRowsAreExactWhenALineMisleadsTheQuickLook(t *testing.T) {
	// A record that carries an unknown nested "bed": the quick look sees a
	// second "bed" and decodes the line, which is B1's. The ward must show
	// B1 (as every line decoded would), and no B9.
	line := recordLine(t, wardRecord(t, "B1", at(8, 0), 20, 0))
	nested := strings.Replace(line, `"bed":"B1"`, `"bed":"B1","extra":{"bed":"B9"}`, 1)
	// The same with the record's own key escaped: the writer never escapes
	// a key, so the line is damaged, never B1's nor B9's check.
	escaped := strings.Replace(line, `"bed":"B1"`, `"b\u0065d":"B1","extra":{"bed":"B9"}`, 1)
	escaped = strings.Replace(escaped, at(8, 0).Format(time.RFC3339), at(8, 30).Format(time.RFC3339), 1)
	path := writeLog(t, filepath.Join(t.TempDir(), "w.jsonl"), nested+"\n", escaped+"\n")
	rows, sum, err := logbook.WardRows([]string{path}, at(9, 0), 0)
	require.NoError(t, err)
	require.Len(t, rows, 1)
	require.Equal(t, "B1", rows[0].Bed)
	require.True(t, rows[0].CheckedAt.Equal(at(8, 0)), "the escaped line at 08:30 is not B1's newest check")
	require.Equal(t, 1, sum.Damaged)
	require.Contains(t, sum.Problems[0].Reason, `key "b\\u0065d" is written escaped`)
	h, _, err := logbook.ReadBedHistory([]string{path}, "B1", 0)
	require.NoError(t, err)
	require.Len(t, h.Entries, 1, "the escaped line is damaged for the bed filter too")
}

// A line of the record format holding only a bed and a time (half
// written, or written by hand into a shared folder) is not a check: it
// is counted as damaged and never stands in the ward, or in the bed's
// history, in place of the real last check and its STOP.
func TestABareRecordNeverReplacesABedsLastCheck(t *testing.T) {
	dir := t.TempDir()
	stop := wardRecord(t, "B9", at(10, 0), 21, setup.Stop)
	a := writeLog(t, filepath.Join(dir, "a.jsonl"), recordLine(t, stop)+"\n")
	bare := fmt.Sprintf(`{"format":%q,"bed":"B9","time":%q}`, setup.RecordFormat, at(11, 59).Format(time.RFC3339))
	empty := fmt.Sprintf(`{"format":%q,"time":%q,"bed":"B9","initials":"AB","setting":{"hole":"","motor_rpm":0}}`, setup.RecordFormat, at(11, 58).Format(time.RFC3339))
	b := writeLog(t, filepath.Join(dir, "z.jsonl"), bare+"\n", empty+"\n", "{}\n")

	rows, sum, err := logbook.WardRows([]string{a, b}, at(12, 0), 0)
	require.NoError(t, err)
	require.Len(t, rows, 1)
	require.Equal(t, setup.Stop, rows[0].HighestLevel, "the real check's STOP stands")
	require.True(t, rows[0].CheckedAt.Equal(at(10, 0)))
	require.Equal(t, 3, sum.Damaged)

	h, sum, err := logbook.ReadBedHistory([]string{a, b}, "B9", 0)
	require.NoError(t, err)
	require.Len(t, h.Entries, 1)
	require.Equal(t, 2, sum.Damaged, "the two lines that name B9; {} cannot hold the bed and is not decoded")
}
