package machine

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestFitCalibrationByHand(t *testing.T) {
	// Worked by hand (least squares, derived): swept 100, 200, 300 mL with
	// gain 1 and measured 95, 190, 295 mL. Mean x 200, mean y 193.33;
	// Sxy = (-100)(-98.33) + 0 + (100)(101.67) = 20000, Sxx = 20000,
	// so k = 1.0 and b = 193.33 - 200 = -6.667 mL.
	fit, err := FitCalibration([]BenchPoint{{100, 1, 95}, {200, 1, 190}, {300, 1, 295}})
	require.NoError(t, err)
	require.InDelta(t, 1.0, fit.K, 1e-12)
	require.InDelta(t, -20.0/3, fit.BML, 1e-9)
	// Residuals: predicted 93.333, 193.333, 293.333, so measured minus
	// predicted is +1.6667, -3.3333, +1.6667 mL.
	require.InDelta(t, 1.666666667, fit.Residuals[0].ResidualML, 1e-9)
	require.InDelta(t, -3.333333333, fit.Residuals[1].ResidualML, 1e-9)
	require.InDelta(t, 1.666666667, fit.Residuals[2].ResidualML, 1e-9)
}

func TestFitRecoversAKnownLineThroughTheGain(t *testing.T) {
	// Round trip (a property, not a reference value): points written as
	// gain x (k x swept + b) with k and b chosen here, not by the code,
	// recover k and b exactly.
	k, b := 0.93, -7.5
	var pts []BenchPoint
	for i, swept := range []float64{250, 330, 410, 520} {
		gain := 0.95 + 0.01*float64(i)
		pts = append(pts, BenchPoint{SweptML: swept, Gain: gain, MeasuredML: gain * (k*swept + b)})
	}
	fit, err := FitCalibration(pts)
	require.NoError(t, err)
	require.InDelta(t, k, fit.K, 1e-12)
	require.InDelta(t, b, fit.BML, 1e-9)
	for _, r := range fit.Residuals {
		require.InDelta(t, 0, r.ResidualML, 1e-9)
	}
}

func TestFitOneHoleIsARatio(t *testing.T) {
	// Derived: one hole gives no line, only a ratio through the origin:
	// 342/0.9 = 380 and 351/0.9 = 390 mL effective, mean 385 / 400 = 0.9625.
	fit, err := FitCalibration([]BenchPoint{{400, 0.9, 342}, {400, 0.9, 351}})
	require.NoError(t, err)
	require.True(t, fit.ThroughOrigin)
	require.InDelta(t, 0.9625, fit.K, 1e-12)
	require.Zero(t, fit.BML)
}

func TestFitRefusesBadPoints(t *testing.T) {
	_, err := FitCalibration(nil)
	require.ErrorIs(t, err, ErrCalibration)
	_, err = FitCalibration([]BenchPoint{{400, 0.9, -3}})
	require.ErrorIs(t, err, ErrCalibration)
}

func TestISOTolerance(t *testing.T) {
	// ISO 80601-2-12:2020 (secondary source): +/-(4 mL + 15% of set).
	require.True(t, WithinISOTolerance(400+64, 400))
	require.False(t, WithinISOTolerance(400+64.1, 400))
	require.True(t, WithinISOTolerance(400-64, 400))
	require.False(t, WithinISOTolerance(400-64.1, 400))
}
