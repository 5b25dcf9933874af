package main

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestSheetCommands: the bedside sheet of a plan and of a stopwatch check
// fits 80 columns (issue 23); with --bed and --log the check's sheet gives
// the record's time and the next check due, and the plan's reads it back.
func TestSheetCommands(t *testing.T) {
	r := crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--sheet")
	require.Equal(t, 0, r.status, r.stderr)
	for _, l := range strings.Split(r.stdout, "\n") {
		require.LessOrEqual(t, len([]rune(l)), 80, l)
	}
	require.Contains(t, r.stdout, "BEDSIDE SHEET  unit demo-a")
	log := filepath.Join(t.TempDir(), "ward.jsonl")
	r = crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "7", "--turn-s", "2.86", "--pause-s", "1.4",
		"--sheet", "--bed", "B4", "--log", log, "--every", "2")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "One turn 2.86 s (timed); Pause 1.4 s (timed)")
	require.Contains(t, r.stdout, "CHECKS (every 2 h: entered)")
	require.Contains(t, r.stderr, "Recorded for bed B4")
	r = crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--sheet", "--bed", "b4", "--log", log)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "last recorded")
	require.Contains(t, r.stdout, "next check due")
	// Flags that clash are one line and exit 2.
	for _, args := range [][]string{
		{"plan", "--height-cm", "175", "--sex", "male", "--sheet", "--json"},
		{"plan", "--height-cm", "175", "--sex", "male", "--bed", "B4"},
		{"check", "--height-cm", "175", "--sex", "male", "--hole", "7", "--rpm", "21", "--dwell-s", "1.4", "--sheet", "--card", "--bed", "B4"},
		{"check", "--height-cm", "175", "--sex", "male", "--hole", "7", "--rpm", "21", "--dwell-s", "1.4", "--every", "2"},
	} {
		r = crankside(t, args...)
		require.Equal(t, 2, r.status, "%v: %s", args, r.stdout)
		require.Equal(t, 1, strings.Count(strings.TrimRight(r.stderr, "\n"), "\n")+1, r.stderr)
	}
}
