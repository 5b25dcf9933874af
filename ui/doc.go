// Package ui is crankside's full-screen terminal UI (bubbletea v1,
// bubbles, lipgloss). It only shows and asks: every number on screen comes
// from package setup, recomputed as the user types.
//
// One root Model routes messages to one child per panel (patient, targets,
// machine, setting, cautions) and to the overlays (full help, profile
// picker). Key presses go to the focused child only after the root has
// asked whether a text field has focus, so a letter typed into a field
// never switches panels or quits. Styles are built once (NewStyles) and
// passed down; colour only repeats what a word already says.
package ui
