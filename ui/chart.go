package ui

import (
	"fmt"
	"math"
	"strings"

	"github.com/NimbleMarkets/ntcharts/canvas"
	"github.com/NimbleMarkets/ntcharts/canvas/graph"
	"github.com/NimbleMarkets/ntcharts/linechart"
	"github.com/charmbracelet/x/ansi"

	"crankside/setup"
)

// breathChart draws one breath: circuit pressure over flow, against time,
// with the PEEP, plateau and relief-valve lines. Reference lines use their
// own characters (- PEEP, ~ plateau, = relief) so they read without colour.
func breathChart(tr *setup.Trace, w, h int, s *Styles) string {
	if tr == nil || w < 24 || h < 7 || len(tr.TimeS) < 2 {
		return ""
	}
	// The title and each chart's unit line take a line each; the legend
	// up to three.
	legendLines := 3 + 3
	ph := (h - legendLines) * 3 / 5
	fh := h - legendLines - ph
	if ph < 4 || fh < 3 {
		return ""
	}
	period := tr.PeriodS

	maxP := math.Max(tr.PeakCmH2O*1.2, tr.PlateauCmH2O+5)
	limitShown := tr.ReliefCmH2O <= maxP*1.05
	if limitShown {
		maxP = math.Max(maxP, tr.ReliefCmH2O+2)
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
		ref(&pc, tr.ReliefCmH2O, '=')
	}
	drawSeries(&pc, tr.TimeS, tr.CircuitCmH2O, s)

	minF, maxF := 0.0, 0.0
	for _, f := range tr.PatientLPerMin {
		minF, maxF = math.Min(minF, f), math.Max(maxF, f)
	}
	fc := linechart.New(w, fh, 0, period, minF*1.1, maxF*1.1+1e-9, linechart.WithXYSteps(6, 2), yLabel, xLabel, styles)
	fc.DrawXYAxisAndLabel()
	ref(&fc, 0, '.')
	drawSeries(&fc, tr.TimeS, tr.PatientLPerMin, s)

	limit := fmt.Sprintf("=relief %.0f", tr.ReliefCmH2O)
	if !limitShown {
		limit = fmt.Sprintf("relief %.0f off scale", tr.ReliefCmH2O)
	}
	legend := wrapWords(w, "cmH2O:", fmt.Sprintf("-PEEP %.0f", tr.PEEPCmH2O), fmt.Sprintf("~plateau %.1f", tr.PlateauCmH2O), limit,
		"|", fmt.Sprintf("%.1f L/min still out at next breath", tr.EndExpiratoryLPerMin))
	for i := range legend {
		legend[i] = s.Label.Render(legend[i])
	}
	title := s.Section.Render(ansi.Truncate("ONE BREATH against time", w, ""))
	unit := func(u string) string { return s.Label.Render(u) }
	return strings.Join([]string{title, unit("cmH2O circuit pressure"), pc.View(), unit("L/min patient flow"), withXUnit(fc.View(), w, s),
		strings.Join(legend, "\n")}, "\n")
}

// withXUnit puts the time axis's unit after its last label ("3.1  s"),
// or on a line of its own when the labels leave no room.
func withXUnit(chart string, w int, s *Styles) string {
	lines := strings.Split(chart, "\n")
	last := strings.TrimRight(lines[len(lines)-1], " ")
	if ansi.StringWidth(last)+3 <= w {
		lines[len(lines)-1] = last + s.Label.Render("  s")
		return strings.Join(lines, "\n")
	}
	return chart + "\n" + s.Label.Render("time, s")
}

// drawSeries draws a trace in braille on one grid for the whole series,
// then puts the grid on the chart once: drawing segment by segment would
// rebuild the grid for every segment.
func drawSeries(c *linechart.Model, xs, ys []float64, s *Styles) {
	grid := graph.NewBrailleGrid(c.GraphWidth(), c.GraphHeight(), c.MinX(), c.MaxX(), c.MinY(), c.MaxY())
	prev := grid.GridPoint(canvas.Float64Point{X: xs[0], Y: ys[0]})
	for i := 1; i < len(xs); i++ {
		p := grid.GridPoint(canvas.Float64Point{X: xs[i], Y: ys[i]})
		if p == prev {
			continue
		}
		for _, q := range graph.GetLinePoints(prev, p) {
			grid.Set(q)
		}
		prev = p
	}
	grid.Set(prev)
	graph.DrawBraillePatterns(&c.Canvas, canvas.Point{X: c.Origin().X + 1, Y: 0}, grid.BraillePatterns(), s.ChartTrace)
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
