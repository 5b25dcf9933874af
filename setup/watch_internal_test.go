package setup

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/machine"
	"crankside/physiology"
)

// TestBandRule checks the band against hand derivations of its rule:
// half-width = 0.15 (P - PEEP) + 4 mL / C + step / 2 (ISO 80601-2-12:2020
// volume accuracy, from memory, on the pressure above PEEP; half the
// manometer's step), each end rounded outward to the step, within
// [0, ceiling].
func TestBandRule(t *testing.T) {
	cases := []struct {
		name                   string
		p, peep, c, step, ceil float64
		want                   [2]float64
	}{
		// derived: 0.15 x 10 + 0.5 = 2.0 -> [13, 17] exactly; no 4 mL term without C.
		{"share and half step", 15, 5, 0, 1, 40, [2]float64{13, 17}},
		// derived: 2.0 + 4/100 = 2.04 -> [12.96, 17.04] -> [12, 18]: the 4 mL term moves both ends.
		{"4 mL over C", 15, 5, 100, 1, 40, [2]float64{12, 18}},
		// derived: 1.425 + 4/60 + 0.5 = 1.9917 -> [12.508, 16.492] -> [12, 17].
		{"the 175 cm man's peak", 14.5, 5, 60, 1, 40, [2]float64{12, 17}},
		// derived: 1.5 + 1.0 = 2.5 -> [12.5, 17.5] -> to steps of 2: [12, 18].
		{"step of 2", 15, 5, 0, 2, 40, [2]float64{12, 18}},
		// derived: 0.15 x 33 + 0.5 = 5.45 -> [32.55, 43.45] -> [32, 44] -> capped at 40.
		{"capped at the ceiling", 38, 5, 0, 1, 40, [2]float64{32, 40}},
		// derived: 0.15 x 1 + 0.5 = 0.65 -> [-0.65+1, ...]: p 1, PEEP 0 -> [0.35, 1.65] -> [0, 2].
		{"floored at 0", 1, 0, 0, 1, 40, [2]float64{0, 2}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := band(c.p, bandHalfWidth(c.p, c.peep, c.c, c.step, false), c.step, c.ceil)
			require.InDeltaSlice(t, c.want[:], got[:], 1e-9, "band(%v, PEEP %v, C %v, step %v, ceiling %v)", c.p, c.peep, c.c, c.step, c.ceil)
			require.LessOrEqual(t, got[0], c.p, "the band contains its prediction")
			require.GreaterOrEqual(t, got[1], c.p, "the band contains its prediction")
		})
	}
}

// TestBandOnFittedReadings: with a lung fitted to the readings the band is
// the reading +/- one manometer step, rounded outward to the step (derived:
// half a step for each of two readings).
func TestBandOnFittedReadings(t *testing.T) {
	// derived: 20 +/- 1 -> [19, 21]; 20.2 +/- 0.5 -> [19.7, 20.7] -> steps of 0.5: [19.5, 21].
	got := band(20, bandHalfWidth(20, 5, 60, 1, true), 1, 40)
	require.InDeltaSlice(t, []float64{19, 21}, got[:], 1e-9)
	got = band(20.2, bandHalfWidth(20.2, 5, 60, 0.5, true), 0.5, 40)
	require.InDeltaSlice(t, []float64{19.5, 21}, got[:], 1e-9)
	// A fit reproduces a reading of 17 only to its tolerance: 17.0000004 is
	// on the mark (within a thousandth of a step), 17.01 is not.
	got = band(17.0000004, bandHalfWidth(17.0000004, 5, 60, 1, true), 1, 40)
	require.InDeltaSlice(t, []float64{16, 18}, got[:], 1e-9)
	got = band(17.01, bandHalfWidth(17.01, 5, 60, 1, true), 1, 40)
	require.InDeltaSlice(t, []float64{16, 19}, got[:], 1e-9)
}

func figuresAt(peak, end, peep float64) Figures {
	return Figures{PeakCmH2O: peak, EndInspCmH2O: end, PEEPCmH2O: peep, ComplianceMLPerCmH2O: 60,
		Timing: machine.TimingOf(21, 1.4, 3.141592653589793)}
}

var step1 = physiology.Value{Value: 1, Source: "test"}

// TestAlarmLimits walks each alarm rule just inside and just outside its
// limit (common practice per REFERENCES.md: high 10 above the usual peak,
// never above the relief valve or 40 (RMVS001 2020); low 5 below the peak
// and at least 2 above PEEP; high rounded down, low up, to whole cmH2O).
func TestAlarmLimits(t *testing.T) {
	cases := []struct {
		name             string
		peak, peep, rel  float64
		wantHigh, wantLo float64
	}{
		// derived: 14.5 + 10 = 24.5 -> 24; 14.5 - 5 = 9.5 -> 10 (above 5 + 2).
		{"ordinary", 14.5, 5, 40, 24, 10},
		// derived: 24.9 + 10 = 34.9 under relief 35 -> 34; 28 + 10 = 38 -> relief 35.
		{"just under the relief", 24.9, 5, 35, 34, 20},
		// low: band bottom 28 - (0.15 x 23 + 4/60 + 0.5) = 23.98 -> 23, so 1 below it, 22, under 28 - 5 = 23.
		{"capped by the relief", 28, 5, 35, 35, 22},
		// derived: 29.5 + 10 = 39.5 -> 39; 31 + 10 = 41 -> 40 (RMVS001), relief 45 above it.
		// low: bottoms 29.5 - 4.24 = 25.26 -> 25 and 31 - 4.47 = 26.53 -> 26, less 1: 24, 25.
		{"just under 40", 29.5, 5, 45, 39, 24},
		{"capped by 40", 31, 5, 45, 40, 25},
		{"no relief stated: 40 caps", 31, 5, 0, 40, 25},
		// derived: 12.5 - 5 = 7.5 -> 8 above 5 + 2 = 7; 10 - 5 = 5 -> PEEP + 2 = 7.
		{"low just above PEEP + 2", 12.5, 5, 40, 22, 8},
		{"low held at PEEP + 2", 10, 5, 40, 20, 7},
		// derived: PEEP 10: 16 - 5 = 11 -> 12 (PEEP + 2 wins).
		{"low held at PEEP + 2, PEEP 10", 16, 10, 40, 26, 12},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			w := watchOf(figuresAt(c.peak, c.peak-2, c.peep), c.rel, step1, false)
			require.Equal(t, c.wantHigh, w.AlarmHighCmH2O, "high alarm for peak %v, relief %v", c.peak, c.rel)
			require.Equal(t, c.wantLo, w.AlarmLowCmH2O, "low alarm for peak %v, PEEP %v", c.peak, c.peep)
			require.LessOrEqual(t, w.AlarmHighCmH2O, 40.0, "never above 40 (RMVS001 2020)")
			if c.rel > 0 {
				require.LessOrEqual(t, w.AlarmHighCmH2O, c.rel, "never above the relief valve")
			}
			require.Greater(t, w.AlarmLowCmH2O, c.peep, "the low alarm stays above PEEP")
		})
	}
}

// TestAlarmNotes: a limit that cannot keep its margin says so, with its numbers.
func TestAlarmNotes(t *testing.T) {
	// derived: peak 36, relief 40: high = min(46, 40) = 40; the band's top is
	// 36 + 0.15 x 31 + 4/60 + 0.5 = 41.2 -> capped 40: the alarm is not above it.
	w := watchOf(figuresAt(36, 30, 5), 40, step1, false)
	require.Len(t, w.Notes, 1)
	require.Contains(t, w.Notes[0], "the high alarm (40 cmH2O")
	require.Contains(t, w.Notes[0], "up to 40 cmH2O")
	// derived: peak 8, PEEP 5: band bottom 8 - (0.45 + 0.067 + 0.5) = 6.98 -> 6;
	// low = max(min(3, 5), 7) = 7, not below 6: note.
	w = watchOf(figuresAt(8, 7, 5), 40, step1, false)
	require.Len(t, w.Notes, 1)
	require.Contains(t, w.Notes[0], "the low alarm (7 cmH2O")
	require.Contains(t, w.Notes[0], "from 6 cmH2O")
	// derived: peak 9.7, PEEP 5: bottom 9.7 - (0.705 + 0.067 + 0.5) = 8.43 -> 8;
	// low 7 < 8, high 19 above the top 11: no note.
	w = watchOf(figuresAt(9.7, 9, 5), 40, step1, false)
	require.Empty(t, w.Notes)
	// derived: peak 8.6, PEEP 6.5: low = ceil(8.5) = 9; bottom 8.6 - (0.315 + 0.067 + 0.5) = 7.72 -> 7 < 9: note.
	w = watchOf(figuresAt(8.6, 8, 6.5), 40, step1, false)
	require.Len(t, w.Notes, 1)
	require.Contains(t, w.Notes[0], "the low alarm (9 cmH2O")
	require.Contains(t, w.Notes[0], "from 7 cmH2O")
	// derived: peak 24, relief 40: high 34, band top 24 + 2.85 + 0.07 + 0.5 = 27.4 -> 28 < 34: no note.
	w = watchOf(figuresAt(24, 20, 5), 40, step1, false)
	require.Empty(t, w.Notes)
	require.True(t, strings.Contains(srcAlarmHigh, "40"))
}

// TestHandTurnAndBag: 21 rpm and a 1.4 s dwell (demo-a's plan for the 175
// cm man): one turn 60 / 21 = 2.857 s, period 4.257 s, 14.09 /min, bag at
// 14 /min; 10 breaths 42.57 s (derived).
func TestHandTurnAndBag(t *testing.T) {
	f := figuresAt(14.5, 12.5, 5)
	w := watchOf(f, 40, step1, false)
	require.InDelta(t, 2.857, w.HandTurn.TurnS, 0.001)
	require.InDelta(t, 1.4, w.HandTurn.PauseS, 1e-9)
	require.InDelta(t, 14.094, w.HandTurn.BreathsPerMin, 0.001)
	require.Equal(t, 14.0, w.BagRateBPM)
	tc := timingCheckOf(f)
	require.InDelta(t, 42.571, tc.SecondsFor10Breaths, 0.001)
	// The line that says it is report.TimingLine's (report/watch_test.go).
}
