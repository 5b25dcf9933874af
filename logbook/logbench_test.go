package logbook_test

import (
	"path/filepath"
	"testing"
	"time"

	"crankside/logbook"
)

// A 30-bed ward checked every 4 hours for a year is about 65 000 checks;
// 100 000 leaves room (issue 14's size). Targets (issue 14): a bed's
// history under 0.5 s and 60 MB, the ward rows under 1 s and 60 MB, on
// this 2-core machine. B/op is all the memory allocated in an op, most
// of it freed as it goes; peak memory is measured apart (see the README).
const benchRecords, benchBeds = 100_000, 30

func benchLog(b *testing.B) string {
	b.Helper()
	path := filepath.Join(b.TempDir(), "year.jsonl")
	writeLargeLog(b, path, benchRecords, benchBeds)
	return path
}

func BenchmarkBedHistory100k(b *testing.B) {
	path := benchLog(b)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		h, _, err := logbook.ReadBedHistory([]string{path}, "B7", 0)
		if err != nil || h.Total != benchRecords/benchBeds+1 { // derived: bed 7 of 30 gets ceil(100000/30) = 3334
			b.Fatalf("history: %v, %d checks", err, h.Total)
		}
	}
}

func BenchmarkBedHistory100kNewest12(b *testing.B) {
	path := benchLog(b)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		h, _, err := logbook.ReadBedHistory([]string{path}, "B7", 12)
		if err != nil || len(h.Entries) != 12 {
			b.Fatalf("history: %v, %d entries", err, len(h.Entries))
		}
	}
}

func BenchmarkWardRows100k(b *testing.B) {
	path := benchLog(b)
	now := genStart.Add(365 * 24 * time.Hour)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rows, _, err := logbook.WardRows([]string{path}, now, 0)
		if err != nil || len(rows) != benchBeds {
			b.Fatalf("ward: %v, %d rows", err, len(rows))
		}
	}
}

// BenchmarkReadLog100k is the whole-file reader on the same log, for
// comparison: every line decoded, every record held.
func BenchmarkReadLog100k(b *testing.B) {
	path := benchLog(b)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		recs, _, err := logbook.ReadLog(path)
		if err != nil || len(recs) != benchRecords {
			b.Fatalf("read: %v, %d records", err, len(recs))
		}
	}
}

// BenchmarkJunkLog50MB reads issue 12's 50 MB of junk lines.
func BenchmarkJunkLog50MB(b *testing.B) {
	path := filepath.Join(b.TempDir(), "junk.jsonl")
	damaged := writeJunkLog(b, path, 50<<20)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		recs, problems, err := logbook.ReadLog(path)
		if err != nil || len(recs) != 3 || len(problems) != logbook.MaxProblemsKept+1 {
			b.Fatalf("read: %v, %d records, %d problems", err, len(recs), len(problems))
		}
		rows, sum, err := logbook.WardRows([]string{path}, today, 0)
		if err != nil || len(rows) != 1 || sum.Damaged != damaged {
			b.Fatalf("ward: %v, %d rows, %d damaged", err, len(rows), sum.Damaged)
		}
	}
}
