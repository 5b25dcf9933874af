package ui

import (
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

var (
	ctrlE = tea.KeyMsg{Type: tea.KeyCtrlE}
	ctrlK = tea.KeyMsg{Type: tea.KeyCtrlK}
)

// TestSheetKeys: Ctrl+E on the Setting panel shows the plan's sheet, on the
// Handover panel the check's (with the record's time and the next check
// due once recorded); elsewhere it says where it works.
func TestSheetKeys(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male"})
	press(m, fkey(1), ctrlE)
	require.Nil(t, m.overlay)
	require.Contains(t, m.note, "ctrl+e bedside sheet: on F4 Setting")
	press(m, fkey(4), ctrlE)
	require.NotNil(t, m.overlay)
	require.Contains(t, screen(m), "Bedside sheet of the plan")
	require.Contains(t, m.overlay.text, "SET THE EXTERNAL PRESSURE ALARM")
	press(m, esc)
	require.Nil(t, m.overlay)

	h, _ := handoverModel(t)
	press(h, runes("B4"), enter, runes("ab"), enter, runes("7"), enter, runes("21"), enter, runes("1.4"))
	require.NotNil(t, h.out.check)
	press(h, ctrlE)
	require.NotNil(t, h.overlay)
	require.Contains(t, h.overlay.text, "bed B4")
	require.NotContains(t, h.overlay.text, "CHECKS (every", "not recorded yet: no schedule")
	press(h, esc)
	runCmd(h, press(h, ctrlS))
	press(h, ctrlE)
	require.Contains(t, h.overlay.text, "CHECKS (every 4 h")
	require.Contains(t, h.overlay.text, "next check due")
}
