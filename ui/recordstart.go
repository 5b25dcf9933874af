package ui

import (
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

// settingEntries are what the machine is set to: a check started from a
// record holds the record's values here until each is confirmed (Enter)
// or changed at the machine.
var settingEntries = []string{"hole", "rpm", "dwell-s", "peep", "o2-lpm"}

// appliedQuestion is asked once when a check is started from a record
// that carried a proposal: was the proposal applied?
type appliedQuestion struct {
	rec setup.Record
}

// appliedKeys answer the question.
var (
	appliedYes = key.NewBinding(key.WithKeys("ctrl+y"), key.WithHelp("ctrl+y", "proposal applied"))
	appliedNo  = key.NewBinding(key.WithKeys("ctrl+n"), key.WithHelp("ctrl+n", "not applied"))
)

// appliedText is the question, on the status line and the panel.
func (q *appliedQuestion) text() string {
	return "The record at " + setup.LocalClock(q.rec.Time) + " proposed " + safetext.Escape(report.ProposalLine(q.rec)) +
		". Was it applied? Ctrl+Y yes (fill it in), Ctrl+N no"
}

// ask puts the question at the top of the handover panel; the status line
// says it in short.
func (q *appliedQuestion) ask(m *Model) {
	m.handoverNote(m.styles.Error.Render(q.text()))
}

// short is the question on the status line.
func (q *appliedQuestion) short() string {
	return "Was the last record's proposal applied (F6 shows it)? Ctrl+Y yes, Ctrl+N no"
}

// appliedKey answers the question; until then no other key acts but quit.
func (m *Model) appliedKey(msg tea.KeyMsg) tea.Cmd {
	switch {
	case key.Matches(msg, m.keys.Quit):
		return m.quit()
	case key.Matches(msg, appliedNo):
		m.applied = nil
		m.handoverNote(m.styles.Label.Render("The proposal was not applied: the entries are the setting found at the last check."))
		m.recompute()
	case key.Matches(msg, appliedYes):
		m.fillProposal(m.applied.rec)
		m.applied = nil
		m.handoverNote(m.styles.Label.Render("The proposal was applied: the entries are the proposed setting."))
		m.recompute()
	default:
		m.note = "answer first: was the proposal applied? Ctrl+Y yes, Ctrl+N no"
	}
	return nil
}

// fillProposal puts the record's proposed setting in the setting's
// entries, still to be confirmed at the machine, and compares what is
// found with it from now on.
func (m *Model) fillProposal(r setup.Record) {
	e := setup.ProposedEntries(r)
	at := "from the proposal of the record at " + setup.LocalClock(r.Time)
	for _, name := range settingEntries {
		f := m.checkField(name)
		f.SetValue(e[name])
		f.from, f.unconfirmed = at, true
	}
	m.fromRecord.entries, m.fromRecord.at = e, at
	m.fromRecord.label = strings.Replace(m.fromRecord.label, " started from", " started, the proposal applied, from", 1)
}

// toConfirm are the labels of the setting's entries still as the record
// gave them, neither confirmed nor changed.
func (m *Model) toConfirm() []string {
	if m.fromRecord == nil {
		return nil
	}
	var l []string
	for _, name := range settingEntries {
		if f := m.checkField(name); f.unconfirmed {
			l = append(l, f.label)
		}
	}
	return l
}
