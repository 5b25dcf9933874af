package main

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestProtocolIsForARDSOnTheCommandLine(t *testing.T) {
	// The 201 cm obstructive patient at pH 7.10: the card's rate 35 is not
	// proposed (an obstructive lung needs time to exhale: common practice).
	args := []string{"check", "--height-cm", "201", "--sex", "male", "--lung", "obstructive", "--hole", "11", "--rpm", "21",
		"--dwell-s", "3", "--ph", "7.10", "--paco2", "80", "--spo2", "86"}
	obj := checkJSON(t, args...)
	require.Equal(t, map[string]string{"protocol-scope": "no-step", "oxygenation": "fired", "plateau": "in-goal", "ph": "no-step"}, ruleStatus(t, obj))
	p := stepProposed(obj)
	require.Equal(t, "11", p["hole"])
	require.Equal(t, 21.0, num(t, p, "motor_rpm"))
	require.Equal(t, 3.0, num(t, p, "dwell_s"), "the rate is not raised")
	require.Equal(t, 5.0, num(t, p, "peep_cmh2o"))
	r := crankside(t, args...)
	require.Contains(t, r.stdout, "NO STEP    protocol-scope: lung condition obstructive, goal the protocol is for ARDS")
	require.Contains(t, r.stdout, "for an obstructive lung the rate stays")
	require.NotContains(t, r.stdout, "-> 35 /min")
}

func TestPEEPStepsAtFiO2OneOnTheCommandLine(t *testing.T) {
	// ARDS Network card "1.0 / 18-24", walked in 2 cmH2O steps: PaO2 50
	// below 55 at FiO2 1.0 (15 L/min into at most 6.2 L/min drawn) and
	// PEEP 18 -> 20; PaO2 110 above 80 at PEEP 24 -> 22.
	base := []string{"check", "--height-cm", "175", "--sex", "male", "--lung", "ards", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--o2-lpm", "15"}
	for _, c := range []struct {
		peep, pao2 string
		want       float64
	}{{"18", "50", 20}, {"20", "50", 22}, {"22", "50", 24}, {"24", "110", 22}, {"22", "110", 20}, {"20", "110", 18}} {
		obj := checkJSON(t, append(base, "--peep", c.peep, "--pao2", c.pao2)...)
		require.Equal(t, c.want, num(t, stepProposed(obj), "peep_cmh2o"), "PEEP %s, PaO2 %s", c.peep, c.pao2)
	}
}

func TestHoldAlveolarVentilationSwitch(t *testing.T) {
	// Vt above 6 with the plateau in goal: the card's step towards 6; the
	// tool's own rate rule can be switched off.
	base := []string{"check", "--height-cm", "175", "--sex", "male", "--lung", "ards", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--spo2", "92"}
	on := checkJSON(t, base...)
	require.Equal(t, "fired", ruleStatus(t, on)["alveolar-ventilation"])
	off := checkJSON(t, append(base, "--hold-alveolar-ventilation=false")...)
	require.Equal(t, "no-step", ruleStatus(t, off)["alveolar-ventilation"])
	require.Equal(t, 21.0, num(t, stepProposed(off), "motor_rpm"))
	require.Equal(t, 1.4, num(t, stepProposed(off), "dwell_s"))
}
