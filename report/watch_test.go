package report_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/report"
	"crankside/setup"
)

// TestTimingLine: 21 rpm and a 1.4 s dwell (demo-a's plan for the 175 cm
// man): one turn 60 / 21 = 2.857 s, period 4.257 s, 60 / 4.257 = 14.09
// breaths a minute, 10 breaths 42.57 s (derived). The line is the issue's
// own example (issue 23).
func TestTimingLine(t *testing.T) {
	tc := setup.TimingCheck{TurnS: 60.0 / 21, PauseS: 1.4, BreathsIn60S: 60 / (60.0/21 + 1.4), SecondsFor10Breaths: 10 * (60.0/21 + 1.4)}
	line := report.TimingLine(tc)
	require.Contains(t, line, "one turn 2.86 s, then a pause of 1.40 s; 14 breaths in one minute (14.1 /min)")
	require.Contains(t, line, "10 breaths take 42.6 s")
}
