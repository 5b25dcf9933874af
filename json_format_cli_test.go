package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// requireVersioned parses one JSON object and checks its first keys: the
// format named, the model version (DESIGN.md: version 3 is this round) and
// a program version.
func requireVersioned(t *testing.T, what, out, format string) map[string]any {
	t.Helper()
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &obj), "%s: %s", what, out)
	require.Equal(t, format, obj["format"], what)
	require.Equal(t, 3.0, obj["model_version"], what)
	require.Regexp(t, `^\d+\.\d+\.\d+`, obj["program_version"], what)
	// The three come first, so a script reading the head of the output
	// learns the format before anything else.
	first := strings.SplitN(strings.TrimSpace(out), "\n", 5)
	require.Equal(t, `"format": "`+format+`",`, strings.TrimSpace(first[1]), what)
	return obj
}

// Every --json output says its format and the model and program versions.
func TestEveryJSONOutputCarriesItsFormatAndVersions(t *testing.T) {
	dir := t.TempDir()
	logPath := filepath.Join(dir, "h.jsonl")
	check := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4"}
	r := crankside(t, append(check, "--bed", "B4", "--initials", "ab", "--log", logPath)...)
	require.Equal(t, 0, r.status, r.stderr)
	// A bench run invented for the test, as tests/cli_test.go's.
	bench := filepath.Join(dir, "bench.csv")
	require.NoError(t, os.WriteFile(bench, []byte(benchHeader+"5,50,5,20,318\n8,50,5,20,408\n12,50,5,20,528\n16,50,5,20,647\n"), 0o600))
	profiles := t.TempDir() // only the embedded demos are listed
	profile := filepath.Join(dir, "ward-3.json")
	r = crankside(t, "profiles", "new", "--from", "demo-a", "--id", "ward-3")
	require.Equal(t, 0, r.status, r.stderr)
	require.NoError(t, os.WriteFile(profile, []byte(r.stdout), 0o600))

	cases := []struct {
		args   []string
		format string
		status int
	}{
		{[]string{"plan", "--height-cm", "175", "--sex", "male", "--json"}, "crankside-plan/2", 0},
		{append(check, "--json"), "crankside-check/2", 0},
		{[]string{"log", "show", "--log", logPath, "--json"}, "crankside-history/3", 0},
		{[]string{"log", "beds", "--log", logPath, "--json"}, "crankside-ward/3", 0},
		{[]string{"profiles", "list", "--profiles", profiles, "--json"}, "crankside-profile-list/1", 0},
		{[]string{"calibrate", "--profile", profile, "--bench", bench, "--date", "2026-11-30", "--json"}, "crankside-calibration/2", 0},
		{[]string{"profiles", "validate", profile, "--json"}, "crankside-profile-validation/1", 0},
	}
	for _, c := range cases {
		r := crankside(t, c.args...)
		what := strings.Join(c.args[:2], " ")
		require.Equal(t, c.status, r.status, "%s: %s", what, r.stderr)
		obj := requireVersioned(t, what, r.stdout, c.format)
		switch c.format {
		case "crankside-ward/3":
			beds := obj["beds"].([]any)
			require.Len(t, beds, 1)
			require.Equal(t, "B4", beds[0].(map[string]any)["bed"])
			require.Equal(t, []any{}, obj["problems"])
		case "crankside-profile-list/1":
			require.Equal(t, "demo-a", obj["profiles"].([]any)[0].(map[string]any)["id"])
		case "crankside-profile-validation/1":
			require.Equal(t, true, obj["valid"])
		}
	}
	// A file that is not a profile: the JSON says why, and the exit status
	// is the text's (2).
	bad := filepath.Join(dir, "bad.json")
	require.NoError(t, os.WriteFile(bad, []byte(`{"format":"crankside-profile/2","id":"x","Id":"y"}`), 0o600))
	r = crankside(t, "profiles", "validate", bad, "--json")
	require.Equal(t, 2, r.status, r.stderr)
	obj := requireVersioned(t, "profiles validate (bad)", r.stdout, "crankside-profile-validation/1")
	require.Equal(t, false, obj["valid"])
	require.NotEmpty(t, obj["problems"])
	// A bad profile in the folder: listed with its problem, exit 1.
	require.NoError(t, os.Rename(bad, filepath.Join(profiles, "bad-unit.json")))
	r = crankside(t, "profiles", "list", "--profiles", profiles, "--json")
	require.Equal(t, 1, r.status, r.stderr)
	obj = requireVersioned(t, "profiles list (bad)", r.stdout, "crankside-profile-list/1")
	found := false
	for _, p := range obj["profiles"].([]any) {
		found = found || p.(map[string]any)["problem"] != nil
	}
	require.True(t, found, r.stdout)
}

// A plan or check whose highest caution is a STOP exits 3, as its --help
// says; the output is complete. 2 stays for bad input.
func TestAStopExitsThree(t *testing.T) {
	// MHRA RMVS001 2020: a measured peak of 120 cmH2O is above 40, a stop.
	stopCheck := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4", "--peak", "120", "--end-pressure", "100"}
	for _, more := range [][]string{nil, {"--json"}, {"--card", "--bed", "B4"}} {
		r := crankside(t, append(stopCheck, more...)...)
		require.Equal(t, 3, r.status, "%v: %s", more, r.stderr)
		require.Contains(t, strings.ToUpper(r.stdout), "STOP")
	}
	// Recorded: the record is written, and the status is still 3.
	logPath := filepath.Join(t.TempDir(), "h.jsonl")
	r := crankside(t, append(stopCheck, "--bed", "B4", "--log", logPath)...)
	require.Equal(t, 3, r.status, r.stderr)
	data, err := os.ReadFile(logPath)
	require.NoError(t, err)
	require.Equal(t, 1, strings.Count(string(data), "\n"))
	// A stiff lung at 10 mL/kg: the plateau is above 35 cmH2O (MHRA
	// RMVS001 2020), a stop of the plan.
	r = crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--compliance", "10", "--ml-per-kg", "10", "--json")
	require.Equal(t, 3, r.status, r.stderr)
	require.Contains(t, r.stdout, `"level": "stop"`)
	// A calm plan and check exit 0; bad input exits 2.
	r = crankside(t, "plan", "--height-cm", "175", "--sex", "male")
	require.Equal(t, 0, r.status, r.stderr)
	r = crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4")
	require.Equal(t, 0, r.status, r.stderr)
	r = crankside(t, append(stopCheck, "--peak", "abc")...)
	require.Equal(t, 2, r.status, r.stderr)
	for _, cmd := range []string{"plan", "check"} {
		r := crankside(t, cmd, "--help")
		require.Equal(t, 0, r.status)
		require.Contains(t, r.stdout, "Exit status: 0 done, no STOP; 3 done, and a caution is a STOP", cmd)
	}
}
