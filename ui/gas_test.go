package ui

import (
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

// The bed at 80x24: SpO2 87 %, pH 7.24, PaCO2 61 mmHg on demo-a
// hole 8, 21 rpm, dwell 1.4 s. ARDS Network protocol card: SpO2 below 88
// and pH below 7.30 are each a warn. The handover panel says so above the
// figures, F5 lists both with their levels, and once recorded the ward's
// row names them (derived: S/F = 87 / 0.21 = 414, above Rice et al.'s 315).
func TestTheBloodGasOnEveryView(t *testing.T) {
	m, _ := handoverModel(t)
	setEntries(m, map[string]string{"bed": "B4", "initials": "ab", "hole": "8", "rpm": "21", "dwell-s": "1.4",
		"spo2": "87", "ph": "7.24", "paco2": "61"})
	require.NotNil(t, m.out.check, "%v", m.out.checkWaiting)
	require.Contains(t, screen(m), "Patient's gas: WARN low O2 (SpO2 87 %),")

	press(m, fkey(5))
	v := strings.Join(m.panels[panelCautions].(*cautionsPanel).lines(), "\n")
	require.Contains(t, v, "WARN oxygenation-low  value 87, limit 88 %")
	require.Contains(t, v, "WARN ph-low  value 7.24, limit 7.3 pH")

	press(m, fkey(6), ctrlS)
	press(m, tea.KeyMsg{Type: tea.KeyF7})
	v = screen(m)
	for _, want := range []string{"gas: WARN low O2", "(SpO2 87 %), WARN pH 7.24 low; S/F 414 none"} {
		require.Contains(t, v, want, "the ward at 80x24:\n%s", v)
	}
}

// While the check still waits (no patient yet), a pH below 7.15 (ARDS
// Network protocol card: the severe branch) is already a STOP on the
// panel and the status line, not "waiting".
func TestASeverelyAcidoticGasIsAStopWhileTheCheckWaits(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, fkey(6))
	setEntries(m, map[string]string{"bed": "B4", "hole": "8", "rpm": "21", "dwell-s": "1.4", "ph": "7.10", "paco2": "61"})
	require.Nil(t, m.out.check)
	v := screen(m)
	require.Contains(t, v, "STOP pH 7.10 is below 7.15: severe")
}

// setEntries fills handover fields by name, as typing would, and
// recomputes (the fields' own typing is tested in keys_test.go).
func setEntries(m *Model, e map[string]string) {
	for name, v := range e {
		m.checkField(name).SetValue(v)
	}
	m.entryChanged()
}
