package machine

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat"
)

// BenchPoint is one bench breath: a hole's geometric swept volume, the
// model's delivered-per-swept gain for the test lung and speed it was
// measured at, and the volume measured into the test lung.
type BenchPoint struct {
	SweptML    float64
	Gain       float64 // delivered / swept for this lung and speed, from the model
	MeasuredML float64
}

// EffectiveSweptML is the swept volume the measurement implies.
func (p BenchPoint) EffectiveSweptML() float64 { return p.MeasuredML / p.Gain }

// Calibration maps geometric to effective swept volume: k x swept + b.
type Calibration struct {
	K   float64
	BML float64
}

// Identity is the calibration of an unmeasured machine.
var Identity = Calibration{K: 1}

// EffectiveSweptML applies the calibration; it never goes below zero.
func (c Calibration) EffectiveSweptML(sweptML float64) float64 {
	return math.Max(0, c.K*sweptML+c.BML)
}

// FitResidual is one bench point against the fitted line.
type FitResidual struct {
	PredictedML float64 // gain x (k x swept + b)
	ResidualML  float64 // measured - predicted
	ResidualPct float64 // percent of predicted: 100 x residual / predicted
}

// Fit is a calibration fitted to bench points.
type Fit struct {
	Calibration
	// ThroughOrigin is true when every point had the same swept volume, so
	// no line could be fitted and k is the ratio with b = 0.
	ThroughOrigin bool
	Residuals     []FitResidual
}

// ErrCalibration is returned (wrapped) when points cannot be fitted.
var ErrCalibration = errors.New("machine: calibration")

// FitCalibration fits effective = k x swept + b by least squares over the
// points (gonum stat.LinearRegression). With a single swept volume among
// the points the line through the origin is used.
func FitCalibration(points []BenchPoint) (Fit, error) {
	if len(points) == 0 {
		return Fit{}, fmt.Errorf("%w: no bench points", ErrCalibration)
	}
	x := make([]float64, len(points))
	y := make([]float64, len(points))
	distinct := false
	for i, p := range points {
		if !(p.SweptML > 0) || !(p.Gain > 0) || !(p.MeasuredML > 0) ||
			math.IsInf(p.SweptML, 0) || math.IsInf(p.Gain, 0) || math.IsInf(p.MeasuredML, 0) {
			return Fit{}, fmt.Errorf("%w: point %d (swept %v mL, gain %v, measured %v mL) must be positive and finite",
				ErrCalibration, i+1, p.SweptML, p.Gain, p.MeasuredML)
		}
		x[i], y[i] = p.SweptML, p.EffectiveSweptML()
		if math.Abs(x[i]-x[0]) > 1e-9 {
			distinct = true
		}
	}
	var fit Fit
	if distinct {
		b, k := stat.LinearRegression(x, y, nil, false)
		fit.Calibration = Calibration{K: k, BML: b}
	} else {
		fit.Calibration = Calibration{K: stat.Mean(y, nil) / x[0]}
		fit.ThroughOrigin = true
	}
	if !(fit.K > 0) || math.IsInf(fit.K, 0) || math.IsNaN(fit.BML) {
		return Fit{}, fmt.Errorf("%w: the fitted line (k %v, b %v mL) is not usable", ErrCalibration, fit.K, fit.BML)
	}
	fit.Residuals = make([]FitResidual, len(points))
	for i, p := range points {
		pred := p.Gain * fit.EffectiveSweptML(p.SweptML)
		r := FitResidual{PredictedML: pred, ResidualML: p.MeasuredML - pred}
		if pred > 0 {
			r.ResidualPct = 100 * r.ResidualML / pred
		}
		fit.Residuals[i] = r
	}
	return fit, nil
}

// WithinISOTolerance reports whether a measured volume is within
// +/-(4 mL + 15% of the predicted) of the prediction (ISO 80601-2-12:2020,
// secondary source).
func WithinISOTolerance(measuredML, predictedML float64) bool {
	return math.Abs(measuredML-predictedML) <= 4+0.15*predictedML
}
