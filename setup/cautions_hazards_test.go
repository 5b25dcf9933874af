package setup

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/machine"
	"crankside/physiology"
)

// hazardous is clean() with a flowmeter of 15 L/min (common practice) and
// a hole that is not the smallest.
func hazardous() assessment {
	a := clean()
	tp := *a.timing
	a.timing = &tp
	a.hz = hazards{maxO2FlowLPerMin: 15, maxO2FlowSource: srcFlowmeter, smallestHoleMLPerKg: 3, smallestHoleLabel: "1"}
	a.f.Hole.EffectiveSweptML = 500
	a.f.CylinderReserveBar, a.f.CylinderEmptyMinutes = 40, 400
	return a
}

func TestEachHazardAtItsLimit(t *testing.T) {
	cases := []struct {
		id             CautionID
		source         string
		level          Level
		over, inside   func(a *assessment)
		wantInMessage  []string
		wantInAdvice   string
		wantValueLimit [2]float64
	}{
		// Common practice: a unit that cannot sense a breath needs a
		// passive patient.
		{CautionPatientTriggering, "common practice", Stop,
			func(a *assessment) { a.hz.breathingAgainst = true }, func(a *assessment) { a.hz.breathingAgainst = false },
			[]string{"breathing against the unit", "readings are not valid"}, "sedation or another ventilator", [2]float64{0, 0}},
		// Common practice: flowmeters top out at 15 L/min. At 15 L/min into
		// a piston drawing 500 mL x 14 /min = 7 L/min, FiO2 is 1.00 (all
		// oxygen); at 30 /min, 15 L/min: 0.21 + 0.79 x 15/15 = 1.00, so
		// the case below uses 40 /min: 20 L/min drawn, 0.21 + 0.79 x 0.75
		// = 0.8025 (derived from the bleed formula).
		{CautionO2FlowAboveFlowmeter, "common practice", Stop,
			func(a *assessment) { a.f.Timing.RateBPM = 40; a.f.O2FlowLPerMin = 15.01; a.f.FiO2 = 1 },
			func(a *assessment) { a.f.O2FlowLPerMin = 15 },
			[]string{"15.0 L/min for FiO2 1.00", "maximum 15 L/min", "reaches only 0.80"}, "accept FiO2 0.80", [2]float64{15.01, 15}},
		// Common practice: more than a fifth off the target is another
		// tidal volume.
		{CautionNoSuitableHole, "common practice", Stop,
			func(a *assessment) { a.offTargetPct = 20.01 }, func(a *assessment) { a.offTargetPct = 20 },
			[]string{"+20% off the target", "more than 20%"}, "do not use", [2]float64{20.01, 20}},
		{CautionNoSuitableHole, "common practice", Stop,
			func(a *assessment) { a.offTargetPct = -20.01 }, func(a *assessment) { a.offTargetPct = -20 },
			[]string{"-20% off the target"}, "do not use", [2]float64{-20.01, 20}},
		// ARDS Network 2000: 4-8 mL/kg PBW; the smallest hole above 8.
		{CautionNoSuitableHole, "ARDS Network 2000", Stop,
			func(a *assessment) { a.hz.smallestHoleMLPerKg = 8.01 }, func(a *assessment) { a.hz.smallestHoleMLPerKg = 8 },
			[]string{"smallest hole (1) gives 8.0 mL/kg PBW, above 8"}, "a ventilator that can give 4-8", [2]float64{8.01, 8}},
		// The 10 % warn stays below the 20 % stop.
		{CautionHoleOffTarget, "common practice", Warn,
			func(a *assessment) { a.offTargetPct = 10.01 }, func(a *assessment) { a.offTargetPct = 10 },
			[]string{"+10% off the target"}, "review the target", [2]float64{10.01, 10}},
		// Common practice: a reserve of about a fifth of a full cylinder;
		// under 2 hours to it is low.
		{CautionO2CylinderLow, "common practice", Warn,
			func(a *assessment) { a.f.CylinderMinutes = 119.9 }, func(a *assessment) { a.f.CylinderMinutes = 120 },
			[]string{"reserve of 40 bar in 120 min", "(under 2 hours)", "empty in 400 min", "FiO2 falls to 0.21"}, "change it at the reserve", [2]float64{119.9, 120}},
		// Devine 1974: the formula starts at 60 in = 152.4 cm.
		{CautionHeightBelowFormula, "Devine 1974", Warn,
			func(a *assessment) { a.heightCm = 152.3 }, func(a *assessment) { a.heightCm = 152.4 },
			[]string{"152.3 cm is below 152.4 cm", "for adults"}, "made for them", [2]float64{152.3, 152.4}},
	}
	for _, c := range cases {
		t.Run(string(c.id)+"/"+c.source, func(t *testing.T) {
			a := hazardous()
			c.over(&a)
			got := find(assess(a), c.id)
			require.NotNil(t, got, "%s (%s) must appear", c.id, c.source)
			require.Equal(t, c.level, got.Level)
			for _, w := range c.wantInMessage {
				require.Contains(t, got.Message, w)
			}
			require.Contains(t, got.Advice, c.wantInAdvice)
			require.Contains(t, got.Source, c.source)
			require.InDelta(t, c.wantValueLimit[0], got.Value, 1e-9, "value")
			require.InDelta(t, c.wantValueLimit[1], got.Limit, 1e-9, "limit")

			b := hazardous()
			c.over(&b)
			c.inside(&b)
			if in := find(assess(b), c.id); in != nil && in.Level >= c.level {
				t.Errorf("%s must not be at level %v just inside its limit: %s", c.id, c.level, in.Message)
			}
		})
	}
}

func TestNoHazardWithoutItsInputs(t *testing.T) {
	// A zero hazards (a caller that knows no flowmeter, no lung) adds
	// nothing to a clean setting, even with a large O2 flow.
	a := clean()
	a.f.O2FlowLPerMin = 40
	require.Nil(t, find(assess(a), CautionO2FlowAboveFlowmeter))
	require.Empty(t, assess(hazardous()))
}

func TestCylinderAtItsReserveSaysSo(t *testing.T) {
	// 10 L x 40 bar = 400 L at 3 L/min: 133 min to empty (common practice:
	// gas = water capacity x pressure); at the 40-bar reserve: 0 min.
	f := Figures{CylinderGiven: true, O2FlowLPerMin: 3, CylinderMinutes: physiology.CylinderMinutesLeft(10, 40, 3)}
	applyCylinderReserve(&f, 10, 40, 40)
	require.InDelta(t, 0, f.CylinderMinutes, 1e-9)
	require.InDelta(t, 133.33, f.CylinderEmptyMinutes, 0.01)
	a := hazardous()
	a.f.CylinderGiven, a.f.O2FlowLPerMin = true, 3
	a.f.CylinderMinutes, a.f.CylinderEmptyMinutes, a.f.CylinderReserveBar = f.CylinderMinutes, f.CylinderEmptyMinutes, 40
	c := find(assess(a), CautionO2CylinderLow)
	require.NotNil(t, c)
	require.Contains(t, c.Message, "at or below its reserve of 40 bar")
	require.Contains(t, c.Message, "empty in 133 min")
	// 10 L x (100 - 40) bar = 600 L at 3 L/min: 200 min to the reserve.
	f = Figures{CylinderGiven: true, O2FlowLPerMin: 3, CylinderMinutes: physiology.CylinderMinutesLeft(10, 100, 3)}
	applyCylinderReserve(&f, 10, 100, 40)
	require.InDelta(t, 200, f.CylinderMinutes, 1e-9)
	require.InDelta(t, 333.33, f.CylinderEmptyMinutes, 0.01)
}

func TestHighVolumeAdviceKnowsTheSmallestHole(t *testing.T) {
	for _, c := range []struct {
		mlkg     float64
		smallest bool
		want     string
	}{
		{8.5, false, "consider a smaller hole"},
		{8.5, true, "this is the machine's smallest hole"},
		{10, false, "use a smaller hole"},
		{10, true, "do not use: this is the machine's smallest hole"},
	} {
		a := hazardous()
		a.f.Hole.MLPerKg = c.mlkg
		a.hz.noSmallerHole = c.smallest
		got := find(assess(a), CautionTidalVolumeHigh)
		require.NotNil(t, got)
		require.Contains(t, got.Advice, c.want, "%v mL/kg, smallest %v", c.mlkg, c.smallest)
		if c.smallest {
			require.NotContains(t, got.Advice, "smaller hole")
		}
	}
}

func TestLowVentilationAdviceFitsTheLung(t *testing.T) {
	// 14 /min x 4 mL/kg = 56 mL/kg/min, below 60 (common practice).
	for _, lung := range []physiology.Lung{physiology.Normal, physiology.ARDS, physiology.Obstructive} {
		a := hazardous()
		a.f.Hole.MLPerKg = 4
		a.f.Timing = machine.Timing{RateBPM: 14, TiS: 1.4}
		a.hz.lung = lung
		got := find(assess(a), CautionMinuteVentilationLow)
		require.NotNil(t, got)
		if lung == physiology.Obstructive {
			require.Contains(t, got.Advice, "accept a higher PaCO2 while the pH allows")
			require.Contains(t, got.Advice, "intrinsic PEEP")
			require.NotContains(t, got.Advice, "raise the rate")
		} else {
			require.Contains(t, got.Advice, "raise the rate or the volume")
		}
	}
}

func TestParseYesNo(t *testing.T) {
	for in, want := range map[string]bool{"yes": true, "Y": true, "true": true, " no ": false, "N": false, "false": false} {
		got, err := ParseYesNo(in)
		require.NoError(t, err, in)
		require.Equal(t, want, got, in)
	}
	_, err := ParseYesNo("maybe")
	require.ErrorContains(t, err, `"maybe" is not yes or no`)
}

// The time to the reserve of a cylinder already below it is 0, not
// negative; a cylinder not given or not drawn on (no flow: no end) keeps
// its time. Gas = water capacity x pressure (common practice): 10 L x 30
// bar at 3 L/min is 100 min to empty.
func TestCylinderReserveAtTheEdges(t *testing.T) {
	f := Figures{CylinderGiven: true, O2FlowLPerMin: 3, CylinderMinutes: physiology.CylinderMinutesLeft(10, 30, 3)}
	applyCylinderReserve(&f, 10, 30, 40)
	require.InDelta(t, 0, f.CylinderMinutes, 1e-9, "below the reserve: none left to it")
	require.InDelta(t, 100, f.CylinderEmptyMinutes, 1e-9)
	require.Equal(t, 40.0, f.CylinderReserveBar)
	f = Figures{CylinderGiven: false, CylinderMinutes: 77}
	applyCylinderReserve(&f, 10, 100, 40)
	require.Equal(t, 77.0, f.CylinderMinutes)
	f = Figures{CylinderGiven: true, CylinderMinutes: math.Inf(1)}
	applyCylinderReserve(&f, 10, 100, 40)
	require.True(t, math.IsInf(f.CylinderMinutes, 1))
}
