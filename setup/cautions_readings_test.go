package setup

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
)

var oneCmH2O = physiology.Value{Value: 1, Source: "common practice"}

// The leak limits on the fitted compliance, just inside and just outside:
// 100 mL/cmH2O (from memory, REFERENCES version 3: an intubated adult's
// respiratory system rarely exceeds it) warns, 150 (common practice) stops.
func TestReadingsSuggestLeakLimits(t *testing.T) {
	cases := []struct {
		c     float64
		level Level // Note: no caution
		limit float64
		text  string
	}{
		{100, Note, 0, ""},
		{100.2, Warn, 100, "compliance of 100.2 mL/cmH2O, above 100"},
		{150, Warn, 100, "compliance of 150.0 mL/cmH2O, above 100"},
		{150.2, Stop, 150, "compliance of 150.2 mL/cmH2O, above 150"},
	}
	for _, k := range cases {
		m := &physiology.Mechanics{ComplianceMLPerCmH2O: k.c, ResistanceCmH2OPerLS: 9}
		cs := fitCautions(&physiology.Readings{PeakCmH2O: 12, EndCmH2O: 9}, m, 40, 0.5, 473, oneCmH2O)
		if k.level == Note {
			require.Empty(t, cs, "C %v", k.c)
			continue
		}
		require.Len(t, cs, 1, "C %v", k.c)
		got := cs[0]
		require.Equal(t, CautionReadingsSuggestLeak, got.ID)
		require.Equal(t, k.level, got.Level, "C %v", k.c)
		require.InDelta(t, k.c, got.Value, 0)
		require.InDelta(t, k.limit, got.Limit, 0)
		require.Contains(t, got.Message, k.text)
		require.Contains(t, got.Message, "473 mL is an upper bound")
		require.Contains(t, got.Advice, "cuff")
		require.Contains(t, got.Advice, "PEEP valve")
		require.Contains(t, got.Source, "from memory")
	}
}

// A measured peak within half a manometer step of the relief pressure
// (this machine's profile: 40 cmH2O; half of a 1 cmH2O step, common
// practice) is the relief valve venting; 0.1 cmH2O further out is not.
func TestMeasuredPeakAtReliefLimits(t *testing.T) {
	m := &physiology.Mechanics{ComplianceMLPerCmH2O: 22, ResistanceCmH2OPerLS: 49, EndOnly: true, RAtLeast: true}
	for _, k := range []struct {
		peak float64
		stop bool
	}{{39.4, false}, {39.5, true}, {40, true}, {40.5, true}, {40.6, false}} {
		cs := fitCautions(&physiology.Readings{PeakCmH2O: k.peak, EndCmH2O: 30}, m, 40, 0.5, 422, oneCmH2O)
		var at *Caution
		for i := range cs {
			if cs[i].ID == CautionMeasuredPeakAtRelief {
				at = &cs[i]
			}
		}
		require.Equal(t, k.stop, at != nil, "peak %v", k.peak)
		require.Equal(t, k.stop, PeakAtRelief(k.peak, 40, 0.5), "peak %v", k.peak)
		if at == nil {
			continue
		}
		require.Equal(t, Stop, at.Level)
		require.InDelta(t, k.peak, at.Value, 0)
		require.InDelta(t, 40, at.Limit, 0)
		require.Contains(t, at.Message, "the relief valve is venting: the breath is pressure-limited; the patient gets less than the hole delivers")
		require.Contains(t, at.Message, "compliance 22 mL/cmH2O from the end pressure")
		require.Contains(t, at.Message, "at least 49")
	}
	// No relief valve stated (0): never at the relief.
	require.False(t, PeakAtRelief(0.2, 0, 0.5))
}

// The leak's share of the stroke: above 10 % warns, above 30 % stops
// (common practice; 30 % is the loss at which a calibration is refused).
func TestLeakShareLimits(t *testing.T) {
	for _, k := range []struct {
		leaked float64 // mL of a 200 mL stroke
		level  Level   // Note: no caution
		limit  float64
		text   string
	}{
		{20, Note, 0, ""},
		{20.4, Warn, 10, "takes 20 mL of the 200 mL stroke (10 %), above 10 %"},
		{60, Warn, 10, "(30 %), above 10 %"},
		{60.4, Stop, 30, "takes 60 mL of the 200 mL stroke (30 %), above 30 %"},
	} {
		f := Figures{Hole: HoleFigure{EffectiveSweptML: 200}, LeakedML: k.leaked}
		cs := leakShareCautions(f)
		if k.level == Note {
			require.Empty(t, cs, "%v mL", k.leaked)
			continue
		}
		require.Len(t, cs, 1)
		require.Equal(t, CautionLeakShareOfStroke, cs[0].ID)
		require.Equal(t, k.level, cs[0].Level, "%v mL", k.leaked)
		require.InDelta(t, 100*k.leaked/200, cs[0].Value, 1e-9)
		require.InDelta(t, k.limit, cs[0].Limit, 0)
		require.Contains(t, cs[0].Message, k.text)
		require.Contains(t, cs[0].Advice, "find and fix the leak")
	}
}

// What a peak at the relief valve still tells, by what the fit found: a
// least resistance, the compliance alone, or no lung at all.
func TestPeakAtReliefSaysWhatTheReadingsTell(t *testing.T) {
	rd := &physiology.Readings{PeakCmH2O: 40, EndCmH2O: 30}
	cs := fitCautions(rd, &physiology.Mechanics{ComplianceMLPerCmH2O: 22, ResistanceCmH2OPerLS: 9, EndOnly: true}, 40, 0.5, 422, oneCmH2O)
	require.Len(t, cs, 1)
	require.Equal(t, "the manometer reads a peak of 40.0 cmH2O, within half a 1 cmH2O step of this machine's relief valve at 40: the relief valve is venting: the breath is pressure-limited; the patient gets less than the hole delivers; what the readings still tell: compliance 22 mL/cmH2O from the end pressure alone (the resistance is assumed; the peak cannot tell it)", cs[0].Message)
	require.Equal(t, "this machine's profile (relief pressure); manometer step: common practice", cs[0].Source)
	cs = fitCautions(rd, nil, 40, 0.5, 422, oneCmH2O)
	require.Len(t, cs, 1)
	require.Contains(t, cs[0].Message, "; no lung could be fitted to the end pressure either")
	require.Empty(t, fitCautions(nil, nil, 40, 0.5, 422, oneCmH2O), "no readings, no fit: nothing")
}

// The leak's share is judged only with a stroke and a leak.
func TestLeakShareNeedsAStrokeAndALeak(t *testing.T) {
	require.Empty(t, leakShareCautions(Figures{Hole: HoleFigure{EffectiveSweptML: 0}, LeakedML: 50}))
	require.Empty(t, leakShareCautions(Figures{Hole: HoleFigure{EffectiveSweptML: 200}, LeakedML: 0}))
	require.Empty(t, leakShareCautions(Figures{Hole: HoleFigure{EffectiveSweptML: -1}, LeakedML: 50}))
}

// A check's volumes are upper bounds when its readings suggest a leak or
// its peak sat at the relief valve, and what the patient gets otherwise.
func TestVolumeBoundNote(t *testing.T) {
	require.Equal(t, "", Check{}.VolumeBoundNote())
	leak := Check{Current: Evaluation{Cautions: []Caution{{ID: CautionPEEPLow}, {ID: CautionReadingsSuggestLeak, Level: Warn}}}}
	require.Equal(t, LeakVolumeNote, leak.VolumeBoundNote())
	relief := Check{Fitted: &physiology.Mechanics{EndOnly: true}}
	require.Equal(t, ReliefVolumeNote, relief.VolumeBoundNote())
	require.Equal(t, "", Check{Fitted: &physiology.Mechanics{}}.VolumeBoundNote())
	require.Equal(t, "at most ", AtMost(CheckJSON{VolumeUpperBound: true}))
	require.Equal(t, "", AtMost(CheckJSON{}))
}
