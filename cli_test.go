package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestPlanJSONHasTheContractKeys(t *testing.T) {
	r := crankside(t, "plan", "--height-cm", "170", "--sex", "female", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	// The plan JSON keys other programs rely on (this command's published
	// interface; they must never change).
	for _, k := range []string{"pbw_kg", "target_vt_ml", "hole", "swept_ml", "delivered_vt_ml", "ml_per_kg",
		"rate_bpm", "motor_rpm", "dwell_s", "ti_s", "te_s", "ie_ratio", "minute_ventilation_l_min",
		"peak_flow_l_min", "peak_pressure_cmh2o", "end_inspiratory_pressure_cmh2o", "plateau_pressure_cmh2o",
		"driving_pressure_cmh2o", "intrinsic_peep_cmh2o", "peak_torque_nm", "cautions"} {
		require.Contains(t, obj, k)
	}
	// PBW 45.5 + 0.91 x (170 - 152.4) = 61.516 kg for a 170 cm woman (ARDSNet 2000, derived).
	require.InDelta(t, 61.516, obj["pbw_kg"], 1e-3)
	// Version 2 (BTPS at the default room 22 C, 50 %, 760 mmHg: F 1.105,
	// REFERENCES): hole 5 sweeps 345.58 mL, x 60/61.5 (circuit share) x
	// 1.105 = 372.6 mL less the cylinder gas's 1-3 % (issue 13's audit) is
	// about 362-369, nearer the 369.1 mL target than hole 6 (about 397).
	require.Equal(t, "5", obj["hole"])
	// ie_ratio is the number E/I, 2.0 for the default 1:2 (common practice);
	// the 0.1 s dwell step moves it a little.
	require.InDelta(t, 2.0, obj["ie_ratio"], 0.05)
	cs := obj["cautions"].([]any)
	require.NotEmpty(t, cs)
	for _, c := range cs {
		m := c.(map[string]any)
		require.Contains(t, m, "id")
		require.Contains(t, []any{"stop", "warn", "note"}, m["level"])
		require.NotEmpty(t, m["message"])
	}
}

func TestPlanTextCarriesUnitsLevelsAndTheClinicalLine(t *testing.T) {
	r := crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--profile", "demo-b")
	require.Equal(t, 0, r.status, r.stderr)
	for _, want := range []string{"PBW 70.6 kg", "Hole          ", "Motor speed   20.0 rpm", "Dwell", " s\n",
		"cmH2O", "L/min", "WARN relief-above-40", "NOTE ti-not-reachable", "responsible clinician under local protocols"} {
		require.Contains(t, r.stdout, want)
	}
}

func TestBadInputIsOneLineAndExitTwo(t *testing.T) {
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"plan", "--height-cm", "abc", "--sex", "male"}, "--height-cm"},
		{[]string{"plan", "--height-cm", "NaN", "--sex", "male"}, "not a number"},
		{[]string{"plan", "--height-cm", "Inf", "--sex", "male"}, "--height-cm"},
		{[]string{"plan", "--height-cm", "0x10", "--sex", "male"}, "--height-cm"},
		{[]string{"plan", "--height-cm", "300", "--sex", "male"}, "130-230"},
		{[]string{"plan", "--height-cm", "170", "--sex", "other"}, "--sex"},
		{[]string{"plan", "--height-cm", "170"}, "--sex is required"},
		{[]string{"plan", "--sex", "male"}, "--height-cm is required"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--lung", "wet"}, "--lung"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--ie", "2:1"}, "inverse"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--ml-per-kg", "12"}, "--ml-per-kg"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--ml-per-kg", "0"}, "--ml-per-kg"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--fio2", "21"}, "--fio2"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--profile", "nope"}, "--profile"},
		{[]string{"plan", "--height-cm", "170", "--sex", "male", "--bogus"}, "unknown flag --bogus"},
		{[]string{"plan", "--height-cm"}, "--height-cm"},
		{[]string{"frobnicate"}, "unknown command"},
		{[]string{"profiles", "show", "nope"}, "not found"},
	}
	for _, c := range cases {
		r := crankside(t, c.args...)
		require.Equal(t, 2, r.status, "%v: %s", c.args, r.stderr)
		require.Contains(t, r.stderr, c.want, "%v", c.args)
		require.Equal(t, 1, strings.Count(strings.TrimRight(r.stderr, "\n"), "\n")+1, "%v: one line, got %q", c.args, r.stderr)
		require.NotContains(t, r.stderr, "goroutine", "%v: no panic trace", c.args)
		require.Empty(t, r.stdout, "%v: nothing half-written", c.args)
	}
}

func TestProfilesCommands(t *testing.T) {
	r := crankside(t, "profiles", "list")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "demo-a")
	require.Contains(t, r.stdout, "demo-b")

	r = crankside(t, "profiles", "show", "demo-b")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "fixed speed 20.0 rpm")

	// show --json prints the v1 file itself: it validates as it is.
	r = crankside(t, "profiles", "show", "demo-a", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	file := filepath.Join(t.TempDir(), "copy.json")
	require.NoError(t, os.WriteFile(file, []byte(r.stdout), 0o644))
	r = crankside(t, "profiles", "validate", file)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "valid")

	bad := filepath.Join(t.TempDir(), "bad.json")
	require.NoError(t, os.WriteFile(bad, []byte(strings.Replace(mustRead(t, file), `"bore_cm": 10`, `"bore_cm": -10`, 1)), 0o644))
	r = crankside(t, "profiles", "validate", bad)
	require.Equal(t, 2, r.status)
	require.Contains(t, r.stderr, "cylinder.bore_cm")
	require.Contains(t, r.stderr, "-10")

	// A plan can use a profile by path.
	r = crankside(t, "plan", "--height-cm", "170", "--sex", "male", "--profile", file, "--json")
	require.Equal(t, 0, r.status, r.stderr)
}

func TestCheckJSONWithReadingsAndProposal(t *testing.T) {
	r := crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--peak", "17", "--end-pressure", "14", "--propose-hole", "7", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	for _, k := range []string{"delivered_vt_ml", "ml_per_kg", "rate_bpm", "ti_s", "te_s", "ie_ratio",
		"minute_ventilation_l_min", "peak_flow_l_min", "peak_pressure_cmh2o", "plateau_pressure_cmh2o",
		"intrinsic_peep_cmh2o", "fio2", "fitted_compliance_ml_per_cmh2o", "fitted_resistance_cmh2o_per_l_s", "cautions", "proposed"} {
		require.Contains(t, obj, k)
	}
	// The fitted lung reproduces the readings it came from.
	require.InDelta(t, 17, obj["peak_pressure_cmh2o"], 1e-3)
	require.InDelta(t, 14, obj["end_inspiratory_pressure_cmh2o"], 1e-3)
	prop := obj["proposed"].(map[string]any)
	require.Equal(t, "7", prop["hole"])
	// Hole 7 sweeps 408.41 mL against hole 8's 439.82 (pi r^2 h, bore 10 cm):
	// a smaller hole must show a smaller tidal volume among the differences.
	diffs, ok := prop["differences"].([]any)
	require.True(t, ok, "differences is a list: %v", prop["differences"])
	vtChange := 0.0
	for _, d := range diffs {
		m := d.(map[string]any)
		if m["what"] == "tidal volume" && m["unit"] == "mL" {
			vtChange = m["change"].(float64)
		}
	}
	require.Less(t, vtChange, 0.0, "tidal volume change for hole 8 -> 7: %v", diffs)
}

func TestCheckRecordsAndLogShow(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "handover.jsonl")
	base := []string{"check", "--height-cm", "175", "--sex", "male", "--rpm", "21", "--dwell-s", "1.4", "--bed", "B4", "--initials", "ab", "--log", logPath}
	r := crankside(t, append(base, "--hole", "8")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "Recorded for bed B4")
	r = crankside(t, append(base, "--hole", "7", "--card")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "HANDOVER CARD  bed B4")
	for _, l := range strings.Split(r.stdout, "\n") {
		require.LessOrEqual(t, len(l), 80)
	}
	// A torn last line: reported, and every earlier record still listed.
	f, err := os.OpenFile(logPath, os.O_WRONLY|os.O_APPEND, 0)
	require.NoError(t, err)
	f.WriteString(`{"format":"crankside-check/1","bed":"B4","ti`)
	f.Close()
	r = crankside(t, "log", "show", "--log", logPath, "--bed", "B4")
	require.Equal(t, 1, r.status)
	require.Contains(t, r.stderr, "torn last line")
	require.Contains(t, r.stdout, "Bed B4: 2 check(s)")
	require.Contains(t, r.stdout, "changed: hole 8 -> 7")
	r = crankside(t, "log", "show", "--log", logPath, "--json")
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	require.Len(t, obj["beds"].([]any), 1)
	require.Len(t, obj["problems"].([]any), 1)
}

func TestCheckRefusalsAndUnsavedRecord(t *testing.T) {
	base := []string{"check", "--height-cm", "175", "--sex", "male", "--dwell-s", "1.4"}
	cases := []struct {
		args []string
		want string
	}{
		{append(base, "--hole", "99", "--rpm", "21"), "--hole"},
		{append(base, "--hole", "8", "--rpm", "21.2"), "--rpm"},
		{append(base, "--hole", "8", "--rpm", "21", "--peak", "17"), "--end-pressure: peak and end-pressure go together"},
		{append(base, "--hole", "8", "--rpm", "21", "--bed", "Smith", "--initials", "ab", "--log", "x.jsonl"), "never a patient's name"},
		{append(base, "--hole", "8", "--rpm", "21", "--log", "x.jsonl"), "--log needs --bed"},
		{[]string{"check", "--height-cm", "175", "--sex", "male"}, "--hole is required"},
	}
	for _, c := range cases {
		r := crankside(t, c.args...)
		require.Equal(t, 2, r.status, "%v: %s", c.args, r.stderr)
		require.Contains(t, r.stderr, c.want)
		require.Empty(t, r.stdout)
	}
	// Readings with no solution: the check is shown with the reason.
	r := crankside(t, append(base, "--hole", "8", "--rpm", "21", "--peak", "15", "--end-pressure", "4")...)
	require.Equal(t, 3, r.status, "unexplained readings are a STOP: %s", r.stderr)
	require.Contains(t, r.stdout, "re-take the end pressure")
	// A log that cannot be written: the check is still printed, and the
	// failure says the record was not saved.
	r = crankside(t, append(base, "--hole", "8", "--rpm", "21", "--bed", "B4", "--initials", "ab", "--log", filepath.Join(t.TempDir(), "missing", "h.jsonl"))...)
	require.Equal(t, 1, r.status)
	require.Contains(t, r.stdout, "THE PATIENT GETS")
	require.Contains(t, r.stderr, "NOT recorded")
}

func TestCalibrateWriteThenPlan(t *testing.T) {
	dir := t.TempDir()
	r := crankside(t, "profiles", "new", "--from", "demo-a", "--id", "ward-3", "--label", "Ward 3 unit")
	require.Equal(t, 0, r.status, r.stderr)
	unit := filepath.Join(dir, "ward-3.json")
	require.NoError(t, os.WriteFile(unit, []byte(r.stdout), 0o644))
	before := crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--profile", unit, "--json")
	require.Equal(t, 0, before.status, before.stderr)

	bench := filepath.Join(dir, "bench.csv")
	require.NoError(t, os.WriteFile(bench, []byte("hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n"+
		"5,50,5,20,318\n8,50,5,20,408\n12,50,5,20,528\n16,50,5,20,647\n"), 0o644))
	r = crankside(t, "calibrate", "--profile", unit, "--bench", bench, "--date", "2026-11-30", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var cal map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &cal))
	for _, k := range []string{"k", "b_ml", "points"} {
		require.Contains(t, cal, k)
	}
	pt := cal["points"].([]any)[0].(map[string]any)
	for _, k := range []string{"hole", "measured_ml", "predicted_ml", "residual_ml", "residual_pct", "within_tolerance"} {
		require.Contains(t, pt, k)
	}
	require.Equal(t, false, cal["written"])
	// Derived by hand: holes 5, 8, 12, 16 sweep 345.58, 439.82, 565.49,
	// 691.15 mL (pi r^2 h, bore 10 cm); a 50 mL/cmH2O test lung behind the
	// 1.5 mL/cmH2O circuit takes 50/51.5 of the effective volume, so the
	// measured 318, 408, 528, 647 mL are 327.54, 420.24, 543.84, 666.41 mL
	// effective; their least-squares line is k 0.9808, b -11.22 mL.
	// Tolerance 0.005 and 2 mL for what the C/(C+Cc) share leaves out, and
	// for k 0.02 more: the version 2 bench model also spends 1-3 % of the
	// volume compressing the cylinder's gas (issue 13's audit), which this
	// share leaves out, so the fitted k is up to that much higher.
	require.InDelta(t, 0.9808, cal["k"], 0.025, "k (derived by hand)")
	require.InDelta(t, -11.22, cal["b_ml"], 2, "b (derived by hand)")
	require.NoFileExists(t, unit+".bak", "nothing written without --write")

	r = crankside(t, "calibrate", "--profile", unit, "--bench", bench, "--date", "2026-11-30", "--write")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "Written to")
	require.FileExists(t, unit+".bak")
	after := crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--profile", unit, "--json")
	var b, a map[string]any
	require.NoError(t, json.Unmarshal([]byte(before.stdout), &b))
	require.NoError(t, json.Unmarshal([]byte(after.stdout), &a))
	require.Equal(t, "2026-11-30", a["calibration_date"])
	require.NotEqual(t, b["effective_swept_ml"], a["effective_swept_ml"])

	// An embedded demo cannot be written; a bad bench file writes nothing.
	r = crankside(t, "calibrate", "--profile", "demo-a", "--bench", bench, "--write")
	require.Equal(t, 2, r.status)
	require.Contains(t, r.stderr, "embedded")
	bad := filepath.Join(dir, "bad.csv")
	require.NoError(t, os.WriteFile(bad, []byte("hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n5,50,5,20,x\n"), 0o644))
	saved := mustRead(t, unit)
	r = crankside(t, "calibrate", "--profile", unit, "--bench", bad, "--write")
	require.Equal(t, 2, r.status)
	require.Contains(t, r.stderr, "line 2")
	require.Equal(t, saved, mustRead(t, unit))
}
