package setup

import (
	"testing"

	"github.com/stretchr/testify/require"
)

// The numbers inside the torque caution are the figures judged, not only
// its level: a motor rated 8.0 N m and a peak crank torque of 7.2 N m is
// 90 % of the rating (derived: 7.2 / 8.0 = 0.90), over the 80 % warning
// (common practice); 9.6 N m is 120 % (derived: 9.6 / 8.0 = 1.20), over
// the 100 % stop (the machine's profile).
func TestTorqueCautionSaysItsNumbers(t *testing.T) {
	for _, c := range []struct {
		peakNm, share float64
		level         Level
		message       string
		value, limit  float64
	}{
		{7.2, 0.90, Warn, "peak crank torque 7.2 N m is 90% of the motor's 8.0 N m rating (over 80%)", 90, 80},
		{9.6, 1.20, Stop, "peak crank torque 9.6 N m is 120% of the motor's 8.0 N m rating", 120, 100},
	} {
		a := clean()
		a.ratedTorque = 8
		a.f.PeakTorqueNm, a.f.TorqueShareOfRating = c.peakNm, c.share
		got := find(assess(a), CautionTorqueHigh)
		require.NotNil(t, got, "%.1f N m", c.peakNm)
		require.Equal(t, c.level, got.Level)
		require.Equal(t, c.message, got.Message)
		require.InDelta(t, c.value, got.Value, 1e-9, "%% of rating")
		require.InDelta(t, c.limit, got.Limit, 1e-9, "%% of rating")
		require.Equal(t, "% of rating", got.Unit)
	}
}
