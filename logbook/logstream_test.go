package logbook_test

import (
	"fmt"
	"math/rand"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

// messyLog writes n records of beds B1..Bbeds in a shuffled order, with
// junk, torn, over-long and undecodable lines among them, some records
// re-spaced (so the quick look at a line fails and it is decoded) and
// some with the bed label written with a JSON escape ("\u0042" for "B").
func messyLog(t *testing.T, path string, n, beds int, seed int64) {
	rng := rand.New(rand.NewSource(seed))
	var lines []string
	base := sampleRecord(t, "B1", 0)
	for i := 0; i < n; i++ {
		bed := fmt.Sprintf("B%d", rng.Intn(beds)+1)
		rec := restamp(base, bed, at(0, 0).Add(time.Duration(rng.Intn(2000))*time.Minute), float64(18+rng.Intn(5)), setup.Level(rng.Intn(4)))
		line := recordLine(t, rec)
		switch rng.Intn(10) {
		case 0:
			line = strings.Replace(line, `"bed":"`, `"bed" : "`, 1)
		case 1:
			line = strings.Replace(line, `"bed":"B`, `"bed":"\u0042`, 1)
		case 2:
			line = line[:rng.Intn(len(line))] // torn by a crash
		case 3:
			line = strings.Replace(line, `"level":"`, `"level":"x`, 1) // no longer decodes if it had a caution
		}
		lines = append(lines, line+"\n")
		if rng.Intn(20) == 0 {
			lines = append(lines, []string{"\x00\x01junk\n", "{}\n", strings.Repeat("z", logbook.MaxRecordBytes+5) + "\n", "\n"}[rng.Intn(4)])
		}
	}
	writeLog(t, path, lines...)
}

// TestStreamReaderMatchesWholeFileReader is a property: on the same
// files, the streaming readers (ReadHistories, ReadBedHistory, WardRows)
// give the same entries as reading every record with ReadLog and
// grouping them with History, which decodes every line.
func TestStreamReaderMatchesWholeFileReader(t *testing.T) {
	for seed := int64(1); seed <= int64(logSize(2, 6)); seed++ {
		path := filepath.Join(t.TempDir(), "messy.jsonl")
		messyLog(t, path, 400, 7, seed)
		recs, _, err := logbook.ReadLog(path)
		require.NoError(t, err)
		whole := logbook.History(recs, "") // oldest first, every record decoded

		streamed, _, err := logbook.ReadHistories([]string{path}, "", 0)
		require.NoError(t, err)
		require.Equal(t, len(whole), len(streamed), "seed %d: beds", seed)
		lastOf := map[string]setup.Record{}
		for i, w := range whole {
			s := streamed[i]
			require.Equal(t, w.Bed, s.Bed, "seed %d", seed)
			require.Equal(t, len(w.Entries), len(s.Entries), "seed %d bed %s", seed, w.Bed)
			for j := range w.Entries {
				// Records written with a caution level share a second and a
				// setting only by chance; equal times keep file order in both.
				k := len(s.Entries) - 1 - j
				require.Equal(t, w.Entries[j].Record, s.Entries[k].Record, "seed %d bed %s entry %d", seed, w.Bed, j)
				require.Equal(t, w.Entries[j].Changes, s.Entries[k].Changes)
			}
			lastOf[w.Bed] = w.Entries[len(w.Entries)-1].Record

			one, _, err := logbook.ReadBedHistory([]string{path}, w.Bed, 5)
			require.NoError(t, err)
			require.Equal(t, min(5, len(w.Entries)), len(one.Entries))
			require.Equal(t, len(w.Entries), one.Total)
			for j, e := range one.Entries {
				require.Equal(t, w.Entries[len(w.Entries)-1-j].Record, e.Record, "seed %d bed %s newest %d", seed, w.Bed, j)
			}
		}

		// Now is after every record (none is from the future).
		rows, _, err := logbook.WardRows([]string{path}, at(0, 0).Add(2001*time.Minute), 0)
		require.NoError(t, err)
		require.Len(t, rows, len(lastOf), "seed %d", seed)
		for _, r := range rows {
			require.Equal(t, lastOf[r.Bed], r.Record, "seed %d bed %s: the ward row is the bed's newest record", seed, r.Bed)
		}
	}
}

// TestReadLogOnJunkKeepsAFewProblemsAndCountsTheRest writes 4 MB (50 MB
// under -logs.large) of junk around three good records: the readers keep at most
// MaxProblemsKept problems whatever the junk, count every damaged line,
// and lose no record.
func TestReadLogOnJunkKeepsAFewProblemsAndCountsTheRest(t *testing.T) {
	path := filepath.Join(t.TempDir(), "junk.jsonl")
	junkLines := writeJunkLog(t, path, logSize(4<<20, 50<<20))
	recs, problems, err := logbook.ReadLog(path)
	require.NoError(t, err)
	require.Len(t, recs, 3)
	require.Len(t, problems, logbook.MaxProblemsKept+1, "five problems, then how many more")
	require.Equal(t, fmt.Sprintf("and %d more damaged lines", junkLines-logbook.MaxProblemsKept), problems[logbook.MaxProblemsKept].String())

	h, sum, err := logbook.ReadBedHistory([]string{path}, "B1", 0)
	require.NoError(t, err)
	require.Len(t, h.Entries, 3)
	require.Len(t, sum.Problems, logbook.MaxProblemsKept)
	// Junk lines that do not hold "B1" are still counted: none of them has
	// the shape of a record.
	require.Equal(t, junkLines, sum.Damaged)
	out := sum.Lines()
	require.Len(t, out, logbook.MaxProblemsKept+1)
	require.Equal(t, fmt.Sprintf("and %d more damaged lines", junkLines-logbook.MaxProblemsKept), out[len(out)-1])
	require.True(t, strings.HasPrefix(out[0], path+" line 1: "), out[0])

	rows, sum, err := logbook.WardRows([]string{path}, at(12, 0), 0)
	require.NoError(t, err)
	require.Len(t, rows, 1)
	require.Equal(t, at(9, 2), rows[0].CheckedAt)
	require.Equal(t, junkLines, sum.Damaged)
	require.Len(t, sum.Problems, logbook.MaxProblemsKept)
}

// writeJunkLog writes about size bytes: short binary junk lines, over-
// long lines, lines that look like JSON but are not records, and three
// good B1 records (09:00, 09:01, 09:02) spread among them. It returns the
// number of damaged lines written.
func writeJunkLog(tb testing.TB, path string, size int) int {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o600)
	require.NoError(tb, err)
	defer f.Close()
	long := strings.Repeat("x", logbook.MaxRecordBytes+100) + "\n"
	var b strings.Builder
	damaged, written, good := 0, 0, 0
	for written < size {
		b.Reset()
		for i := 0; i < 20000; i++ {
			b.WriteString("\x1b[2J junk \x00\n")
			damaged++
		}
		b.WriteString(long)
		b.WriteString(`{"format":"something-else","bed":"B1"}` + "\n")
		damaged += 2
		if good < 3 && written > good*size/3 {
			b.WriteString(recordLine(tb, wardRecord(tb, "B1", at(9, good), 20, setup.Warn)) + "\n")
			good++
		}
		n, err := f.WriteString(b.String())
		require.NoError(tb, err)
		written += n
	}
	require.Equal(tb, 3, good)
	return damaged
}

// The history reader decodes on every core; what it returns, counts and
// reports must not depend on how many there are. Checked on messy logs
// (damaged, torn and over-long lines, copies across two logs) against
// a read on one core, for all beds and for one.
func TestHistoryReadIsTheSameOnOneCoreAndOnMany(t *testing.T) {
	dir := t.TempDir()
	var paths []string
	for seed := int64(1); seed <= 3; seed++ {
		path := filepath.Join(dir, fmt.Sprintf("messy%d.jsonl", seed))
		messyLog(t, path, logSize(250, 700), 7, seed)
		paths = append(paths, path)
	}
	// A copy of the first log as a fourth terminal's: every record in it
	// is a duplicate, every damaged line counted again.
	data, err := os.ReadFile(paths[0])
	require.NoError(t, err)
	copyPath := filepath.Join(dir, "copy.jsonl")
	require.NoError(t, os.WriteFile(copyPath, data, 0o600))
	paths = append(paths, copyPath)

	read := func(procs int, bed string, limit int) ([]logbook.BedHistory, logbook.LogSummary) {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		hs, sum, err := logbook.ReadHistories(paths, bed, limit)
		require.NoError(t, err)
		return hs, sum
	}
	for _, c := range []struct {
		bed   string
		limit int
	}{{"", 0}, {"", 1}, {"B3", 0}, {"B3", 5}} {
		oneHs, oneSum := read(1, c.bed, c.limit)
		require.NotEmpty(t, oneHs)
		require.Positive(t, oneSum.Damaged)
		require.Positive(t, oneSum.Duplicates)
		for _, procs := range []int{2, 4} {
			hs, sum := read(procs, c.bed, c.limit)
			require.Equal(t, oneHs, hs, "bed %q limit %d on %d cores", c.bed, c.limit, procs)
			require.Equal(t, oneSum, sum, "bed %q limit %d on %d cores", c.bed, c.limit, procs)
		}
	}
}
