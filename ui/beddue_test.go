package ui

import (
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

// TestStatusLineNextCheckDue: once the bed's record is known the handover
// status line says how long ago it was checked and when the next check is
// due; past the interval it says OVERDUE (4 h, common practice). A second
// screen on the same log finds the record by the bed's label.
func TestStatusLineNextCheckDue(t *testing.T) {
	m, logPath := handoverModel(t)
	clock := testNow()
	m.now = func() time.Time { return clock }
	press(m, runes("B4"), enter, runes("ab"), enter, runes("7"), enter, runes("21"), enter, runes("1.4"))
	require.NotNil(t, m.out.check)
	require.NotContains(t, screen(m), "checked", "no record of B4 yet: nothing said until the log is read")
	runCmd(m, press(m, ctrlS))
	m.note = ""
	clock = clock.Add(80 * time.Minute)
	require.Contains(t, screen(m), "B4 checked 1 h 20 min ago, next due")
	clock = clock.Add(3 * time.Hour)
	require.Contains(t, screen(m), "B4 OVERDUE: checked 4 h 20 min ago (every 4 h)")

	// Another screen on the same log: typing the bed reads its record.
	p, src := demoProfile(t, "demo-a")
	n := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: func() time.Time { return clock }, LogPath: logPath,
		Prefill: map[string]string{"height-cm": "175", "sex": "male"}, Every: 6 * time.Hour})
	n.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(n, fkey(6), runes("b4"), enter, runes("ab"), enter, runes("7"), enter, runes("21"), enter, runes("1.4"))
	require.True(t, n.due.known)
	require.Contains(t, screen(n), "B4 checked 4 h 20 min ago, next due")
}
