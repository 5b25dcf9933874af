package ui

import (
	"testing"
	"unicode/utf8"

	tea "github.com/charmbracelet/bubbletea"
)

// FuzzTyping types arbitrary text into every panel, as keys and as a
// paste: no panic, and the screen is always drawn.
func FuzzTyping(f *testing.F) {
	f.Add("175\rm4", false)
	f.Add("١٧٥\x00\x1b[2J\t\t\tB4\rab\r8\r21\r1.4", true)
	f.Add("3b/nonexistent.csv\r", false)
	f.Fuzz(func(t *testing.T, text string, paste bool) {
		if !utf8.ValidString(text) || len(text) > 2000 {
			return
		}
		m := newTestModel(t, nil)
		for panel := 0; panel < len(m.panels); panel++ {
			m.focusPanel(panel)
			if paste {
				m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(text), Paste: true})
			} else {
				for _, r := range text {
					switch r {
					case '\r':
						m.Update(tea.KeyMsg{Type: tea.KeyEnter})
					case '\t':
						m.Update(tea.KeyMsg{Type: tea.KeyTab})
					case 'q', 3: // quitting would end the run; it is tested elsewhere
					default:
						m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
					}
				}
			}
			if m.View() == "" {
				t.Fatal("empty view")
			}
		}
	})
}
