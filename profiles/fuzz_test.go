package profiles

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"

	"crankside/profiles/safetext"
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
			if _, _, found := safetext.FirstUnsafe(err.Error()); found {
				t.Fatalf("the message holds a character unsafe to print: %q", err.Error())
			}
			return
		}
		// No text accepted can act on a terminal or hide a character.
		texts := []string{p.ID, p.Label}
		for _, h := range p.Crank.Holes {
			texts = append(texts, h.Label)
		}
		for _, s := range texts {
			if r, _, found := safetext.FirstUnsafe(s); found {
				t.Fatalf("accepted text %q holding %U", s, r)
			}
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

func FuzzReadBench(f *testing.F) {
	f.Add([]byte(BenchHeader() + "\n5,50,5,20,318\n8,50,5,20,408\n"))
	f.Add([]byte(BenchHeader() + "\n99,50,abc,20,-1\n7,50\n\"unterminated\n"))
	f.Add([]byte("\xef\xbb\xbf" + BenchHeader() + "\r\n5,50,5,20,318\r\n"))
	f.Add([]byte{0, 1, 2, 0xff, '\n', ','})
	p, _, err := Open("demo-a", "")
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		pts, err := ReadBench(bytes.NewReader(data), "fuzz.csv", p)
		if err != nil {
			if !errors.Is(err, ErrBench) {
				t.Fatalf("refusal is not a bench error: %v", err)
			}
			return
		}
		for _, pt := range pts {
			if _, ok := p.HoleByLabel(pt.Hole); !ok || !(pt.MeasuredML > 0) || math.IsInf(pt.MeasuredML, 0) || !(pt.RPM > 0) {
				t.Fatalf("accepted a bad bench point %+v", pt)
			}
		}
	})
}
