package ui

import (
	tea "github.com/charmbracelet/bubbletea"

	"crankside/setup"
)

// The gas unit chosen on the handover panel is kept between runs in the
// preferences file that the command read at the start (setup.Preferences);
// a changed choice is written by a command, off the UI's goroutine.

// prefsSavedMsg is what became of writing the preferences.
type prefsSavedMsg struct {
	gasUnit string
	err     error
}

// startUnits takes the preferences read at the start.
func (m *Model) startUnits(opts Options) {
	m.prefsPath = opts.PreferencesPath
	m.keptGasUnit = opts.Preferences.GasUnit
	if f := m.checkField("gas-unit"); f != nil && opts.Preferences.GasUnit != "" {
		f.SetValue(opts.Preferences.GasUnit)
	}
	m.out.unitNote = opts.PreferencesNote
	m.handover.showGasUnit()
}

// rememberGasUnit writes the gas unit when the choice changed from the one
// kept.
func (m *Model) rememberGasUnit() tea.Cmd {
	f := m.checkField("gas-unit")
	if f == nil || m.prefsPath == "" || f.Value() == m.keptGasUnit {
		return nil
	}
	path, unit := m.prefsPath, f.Value()
	m.keptGasUnit = unit
	return func() tea.Msg {
		return prefsSavedMsg{gasUnit: unit, err: setup.WritePreferences(path, setup.Preferences{GasUnit: unit})}
	}
}

func (m *Model) prefsSaved(msg prefsSavedMsg) {
	if msg.err != nil {
		m.keptGasUnit = ""
		m.out.unitNote = "the gas unit is not kept for the next start: " + msg.err.Error()
		return
	}
	m.out.unitNote = ""
}

// enteredLine echoes the entries typed in the ward's units, in the tool's.
func (p *handoverPanel) enteredLine(add func(string), ck *setup.Check) {
	if line := setup.ConversionLine(ck.Converted); line != "" {
		add(p.styles.Label.Render("Entered ") + p.styles.Value.Render(line))
	}
}

// showGasUnit puts the chosen unit in the labels of the gas entries.
func (p *handoverPanel) showGasUnit() {
	unit := "mmHg"
	if f := p.form.byName("gas-unit"); f != nil && f.Value() == setup.GasUnitKPa {
		unit = "kPa"
	}
	for _, g := range []struct{ name, label string }{{"pao2", "PaO2 "}, {"paco2", "PaCO2 "}} {
		if f := p.form.byName(g.name); f != nil {
			f.label, f.unit = g.label+unit, unit
		}
	}
}
