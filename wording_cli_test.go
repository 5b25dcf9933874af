package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// Issue rule: with no bed asked for, an empty log says so without naming
// "that bed".
func TestLogShowOfAnEmptyLogWithoutABed(t *testing.T) {
	empty := filepath.Join(t.TempDir(), "empty.jsonl")
	require.NoError(t, os.WriteFile(empty, nil, 0o600))
	r := crankside(t, "log", "show", "--log", empty)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "No checks recorded.\n")
	require.NotContains(t, r.stdout, "that bed")
	r = crankside(t, "log", "show", "--log", empty, "--bed", "B4")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "No checks recorded for bed B4.")
}

// Issue rule: help does not end in an empty "Flags:" heading.
func TestLogHelpHasNoEmptyFlagsHeading(t *testing.T) {
	r := crankside(t, "log", "--help")
	require.Equal(t, 0, r.status, r.stderr)
	require.False(t, strings.HasSuffix(strings.TrimSpace(r.stdout), "Flags:"), r.stdout)
	r = crankside(t, "log", "beds", "--help")
	require.Contains(t, r.stdout, "--every")
}

// Issue rule: a calibration dated in the future is said to be so (and is a
// WARN), not "-182 days old"; the leak carries its pressure's unit.
func TestProfilesShowFutureCalibrationAndLeakUnit(t *testing.T) {
	r := crankside(t, "profiles", "show", "demo-b", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var p map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &p))
	p["calibration"].(map[string]any)["date"] = "2999-01-01"
	data, err := json.Marshal(p)
	require.NoError(t, err)
	path := filepath.Join(t.TempDir(), "future.json")
	require.NoError(t, os.WriteFile(path, data, 0o600))
	r = crankside(t, "profiles", "show", path)
	require.Equal(t, 0, r.status, r.stderr)
	require.NotContains(t, r.stdout, "days old")
	require.Contains(t, r.stdout, "Calibration 2999-01-01 (WARN: dated in the future)")
	require.Contains(t, r.stdout, "WARN calibration-future")
	require.Contains(t, r.stdout, "leak 0.00 L/min at 20 cmH2O")
}
