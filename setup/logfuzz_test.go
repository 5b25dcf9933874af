package setup

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

func FuzzReadLog(f *testing.F) {
	good, _ := json.Marshal(Record{Format: RecordFormat, Bed: "B4", Initials: "AB"})
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
			if r.Format != RecordFormat {
				t.Fatalf("accepted a record of format %q", r.Format)
			}
		}
	})
}
