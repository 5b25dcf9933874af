package logbook_test

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

// Genuine records of earlier writers, written by the program as it was
// (built from the commit named, run as `crankside check --height-cm 175
// --sex male --hole 8 --rpm 21 --dwell-s 1.4 --initials ab --log FILE`
// with the flags given), one JSON line each, never edited:
//
//   - testdata/records-f64a79f.jsonl: commit f64a79f, the first writer:
//     b4 (no more flags), B5 (--peak 30 --end-pressure 20), B6 (--hole 3:
//     3.9 mL/kg), B7 (--peak 120 --end-pressure 100: no lung explains
//     them; that writer wrote neither measured-peak-high nor
//     readings-unexplained), B8 (--propose-hole 7).
//   - testdata/records-61369fa.jsonl: commit 61369fa, which wrote the gas
//     readings a few commits before their cautions: B9 (--ph 7.22 --paco2
//     58 --spo2 92) and B10 (--ph 7.10 --paco2 80 --spo2 85 --pao2 50),
//     neither with a ph-low caution.
//
// None of them has a "record" key: they are RecordV1's writers.

// readAfter is the time the ward reads these records at: an hour after
// they were written (2026-12-02 17:36 UTC).
var readAfter = time.Date(2026, 12, 2, 18, 40, 0, 0, time.UTC)

// genuineLines are a testdata log's lines, without their newlines.
func genuineLines(t *testing.T, name string) []string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", name))
	require.NoError(t, err)
	return strings.Split(strings.TrimSuffix(string(b), "\n"), "\n")
}

// versionLog writes lines to an owner-only log, one a line.
func versionLog(t *testing.T, lines ...string) string {
	t.Helper()
	return writeLog(t, filepath.Join(t.TempDir(), "ward.jsonl"), strings.Join(lines, "\n")+"\n")
}

// historyOf reads the log's histories by bed.
func historyOf(t *testing.T, path string) (map[string]setup.Record, logbook.LogSummary) {
	t.Helper()
	hs, sum, err := logbook.ReadHistories([]string{path}, "", 0)
	require.NoError(t, err)
	out := map[string]setup.Record{}
	for _, h := range hs {
		out[h.Bed] = h.Entries[0].Record
	}
	return out, sum
}

func cautionOf(r setup.Record, id setup.CautionID) *setup.Caution {
	for i := range r.Cautions {
		if r.Cautions[i].ID == id {
			return &r.Cautions[i]
		}
	}
	return nil
}

// An old but genuine record reads: it is held to what its writer wrote,
// and what this program's rules call for that it did not write is added,
// saying so, so that it reads no calmer than its figures.
func TestRecordsOfEarlierWritersRead(t *testing.T) {
	lines := append(genuineLines(t, "records-f64a79f.jsonl"), genuineLines(t, "records-61369fa.jsonl")...)
	require.Len(t, lines, 7)
	for _, l := range lines {
		require.NotContains(t, l, `"record":`, "written before the key")
	}
	// The premise: the first writer's B7 has the 120 cmH2O reading and no
	// measured-peak-high; 61369fa's B10 has pH 7.10 and no ph-low.
	require.Contains(t, lines[3], `"peak_cmh2o":120`)
	require.NotContains(t, lines[3], "measured-peak-high")
	require.Contains(t, lines[6], `"ph":7.1,`)
	require.NotContains(t, lines[6], "ph-low")

	path := versionLog(t, lines...)
	recs, sum := historyOf(t, path)
	require.Zero(t, sum.Damaged, "%v", sum.Problems)
	require.Len(t, recs, 7)

	b7 := recs["B7"]
	// MHRA RMVS001 2020: a measured peak above 40 cmH2O is a stop.
	c := cautionOf(b7, "measured-peak-high")
	require.NotNil(t, c, "added on reading")
	require.Equal(t, setup.Stop, c.Level)
	require.InDelta(t, 120, c.Value, 1e-9, "the reading, as recorded")
	require.InDelta(t, 40, c.Limit, 1e-9, "MHRA RMVS001 2020: 40 cmH2O")
	require.Contains(t, c.Source, "recomputed on reading")
	c = cautionOf(b7, "readings-unexplained")
	require.NotNil(t, c, "the record has a fit problem: no lung explains the readings")
	require.Equal(t, setup.Stop, c.Level)
	require.Contains(t, c.Message, "did not write it")

	// ARDS Network protocol card: pH below 7.15 is the severe branch (a
	// stop here); 7.15-7.29 the mild one (a warning).
	c = cautionOf(recs["B10"], "ph-low")
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	c = cautionOf(recs["B9"], "ph-low")
	require.NotNil(t, c)
	require.Equal(t, setup.Warn, c.Level)

	// What the record holds is kept as written: B6's own caution.
	c = cautionOf(recs["B6"], "tidal-volume-low")
	require.NotNil(t, c)
	require.Equal(t, setup.Warn, c.Level, "4 mL/kg and below: ARDS Network 2000's lower bound, a warning")
	require.Nil(t, cautionOf(recs["B4"], "measured-peak-high"), "no reading, nothing added")

	rows, wsum, err := logbook.WardRows([]string{path}, readAfter, 0)
	require.NoError(t, err)
	require.Zero(t, wsum.Damaged)
	levels := map[string]setup.Level{}
	for _, r := range rows {
		levels[r.Bed] = r.HighestLevel
	}
	require.Equal(t, setup.Stop, levels["B7"], "the ward shows B7 at its readings' level")
	require.Equal(t, setup.Stop, levels["B10"])
	require.Equal(t, setup.Warn, levels["B4"], "calibration-missing, as written")
}

// versioned is line with a "record" key of the given value, where the
// writer puts it (after the initials).
func versioned(t *testing.T, line, value string) string {
	t.Helper()
	out := strings.Replace(line, `"initials":"AB",`, `"initials":"AB","record":`+value+`,`, 1)
	require.NotEqual(t, line, out)
	return out
}

// A line is held to what the writer it names always wrote: the first
// writer's B7 claiming version 2 lacks the gas path and the timing check;
// a future version is refused with the version this program reads.
func TestAWriterVersionIsHeldToWhatItWrote(t *testing.T) {
	lines := genuineLines(t, "records-f64a79f.jsonl")
	b4 := lines[0]
	b7 := lines[3]
	requireDamaged(t, "lacks gas, timing_check, which a record version 2 always has", []string{"B4"}, b4, versioned(t, b7, "2"))
	requireDamaged(t, "record version 4 is newer than this program reads (up to 3)", []string{"B4"}, b4, versioned(t, b7, "4"))
	requireDamaged(t, "record version 1 was never written", []string{"B4"}, b4, versioned(t, b7, "1"))
	requireDamaged(t, "record version -2 was never written", []string{"B4"}, b4, versioned(t, b7, "-2"))

	// This writer's record lacking what version 2 always writes.
	ck := unexplainedCheck(t, false)
	rec, err := setup.NewRecord(ck, "B9", "ab", at(10, 0))
	require.NoError(t, err)
	noGas := rec
	noGas.Gas = nil
	requireDamaged(t, "lacks gas, which a record version 2 always has", []string{"B4"}, b4, v2Line(t, noGas))
	requireDamaged(t, "lacks gas, which a record version 3 always has", []string{"B4"}, b4, recordLine(t, noGas))
	explained := wardRecord(t, "B5", at(10, 0), 21, 0)
	explained.Watch = nil
	requireDamaged(t, "lacks watch, which a record version 2 always has", []string{"B4"}, b4, v2Line(t, explained))
	explained.Watch, explained.TimingCheck = wardRecord(t, "B5", at(10, 0), 21, 0).Watch, nil
	requireDamaged(t, "lacks timing_check, which a record version 2 always has", []string{"B4"}, b4, v2Line(t, explained))

	// The compact writer (version 3) never writes what the reader puts
	// back: a line of it that carries one was not written by it.
	compact := recordLine(t, wardRecord(t, "B5", at(10, 0), 21, 0))
	for _, extra := range []string{`"clinical_caution":"calm"`, `"watch":{}`, `"timing_check":{}`, `"figures_withheld":"x"`} {
		requireDamaged(t, "which a record version 3 never writes", []string{"B4"}, b4, strings.TrimSuffix(compact, "}")+","+extra+"}")
	}
}

// v2Line is rec as the version 2 writer wrote it: every key, nulls too.
func v2Line(t *testing.T, rec setup.Record) string {
	t.Helper()
	rec.WriterVersion = logbook.RecordV2
	b, err := json.Marshal(rec)
	require.NoError(t, err)
	return string(b)
}

// Taking a version 2 record's "record" key out with its STOP does not
// make it read calm: as a version 1 record it reads, with the stop its
// readings call for added back.
func TestADowngradedRecordReadsNoCalmer(t *testing.T) {
	ck := unexplainedCheck(t, false)
	rec, err := setup.NewRecord(ck, "B9", "ab", at(10, 0))
	require.NoError(t, err)
	require.Equal(t, setup.Stop, setup.Highest(rec.Cautions))
	rec.Cautions = nil
	line := v2Line(t, rec)
	require.Contains(t, line, `"record":2,`)
	v1 := strings.Replace(line, `"record":2,`, "", 1)
	recs, sum := historyOf(t, versionLog(t, v1))
	require.Zero(t, sum.Damaged, "%v", sum.Problems)
	got := recs["B9"]
	require.Equal(t, setup.Stop, setup.Highest(got.Cautions))
	// MHRA RMVS001 2020: the 120 cmH2O reading is above 40.
	c := cautionOf(got, "measured-peak-high")
	require.NotNil(t, c)
	require.InDelta(t, 120, c.Value, 1e-9)
	require.NotNil(t, cautionOf(got, "readings-unexplained"))
}

// AppendRecord writes this writer's version, after the initials, so that
// a reader still finds format, time and bed first.
func TestAppendRecordWritesItsVersion(t *testing.T) {
	path := filepath.Join(t.TempDir(), "log.jsonl")
	rec := wardRecord(t, "B4", at(10, 0), 21, 0)
	require.Zero(t, rec.WriterVersion)
	require.NoError(t, logbook.AppendRecord(path, rec))
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	require.True(t, strings.HasPrefix(string(b), `{"format":"crankside-check/1","time":"2026-12-01T10:00:00Z","bed":"B4","initials":"AB","record":3,`), "%.120s", b)
	recs, sum := historyOf(t, path)
	require.Zero(t, sum.Damaged)
	require.Equal(t, logbook.RecordV3, recs["B4"].WriterVersion)
}
