package ui

import (
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

// Readings of 12/9 cmH2O on hole 8 fit a compliance no intubated adult
// has (above 150 mL/cmH2O; REFERENCES version 3, from memory): the screen
// heads the volume as an upper bound, in the panel and on the strip, and
// shows the fit's range open on the side no lung explains.
func TestALeakShowsTheVolumeAsAnUpperBound(t *testing.T) {
	m, _ := handoverModel(t)
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 60})
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, runes("12"), enter, runes("9"))
	require.NotNil(t, m.out.check, "%v", m.out.checkWaiting)
	v := screen(m)
	require.Contains(t, v, "the readings suggest a leak: every volume here is an upper bound")
	require.Contains(t, v, "AT MOST")
	require.NotContains(t, v, "PATIENT GETS ")
	require.Contains(t, v, "| at most 4")
	press(m, tea.KeyMsg{Type: tea.KeyPgDown}, tea.KeyMsg{Type: tea.KeyPgDown})
	v = screen(m)
	require.Contains(t, v, "-open")
	require.Contains(t, v, "from the manometer's step alone")
}
