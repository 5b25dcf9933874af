package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// Issue rule: validate prints, under its "valid" line, every warning the
// profile's own checks give, with their level word: here a relief valve at
// 80 cmH2O (above 40: MHRA RMVS001 2020, as the caution cites) and two hole
// labels that read alike (I and 1: common practice).
func TestProfilesValidatePrintsTheProfilesWarnings(t *testing.T) {
	r := crankside(t, "profiles", "new", "--from", "demo-a", "--id", "ward-5")
	require.Equal(t, 0, r.status, r.stderr)
	var p map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &p))
	p["circuit"].(map[string]any)["relief_cmh2o"] = 80
	holes := p["crank"].(map[string]any)["holes"].([]any)
	holes[1].(map[string]any)["label"] = "I"
	data, err := json.Marshal(p)
	require.NoError(t, err)
	path := filepath.Join(t.TempDir(), "ward-5.json")
	require.NoError(t, os.WriteFile(path, data, 0o600))

	r = crankside(t, "profiles", "validate", path)
	require.Equal(t, 0, r.status, r.stderr)
	lines := strings.Split(strings.TrimSpace(r.stdout), "\n")
	require.Contains(t, lines[0], "valid crankside-profile/3 profile")
	require.Contains(t, r.stdout, path+": WARN relief-above-40:")
	require.Contains(t, r.stdout, path+": WARN crank.holes[1].label:")
	require.Contains(t, r.stdout, path+": WARN calibration-missing:")
}

// Issue rule: a new profile may not take a built-in demo's id (that id
// opens the built-in one).
func TestProfilesNewRefusesABuiltInID(t *testing.T) {
	for _, id := range []string{"demo-a", "demo-b"} {
		r := crankside(t, "profiles", "new", "--from", "demo-a", "--id", id)
		require.Equal(t, 2, r.status, r.stdout)
		require.Empty(t, r.stdout)
		require.Contains(t, r.stderr, "built-in")
		require.Equal(t, 1, strings.Count(strings.TrimSpace(r.stderr), "\n")+1, r.stderr)
	}
}
