package setup

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/machine"
)

// The ti-not-reachable caution measures the Ti change against the Ti
// wanted: 100 x (Ti set - Ti wanted) / Ti wanted. A fixed motor under 20 %
// off is a note, from 20 % a warn (issue 10); a variable motor at its limit
// is a warn. Wanted Ti of 1.0 s hides a division swapped for a
// multiplication, so these use 0.8 s and 1.2 s (derived by hand):
//   - wanted 0.8 s, set 0.95 s: 100 x 0.15 / 0.8 = +18.75 % -> "+19%", note
//     (a multiplication would give 100 x 0.15 x 0.8 = 12 %);
//   - wanted 0.8 s, set 0.97 s: 100 x 0.17 / 0.8 = +21.25 % -> "+21%", warn
//     (multiplied: 13.6 %, a note);
//   - wanted 1.2 s, set 1.42 s: 100 x 0.22 / 1.2 = +18.33 % -> "+18%", note
//     (multiplied: 26.4 %, a warn);
//   - wanted 1.2 s, set 0.95 s: 100 x -0.25 / 1.2 = -20.83 % -> "-21%", warn;
//   - wanted 1.2 s, set 1.0 s: -16.67 % -> "-17%", note.
func TestFixedMotorTiChangeMeasuredAgainstTheWantedTi(t *testing.T) {
	cases := []struct {
		wantTi, setTi float64
		fixed         bool
		level         Level
		pct           string
	}{
		{0.8, 0.95, true, Note, "(+19%)"},
		{0.8, 0.97, true, Warn, "(+21%)"},
		{1.2, 1.42, true, Note, "(+18%)"},
		{1.2, 0.95, true, Warn, "(-21%)"},
		{1.2, 1.0, true, Note, "(-17%)"},
		{1.2, 1.42, false, Warn, "(+18%)"},
	}
	for _, c := range cases {
		a := clean()
		a.fixedMotor = c.fixed
		a.timing = &machine.TimingPlan{WantedTiS: c.wantTi, WantedRPM: 25, Speed: machine.SpeedLimited}
		a.f.Timing.TiS, a.f.Timing.RPM, a.f.Timing.IE = c.setTi, 20, 2
		got := find(assess(a), "ti-not-reachable")
		require.NotNil(t, got, "%+v", c)
		require.Equal(t, c.level, got.Level, "%+v", c)
		require.InDelta(t, c.setTi, got.Value, 1e-12)
		require.InDelta(t, c.wantTi, got.Limit, 1e-12)
		require.Contains(t, got.Message, c.pct, "%+v", c)
		require.Contains(t, got.Message, "needs 25.0 rpm; the motor is set to 20.0 rpm", "%+v", c)
	}
}
