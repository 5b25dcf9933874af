package machine

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// BenchRun is one bench breath that the model can run again: the stroke as
// it was measured (the test lung, the circuit, from rest with no PEEP valve,
// room air into a room-temperature lung so Gas.BTPSFactor is 0 or 1, the
// cylinder head, the relief valve), and the volume measured into the test
// lung. The fit sets Input.Stroke.Scale and Input.Gas.LeakLPerMinAt20CmH2O
// itself; their values here are ignored.
type BenchRun struct {
	Input      StrokeInput
	MeasuredML float64
}

// LeakFit is a bench calibration fitted through the version 2 model,
// with the leak when the bench allows it.
type LeakFit struct {
	Calibration
	LeakLPerMinAt20CmH2O float64
	// LeakFitted is true when the leak was fitted with k and b; false when
	// the bench could not separate them and the given leak was kept.
	// LeakNote says which, and why, in a sentence for the user.
	LeakFitted bool
	LeakNote   string
	// ThroughOrigin is true when every run had the same swept volume: b is
	// then 0 and only k (and the leak) are fitted.
	ThroughOrigin bool
	Residuals     []FitResidual
}

// LeakFitComplianceRatio is how far apart, as a ratio, the test lungs'
// compliances must be for the leak to be fitted: a leak takes more from a
// stiff lung (higher pressure) than from a soft one, and only that
// difference separates it from the calibration's k (DESIGN version 2).
const LeakFitComplianceRatio = 2.0

// FitCalibrationWithLeak fits the calibration (effective swept = k x swept
// + b) to bench runs through the version 2 model. When the runs' test lungs
// span compliances at least LeakFitComplianceRatio apart, the leak (L/min at
// 20 cmH2O) is fitted together with k and b by minimising the squared volume
// residuals (damped Gauss-Newton, fitWithLeak); otherwise givenLeakLPerMin is kept
// and LeakNote says so. Runs that the model cannot simulate, or measured
// volumes that are not positive and finite, return an error naming the run.
func FitCalibrationWithLeak(runs []BenchRun, givenLeakLPerMin float64) (LeakFit, error) {
	if len(runs) == 0 {
		return LeakFit{}, fmt.Errorf("%w: no bench runs", ErrCalibration)
	}
	if !(givenLeakLPerMin >= 0) || math.IsInf(givenLeakLPerMin, 0) {
		return LeakFit{}, fmt.Errorf("%w: given leak %v L/min must be zero or positive", ErrCalibration, givenLeakLPerMin)
	}
	cMin, cMax := math.Inf(1), 0.0
	pts := make([]BenchPoint, len(runs))
	for i, r := range runs {
		if !(r.MeasuredML > 0) || math.IsInf(r.MeasuredML, 0) {
			return LeakFit{}, fmt.Errorf("%w: run %d measured %v mL must be positive and finite", ErrCalibration, i+1, r.MeasuredML)
		}
		in := benchInput(r.Input, 1, givenLeakLPerMin)
		res, err := SimulateStroke(in)
		if err != nil {
			return LeakFit{}, fmt.Errorf("%w: run %d: %v", ErrCalibration, i+1, err)
		}
		swept := in.Stroke.SweptML()
		pts[i] = BenchPoint{SweptML: swept, Gain: res.DeliveredML / swept, MeasuredML: r.MeasuredML}
		c := r.Input.Lung.ComplianceMLPerCmH2O
		cMin, cMax = math.Min(cMin, c), math.Max(cMax, c)
	}
	start, err := FitCalibration(pts)
	if err != nil {
		return LeakFit{}, err
	}
	fit := LeakFit{Calibration: start.Calibration, LeakLPerMinAt20CmH2O: givenLeakLPerMin, ThroughOrigin: start.ThroughOrigin}
	if cMax < LeakFitComplianceRatio*cMin {
		fit.LeakNote = fmt.Sprintf("leak kept at %.3g L/min at 20 cmH2O: the bench's test lungs (%.4g-%.4g mL/cmH2O) are less than a factor %g apart, so the leak cannot be told from k",
			givenLeakLPerMin, cMin, cMax, LeakFitComplianceRatio)
	} else if err := fitWithLeak(runs, &fit); err != nil {
		return LeakFit{}, err
	}
	fit.Residuals = make([]FitResidual, len(runs))
	for i, r := range runs {
		pred, err := predictBench(r, fit.Calibration, fit.LeakLPerMinAt20CmH2O)
		if err != nil {
			return LeakFit{}, fmt.Errorf("%w: run %d: %v", ErrCalibration, i+1, err)
		}
		res := FitResidual{PredictedML: pred, ResidualML: r.MeasuredML - pred}
		if pred > 0 {
			res.ResidualPct = 100 * res.ResidualML / pred
		}
		fit.Residuals[i] = res
	}
	return fit, nil
}

// fitWithLeak minimises the squared residuals over k, b (unless the fit
// goes through the origin) and the leak, from the fit's starting values, by
// damped Gauss-Newton: the Jacobian by central differences, each step the
// least-squares solution of J d = -r (gonum mat, QR). (gonum's optimize
// package would pull in a module this project does not carry.) The model
// is smooth and nearly linear in k and b, so a few steps converge.
func fitWithLeak(runs []BenchRun, fit *LeakFit) error {
	// Parameters: k, b in mL, leak in L/min; the leak is held >= 0.
	unpack := func(x []float64) (Calibration, float64) {
		if fit.ThroughOrigin {
			return Calibration{K: x[0]}, x[1]
		}
		return Calibration{K: x[0], BML: x[1]}, x[2]
	}
	x := []float64{fit.K, fit.BML, fit.LeakLPerMinAt20CmH2O}
	steps := []float64{1e-4, 1e-2, 1e-3}
	if fit.ThroughOrigin {
		x, steps = []float64{fit.K, fit.LeakLPerMinAt20CmH2O}, []float64{1e-4, 1e-3}
	}
	residuals := func(x []float64, out []float64) (float64, error) {
		cal, leak := unpack(x)
		var sum float64
		for i, r := range runs {
			pred, err := predictBench(r, cal, leak)
			if err != nil {
				return 0, err
			}
			out[i] = pred - r.MeasuredML
			sum += out[i] * out[i]
		}
		return sum, nil
	}
	m, n := len(runs), len(x)
	res, trial := make([]float64, m), make([]float64, m)
	sse, err := residuals(x, res)
	if err != nil {
		return fmt.Errorf("%w: %v", ErrCalibration, err)
	}
	for range 30 {
		d, err := gaussNewtonStep(x, steps, res, m, n, residuals)
		if err != nil {
			return err
		}
		improved := false
		for range 20 { // halve the step until the residuals fall
			next := make([]float64, n)
			for j := range x {
				next[j] = x[j] + d[j]
			}
			next[n-1] = math.Max(0, next[n-1])
			if s, err := residuals(next, trial); err == nil && s < sse {
				small := sse-s <= 1e-12*(1+sse)
				x, sse, improved = next, s, true
				copy(res, trial)
				if small {
					improved = false
				}
				break
			}
			for j := range d {
				d[j] /= 2
			}
		}
		if !improved {
			break
		}
	}
	cal, leak := unpack(x)
	if !(cal.K > 0) || math.IsNaN(cal.BML) || math.IsInf(leak, 0) || math.IsNaN(leak) {
		return fmt.Errorf("%w: the fit with the leak (k %v, b %v mL, leak %v L/min) is not usable", ErrCalibration, cal.K, cal.BML, leak)
	}
	fit.Calibration, fit.LeakLPerMinAt20CmH2O, fit.LeakFitted = cal, leak, true
	fit.LeakNote = fmt.Sprintf("leak fitted with k and b: %.3g L/min at 20 cmH2O", leak)
	return nil
}

// gaussNewtonStep is the least-squares solution d of J d = -r, with the
// Jacobian J of the residuals by central differences.
func gaussNewtonStep(x, steps, res []float64, m, n int, residuals func(x, out []float64) (float64, error)) ([]float64, error) {
	jac := mat.NewDense(m, n, nil)
	up, down := make([]float64, m), make([]float64, m)
	for j := range x {
		xu, xd := append([]float64(nil), x...), append([]float64(nil), x...)
		xu[j] += steps[j]
		xd[j] -= steps[j]
		if j == n-1 && xd[j] < 0 { // the leak cannot go below 0: a one-sided difference
			xd[j] = x[j]
		}
		if _, err := residuals(xu, up); err != nil {
			return nil, fmt.Errorf("%w: %v", ErrCalibration, err)
		}
		if _, err := residuals(xd, down); err != nil {
			return nil, fmt.Errorf("%w: %v", ErrCalibration, err)
		}
		for i := range up {
			jac.Set(i, j, (up[i]-down[i])/(xu[j]-xd[j]))
		}
	}
	neg := mat.NewVecDense(m, nil)
	for i, r := range res {
		neg.SetVec(i, -r)
	}
	var d mat.VecDense
	if err := d.SolveVec(jac, neg); err != nil {
		return nil, fmt.Errorf("%w: the bench cannot separate k, b and the leak: %v", ErrCalibration, err)
	}
	return d.RawVector().Data, nil
}

// benchInput is a bench run's stroke with a calibration scale and a leak.
func benchInput(in StrokeInput, scale, leakLPerMin float64) StrokeInput {
	in.Stroke.Scale = scale
	in.Gas.LeakLPerMinAt20CmH2O = leakLPerMin
	in.Observe = nil
	return in
}

// predictBench is the volume the model predicts into a run's test lung
// with a calibration and a leak.
func predictBench(r BenchRun, cal Calibration, leakLPerMin float64) (float64, error) {
	swept := r.Input.Stroke.SweptML()
	res, err := SimulateStroke(benchInput(r.Input, cal.EffectiveSweptML(swept)/swept, leakLPerMin))
	if err != nil {
		return 0, err
	}
	return res.DeliveredML, nil
}
