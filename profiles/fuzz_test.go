package profiles

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"
)

func FuzzParse(f *testing.F) {
	for _, name := range []string{"demo-a.json", "demo-b.json"} {
		data, err := os.ReadFile(filepath.Join("demo", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Add([]byte(`{"format":"crankside-profile/1","id":"x","id":"y"}`))
	f.Add([]byte(`{"crank":{"holes":[{"label":"1","radius_cm":1e308}]}}`))
	f.Add([]byte(`[[[[[[[[[[[[]]]]]]]]]]]]`))
	f.Fuzz(func(t *testing.T, data []byte) {
		p, err := Parse(data, "fuzz.json")
		if err != nil {
			if !errors.Is(err, ErrProfile) {
				t.Fatalf("refusal is not a profile error: %v", err)
			}
			return
		}
		// Whatever is accepted is finite, valid, and survives a round trip.
		for _, v := range []float64{p.Cylinder.BoreCm, p.Crank.RodCm, p.Crank.OffsetCm, p.Motor.MinRPM, p.Motor.MaxRPM, p.Motor.RPM} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("accepted a non-finite number: %+v", p)
			}
		}
		out, err := Marshal(p)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := Parse(out, "again.json"); err != nil {
			t.Fatalf("accepted profile does not parse again: %v", err)
		}
	})
}
