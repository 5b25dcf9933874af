package ui

import (
	"fmt"
	"strings"
)

func f0(v float64) string { return fmt.Sprintf("%.0f", v) }
func f1(v float64) string { return fmt.Sprintf("%.1f", v) }
func f2(v float64) string { return fmt.Sprintf("%.2f", v) }

// kv is one "label  value unit" line.
func (s Styles) kv(label, value, unit string) string {
	if len(label) >= 16 {
		label += " " // a long label still keeps its value apart
	}
	line := s.Label.Render(fmt.Sprintf("%-16s", label)) + s.Value.Render(value)
	if unit != "" {
		line += " " + s.Unit.Render(unit)
	}
	return line
}

// waitingView is what a figure panel shows while an entry is missing or
// invalid: the reasons, never the figures of an earlier entry.
func (s Styles) waitingView(reasons []string) string {
	var b strings.Builder
	b.WriteString(s.Waiting.Render("WAITING: figures appear when every entry can be used"))
	for _, r := range reasons {
		b.WriteString("\n" + s.Error.Render("  ! "+r))
	}
	return b.String()
}
