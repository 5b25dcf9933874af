package logbook_test

import (
	"path/filepath"
	"testing"
	"time"

	"crankside/logbook"
)

// The ward and a bed's history on 100 000 records as this program writes
// them now (the compact record, logbook.RecordVersion), beside the
// benchmarks of logbench_test.go on the first writers' lines. Issue 22's
// targets: log beds within 3x wc -l of the same file in CPU time, a bed's
// history under 60 MB whatever its length (measured with /usr/bin/time,
// see the README); here ns/op, B/op (all the memory allocated in an op,
// most of it freed as it goes) and allocs/op.

func currentWriterLog(b *testing.B) string {
	b.Helper()
	path := filepath.Join(b.TempDir(), "year-compact.jsonl")
	writeLargeLogAs(b, path, benchRecords, benchBeds, logbook.EncodeRecordLine)
	return path
}

func BenchmarkWardRows100kCurrentWriter(b *testing.B) {
	path := currentWriterLog(b)
	now := genStart.Add(365 * 24 * time.Hour)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rows, sum, err := logbook.WardRows([]string{path}, now, 0)
		if err != nil || len(rows) != benchBeds || sum.Damaged != 0 {
			b.Fatalf("ward: %v, %d rows, %d damaged", err, len(rows), sum.Damaged)
		}
	}
}

// BenchmarkBedHistory100kShown is log show --bed's read: the newest
// HistoryShown checks of the bed held, the rest counted.
func BenchmarkBedHistory100kShown(b *testing.B) {
	path := currentWriterLog(b)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		h, _, err := logbook.ReadBedHistory([]string{path}, "B7", logbook.HistoryShown)
		if err != nil || len(h.Entries) != logbook.HistoryShown || h.Total != benchRecords/benchBeds+1 { // derived: bed 7 of 30 gets ceil(100000/30) = 3334
			b.Fatalf("history: %v, %d entries of %d", err, len(h.Entries), h.Total)
		}
	}
}
