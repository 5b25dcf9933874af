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
// reading is only known to +/- half the manometer's step (the gauge's own
// error is left out: "from the manometer's step alone"): the fit is made
// again at the four corners (peak +/- h/2, end +/- h/2) and each figure's
// lowest and highest kept, the fit itself always included. Each pair is
// [low, high]. A corner no lung explains leaves its figures' ranges open
// on the side it would have widened (Open*: [low open, high open]): a
// lower end reading means a more compliant lung, a larger volume and a
// lower plateau; a wider gap between peak and end a higher resistance. A
// fit to the end pressure alone (peak at the relief valve) varies only the
// end reading, and its resistance is assumed: open on both sides.
type FitRanges struct {
	StepCmH2O            physiology.Value
	ComplianceMLPerCmH2O [2]float64
	ResistanceCmH2OPerLS [2]float64
	DeliveredML          [2]float64 // predicted tidal volume at BTPS
	MLPerKg              [2]float64
	PlateauCmH2O         [2]float64
	OpenC, OpenR         [2]bool
	OpenVt, OpenPlateau  [2]bool  // OpenVt also holds for MLPerKg
	Corners              int      // corners that a lung explains
	Skipped              []string // the corners that no lung explains, as "peak 21.5, end 17.5"
	EndOnly              bool     // the fit is to the end pressure alone
}

// FitRangeLabel says what the ranges leave out.
const FitRangeLabel = "from the manometer's step alone (the gauge's own error is not included)"

// Note says in a sentence which corners were left out and which sides are
// open, or is "".
func (fr FitRanges) Note() string {
	var parts []string
	switch {
	case fr.EndOnly && fr.OpenR[0]:
		parts = append(parts, "the peak is at the relief valve and tells nothing of the resistance: it is assumed, and its range is open on both sides")
	case fr.EndOnly:
		parts = append(parts, "the peak is at the relief valve: the resistance is at least the one shown, and its range is open above")
	}
	if len(fr.Skipped) > 0 {
		parts = append(parts, fmt.Sprintf("no lung explains the readings at %s (within the manometer's step): the ranges are open on the side%s shown as 'open'",
			strings.Join(fr.Skipped, "; "), plural(len(fr.Skipped))))
	}
	return strings.Join(parts, "; ")
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// RangeText prints one range as "low-high", an open side as "open".
func RangeText(r [2]float64, open [2]bool, format func(float64) string) string {
	lo, hi := format(r[0]), format(r[1])
	if open[0] {
		lo = "open"
	}
	if open[1] {
		hi = "open"
	}
	return lo + "-" + hi
}

// Text is the ranges in one line for a screen: C, R, tidal volume and
// mL/kg, an open side shown as "open".
func (fr FitRanges) Text() string {
	whole := func(v float64) string { return fmt.Sprintf("%.0f", v) }
	tenth := func(v float64) string { return fmt.Sprintf("%.1f", v) }
	return fmt.Sprintf("C %s mL/cmH2O, R %s cmH2O/(L/s), Vt %s mL (%s mL/kg)",
		RangeText(fr.ComplianceMLPerCmH2O, fr.OpenC, Sig2), RangeText(fr.ResistanceCmH2OPerLS, fr.OpenR, Sig2),
		RangeText(fr.DeliveredML, fr.OpenVt, whole), RangeText(fr.MLPerKg, fr.OpenVt, tenth))
}

// manometerStep is the request's step with its source.
func manometerStep(req CheckRequest) physiology.Value {
	if req.ManometerStepCmH2O > 0 {
		return physiology.Value{Value: req.ManometerStepCmH2O, Source: entered}
	}
	return physiology.Value{Value: DefaultManometerStepCmH2O, Source: srcManometerStep}
}

// fitRanges fits the lung at the corners of the readings' resolution,
// each started from the central fit m, and evaluates the setting on each
// and on m itself. The corners run at ScanStepS (volumes within 1e-4 of
// 1 ms, far below what half a cmH2O moves).
func fitRanges(rf readingsFit, rd physiology.Readings, m physiology.Mechanics, req CheckRequest) *FitRanges {
	rf.u.stepS = ScanStepS
	step := manometerStep(req)
	half := step.Value / 2
	fr := &FitRanges{StepCmH2O: step, EndOnly: m.EndOnly}
	h, _ := rf.u.p.HoleByLabel(rf.s.Hole)
	t := machine.TimingOf(rf.s.RPM, rf.s.DwellS, rf.u.crank(h).DeliveryAngle())
	figuresOf := func(m physiology.Mechanics) (Figures, error) {
		return evaluate(rf.u, h, t, lungState{lung: machine.Lung{ComplianceMLPerCmH2O: m.ComplianceMLPerCmH2O, ResistanceCmH2OPerLS: m.ResistanceCmH2OPerLS},
			peep: rf.s.PEEPCmH2O, pbwKg: rf.pbw}, 0, 0, 0)
	}
	f, err := figuresOf(m)
	if err != nil {
		return nil
	}
	fr.set(m, f)
	peaks := []float64{-half, half}
	if m.EndOnly {
		peaks = []float64{0}
		fr.OpenR = [2]bool{!m.RAtLeast, true}
	}
	for _, dp := range peaks {
		for _, de := range []float64{-half, half} {
			c := physiology.Readings{PeakCmH2O: rd.PeakCmH2O + dp, EndCmH2O: rd.EndCmH2O + de}
			cm, err := rf.fit(c, &m)
			var cf Figures
			if err == nil {
				cf, err = figuresOf(cm)
			}
			if err != nil {
				fr.Skipped = append(fr.Skipped, fmt.Sprintf("peak %s, end %s cmH2O", plain(c.PeakCmH2O), plain(c.EndCmH2O)))
				fr.openToward(dp, de)
				continue
			}
			fr.widen(cm, cf)
			fr.Corners++
		}
	}
	return fr
}

// set starts every range at the fit itself.
func (fr *FitRanges) set(m physiology.Mechanics, f Figures) {
	for _, p := range []struct {
		r *[2]float64
		v float64
	}{{&fr.ComplianceMLPerCmH2O, m.ComplianceMLPerCmH2O}, {&fr.ResistanceCmH2OPerLS, m.ResistanceCmH2OPerLS},
		{&fr.DeliveredML, f.Hole.DeliveredML}, {&fr.MLPerKg, f.Hole.MLPerKg}, {&fr.PlateauCmH2O, f.PlateauCmH2O}} {
		*p.r = [2]float64{p.v, p.v}
	}
}

// widen takes a corner's lung and figures into the ranges.
func (fr *FitRanges) widen(m physiology.Mechanics, f Figures) {
	w := func(r *[2]float64, v float64) {
		r[0], r[1] = math.Min(r[0], v), math.Max(r[1], v)
	}
	w(&fr.ComplianceMLPerCmH2O, m.ComplianceMLPerCmH2O)
	w(&fr.ResistanceCmH2OPerLS, m.ResistanceCmH2OPerLS)
	w(&fr.DeliveredML, f.Hole.DeliveredML)
	w(&fr.MLPerKg, f.Hole.MLPerKg)
	w(&fr.PlateauCmH2O, f.PlateauCmH2O)
}

// openToward opens the ranges on the sides a corner (dp, de) with no
// solution would have widened: the end reading sets C (lower end, higher
// C, larger volume, lower plateau), the gap between peak and end sets R
// (wider gap, higher R; an unchanged gap could go either way).
func (fr *FitRanges) openToward(dp, de float64) {
	side := func(open *[2]bool, up bool) {
		if up {
			open[1] = true
		} else {
			open[0] = true
		}
	}
	side(&fr.OpenC, de < 0)
	side(&fr.OpenVt, de < 0)
	side(&fr.OpenPlateau, de > 0)
	switch {
	case fr.EndOnly:
	case dp-de > 0:
		fr.OpenR[1] = true
	case dp-de < 0:
		fr.OpenR[0] = true
	default:
		fr.OpenR = [2]bool{true, true}
	}
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
	cross := func(id CautionID, what string, r [2]float64, open [2]bool) {
		rule := cautionRule(id)
		l := rule.Limits[0]
		if (r[0] < l.Value || open[0]) && (r[1] > l.Value || open[1]) {
			out = append(out, Caution{ID: id, Level: l.Level, Value: r[1], Limit: l.Value, Unit: l.Unit,
				Message: fmt.Sprintf("within the manometer's %s cmH2O step the %s may be %s %s, across the limit of %s",
					plain(fr.StepCmH2O.Value), what, RangeText(r, open, Sig2), l.Unit, plain(l.Value)),
				Advice: "re-read the manometer more finely or measure a plateau (hold at end of inspiration) before relying on the fit",
				Source: rule.Source})
		}
	}
	cross(CautionRangeCrossesVt8, "tidal volume", fr.MLPerKg, fr.OpenVt)
	cross(CautionRangeCrossesVt10, "tidal volume", fr.MLPerKg, fr.OpenVt)
	cross(CautionRangeCrossesVt4, "tidal volume", fr.MLPerKg, fr.OpenVt)
	cross(CautionRangeCrossesPlateau30, "plateau pressure", fr.PlateauCmH2O, fr.OpenPlateau)
	cross(CautionRangeCrossesPlateau35, "plateau pressure", fr.PlateauCmH2O, fr.OpenPlateau)
	return out
}

// Sig2 prints v to 2 significant figures as a plain decimal (a fit from
// readings to 1 cmH2O is not known better).
func Sig2(v float64) string {
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
