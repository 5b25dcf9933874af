package setup

import (
	"fmt"
	"io"
	"time"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// PointResult is one bench point against the fitted calibration.
type PointResult struct {
	Hole        string  `json:"hole"`
	RPM         float64 `json:"rpm"`
	SweptML     float64 `json:"swept_ml"`
	Gain        float64 `json:"model_gain"`
	MeasuredML  float64 `json:"measured_ml"`
	PredictedML float64 `json:"predicted_ml"`
	ResidualML  float64 `json:"residual_ml"`
	ResidualPct float64 `json:"residual_pct"`
	Within      bool    `json:"within_tolerance"`
}

// VolumeChange is one hole's calibrated swept volume before and after.
type VolumeChange struct {
	Hole     string  `json:"hole"`
	SweptML  float64 `json:"swept_ml"`
	BeforeML float64 `json:"before_ml"`
	AfterML  float64 `json:"after_ml"`
}

// CalibrationResult is a refit from bench measurements, not yet saved.
type CalibrationResult struct {
	Profile       profiles.Profile // the profile carrying the new calibration
	Before        machine.Calibration
	K             float64
	BML           float64
	ThroughOrigin bool
	Points        []PointResult
	Holes         int
	Date          string
	Cautions      []Caution
	Volumes       []VolumeChange
	// LeakLPerMinAt20 is the leak (L/min at 20 cmH2O) the fit used: fitted
	// with k and b when LeakFitted, else the profile's; LeakNote says which
	// and why. The written profile carries it.
	LeakLPerMinAt20 float64
	LeakBefore      float64
	LeakFitted      bool
	LeakNote        string
	// status is the calibration as a plan will read it from Profile.
	status CalibrationStatus
}

// Unwritable lists the cautions that keep this calibration out of the
// profile file: a k outside CalKMin-CalKMax, or a hole whose effective
// volume would exceed its geometric volume (DESIGN, cautions). Empty when
// the calibration may be written.
func (r CalibrationResult) Unwritable() []Caution {
	return calibrationFitCautions(r.status)
}

// Calibrate fits k and b to bench points for profile p. Each point is
// turned into an effective swept volume through the breath model (measured
// / the model's delivered-per-swept gain for that test lung and speed); a
// least-squares line of effective against geometric swept volume gives k
// and b. date (YYYY-MM-DD, empty for today) must not be in the future.
func Calibrate(p profiles.Profile, points []profiles.BenchPoint, date string, now time.Time) (CalibrationResult, error) {
	now = orNow(now)
	if date == "" {
		date = now.Format(time.DateOnly)
	}
	d, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return CalibrationResult{}, &InputError{Field: "date", Reason: fmt.Sprintf("%s is not a date written YYYY-MM-DD", physiology.Quote(date))}
	}
	if d.After(now) {
		return CalibrationResult{}, &InputError{Field: "date", Reason: fmt.Sprintf("%s is in the future", date)}
	}
	old, err := newUnit(p, now)
	if err != nil {
		return CalibrationResult{}, err
	}
	fit, gains, err := fitBench(old, points)
	if err != nil {
		return CalibrationResult{}, err
	}
	// The profile that --write stores: the bench points, their date and the
	// leak the fit used. A plan derives k and b from these (fitCalibration),
	// so the line shown here is derived the same way from the same profile:
	// what is previewed is what is written and then used, to the digit. The
	// joint fit above chooses the leak; k and b are the line at that leak.
	np := p
	np.Calibration = &profiles.Calibration{Date: date, Points: append([]profiles.BenchPoint(nil), points...)}
	np.Circuit.LeakLMinAt20CmH2O = fit.LeakLPerMinAt20CmH2O
	nu, err := newUnit(np, now)
	if err != nil {
		return CalibrationResult{}, err
	}
	st := nu.cal
	res := CalibrationResult{Profile: np, Before: old.cal.Calibration, K: st.K, BML: st.BML, ThroughOrigin: st.Fit.ThroughOrigin, Date: date,
		LeakLPerMinAt20: fit.LeakLPerMinAt20CmH2O, LeakBefore: p.Circuit.LeakLMinAt20CmH2O, LeakFitted: fit.LeakFitted, LeakNote: fit.LeakNote,
		Holes: st.Holes, status: st}
	for i, pt := range points {
		r := st.Fit.Residuals[i]
		res.Points = append(res.Points, PointResult{Hole: pt.Hole, RPM: pt.RPM, SweptML: r4(gains[i].SweptML), Gain: r4(gains[i].Gain),
			MeasuredML: pt.MeasuredML, PredictedML: r4(r.PredictedML), ResidualML: r4(r.ResidualML), ResidualPct: r4(r.ResidualPct), Within: st.Residuals[i].Within})
	}
	res.Cautions = calibrationCautions(st)
	for _, h := range p.Crank.Holes {
		swept := machine.SweptVolumeML(p.Cylinder.BoreCm, old.crank(h))
		res.Volumes = append(res.Volumes, VolumeChange{Hole: h.Label, SweptML: r4(swept),
			BeforeML: r4(old.cal.EffectiveSweptML(swept)), AfterML: r4(st.EffectiveSweptML(swept))})
	}
	return res, nil
}

// fitBench fits k, b and, when the bench's test lungs are a factor
// machine.LeakFitComplianceRatio apart in compliance, the leak, through the
// version 2 model (machine.FitCalibrationWithLeak); it returns the fit and
// each point's model gain at the leak used.
func fitBench(u unit, points []profiles.BenchPoint) (machine.LeakFit, []machine.BenchPoint, error) {
	runs := make([]machine.BenchRun, len(points))
	for i, bp := range points {
		h, ok := u.p.HoleByLabel(bp.Hole)
		if !ok {
			return machine.LeakFit{}, nil, &InputError{Field: fmt.Sprintf("calibration point %d", i+1), Reason: fmt.Sprintf("hole %q is not on this machine", bp.Hole)}
		}
		runs[i] = machine.BenchRun{Input: benchInput(u, u.stroke(h, bp.RPM, machine.Identity), bp), MeasuredML: bp.MeasuredML}
	}
	fit, err := machine.FitCalibrationWithLeak(runs, u.p.Circuit.LeakLMinAt20CmH2O)
	if err != nil {
		return machine.LeakFit{}, nil, &InputError{Field: "bench", Reason: err.Error()}
	}
	u.gas.LeakLPerMinAt20 = fit.LeakLPerMinAt20CmH2O
	gains, err := benchGains(u, points)
	if err != nil {
		return machine.LeakFit{}, nil, err
	}
	return fit, gains, nil
}

// CalibrationJSON is the object `crankside calibrate --json` prints.
type CalibrationJSON struct {
	ProfileID     string         `json:"profile_id"`
	Date          string         `json:"date"`
	K             float64        `json:"k"`
	BML           float64        `json:"b_ml"`
	ThroughOrigin bool           `json:"through_origin"`
	HolesMeasured int            `json:"holes_measured"`
	Points        []PointResult  `json:"points"`
	Volumes       []VolumeChange `json:"volumes"`
	Cautions      []Caution      `json:"cautions"`
	Written       bool           `json:"written"`
	// The leak (L/min at 20 cmH2O) the fit used and the profile gets.
	LeakLMinAt20CmH2O float64 `json:"leak_l_min_at_20_cmh2o"`
	LeakBefore        float64 `json:"leak_before_l_min_at_20_cmh2o"`
	LeakFitted        bool    `json:"leak_fitted"`
	LeakNote          string  `json:"leak_note"`
}

// JSON is the result as the --json object.
func (r CalibrationResult) JSON(written bool) CalibrationJSON {
	return CalibrationJSON{ProfileID: r.Profile.ID, Date: r.Date, K: r4(r.K), BML: r4(r.BML), ThroughOrigin: r.ThroughOrigin,
		HolesMeasured: r.Holes, Points: r.Points, Volumes: r.Volumes, Cautions: roundCautions(r.Cautions), Written: written,
		LeakLMinAt20CmH2O: r4(r.LeakLPerMinAt20), LeakBefore: r4(r.LeakBefore), LeakFitted: r.LeakFitted, LeakNote: r.LeakNote}
}

// ReadBench reads a bench CSV for p (profiles.ReadBenchNumbers) with the
// one number parser, physiology.ParseNumber: a decimal comma is a decimal
// mark ("480,5" quoted in a comma-separated file, or bare in a
// semicolon-separated one, is 480.5).
func ReadBench(r io.Reader, source string, p profiles.Profile) ([]profiles.BenchPoint, error) {
	return profiles.ReadBenchNumbers(r, source, p, physiology.ParseNumber)
}
