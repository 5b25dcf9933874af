package ui

import (
	"fmt"
	"math"
	"strings"

	"github.com/NimbleMarkets/ntcharts/canvas"
	"github.com/NimbleMarkets/ntcharts/linechart"

	"crankside/setup"
)

// breathChart draws one breath: circuit pressure over flow, against time,
// with the PEEP, plateau and limit lines. Reference lines use their own
// characters (- PEEP, ~ plateau, = limit) so they read without colour.
func breathChart(tr *setup.Trace, w, h int, s *Styles) string {
	if tr == nil || w < 24 || h < 7 || len(tr.TimeS) < 2 {
		return ""
	}
	legendLines := 3
	ph := (h - legendLines) * 3 / 5
	fh := h - legendLines - ph
	if ph < 4 || fh < 3 {
		return ""
	}
	period := tr.PeriodS

	maxP := math.Max(tr.PeakCmH2O*1.2, tr.PlateauCmH2O+5)
	limitShown := tr.LimitCmH2O <= maxP*1.05
	if limitShown {
		maxP = math.Max(maxP, tr.LimitCmH2O+2)
	}
	yLabel := linechart.WithYLabelFormatter(func(_ int, v float64) string { return fmt.Sprintf("%4.0f", v) })
	xLabel := linechart.WithXLabelFormatter(func(_ int, v float64) string { return fmt.Sprintf("%.1f", v) })
	styles := linechart.WithStyles(s.ChartAxis, s.ChartRef, s.ChartTrace)

	pc := linechart.New(w, ph, 0, period, 0, maxP, linechart.WithXYSteps(0, 2), yLabel, styles)
	pc.DrawXYAxisAndLabel()
	ref := func(c *linechart.Model, y float64, r rune) {
		c.DrawRuneLineWithStyle(canvas.Float64Point{X: 0, Y: y}, canvas.Float64Point{X: period, Y: y}, r, s.ChartRef)
	}
	ref(&pc, tr.PEEPCmH2O, '-')
	ref(&pc, tr.PlateauCmH2O, '~')
	if limitShown {
		ref(&pc, tr.LimitCmH2O, '=')
	}
	drawSeries(&pc, tr.TimeS, tr.CircuitCmH2O, w, s)

	minF, maxF := 0.0, 0.0
	for _, f := range tr.PatientLPerMin {
		minF, maxF = math.Min(minF, f), math.Max(maxF, f)
	}
	fc := linechart.New(w, fh, 0, period, minF*1.1, maxF*1.1+1e-9, linechart.WithXYSteps(6, 2), yLabel, xLabel, styles)
	fc.DrawXYAxisAndLabel()
	ref(&fc, 0, '.')
	drawSeries(&fc, tr.TimeS, tr.PatientLPerMin, w, s)

	limit := fmt.Sprintf("=limit %.0f", tr.LimitCmH2O)
	if !limitShown {
		limit = fmt.Sprintf("limit %.0f off scale", tr.LimitCmH2O)
	}
	legend := wrapWords(w, "cmH2O:", fmt.Sprintf("-PEEP %.0f", tr.PEEPCmH2O), fmt.Sprintf("~plateau %.1f", tr.PlateauCmH2O), limit,
		"| L/min by s;", fmt.Sprintf("%.1f L/min still out at next breath", tr.EndExpiratoryLPerMin))
	for i := range legend {
		legend[i] = s.Label.Render(legend[i])
	}
	return strings.Join([]string{pc.View(), fc.View(), fit(strings.Join(legend, "\n"), w, legendLines)}, "\n")
}

// drawSeries draws a trace in braille, a few samples per column.
func drawSeries(c *linechart.Model, xs, ys []float64, w int, s *Styles) {
	step := max(1, len(xs)/(4*w))
	prev := canvas.Float64Point{X: xs[0], Y: ys[0]}
	for i := step; i < len(xs); i += step {
		p := canvas.Float64Point{X: xs[i], Y: ys[i]}
		c.DrawBrailleLineWithStyle(prev, p, s.ChartTrace)
		prev = p
	}
	last := canvas.Float64Point{X: xs[len(xs)-1], Y: ys[len(ys)-1]}
	if last != prev {
		c.DrawBrailleLineWithStyle(prev, last, s.ChartTrace)
	}
}

// wrapWords joins words into lines no wider than w.
func wrapWords(w int, words ...string) []string {
	var lines []string
	line := ""
	for _, word := range words {
		switch {
		case line == "":
			line = word
		case len(line)+1+len(word) <= w:
			line += " " + word
		default:
			lines = append(lines, line)
			line = word
		}
	}
	return append(lines, line)
}
