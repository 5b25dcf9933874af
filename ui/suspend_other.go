//go:build !unix

package ui

import tea "github.com/charmbracelet/bubbletea"

// keepTerminal has nothing to watch where there are no stop signals.
func keepTerminal(*tea.Program) (stop func()) { return func() {} }

// suspendSelf suspends through the program where it can.
func suspendSelf() tea.Msg { return tea.SuspendMsg{} }
