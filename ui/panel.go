package ui

import (
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
	checkWaiting []string
	saveNote     string // the last record's outcome, shown on the handover panel
}

// signals are what a panel asks of the root after a key.
type signals struct {
	changed bool   // an entry changed: recompute
	advance bool   // on to the next panel
	pick    bool   // open the profile picker
	save    bool   // record the handover check
	card    bool   // show the handover card
	history bool   // show the bed's earlier checks
	bench   string // refit the calibration from this bench file
	write   bool   // save the previewed refit
}

// panel is one child of the root model.
type panel interface {
	tea.Model
	help.KeyMap
	SetSize(w, h int)
	Focus() tea.Cmd
	Blur()
	// Editing is true while a text field has the cursor: the root then
	// sends it every printable key.
	Editing() bool
	Title() string
	SetOutcome(o *outcome)
	// Signals returns and clears what the last key asked for.
	Signals() signals
}

// truncate cuts a styled line to w cells.
func truncate(s string, w int) string {
	if w <= 0 {
		return ""
	}
	return ansi.Truncate(s, w, "…")
}

// fit cuts a block to w x h.
func fit(s string, w, h int) string {
	lines := strings.Split(s, "\n")
	if len(lines) > h {
		lines = lines[:max(h, 0)]
	}
	for i, l := range lines {
		lines[i] = truncate(l, w)
	}
	return strings.Join(lines, "\n")
}
