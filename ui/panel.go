package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/help"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"crankside/profiles"
	"crankside/setup"
)

// outcome is what setup computed for the current entries, shared by every
// panel. plan is nil while an entry is missing or invalid; waiting says why.
type outcome struct {
	plan    *setup.Plan
	trace   *setup.Trace
	waiting []string
	profile profiles.Profile
	source  profiles.Source
	summary *setup.ProfileSummary
	loadErr string // the last profile that could not be loaded

	// The handover check of what the machine is set to; nil while waiting.
	check        *setup.Check
	checkJSON    setup.CheckJSON // check's report body, built once per recompute
	checkWaiting []string
	// readingStops are the manometer readings' own cautions, then the
	// blood gas's, judged while the check still waits for other entries.
	readingStops []setup.Caution
	checkLung    string // the lung condition the check's assumed mechanics are for
	// started says which record the check was started from, and
	// changedFromRecord what the entries now hold otherwise.
	started           string
	changedFromRecord []string
	// toConfirm are the setting's entries filled from a record that
	// nobody has yet confirmed or changed at the machine (their labels).
	toConfirm []string
	fromAt    string // "from the record at 14:05 UTC"
	saveNote  string // the last record's outcome, shown on the handover panel
	// logNote says where the screen records checks and whether it can.
	logNote string
	// unitNote says why the gas unit chosen is not kept between runs (a
	// preferences file refused or not written); "" when all is well.
	unitNote string
}

// panel is one child of the root model.
type panel interface {
	tea.Model
	help.KeyMap
	SetSize(w, h int)
	Focus() tea.Cmd
	Blur()
	// Editing is true while one of the panel's fields has the focus: the
	// root then sends it the keys that type; elsewhere they are refused.
	Editing() bool
	Title() string
	SetOutcome(o *outcome)
}

// truncate cuts a styled line to w cells; it is kept for the one-line
// strips (title bar, help line), never for safety text, which wraps.
func truncate(s string, w int) string {
	if w <= 0 {
		return ""
	}
	return ansi.Truncate(s, w, "…")
}

// wrapBlock wraps every line of a block to w cells, at spaces where it can.
func wrapBlock(s string, w int) []string {
	if w <= 0 {
		return nil
	}
	var out []string
	for _, l := range strings.Split(s, "\n") {
		if ansi.StringWidth(l) <= w {
			out = append(out, l)
			continue
		}
		if ansi.StringWidth(strings.TrimRight(ansi.Strip(l), " ")) <= w {
			// Only padding overflows: drop it, nothing is lost.
			out = append(out, ansi.Truncate(l, w, ""))
			continue
		}
		if w <= 8 {
			out = append(out, strings.Split(ansi.Wrap(l, w, ""), "\n")...)
			continue
		}
		// Continuation lines are indented, so a wrapped line reads as one.
		for i, c := range strings.Split(ansi.Wrap(l, w-4, ""), "\n") {
			if i > 0 {
				c = "    " + c
			}
			out = append(out, c)
		}
	}
	return out
}

// fit wraps a block to w and shows h lines of it from line off, with a
// marker on the first or last line when more lies above or below. It
// never cuts a line short.
func fit(s string, w, h int) string {
	return strings.Join(window(wrapBlock(s, w), h, 0), "\n")
}

// window shows h lines from off (clamped), marking what is hidden.
func window(lines []string, h, off int) []string {
	if h <= 0 {
		return nil
	}
	if len(lines) <= h {
		return lines
	}
	off = min(max(off, 0), len(lines)-h)
	out := append([]string(nil), lines[off:off+h]...)
	if off > 0 {
		out[0] = fmt.Sprintf("^ %d more line%s above (PgUp)", off, plural(off))
	}
	if below := len(lines) - off - h; below > 0 {
		below++
		out[h-1] = fmt.Sprintf("v %d more line%s below (PgDn)", below, plural(below))
	}
	return out
}

// besideEachOther puts a column of lines, padded to w cells, beside
// another, two spaces apart: the cheap form of lipgloss.JoinHorizontal
// for text already wrapped to its width.
func besideEachOther(left []string, w int, right []string) string {
	n := max(len(left), len(right))
	var b strings.Builder
	for i := 0; i < n; i++ {
		l, r := "", ""
		if i < len(left) {
			l = left[i]
		}
		if i < len(right) {
			r = right[i]
		}
		b.WriteString(l)
		if pad := w - ansi.StringWidth(l); pad > 0 {
			b.WriteString(strings.Repeat(" ", pad))
		}
		b.WriteString("  " + r)
		if i < n-1 {
			b.WriteString("\n")
		}
	}
	return b.String()
}
