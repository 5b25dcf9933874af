package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

const benchHeader = "hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n"

// newUnitFile writes a copy of demo-a that calibrate may write.
func newUnitFile(t *testing.T, dir string) string {
	t.Helper()
	r := crankside(t, "profiles", "new", "--from", "demo-a", "--id", "ward-9", "--label", "Ward 9 unit")
	require.Equal(t, 0, r.status, r.stderr)
	unit := filepath.Join(dir, "ward-9.json")
	require.NoError(t, os.WriteFile(unit, []byte(r.stdout), 0o600))
	return unit
}

// Issue rule: what calibrate shows is what is written and then used. An
// invented bench whose test lungs are 2.5 times apart in compliance (20 and
// 50 mL/cmH2O), so the leak is fitted too; the k and b the preview shows
// must be the k and b a plan on the written file uses, to the digit.
func TestCalibrateWritesTheLineItShows(t *testing.T) {
	dir := t.TempDir()
	unit := newUnitFile(t, dir)
	bench := filepath.Join(dir, "bench.csv")
	require.NoError(t, os.WriteFile(bench, []byte(benchHeader+"4,20,5,20,255\n9,50,5,20,415\n14,20,5,20,500\n20,50,5,20,712\n"), 0o600))
	r := crankside(t, "calibrate", "--profile", unit, "--bench", bench, "--date", "2026-11-30", "--write", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var cal map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &cal))
	require.Equal(t, true, cal["written"])
	require.Equal(t, true, cal["leak_fitted"], "the bench spans compliances 2.5 apart")
	plan := crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--profile", unit, "--json")
	require.Equal(t, 0, plan.status, plan.stderr)
	var pl map[string]any
	require.NoError(t, json.Unmarshal([]byte(plan.stdout), &pl))
	require.Equal(t, cal["k"], pl["calibration_k"], "k shown by calibrate and used by the plan")
	require.Equal(t, cal["b_ml"], pl["calibration_b_ml"], "b shown by calibrate and used by the plan")
}

// Design rule (cautions): a calibration whose k is implausible, or that
// makes a hole's effective volume exceed its geometric volume, is not
// written: --write refuses it in one line naming the caution.
func TestCalibrateRefusesToWriteAnImplausibleLine(t *testing.T) {
	dir := t.TempDir()
	unit := newUnitFile(t, dir)
	saved := mustRead(t, unit)
	bench := filepath.Join(dir, "bench.csv")
	// Invented: about 1.16 x swept, more than the piston sweeps.
	require.NoError(t, os.WriteFile(bench, []byte(benchHeader+"4,20,5,20,330\n9,50,5,20,520\n14,20,5,20,640\n20,50,5,20,900\n"), 0o600))
	r := crankside(t, "calibrate", "--profile", unit, "--bench", bench, "--write")
	require.Equal(t, 1, r.status, r.stdout)
	require.Contains(t, r.stderr, "nothing written")
	require.Contains(t, r.stderr, "calibration-k-implausible")
	require.Equal(t, saved, mustRead(t, unit), "the profile is unchanged")
	require.NoFileExists(t, unit+".bak")
	require.NotContains(t, r.stdout, "Written to")

	// Without --write the preview is still shown, with its cautions.
	r = crankside(t, "calibrate", "--profile", unit, "--bench", bench)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "WARN calibration-k-implausible")
}
