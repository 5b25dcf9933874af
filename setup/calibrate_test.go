package setup_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// synthesize makes bench points through the breath model's own gain
// (setup.BenchGains) for a machine whose effective swept volume is k x swept
// + b. Tests that use it are round trips: they check what follows the gain
// (the line, the plan's use of it), never the gain itself.
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
	// Bench volumes written by hand (derived) for a machine whose effective
	// swept volume is 0.93 x swept - 9 mL. demo-a: bore 10 cm (78.539816
	// cm2), circuit 1.5 mL/cmH2O; a bench breath from rest into a test lung
	// C ends at zero piston flow, so the lung takes C / (C + 1.5) of the
	// effective volume (derived: compliances in parallel).
	//   hole 4, r 2.0: swept 314.159, effective 283.168, C 30: x 0.952381 = 269.7
	//   hole 9, r 3.0: swept 471.239, effective 429.252, C 40: x 0.963855 = 413.7
	//   hole 14, r 4.0: swept 628.319, effective 575.336, C 50: x 0.970874 = 558.6
	//   hole 20, r 5.2: swept 816.814, effective 750.637, C 60: x 0.975610 = 732.3
	// Tolerances: k 0.002 and b 1 mL, residuals 0.5 mL, for the 0.05 mL
	// rounding and the circuit's lag behind the piston that the share ignores.
	p := profile(t, "demo-a")
	p.Cylinder.ClearanceCm = 0 // the version 1 bench (no cylinder gas), as derived below
	pts := benchRows(20, "4", "9", "14", "20")
	for i, ml := range []float64{269.7, 413.7, 558.6, 732.3} {
		pts[i].MeasuredML = ml
	}
	res, err := setup.Calibrate(p, pts, "2026-11-30", today)
	require.NoError(t, err)
	require.InDelta(t, 0.93, res.K, 0.002, "k (derived by hand)")
	require.InDelta(t, -9, res.BML, 1, "b (derived by hand)")
	for _, pt := range res.Points {
		require.InDelta(t, 0, pt.ResidualML, 0.5, "hole %s", pt.Hole)
		require.True(t, pt.Within)
	}
	require.Empty(t, res.Cautions)
	require.Equal(t, 4, res.Holes)
}

func TestCalibrateDemoBBenchByHand(t *testing.T) {
	// The demo's four invented bench points (holes B, D, F, H at r 2.5, 3.5,
	// 4.5, 5.5 cm; test lung C 50, R 5; 20 rpm; 287, 398, 518, 633 mL), fitted
	// by hand (derived). Bore 9 cm: area 63.617251 cm2, swept 318.0863,
	// 445.3208, 572.5553, 699.7898 mL. Circuit 2 mL/cmH2O: the lung takes
	// 50/52 = 0.961538 of the effective volume, so effective = measured x
	// 1.04 = 298.48, 413.92, 538.72, 658.32 mL. Least squares: mean x
	// 508.9380, mean y 477.36; the x are evenly spaced (h = 127.2345), so
	// k = (1.5 x 178.88 + 0.5 x 63.44 + 0.5 x 61.36 + 1.5 x 180.96) / (5 h)
	// = 602.16 / 636.1725 = 0.946536 and b = 477.36 - 0.946536 x 508.9380
	// = -4.368 mL. Tolerances as in TestCalibrateRecoversAKnownLine.
	p := profile(t, "demo-b")
	p.Cylinder.ClearanceCm = 0 // the version 1 bench (no cylinder gas), as derived below
	res, err := setup.Calibrate(p, p.Calibration.Points, "2026-11-24", today)
	require.NoError(t, err)
	require.InDelta(t, 0.946536, res.K, 0.001, "k (derived by hand)")
	require.InDelta(t, -4.368, res.BML, 0.5, "b (derived by hand)")
	require.False(t, res.ThroughOrigin)
	require.Equal(t, 4, res.Holes)
}

func TestCalibrationCautions(t *testing.T) {
	p := profile(t, "demo-a")
	// Two holes only, one point far off: both cautions. Volumes for an
	// uncalibrated machine (derived): hole 5 (r 2.2) 345.575 mL x 30/31.5 =
	// 329.1 mL; hole 12 (r 3.6) 565.487 mL x 40/41.5 = 545.0 mL; then hole 5
	// again at 1.5 x 329.1 = 493.7 mL, which no line through the three can
	// come within ISO 80601-2-12's 4 mL + 15% of.
	pts := benchRows(20, "5", "12")
	pts[0].MeasuredML, pts[1].MeasuredML = 329.1, 545.0
	pts = append(pts, pts[0])
	pts[2].MeasuredML = 493.7
	res, err := setup.Calibrate(p, pts, "", today)
	require.NoError(t, err)
	require.Equal(t, "2026-12-01", res.Date)
	require.True(t, hasCaution(res.Cautions, setup.CautionCalibrationResidual))
	require.True(t, hasCaution(res.Cautions, setup.CautionCalibrationThin))
	_, err = setup.Calibrate(p, pts, "2027-01-01", today)
	require.ErrorIs(t, err, setup.ErrInput, "a date in the future is refused")
}

func TestPlanUsesTheNewCalibration(t *testing.T) {
	p := profile(t, "demo-a")
	pt := setup.Patient{HeightCm: 175, Sex: physiology.Male}
	before, err := setup.MakePlan(setup.Request{Patient: pt, Now: today}, p)
	require.NoError(t, err)
	// Round trip: bench points made through the model's gain for k 0.9 and
	// b -10 mL, fitted, then planned with.
	res, err := setup.Calibrate(p, synthesize(t, p, 0.9, -10, benchRows(21, "5", "8", "12", "16")), "2026-11-30", today)
	require.NoError(t, err)
	after, err := setup.MakePlan(setup.Request{Patient: pt, Now: today}, res.Profile)
	require.NoError(t, err)
	// Every hole now delivers 0.9 x swept - 10 mL of effective volume.
	for i, h := range after.Holes {
		require.InDelta(t, 0.9*h.SweptML-10, h.EffectiveSweptML, 1e-6)
		require.Less(t, h.DeliveredML, before.Holes[i].DeliveredML)
	}
	require.False(t, hasCaution(after.Cautions, setup.CautionCalibrationMissing))
	require.True(t, hasCaution(before.Cautions, setup.CautionCalibrationMissing))
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

// Issue rule: the k and b Calibrate shows are those a plan derives from the
// profile it returns (what --write stores), exactly: an invented bench
// whose test lungs are 2.5 times apart, so the leak is fitted too.
func TestCalibrateShowsTheLineThePlanUses(t *testing.T) {
	p := profile(t, "demo-a")
	pts := benchRows(20, "4", "9", "14", "20")
	for i, row := range []struct{ c, ml float64 }{{20, 255}, {50, 415}, {20, 500}, {50, 712}} {
		pts[i].TestLungComplianceMLPerCmH2O, pts[i].MeasuredML = row.c, row.ml
	}
	res, err := setup.Calibrate(p, pts, "2026-11-30", today)
	require.NoError(t, err)
	require.True(t, res.LeakFitted)
	sum, err := setup.DescribeProfile(res.Profile, today)
	require.NoError(t, err)
	require.Equal(t, res.K, sum.Calibration.K, "k previewed and k used")
	require.Equal(t, res.BML, sum.Calibration.BML, "b previewed and b used")
	for i, pt := range res.Points {
		require.InDelta(t, sum.Calibration.Fit.Residuals[i].ResidualML, pt.ResidualML, 1e-4, "point %d residual", i+1)
	}
}

// Design rule (cautions): a k above 1.1 is not written.
func TestCalibrateUnwritableNamesTheCaution(t *testing.T) {
	p := profile(t, "demo-a")
	pts := benchRows(20, "4", "9", "14", "20")
	for i, row := range []struct{ c, ml float64 }{{20, 330}, {50, 520}, {20, 640}, {50, 900}} {
		pts[i].TestLungComplianceMLPerCmH2O, pts[i].MeasuredML = row.c, row.ml
	}
	res, err := setup.Calibrate(p, pts, "2026-11-30", today)
	require.NoError(t, err)
	var ids []setup.CautionID
	for _, c := range res.Unwritable() {
		ids = append(ids, c.ID)
	}
	require.Contains(t, ids, setup.CautionCalibrationKImplausible)
}
