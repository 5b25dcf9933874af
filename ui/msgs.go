package ui

import tea "github.com/charmbracelet/bubbletea"

// Panels tell the root what they want with these messages, returned as
// commands; the root handles each in one named method.
type (
	entryChanged      struct{}              // an entry changed: recompute
	advanceRequested  struct{}              // on to the next panel
	pickRequested     struct{}              // open the profile picker
	recordRequested   struct{}              // record the handover check
	cardRequested     struct{}              // show the handover card
	historyRequested  struct{}              // show the bed's earlier checks
	stepTakeRequested struct{}              // fill the proposal with the protocol's step
	benchChosen       struct{ path string } // refit the calibration from this file
	refitWriteRequest struct{}              // save the previewed refit
	sheetRequested    struct{ check bool }  // show the bedside sheet (of the check, or the plan)
	pacingRequested   struct{ check bool }  // open the pacing view (of the check, or the plan)
)

// ask wraps a message as a command.
func ask(msg tea.Msg) tea.Cmd { return func() tea.Msg { return msg } }
