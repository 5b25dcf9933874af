package physiology

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestVtStepsTowardsSixWhenThePlateauAllows(t *testing.T) {
	// ARDS Network protocol card: Vt to 6 mL/kg PBW in 1 mL/kg steps; the
	// plateau goal is <= 30.
	cases := []struct {
		name          string
		vt, plateau   float64
		status        RuleStatus
		want          float64
		actionHasWord string
	}{
		{"Vt 8, plateau 26: 7", 8, 26, RuleFired, 7, "towards 6"},
		{"Vt 8, plateau 30 (at the goal): 7", 8, 30, RuleFired, 7, "towards 6"},
		{"Vt 8, plateau 30.01 (above): 7 by the plateau rule", 8, 30.01, RuleFired, 7, "above goal"},
		{"Vt 7, plateau 26: 6", 7, 26, RuleFired, 6, "towards 6"},
		{"Vt 6.5: 6, not 5.5", 6.5, 26, RuleFired, 6, "towards 6"},
		{"Vt 6.04 shown as 6.0: in goal", 6.04, 26, RuleInGoal, 6.04, "in goal"},
		{"Vt 6.05 shown as 6.1: 6", 6.05, 26, RuleFired, 6, "towards 6"},
	}
	for _, c := range cases {
		st := ProtocolState{PBWKg: 70, MLPerKg: c.vt, RateBPM: 20, PEEPCmH2O: 8, FiO2: 0.5, PlateauCmH2O: c.plateau, Lung: ARDS}
		s, err := NextProtocolStep(st, GasReadings{SpO2Pct: ptr(92)})
		require.NoError(t, err)
		r := ruleOf(t, s, "plateau")
		require.Equal(t, c.status, r.Status, "%s: %s", c.name, r.Action)
		require.InDelta(t, c.want, s.MLPerKg, 1e-9, c.name)
		require.Contains(t, r.Action, c.actionHasWord, c.name)
	}
}

func TestTheProtocolIsForARDS(t *testing.T) {
	// An obstructive lung at pH 7.10: the card's rate 35 is not applied
	// (the lung needs time to exhale: common practice); the step says the
	// protocol is for ARDS.
	st := ProtocolState{PBWKg: 94.2, MLPerKg: 5.9, RateBPM: 10, PEEPCmH2O: 5, FiO2: 0.4, PlateauCmH2O: 20, Lung: Obstructive}
	s, err := NextProtocolStep(st, GasReadings{PH: ptr(7.10), PaCO2MmHg: ptr(80), SpO2Pct: ptr(86)})
	require.NoError(t, err)
	require.Equal(t, "protocol-scope", s.Rules[0].ID)
	require.Contains(t, s.Rules[0].Action, "this lung is obstructive")
	require.Contains(t, s.Rules[0].Action, "low rate and long expiration")
	require.False(t, s.RateChanged)
	require.False(t, s.VtChanged)
	require.False(t, s.PEEPChanged)
	require.Equal(t, 10.0, s.RateBPM)
	ph := ruleOf(t, s, "ph")
	require.Equal(t, RuleNoStep, ph.Status)
	require.Contains(t, ph.Action, "rate stays 10.0 /min")
	require.Contains(t, ph.Action, "accept a higher PaCO2 while the pH allows")
	require.Contains(t, ph.Action, "below 7.15: call the clinician now")
	// SpO2 86 below 88: FiO2 0.4 -> 0.5 alone (0.1 step, common practice).
	ox := ruleOf(t, s, "oxygenation")
	require.Equal(t, RuleFired, ox.Status)
	require.InDelta(t, 0.5, s.FiO2, 1e-9)
	require.Equal(t, 5.0, s.PEEPCmH2O)
	// Above goal (SpO2 97): 0.4 -> 0.3. In goal (SpO2 88, the edge): none.
	s, _ = NextProtocolStep(st, GasReadings{SpO2Pct: ptr(97)})
	require.InDelta(t, 0.3, s.FiO2, 1e-9)
	s, _ = NextProtocolStep(st, GasReadings{SpO2Pct: ptr(88)})
	require.False(t, s.Changed())
	// At FiO2 1.0 below goal: no step. A plateau above 30: no Vt step.
	st.FiO2, st.PlateauCmH2O = 1.0, 31
	s, _ = NextProtocolStep(st, GasReadings{SpO2Pct: ptr(80)})
	require.Equal(t, RuleNoStep, ruleOf(t, s, "oxygenation").Status)
	require.Equal(t, RuleNoStep, ruleOf(t, s, "plateau").Status)
	require.False(t, s.Changed())
	// A normal lung gets the same scope, and its own words for the pH.
	st = ProtocolState{PBWKg: 70, MLPerKg: 8, RateBPM: 14, PEEPCmH2O: 5, FiO2: 0.21, PlateauCmH2O: 20, Lung: Normal}
	s, _ = NextProtocolStep(st, GasReadings{PH: ptr(7.25), PaCO2MmHg: ptr(50)})
	require.Contains(t, s.Rules[0].Action, "this lung is normal")
	require.Contains(t, ruleOf(t, s, "ph").Action, "the clinician decides the rate")
	require.False(t, s.Changed(), "no Vt towards 6 and no rate outside ARDS")
	// The same patient as ARDS: the card's rules run.
	st.Lung = ARDS
	s, _ = NextProtocolStep(st, GasReadings{PH: ptr(7.25), PaCO2MmHg: ptr(50)})
	require.True(t, s.VtChanged)
	require.True(t, s.RateChanged)
	require.NotEqual(t, "protocol-scope", s.Rules[0].ID, "ARDS stated: no scope line")
}

func TestAlveolarHoldIsTheToolsOwnChoice(t *testing.T) {
	// Vt 8 -> 7 mL/kg of 70 kg (560 -> 490 mL), dead space 2.2 x 70 = 154
	// mL (Radford 1955, from memory): held, the rate is 20 x (560 - 154) /
	// (490 - 154) = 24.2 /min (derived); switched off it stays 20.
	st := ProtocolState{PBWKg: 70, MLPerKg: 8, RateBPM: 20, PEEPCmH2O: 8, FiO2: 0.5, PlateauCmH2O: 26, Lung: ARDS}
	s, err := NextProtocolStep(st, GasReadings{SpO2Pct: ptr(92)})
	require.NoError(t, err)
	hold := ruleOf(t, s, "alveolar-ventilation")
	require.Equal(t, RuleFired, hold.Status)
	require.InDelta(t, 24.2, s.RateBPM, 0.05)
	require.Contains(t, hold.Goal, "this tool's own rule, not the card's")
	require.Contains(t, hold.Source, "--hold-alveolar-ventilation=false")
	st.NoAlveolarHold = true
	s, err = NextProtocolStep(st, GasReadings{SpO2Pct: ptr(92)})
	require.NoError(t, err)
	require.False(t, s.RateChanged)
	require.Equal(t, 20.0, s.RateBPM)
	require.Equal(t, RuleNoStep, ruleOf(t, s, "alveolar-ventilation").Status)
	require.Contains(t, ruleOf(t, s, "alveolar-ventilation").Action, "switched off")
}

func TestVtStaysAbove6WhenThePHIsSevere(t *testing.T) {
	// ARDS Network card: below pH 7.15 the rate goes to 35 and Vt may rise;
	// the step towards 6 waits. At pH 7.15 (not below) it runs.
	st := ProtocolState{PBWKg: 70, MLPerKg: 7, RateBPM: 20, PEEPCmH2O: 8, FiO2: 0.5, PlateauCmH2O: 26, Lung: ARDS}
	s, err := NextProtocolStep(st, GasReadings{PH: ptr(7.14), PaCO2MmHg: ptr(60)})
	require.NoError(t, err)
	require.False(t, s.VtChanged)
	require.Equal(t, RuleNoStep, ruleOf(t, s, "plateau").Status)
	require.Contains(t, ruleOf(t, s, "plateau").Action, "below 7.15: Vt stays")
	require.Equal(t, 35.0, s.RateBPM)
	require.NotContains(t, ruleOf(t, s, "ph").Action, "took Vt down")
	s, err = NextProtocolStep(st, GasReadings{PH: ptr(7.15), PaCO2MmHg: ptr(60)})
	require.NoError(t, err)
	require.True(t, s.VtChanged)
	require.Equal(t, 6.0, s.MLPerKg)
}

// The other lungs' rules at their edges (ARDS Network protocol card: the
// plateau goal is 30 cmH2O or less, pH below 7.15 is the severe band; the
// FiO2 step for a lung the card is not for is this tool's own, 0.1 at a
// time, room air the lowest): a plateau of exactly 30 is in goal, a pH of
// exactly 7.15 is not called severe, a normal lung over the oxygenation
// goal on room air has no oxygen to take away. For ARDS at pH below 7.15
// a Vt above 6 stays at a plateau of exactly 30 (in goal: the card allows
// Vt up there, not down).
func TestOtherLungsAtTheirEdges(t *testing.T) {
	st := ProtocolState{PBWKg: 70, MLPerKg: 8, RateBPM: 14, PEEPCmH2O: 5, FiO2: 0.21, PlateauCmH2O: 30, Lung: Normal}
	s, err := NextProtocolStep(st, GasReadings{SpO2Pct: ptr(99), PH: ptr(7.15), PaCO2MmHg: ptr(60)})
	require.NoError(t, err)
	require.Equal(t, RuleInGoal, ruleOf(t, s, "plateau").Status, ruleOf(t, s, "plateau").Action)
	ox := ruleOf(t, s, "oxygenation")
	require.Equal(t, RuleNoStep, ox.Status, ox.Action)
	require.Equal(t, "above goal on room air: no oxygen to take away", ox.Action)
	require.False(t, s.FiO2Changed)
	require.Equal(t, 0.21, s.FiO2)
	require.NotContains(t, ruleOf(t, s, "ph").Action, "below 7.15")

	s, err = NextProtocolStep(st, GasReadings{PH: ptr(7.14), PaCO2MmHg: ptr(60)})
	require.NoError(t, err)
	require.Contains(t, ruleOf(t, s, "ph").Action, "below 7.15: call the clinician now")

	ards := ProtocolState{PBWKg: 70, MLPerKg: 7, RateBPM: 20, PEEPCmH2O: 8, FiO2: 0.5, PlateauCmH2O: 30, Lung: ARDS}
	s, err = NextProtocolStep(ards, GasReadings{PH: ptr(7.10), PaCO2MmHg: ptr(70)})
	require.NoError(t, err)
	require.False(t, s.VtChanged, ruleOf(t, s, "plateau").Action)
	require.Equal(t, 7.0, s.MLPerKg)
}
