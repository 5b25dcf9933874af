package ui

import (
	"testing"

	tea "github.com/charmbracelet/bubbletea"
)

// BenchmarkKeystroke is one digit typed into the height field: the plan
// and the breath are recomputed and the screen drawn, as on every key.
func BenchmarkKeystroke(b *testing.B) {
	m := newTestModel(b, map[string]string{"height-cm": "17", "sex": "male"})
	m.focusPanel(panelPatient)
	digit := tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("5")}
	back := tea.KeyMsg{Type: tea.KeyBackspace}
	for b.Loop() {
		m.Update(digit)
		_ = m.View()
		m.Update(back)
	}
}

// BenchmarkKeystrokeOnTheSetting is a key on the setting panel at 120x40,
// where the chart is largest.
func BenchmarkKeystrokeOnTheSetting(b *testing.B) {
	m := newTestModel(b, map[string]string{"height-cm": "175", "sex": "male"})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	m.focusPanel(panelPatient)
	m.patient.form.move(0)
	digit := tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("1")}
	back := tea.KeyMsg{Type: tea.KeyBackspace}
	for b.Loop() {
		m.Update(back)
		m.Update(digit)
		_ = m.View()
	}
}

// BenchmarkFirstFrame is building the model and drawing the first screen.
func BenchmarkFirstFrame(b *testing.B) {
	p, src := demoProfile(b, "demo-a")
	for b.Loop() {
		m := New(Options{Profile: p, Source: src, Now: testNow})
		m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
		_ = m.View()
	}
}
