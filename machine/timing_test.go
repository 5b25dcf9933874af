package machine

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
)

var (
	variable   = Motor{MinRPM: 8, MaxRPM: 40, StepRPM: 0.5}
	controller = Controller{DwellStepS: 0.1, MaxDwellS: 10}
)

func TestTimingRoundsToTheMachinesSteps(t *testing.T) {
	// 12/min lasts 5 s (common practice); I:E 1:2 gives Ti 5/3 s, a turn of
	// 10/3 s = 18 rpm, and a dwell of 5 - 10/3 = 1.667 s -> 1.7 s on a 0.1 s step.
	tp, err := PlanTiming(variable, controller, math.Pi, 12, 2)
	require.NoError(t, err)
	require.Equal(t, Reached, tp.Speed)
	require.Equal(t, Reached, tp.Rate)
	require.InDelta(t, 18, tp.RPM, 1e-9)
	require.InDelta(t, 1.7, tp.DwellS, 1e-9)
	// Recomputed from the rounded values (derived): period 10/3 + 1.7 =
	// 151/30 s = 5.0333 s, rate 60 x 30/151 = 1800/151 = 11.9205/min; Te
	// 151/30 - 50/30 = 101/30 = 3.3667 s; I:E 1:(101/30)/(50/30) = 1:2.02.
	require.InDelta(t, 11.920529801, tp.RateBPM, 1e-9)
	require.InDelta(t, 1.666666667, tp.TiS, 1e-9)
	require.InDelta(t, 3.366666667, tp.TeS, 1e-9)
	require.InDelta(t, 2.02, tp.IE, 1e-9)
	require.InDelta(t, 5.0/3, tp.WantedTiS, 1e-9)
}

func TestTimingSpeedOnTheStep(t *testing.T) {
	// 14/min, 1:2: Ti 1.4286 s, turn 2.857 s = 21 rpm exactly; 15/min, 1:2:
	// 22.5 rpm; 13/min 1:2: 19.5 rpm; 16/min 1:2.5: Ti 1.0714 s, 28 rpm.
	for _, c := range []struct{ rate, ie, rpm float64 }{{14, 2, 21}, {15, 2, 22.5}, {13, 2, 19.5}, {16, 2.5, 28}} {
		tp, err := PlanTiming(variable, controller, math.Pi, c.rate, c.ie)
		require.NoError(t, err)
		require.InDelta(t, c.rpm, tp.RPM, 1e-9, "rate %v I:E 1:%v", c.rate, c.ie)
		require.True(t, variable.Settable(tp.RPM))
		require.True(t, controller.Settable(tp.DwellS))
	}
	// 17/min 1:2: 25.5 rpm wanted exactly; 17.3/min 1:2: 25.95 -> 26.0 rpm.
	tp, err := PlanTiming(variable, controller, math.Pi, 17.3, 2)
	require.NoError(t, err)
	require.InDelta(t, 26.0, tp.RPM, 1e-9)
}

func TestFixedMotorOnlySetsDwell(t *testing.T) {
	m := FixedMotor(20) // a turn of 3 s, Ti 1.5 s
	tp, err := PlanTiming(m, controller, math.Pi, 12, 2)
	require.NoError(t, err)
	require.InDelta(t, 20, tp.RPM, 0)
	require.InDelta(t, 1.5, tp.TiS, 1e-12)
	require.InDelta(t, 2.0, tp.DwellS, 1e-9) // 5 s - 3 s
	require.InDelta(t, 12, tp.RateBPM, 1e-9)
	require.InDelta(t, 3.5/1.5, tp.IE, 1e-9)
	// 12/min at 1:2 wants 18 rpm: the fixed 20 rpm is outside its one-speed range.
	require.Equal(t, SpeedLimited, tp.Speed)
	require.Equal(t, Reached, tp.Rate)
}

func TestTiOutsideTheMotorsRangeUsesTheNearest(t *testing.T) {
	// 6/min at 1:2 wants Ti 3.33 s: a turn of 6.67 s = 9 rpm is fine; 5/min at
	// 1:3 wants Ti 3 s, a 6 s turn, 10 rpm, fine; 4/min at 1:1 wants Ti 7.5 s,
	// a 15 s turn = 4 rpm: below 8 rpm, so 8 rpm (Ti 3.75 s) with a longer dwell.
	tp, err := PlanTiming(variable, controller, math.Pi, 4, 1)
	require.NoError(t, err)
	require.Equal(t, SpeedLimited, tp.Speed)
	require.InDelta(t, 8, tp.RPM, 0)
	require.InDelta(t, 3.75, tp.TiS, 1e-12)
	require.InDelta(t, 7.5, tp.DwellS, 1e-9) // 15 s - 7.5 s turn
	require.InDelta(t, 4, tp.RateBPM, 1e-9)
}

func TestRateTheMotorCannotReach(t *testing.T) {
	// A fixed 20 rpm turn lasts 3 s: 25/min (2.4 s per breath) cannot be run.
	tp, err := PlanTiming(FixedMotor(20), controller, math.Pi, 25, 2)
	require.NoError(t, err)
	require.Equal(t, TooFast, tp.Rate)
	require.InDelta(t, 0, tp.DwellS, 0)
	require.InDelta(t, 20, tp.RateBPM, 1e-9) // the fastest it can do
	// The variable motor tops out at 40 rpm: 1.5 s per turn, so 45/min is out.
	tp, err = PlanTiming(variable, controller, math.Pi, 45, 1)
	require.NoError(t, err)
	require.Equal(t, TooFast, tp.Rate)
	require.InDelta(t, 40, tp.RPM, 0)
	// Too slow: a 10 s maximum dwell on a fixed 20 rpm motor gives 13 s at most.
	tp, err = PlanTiming(FixedMotor(20), controller, math.Pi, 4, 2)
	require.NoError(t, err)
	require.Equal(t, TooSlow, tp.Rate)
	require.InDelta(t, 10, tp.DwellS, 1e-9)
	require.InDelta(t, 60/13.0, tp.RateBPM, 1e-9)
}

func TestSpeedRaisedWhenNearestStepLeavesNoDwell(t *testing.T) {
	// 1:1 at 19.9/min: turn wanted = 60/19.9 s = 19.9 rpm, nearest step 20.0
	// rpm fits. At 19.8/min the nearest step is 20 rpm too. Build a case where
	// rounding goes down: 1:1 at 19.7/min wants 19.7 rpm -> 19.5 rpm, a turn
	// longer than the period; the next faster step, 20 rpm, is used.
	tp, err := PlanTiming(variable, controller, math.Pi, 19.7, 1)
	require.NoError(t, err)
	require.True(t, tp.Raised)
	require.InDelta(t, 20, tp.RPM, 0)
	require.GreaterOrEqual(t, tp.DwellS, 0.0)
	// Derived: the period is 60/19.7 = 3.0457 s and the 20 rpm turn 3 s, so
	// the dwell of 0.0457 s rounds to 0.0 on the 0.1 s step and the machine
	// runs 60/3 = 20/min at 1:1.
	require.InDelta(t, 0, tp.DwellS, 1e-9)
	require.InDelta(t, 20, tp.RateBPM, 1e-9)
	require.InDelta(t, 1, tp.IE, 1e-9)
}

func TestIEIsNeverInverse(t *testing.T) {
	_, err := PlanTiming(variable, controller, math.Pi, 12, 0.5)
	require.ErrorIs(t, err, ErrTiming)
	for rate := 8.0; rate <= 40; rate += 0.7 {
		for _, ie := range []float64{1, 1.5, 2, 3, 4} {
			tp, err := PlanTiming(variable, controller, math.Pi, rate, ie)
			require.NoError(t, err)
			require.GreaterOrEqual(t, tp.IE, 1.0-1e-9, "rate %v ie %v", rate, ie)
			require.GreaterOrEqual(t, tp.DwellS, 0.0)
			require.True(t, variable.Settable(tp.RPM), "rpm %v", tp.RPM)
			require.True(t, controller.Settable(tp.DwellS), "dwell %v", tp.DwellS)
		}
	}
}

// A motor's speeds are counted from its lowest, which need not be a
// multiple of its step: from 8.3 rpm in 0.5 rpm steps, 8.8 and 9.3 are
// speeds and 9.0 is not (common practice: a controller's detents start at
// its lowest speed). A rate of 0, a motor whose lowest speed is 0 and a
// dwell timer with no step are refused before any timing is planned.
func TestTimingEdges(t *testing.T) {
	offset := Motor{MinRPM: 8.3, MaxRPM: 40, StepRPM: 0.5}
	require.True(t, offset.Settable(8.8))
	require.True(t, offset.Settable(9.3))
	require.False(t, offset.Settable(9.0))
	_, err := PlanTiming(variable, controller, math.Pi, 0, 2)
	require.ErrorIs(t, err, ErrTiming)
	require.ErrorContains(t, err, "rate 0 must be positive")
	_, err = PlanTiming(Motor{MinRPM: 0, MaxRPM: 40, StepRPM: 0.5}, controller, math.Pi, 12, 2)
	require.ErrorIs(t, err, ErrTiming)
	require.ErrorContains(t, err, "is not usable")
	_, err = PlanTiming(variable, Controller{DwellStepS: 0, MaxDwellS: 10}, math.Pi, 12, 2)
	require.ErrorIs(t, err, ErrTiming, "a dwell timer with no step")
	require.ErrorContains(t, err, "is not usable")
}

// The timing's tolerances are for float noise only: exactly on a limit is
// within it. An in-line crank delivers over half a turn (pi), so at I:E
// 1:1 a rate of N /min needs a turn of 60/N s, N rpm (derived): 8 /min is
// the variable motor's lowest speed and 40 /min its top, each reached, not
// limited, also a part in 1e12 beyond. A dwell that rounds to exactly the
// controller's longest (10 s) is reached (derived below). A fixed motor of
// one speed and a controller with no dwell at all are machines, and plan.
func TestTimingOnItsLimits(t *testing.T) {
	for _, rate := range []float64{8, 40, 8 * (1 - 1e-12), 40 * (1 + 1e-12)} {
		tp, err := PlanTiming(variable, controller, math.Pi, rate, 1)
		require.NoError(t, err)
		require.InEpsilon(t, rate, tp.WantedRPM, 1e-12, "the premise: on the limit but for float noise")
		require.Equal(t, Reached, tp.Speed, "rate %v", rate)
		require.Equal(t, Reached, tp.Rate, "rate %v", rate)
		require.InDelta(t, math.Round(rate), tp.RPM, 1e-9)
	}
	// 3 /min at I:E 1:3 on the variable motor: Ti 5 s, a turn of 10 s
	// wanted (6 rpm) is below 8 rpm, so 8 rpm (7.5 s a turn) and a dwell of
	// 20 - 7.5 = 12.5 s, above the longest 10 s: too slow. At 3.5 /min the
	// period is 17.142857 s, the dwell 9.642857 -> 9.6 s: reached. At
	// 60 / 17.5 = 3.428571 /min the dwell is exactly 10 s: reached.
	tp, err := PlanTiming(variable, controller, math.Pi, 60/17.5, 3)
	require.NoError(t, err)
	require.Equal(t, 10.0, tp.DwellS)
	require.Equal(t, Reached, tp.Rate)
	tp, err = PlanTiming(variable, controller, math.Pi, 3, 3)
	require.NoError(t, err)
	require.Equal(t, TooSlow, tp.Rate)

	tp, err = PlanTiming(Motor{MinRPM: 20, MaxRPM: 20}, controller, math.Pi, 12, 2)
	require.NoError(t, err, "a fixed motor (StepRPM 0)")
	require.Equal(t, 20.0, tp.RPM)
	tp, err = PlanTiming(variable, Controller{DwellStepS: 0.1, MaxDwellS: 0}, math.Pi, 20, 1)
	require.NoError(t, err, "a controller with no dwell")
	require.Equal(t, 0.0, tp.DwellS)
}

// fastestAtMost is the slowest settable speed whose turn fits the period,
// exactly on a speed included: a 1.5 s period fits the top 40 rpm, 3 s
// fits 20 rpm exactly (a step of the variable motor, and the fixed motor's
// one speed), and 3 s does not fit a fixed 19 rpm.
func TestFastestAtMostIncludesItsLimit(t *testing.T) {
	require.Equal(t, 40.0, variable.fastestAtMost(1.5))
	require.Equal(t, 20.0, variable.fastestAtMost(3))
	require.Equal(t, 20.0, FixedMotor(20).fastestAtMost(3))
	require.Equal(t, 0.0, FixedMotor(19).fastestAtMost(3))
	require.Equal(t, 0.0, variable.fastestAtMost(1.4))
}

// The settable checks forgive float noise up to 1e-9 on each side of the
// range, that margin included: a speed or dwell computed by adding steps
// can miss its mark by a few ulps (clean), and a tolerance that excluded
// its own edge would refuse one at random.
func TestSettableForgivesItsOwnMargin(t *testing.T) {
	require.True(t, variable.Settable(8-1e-9))
	require.True(t, variable.Settable(40+1e-9))
	require.False(t, variable.Settable(8-1e-6))
	require.True(t, controller.Settable(-1e-9))
	require.True(t, controller.Settable(10+1e-9))
	require.False(t, controller.Settable(10.1))
}
