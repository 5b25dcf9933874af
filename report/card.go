package report

import (
	"crankside/physiology"
	"crankside/setup"
	"math"
	"strings"
)

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}

// wrap breaks text at spaces into lines of at most width; continuation
// lines are indented by four spaces.
func wrap(text string, width int) []string {
	var out []string
	for len(text) > width {
		cut := strings.LastIndexByte(text[:width], ' ')
		if cut <= 4 {
			cut = width
		}
		out = append(out, strings.TrimRight(text[:cut], " "))
		text = "    " + strings.TrimLeft(text[cut:], " ")
	}
	return append(out, text)
}

// checkedBy is who checked a record, for the card and the history.
func checkedBy(r setup.Record) string {
	by := r.Initials
	if by == "" {
		by = "(initials not given)"
	}
	if r.SecondInitials != "" {
		by += ", second check " + r.SecondInitials
	}
	return by
}

// secondSignatureLine is the card's line for a second signature when the
// proposal changes the hole or the PEEP, or "".
func secondSignatureLine(r setup.Record) string {
	if !setup.NeedsSecondSignature(r) {
		return ""
	}
	if r.SecondInitials != "" {
		return "Hole or PEEP changes: second check by " + r.SecondInitials + "  signature ____________"
	}
	return "Hole or PEEP changes: second checker ______  signature ____________"
}

// plain prints a number as a plain decimal, never an exponent.
func plain(v float64) string { return physiology.PlainNumber(v) }

// r4 rounds for the report: 4 decimals is far below any meaningful change.
func r4(v float64) float64 { return math.Round(v*1e4) / 1e4 }
