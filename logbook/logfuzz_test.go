package logbook

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
	"time"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// wholeRecord is a check record as this program writes one: a real check
// of demo-a, so that the inputs added to the corpus are records the
// readers keep.
func wholeRecord(f *testing.F, bed string, at time.Time) setup.Record {
	f.Helper()
	p, _, err := profiles.Open("demo-a", "")
	if err != nil {
		f.Fatal(err)
	}
	ck, err := setup.RunCheck(setup.CheckRequest{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: "8", RPM: 21, DwellS: 1.4, PEEPCmH2O: 5}, Now: at}, p)
	if err != nil {
		f.Fatal(err)
	}
	rec, err := setup.NewRecord(ck, bed, "AB", at)
	if err != nil {
		f.Fatal(err)
	}
	return rec
}

func FuzzReadLog(f *testing.F) {
	good, _ := json.Marshal(wholeRecord(f, "B4", time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC)))
	f.Add(append(append(good, '\n'), good...))
	f.Add([]byte(string(good) + "\n{\"format\":\"crankside-check/1\",\"bed\""))
	f.Add([]byte("\x00\x01\x02\n\n\n" + strings.Repeat("x", 5000)))
	f.Add([]byte(`{"format":"crankside-check/1","cautions":[{"level":"loud"}]}` + "\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		recs, problems, err := readRecords(bytes.NewReader(data))
		if err != nil {
			t.Fatalf("a reader of bytes in memory failed: %v", err)
		}
		lines := bytes.Count(data, []byte("\n")) + 1
		if len(recs)+len(problems) > lines {
			t.Fatalf("%d records and %d problems from %d lines", len(recs), len(problems), lines)
		}
		for _, r := range recs {
			if r.Format != setup.RecordFormat {
				t.Fatalf("accepted a record of format %q", r.Format)
			}
		}
	})
}

// FuzzStreamMatchesWhole is a property: on the same bytes, the streaming
// readers keep the same records as decoding every line (ReadLog's
// reader), once duplicates (the same JSON on re-encoding) are dropped
// from the latter, and the ward's quick look picks each bed's newest.
func FuzzStreamMatchesWhole(f *testing.F) {
	rec := wholeRecord(f, "B4", time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC))
	good, _ := json.Marshal(rec)
	rec.Bed, rec.Time = "B5", rec.Time.Add(time.Minute)
	other, _ := json.Marshal(rec)
	f.Add([]byte(string(good) + "\n" + string(other) + "\n" + string(good) + "\n"))
	f.Add([]byte(string(good) + "\n" + strings.Replace(string(other), `"bed":"B5"`, `"bed":"B4","bed":"B5"`, 1) + "\n"))
	f.Add([]byte(strings.Replace(string(good), `"bed":"B4"`, `"b\u0065d":"B4","x":{"bed":"B9"}`, 1) + "\n"))
	f.Add([]byte(string(good[:40]) + "\n" + string(other) + "\n{}\n"))
	// The same record again with a field this program does not read: it
	// decodes to the same record, so it is a copy (a CI smoke run found it).
	f.Add([]byte(string(good) + "\n" + strings.TrimSuffix(string(good), "}") + `,"x":1}` + "\n"))
	// A line of the format with only a bed and a time is not a check: it
	// must not become the bed's last one.
	f.Add([]byte(string(good) + "\n" + `{"format":"crankside-check/1","bed":"B4","time":"2026-12-01T23:59:00Z"}` + "\n"))
	// An older record of the bed written lower case is one of its checks.
	f.Add([]byte(string(good) + "\n" + strings.Replace(string(other), `"bed":"B5"`, `"bed":"b4"`, 1) + "\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		recs, _, err := readRecords(bytes.NewReader(data))
		if err != nil {
			t.Fatal(err)
		}
		want := map[string][]setup.Record{} // newest first, duplicates once
		seen := map[string]bool{}
		for _, h := range History(recs, "") {
			for i := len(h.Entries) - 1; i >= 0; i-- {
				b, _ := json.Marshal(h.Entries[i].Record)
				if !seen[string(b)] {
					seen[string(b)] = true
					want[h.Bed] = append(want[h.Bed], h.Entries[i].Record)
				}
			}
		}
		var sum LogSummary
		hr := newHistoryReader("", 0, &sum)
		if err := scanLog(bytes.NewReader(data), "x", &sum, hr.visit("x", 0)); err != nil {
			t.Fatal(err)
		}
		got := hr.histories(0)
		if len(got) != len(want) {
			t.Fatalf("%d beds streamed, %d decoded", len(got), len(want))
		}
		for _, h := range got {
			w := want[h.Bed]
			if len(h.Entries) != len(w) {
				t.Fatalf("bed %q: %d entries streamed, %d decoded", h.Bed, len(h.Entries), len(w))
			}
			// Records at the same second may be ordered apart; compare
			// times in order, and the newest record itself when it alone
			// has the newest time.
			for i := range w {
				if !h.Entries[i].Record.Time.Equal(w[i].Time) {
					t.Fatalf("bed %q entry %d: time %v streamed, %v decoded", h.Bed, i, h.Entries[i].Record.Time, w[i].Time)
				}
			}
		}
		wr := newWardScan(time.Date(9999, 12, 31, 0, 0, 0, 0, time.UTC), &sum) // no record is from the future here
		if err := scanLog(bytes.NewReader(data), "x", &sum, wr.visit("x", 0)); err != nil {
			t.Fatal(err)
		}
		rows, exact := wr.rows(time.Time{}, time.Hour)
		if !exact {
			return // WardRows then decodes every line, as checked above
		}
		if len(rows) != len(want) {
			t.Fatalf("%d ward rows, %d beds", len(rows), len(want))
		}
		for _, r := range rows {
			if !r.CheckedAt.Equal(want[r.Bed][0].Time.UTC()) {
				t.Fatalf("bed %q: ward row at %v, newest record at %v", r.Bed, r.CheckedAt, want[r.Bed][0].Time)
			}
		}
	})
}
