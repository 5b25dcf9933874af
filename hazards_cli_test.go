package main

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestPlanCommandsOfTheHazards(t *testing.T) {
	// Flowmeters top out at 15 L/min (common practice); this plan's piston
	// draws 21.7 L/min, so FiO2 1.0 is not reached: 0.21 + 0.79 x 15 /
	// 21.68 = 0.76 (derived).
	r := crankside(t, "plan", "--height-cm", "200", "--sex", "male", "--ml-per-kg", "8", "--rate", "30", "--fio2", "1.0")
	require.Contains(t, r.stdout, "STOP  o2-flow-above-flowmeter: the O2 bleed 21.7 L/min for FiO2 1.00 is above the flowmeter's maximum 15 L/min: at 15 L/min the FiO2 reaches only 0.76")
	require.NotContains(t, r.stdout, "SET THE MACHINE")
	// 130 cm female: PBW 25.1 kg; demo-a's smallest hole gives 9.2 mL/kg
	// (ARDS Network 2000: at most 8).
	r = crankside(t, "plan", "--height-cm", "130", "--sex", "female")
	require.Contains(t, r.stdout, "STOP  no-suitable-hole: the smallest hole (1) gives 9.2 mL/kg PBW, above 8")
	require.NotContains(t, r.stdout, "SET THE MACHINE")
	require.Contains(t, r.stdout, "the PBW formula and this unit are for adults")
	require.NotContains(t, r.stdout, "consider a smaller hole")
}

func TestCheckBreathingAgainstTheUnit(t *testing.T) {
	args := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4"}
	r := crankside(t, append(args, "--breathing-against")...)
	require.Contains(t, r.stdout, "STOP patient-triggering: the patient is breathing against the unit")
	r = crankside(t, append(args, "--breathing-against=false")...)
	require.NotContains(t, r.stdout, "patient-triggering")
	r = crankside(t, append(args, "--cylinder-reserve-bar", "0")...)
	require.Equal(t, 2, r.status)
	require.True(t, strings.Contains(r.stderr, "cylinder-reserve-bar"), r.stderr)
}
