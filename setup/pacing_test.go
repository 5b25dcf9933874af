package setup_test

import (
	"errors"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/setup"
)

// TestPacerPhaseAtAClockTime: one turn 2.86 s and a pause 1.40 s (issue
// 23's example), period 4.26 s (derived). At 1.00 s: TURN, 1.86 s left,
// breath 1; at 3.00 s: PAUSE, 1.26 s left; at 4.26 s: breath 2 begins,
// TURN, 2.86 s left; at 43.00 s: 10 whole periods are 42.60 s, so breath
// 11, TURN, 2.46 s left; at 45.70 s: 3.10 s into breath 11, PAUSE, 1.16 s.
func TestPacerPhaseAtAClockTime(t *testing.T) {
	p := setup.Pacer{TurnS: 2.86, PauseS: 1.40}
	start := time.Date(2026, 12, 2, 3, 0, 0, 0, time.UTC)
	cases := []struct {
		at     float64
		phase  string
		left   float64
		breath int
	}{
		{0, setup.PhaseTurn, 2.86, 1},
		{1, setup.PhaseTurn, 1.86, 1},
		{2.859, setup.PhaseTurn, 0.001, 1},
		{2.861, setup.PhasePause, 1.399, 1},
		{3, setup.PhasePause, 1.26, 1},
		{4.26, setup.PhaseTurn, 2.86, 2},
		{43, setup.PhaseTurn, 2.46, 11},
		{45.7, setup.PhasePause, 1.16, 11},
		{-5, setup.PhaseTurn, 2.86, 1}, // a clock before the start is the start
	}
	for _, c := range cases {
		now := start.Add(time.Duration(c.at * float64(time.Second)))
		st := p.At(start, now)
		require.Equal(t, c.phase, st.Phase, "at %v s", c.at)
		require.InDelta(t, c.left, st.LeftS, 1e-6, "at %v s", c.at)
		require.Equal(t, c.breath, st.Breath, "at %v s", c.at)
	}
	// derived: 60 / 4.26 = 14.08 breaths a minute.
	require.InDelta(t, 14.085, p.PerMinute(), 0.001)
}

// TestPacerOfAPlan: the plan's rhythm is its timing (derived: 21 rpm is a
// 2.857 s turn, dwell 1.4 s); a plan with a stop has none.
func TestPacerOfAPlan(t *testing.T) {
	pl := plan(t, "demo-a", setup.Patient{HeightCm: 175, Sex: physiology.Male}, setup.Targets{})
	p, err := pl.Pacer()
	require.NoError(t, err)
	require.InDelta(t, 2.857, p.TurnS, 0.001)
	require.InDelta(t, 1.4, p.PauseS, 1e-9)
	require.InDelta(t, 1.4286, p.TiS, 0.001, "in-line: half the turn delivers (DESIGN)")
	require.Equal(t, "hole 8, 21 rpm, dwell 1.4 s", p.Setting, "the version 1 plan picks hole 8 (TestCheckOfAnObservedSetting)")
	stop := plan(t, "demo-a", setup.Patient{HeightCm: 175, Sex: physiology.Male}, setup.Targets{ComplianceMLPerCmH2O: 12})
	_, err = stop.Pacer()
	require.True(t, errors.Is(err, setup.ErrNoPacing))
}
