package setup_test

import (
	"testing"

	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/stat"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// synthesize makes bench points through the breath model for a machine
// whose effective swept volume is k x swept + b (derived: the model is
// linear in the piston's amplitude).
func synthesize(t *testing.T, p profiles.Profile, k, b float64, rows []profiles.BenchPoint) []profiles.BenchPoint {
	t.Helper()
	gains, err := setup.BenchGains(p, rows)
	require.NoError(t, err)
	out := append([]profiles.BenchPoint(nil), rows...)
	for i := range out {
		out[i].MeasuredML = gains[i].Gain * (k*gains[i].SweptML + b)
	}
	return out
}

func benchRows(rpm float64, holes ...string) []profiles.BenchPoint {
	var rows []profiles.BenchPoint
	for i, h := range holes {
		rows = append(rows, profiles.BenchPoint{Hole: h, TestLungComplianceMLPerCmH2O: 30 + 10*float64(i),
			TestLungResistanceCmH2OPerLS: 5 + 5*float64(i%2), RPM: rpm, MeasuredML: 1})
	}
	return rows
}

func TestCalibrateRecoversAKnownLine(t *testing.T) {
	p := profile(t, "demo-a")
	pts := synthesize(t, p, 0.93, -9, benchRows(20, "4", "9", "14", "20"))
	res, err := setup.Calibrate(p, pts, "2026-11-30", today)
	require.NoError(t, err)
	require.InDelta(t, 0.93, res.K, 1e-9)
	require.InDelta(t, -9, res.BML, 1e-6)
	for _, pt := range res.Points {
		require.InDelta(t, 0, pt.ResidualML, 1e-3)
		require.True(t, pt.Within)
	}
	require.Empty(t, res.Cautions)
	require.Equal(t, 4, res.Holes)
}

func TestCalibrateMatchesGonumLinearRegression(t *testing.T) {
	// The fit is a least-squares line of effective (measured / model gain)
	// against geometric swept volume: recompute it with gonum directly.
	p := profile(t, "demo-b")
	pts := profile(t, "demo-b").Calibration.Points
	gains, err := setup.BenchGains(p, pts)
	require.NoError(t, err)
	var x, y []float64
	for i, g := range gains {
		x = append(x, g.SweptML)
		y = append(y, pts[i].MeasuredML/g.Gain)
	}
	b, k := stat.LinearRegression(x, y, nil, false)
	res, err := setup.Calibrate(p, pts, "2026-11-24", today)
	require.NoError(t, err)
	require.InDelta(t, k, res.K, 1e-12)
	require.InDelta(t, b, res.BML, 1e-9)
}

func TestCalibrationCautions(t *testing.T) {
	p := profile(t, "demo-a")
	// Two holes only, one point far off: both cautions.
	pts := synthesize(t, p, 1, 0, benchRows(20, "5", "12"))
	pts = append(pts, pts[0])
	pts[2].MeasuredML *= 1.5
	res, err := setup.Calibrate(p, pts, "", today)
	require.NoError(t, err)
	require.Equal(t, "2026-12-01", res.Date)
	require.True(t, hasCaution(res.Cautions, "calibration-residual"))
	require.True(t, hasCaution(res.Cautions, "calibration-thin"))
	_, err = setup.Calibrate(p, pts, "2027-01-01", today)
	require.ErrorIs(t, err, setup.ErrInput, "a date in the future is refused")
}

func TestPlanUsesTheNewCalibration(t *testing.T) {
	p := profile(t, "demo-a")
	pt := setup.Patient{HeightCm: 175, Sex: physiology.Male}
	before, err := setup.MakePlan(setup.Request{Patient: pt, Now: today}, p)
	require.NoError(t, err)
	res, err := setup.Calibrate(p, synthesize(t, p, 0.9, -10, benchRows(21, "5", "8", "12", "16")), "2026-11-30", today)
	require.NoError(t, err)
	after, err := setup.MakePlan(setup.Request{Patient: pt, Now: today}, res.Profile)
	require.NoError(t, err)
	// Every hole now delivers 0.9 x swept - 10 mL of effective volume.
	for i, h := range after.Holes {
		require.InDelta(t, 0.9*h.SweptML-10, h.EffectiveSweptML, 1e-6)
		require.Less(t, h.DeliveredML, before.Holes[i].DeliveredML)
	}
	require.False(t, hasCaution(after.Cautions, "calibration-missing"))
	require.True(t, hasCaution(before.Cautions, "calibration-missing"))
	// A weaker machine needs a larger hole for the same target.
	require.Greater(t, after.Hole.RadiusCm, before.Hole.RadiusCm)
}

func BenchmarkCalibrationFit(b *testing.B) {
	p := profile(b, "demo-b")
	pts := p.Calibration.Points
	for b.Loop() {
		if _, err := setup.Calibrate(p, pts, "2026-11-24", today); err != nil {
			b.Fatal(err)
		}
	}
}
