package setup

import (
	"fmt"
	"math"
	"strings"

	"crankside/machine"
	"crankside/physiology"
)

// DefaultManometerStepCmH2O is the manometer's resolution assumed when none
// is entered: a circuit manometer is read to 1 cmH2O (common practice).
const DefaultManometerStepCmH2O = 1.0

// srcManometerStep is where the default resolution comes from.
const srcManometerStep = "common practice: a circuit manometer is read to 1 cmH2O"

// Manometer step limits: finer than 0.1 cmH2O is no dial, coarser than 5
// leaves no fit worth showing.
const (
	ManometerStepMinCmH2O = 0.1
	ManometerStepMaxCmH2O = 5.0
)

// FitRanges are what a lung fitted to the readings may be, given that each
// reading is only known to +/- half the manometer's step: the fit is made
// again at the four corners (peak +/- h/2, end +/- h/2) and each figure's
// lowest and highest kept. Each pair is [low, high].
type FitRanges struct {
	StepCmH2O            physiology.Value
	ComplianceMLPerCmH2O [2]float64
	ResistanceCmH2OPerLS [2]float64
	DeliveredML          [2]float64 // predicted tidal volume at BTPS
	MLPerKg              [2]float64
	PlateauCmH2O         [2]float64
	Corners              int      // corners that a lung explains
	Skipped              []string // the corners that no lung explains, as "peak 21.5, end 17.5"
}

// Note says in a sentence which corners were left out, or is "".
func (fr FitRanges) Note() string {
	if len(fr.Skipped) == 0 {
		return ""
	}
	return fmt.Sprintf("no lung explains the readings at %s (within the manometer's step); the ranges are from the other %d corners and may be wider",
		strings.Join(fr.Skipped, "; "), fr.Corners)
}

// manometerStep is the request's step with its source.
func manometerStep(req CheckRequest) physiology.Value {
	if req.ManometerStepCmH2O > 0 {
		return physiology.Value{Value: req.ManometerStepCmH2O, Source: entered}
	}
	return physiology.Value{Value: DefaultManometerStepCmH2O, Source: srcManometerStep}
}

// fitRanges fits the lung at the four corners of the readings' resolution
// and evaluates the setting on each; nil when no corner fits. The corners
// run at ScanStepS (volumes within 1e-4 of 1 ms, far below what half a
// cmH2O moves), so the ranges cost about as much as the fit itself.
func fitRanges(u unit, s Setting, rd physiology.Readings, pbw float64, req CheckRequest) *FitRanges {
	u.stepS = ScanStepS
	step := manometerStep(req)
	half := step.Value / 2
	fr := &FitRanges{StepCmH2O: step}
	first := true
	widen := func(r *[2]float64, v float64) {
		if first || v < r[0] {
			r[0] = v
		}
		if first || v > r[1] {
			r[1] = v
		}
	}
	h, _ := u.p.HoleByLabel(s.Hole)
	t := machine.TimingOf(s.RPM, s.DwellS, u.crank(h).DeliveryAngle())
	for _, dp := range []float64{-half, half} {
		for _, de := range []float64{-half, half} {
			c := physiology.Readings{PeakCmH2O: rd.PeakCmH2O + dp, EndCmH2O: rd.EndCmH2O + de}
			m, err := fitReadings(u, s, c, pbw, req)
			var f Figures
			if err == nil {
				f, err = evaluate(u, h, t, lungState{lung: machine.Lung{ComplianceMLPerCmH2O: m.ComplianceMLPerCmH2O, ResistanceCmH2OPerLS: m.ResistanceCmH2OPerLS},
					peep: s.PEEPCmH2O, pbwKg: pbw}, 0, 0, 0)
			}
			if err != nil {
				fr.Skipped = append(fr.Skipped, fmt.Sprintf("peak %s, end %s cmH2O", plain(c.PeakCmH2O), plain(c.EndCmH2O)))
				continue
			}
			widen(&fr.ComplianceMLPerCmH2O, m.ComplianceMLPerCmH2O)
			widen(&fr.ResistanceCmH2OPerLS, m.ResistanceCmH2OPerLS)
			widen(&fr.DeliveredML, f.Hole.DeliveredML)
			widen(&fr.MLPerKg, f.Hole.MLPerKg)
			widen(&fr.PlateauCmH2O, f.PlateauCmH2O)
			first = false
			fr.Corners++
		}
	}
	if fr.Corners == 0 {
		return nil
	}
	return fr
}

// rangeCautions say when a range that the manometer's resolution allows
// crosses a caution's limit: the fitted value may sit on one side and the
// patient on the other, so it is a warn (a clinician decides; a finer
// reading or a measured plateau settles it).
func rangeCautions(fr *FitRanges, f Figures, pbw float64) []Caution {
	if fr == nil {
		return nil
	}
	var out []Caution
	cross := func(id, what string, r [2]float64, limit float64, unit, src string) {
		if r[0] < limit && r[1] > limit {
			out = append(out, Caution{ID: id, Level: Warn, Value: r[1], Limit: limit, Unit: unit,
				Message: fmt.Sprintf("within the manometer's %s cmH2O step the %s may be %s-%s %s, across the limit of %s",
					plain(fr.StepCmH2O.Value), what, sig2(r[0]), sig2(r[1]), unit, plain(limit)),
				Advice: "re-read the manometer more finely or measure a plateau (hold at end of inspiration) before relying on the fit",
				Source: src + "; range from the manometer's resolution"})
		}
	}
	cross("range-crosses-vt-8", "tidal volume", fr.MLPerKg, VtWarnMLPerKg, "mL/kg PBW", srcARDSNet)
	cross("range-crosses-vt-10", "tidal volume", fr.MLPerKg, VtStopMLPerKg, "mL/kg PBW", srcARDSNet)
	cross("range-crosses-vt-4", "tidal volume", fr.MLPerKg, VtLowMLPerKg, "mL/kg PBW", srcARDSNet)
	cross("range-crosses-plateau-30", "plateau pressure", fr.PlateauCmH2O, PlateauMaxCmH2O, "cmH2O", srcARDSNet)
	cross("range-crosses-plateau-35", "plateau pressure", fr.PlateauCmH2O, PlateauStopCmH2O, "cmH2O", srcMHRA)
	return out
}

// sig2 prints v to 2 significant figures as a plain decimal (a fit from
// readings to 1 cmH2O is not known better).
func sig2(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return plain(v)
	}
	d := math.Floor(math.Log10(math.Abs(v)))
	scale := math.Pow(10, 1-d)
	r := math.Round(v*scale) / scale
	if d >= 1 {
		return fmt.Sprintf("%.0f", r)
	}
	return fmt.Sprintf("%.*f", int(1-d), r)
}
