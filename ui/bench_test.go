package ui

import (
	"testing"

	tea "github.com/charmbracelet/bubbletea"
)

// keystrokes alternates typing the last digit of the height and deleting
// it, one Update and one View per iteration: each key recomputes the plan
// (or finds the entry incomplete) and redraws the screen.
func keystrokes(b *testing.B, w, h int) {
	m := newTestModel(b, map[string]string{"height-cm": "175", "sex": "male"})
	m.Update(tea.WindowSizeMsg{Width: w, Height: h})
	m.focusPanel(panelPatient)
	keys := []tea.KeyMsg{{Type: tea.KeyBackspace}, {Type: tea.KeyRunes, Runes: []rune("5")}}
	i := 0
	for b.Loop() {
		m.Update(keys[i%2])
		_ = m.View()
		i++
	}
}

// BenchmarkKeystroke is one key in the height field at 80x24.
func BenchmarkKeystroke(b *testing.B) { keystrokes(b, 80, 24) }

// BenchmarkKeystrokeWide is one key at 120x40, where the setting and its
// chart are drawn under the patient panel.
func BenchmarkKeystrokeWide(b *testing.B) { keystrokes(b, 120, 40) }

// BenchmarkFirstFrame is building the model and drawing the first screen.
func BenchmarkFirstFrame(b *testing.B) {
	p, src := demoProfile(b, "demo-a")
	for b.Loop() {
		m := New(Options{Profile: p, Source: src, Now: testNow})
		m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
		_ = m.View()
	}
}

// BenchmarkKeystroke200x60 is one key in a large window, where the chart
// is widest: it is drawn once per plan and size, not per key.
func BenchmarkKeystroke200x60(b *testing.B) { keystrokes(b, 200, 60) }
