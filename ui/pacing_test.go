package ui

import (
	"bytes"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

// TestPacingFollowsTheClock: the view's phase, time left and breath come
// from the injected clock at each tick, whatever the number of ticks.
// derived: demo-a's plan for the 175 cm man is 21 rpm (a 2.857 s turn) and
// a 1.4 s dwell, period 4.257 s. At +1 s: TURN, 1.9 s left, breath 1; at
// +3 s: PAUSE, 1.3 s left (4.257 - 3); at +9 s: breath 3 (2 periods are
// 8.514 s), TURN, 2.4 s left (2.857 - 0.486).
func TestPacingFollowsTheClock(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male"})
	clock := testNow()
	m.now = func() time.Time { return clock }
	var bell bytes.Buffer
	m.bellOut = &bell
	press(m, fkey(4))
	_, cmd := m.Update(ctrlK)
	_, cmd = m.Update(cmd())
	require.NotNil(t, m.pacing)
	require.NotNil(t, cmd, "the first tick is asked for")
	gen := m.pacing.gen
	at := func(s float64) string {
		clock = m.pacing.start.Add(time.Duration(s * float64(time.Second)))
		cmd := m.pacingTicked(pacingTick{gen: gen})
		require.NotNil(t, cmd, "the next tick")
		if msg, ok := cmd().(tea.BatchMsg); ok {
			for _, c := range msg {
				c()
			}
		}
		return screen(m)
	}
	v := at(1)
	require.Contains(t, v, "TURN: 1.9 s left")
	require.Contains(t, v, "breath 1")
	require.Contains(t, v, "█████  █   █  ████   █   █", "TURN in large letters")
	v = at(3)
	require.Contains(t, v, "PAUSE: 1.3 s left")
	require.Contains(t, v, "████    ███   █   █   ████  █████", "PAUSE in large letters")
	require.Zero(t, bell.Len(), "no bell unless asked")
	press(m, tea.KeyMsg{Type: tea.KeyCtrlG})
	require.Contains(t, screen(m), "Bell at each turn: on")
	v = at(9)
	require.Contains(t, v, "TURN: 2.4 s left")
	require.Contains(t, v, "breath 3")
	require.Equal(t, "\a", bell.String(), "one bell at the new turn")
	at(9.5)
	require.Equal(t, "\a", bell.String(), "no bell within a turn")
	// A tick of an older view does nothing; a typing key is refused.
	require.Nil(t, m.pacingTicked(pacingTick{gen: gen - 1}))
	press(m, runes("x"))
	require.Contains(t, m.note, "pacing view takes Esc")
	press(m, esc)
	require.Nil(t, m.pacing)
	require.Nil(t, m.pacingTicked(pacingTick{gen: gen}), "the chain stops once closed")
}

// TestPacingRefusedForAStop: a plan with a stop gets no rhythm.
func TestPacingRefusedForAStop(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male", "compliance": "12"})
	press(m, fkey(4), ctrlK)
	require.Nil(t, m.pacing)
	require.Contains(t, m.note, "no rhythm is given for a setting with a stop")
}
