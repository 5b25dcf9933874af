package logbook_test

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

// genStart is when generated logs begin: invented data.
var genStart = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)

// writeLargeLog writes n records spread over beds beds (B1, B2, ...), one
// check every 4 hours per bed in turn, in time order, to a new 0600 file.
// The records are real checks on the demo profile (a few settings copied
// with a new bed and time): each line is as long as a real one. It writes
// directly rather than through AppendRecord, whose sync per record would
// make a 100 000-record log take minutes.
func writeLargeLog(tb testing.TB, path string, n, beds int) {
	tb.Helper()
	writeLargeLogAs(tb, path, n, beds, func(rec setup.Record) ([]byte, error) { return json.Marshal(rec) })
}

// writeLargeLogAs is writeLargeLog with each record's line as encode
// writes it (json.Marshal: the first writers' lines, with no "record"
// key; logbook.EncodeRecordLine: this writer's).
func writeLargeLogAs(tb testing.TB, path string, n, beds int, encode func(setup.Record) ([]byte, error)) {
	tb.Helper()
	var kinds []setup.Record
	for i, s := range []struct {
		hole       string
		rpm, dwell float64
	}{{"8", 21, 1.4}, {"7", 21, 1.4}, {"8", 20, 1.5}} {
		req := checkReq(s.hole, s.rpm, s.dwell)
		if i == 1 { // one kind carries a proposal, as many real checks do
			rpm := 20.0
			req.Proposal = setup.Proposal{RPM: &rpm}
		}
		ck, err := setup.RunCheck(req, profile(tb, "demo-a"))
		require.NoError(tb, err)
		rec, err := setup.NewRecord(ck, "B1", "ab", genStart.Add(time.Duration(i)*time.Second))
		require.NoError(tb, err)
		kinds = append(kinds, rec)
	}
	// Each kind is encoded once; a line is its kind's with the time and
	// bed of its header replaced (the writer writes them first, once), so
	// that a slow encoder does not make the log take minutes.
	header := func(rec setup.Record) []byte {
		return fmt.Appendf(nil, `"time":%q,"bed":%q,`, rec.Time.UTC().Format(time.RFC3339), rec.Bed)
	}
	var lines [][]byte
	for _, k := range kinds {
		line, err := encode(k)
		require.NoError(tb, err)
		require.True(tb, bytes.Contains(line, header(k)), "the header where the writer writes it")
		lines = append(lines, line)
	}
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o600)
	require.NoError(tb, err)
	w := bufio.NewWriterSize(f, 1<<20)
	step := 4 * time.Hour / time.Duration(beds)
	for i := 0; i < n; i++ {
		kind := (i / beds) % len(kinds)
		rec := kinds[kind]
		rec.Bed = fmt.Sprintf("B%d", i%beds+1)
		rec.Time = genStart.Add(time.Duration(i) * step).Truncate(time.Second)
		w.Write(bytes.Replace(lines[kind], header(kinds[kind]), header(rec), 1))
		w.WriteByte('\n')
	}
	require.NoError(tb, w.Flush())
	require.NoError(tb, f.Close())
}
