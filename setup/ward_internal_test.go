package setup

import (
	"encoding/json"
	"testing"
	"time"
)

// BenchmarkQuickHeader is the per-line cost of the ward's quick look.
func BenchmarkQuickHeader(b *testing.B) {
	rec := Record{Format: RecordFormat, Time: time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC), Bed: "B7", Initials: "AB"}
	rec.MechanicsSource = "from memory: typical intubated adult values"
	rec.Cautions = []Caution{{ID: "calibration-missing", Level: Warn, Message: "this machine has no bench calibration: volumes are geometric, before leaks", Unit: "days", Advice: "measure the delivered volume at the bedside; calibrate on a test lung", Source: "common practice"}}
	rec.ClinicalCaution = ClinicalCaution
	line, err := json.Marshal(rec)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(line)))
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if bed, _, ok := quickHeader(line); !ok || bed != "B7" {
			b.Fatalf("quick look failed on %s", line)
		}
	}
}
