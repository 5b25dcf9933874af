package logbook

import (
	"bytes"
	"encoding/json"
	"testing"
	"time"

	"crankside/setup"
)

// BenchmarkLineHeader is the per-line cost of the ward's quick look.
func BenchmarkLineHeader(b *testing.B) {
	rec := setup.Record{Format: setup.RecordFormat, Time: time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC), Bed: "B7", Initials: "AB"}
	rec.MechanicsSource = "from memory: typical intubated adult values"
	rec.Cautions = []setup.Caution{{ID: "calibration-missing", Level: setup.Warn, Message: "this machine has no bench calibration: volumes are geometric, before leaks", Unit: "days", Advice: "measure the delivered volume at the bedside; calibrate on a test lung", Source: "common practice"}}
	rec.ClinicalCaution = setup.ClinicalCaution
	line, err := json.Marshal(rec)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(line)))
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if bed, _, ok := lineHeader(line); !ok || string(bed) != "B7" {
			b.Fatalf("quick look failed on %s", line)
		}
	}
}

// containsFoldASCII agrees with the standard library's answer (upper-case
// both, then bytes.Contains) on every short text and label over a small
// alphabet, where case and overlap matter most.
func TestContainsFoldASCIIAgreesWithTheStandardLibrary(t *testing.T) {
	alphabet := []byte("bB4-x")
	var all [][]byte
	var gen func(prefix []byte, n int)
	gen = func(prefix []byte, n int) {
		all = append(all, append([]byte(nil), prefix...))
		if n == 0 {
			return
		}
		for _, c := range alphabet {
			gen(append(prefix, c), n-1)
		}
	}
	gen(nil, 5)
	for _, text := range all {
		for _, label := range all[1:32] {
			want := bytes.Contains(bytes.ToUpper(text), bytes.ToUpper(label))
			if got := containsFoldASCII(text, label); got != want {
				t.Fatalf("containsFoldASCII(%q, %q) = %v, the standard library says %v", text, label, got, want)
			}
		}
	}
}
