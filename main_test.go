package main

import (
	"bytes"
	"runtime/debug"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// runInProcess calls run, the whole program but the process exit, with a
// fresh configuration and home folder so that no profile or log of the
// machine running the tests is read. tests/ runs the built binary for the
// exit statuses and the stderr a shell sees; this runs the same entry
// hundreds of times without starting a process each time.
func runInProcess(t *testing.T, args ...string) (stdout, stderr string, status int) {
	t.Helper()
	var out, errb bytes.Buffer
	status = run(args, &out, &errb)
	return out.String(), errb.String(), status
}

// Values no number flag may accept (common practice: only plain finite
// decimals are numbers at a bedside).
var hostileNumbers = []string{"NaN", "nan", "Inf", "-Inf", "+Inf", "1e999", "-1e999", "abc", "", " ", "0x1A", "1,5,0", "1.5,0", "1,", "١٧٥", "17 5", "1e", "--", "\x7f"}

// Every number flag of plan and check, with every hostile value: exit 2,
// one line on stderr naming the flag, nothing on stdout. tests/hostile_test.go
// runs a few of these through the built binary.
func TestEveryNumberFlagRefusesHostileValues(t *testing.T) {
	t.Setenv("XDG_CONFIG_HOME", t.TempDir())
	t.Setenv("HOME", t.TempDir())
	plan := []string{"plan", "--height-cm", "175", "--sex", "male"}
	check := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4"}
	cases := []struct {
		base []string
		flag string
	}{
		{plan, "--height-cm"}, {plan, "--ml-per-kg"}, {plan, "--rate"}, {plan, "--peep"}, {plan, "--fio2"},
		{plan, "--compliance"}, {plan, "--resistance"}, {plan, "--cylinder-l"}, {plan, "--cylinder-bar"},
		{check, "--height-cm"}, {check, "--rpm"}, {check, "--dwell-s"}, {check, "--peep"}, {check, "--o2-lpm"},
		{check, "--peak"}, {check, "--end-pressure"}, {check, "--compliance"}, {check, "--resistance"},
		{check, "--cylinder-l"}, {check, "--cylinder-bar"}, {check, "--propose-rpm"}, {check, "--propose-dwell-s"}, {check, "--propose-peep"},
	}
	for _, c := range cases {
		for _, v := range hostileNumbers {
			args := append(append([]string(nil), c.base...), c.flag, v)
			stdout, stderr, status := runInProcess(t, args...)
			require.Equal(t, 2, status, "%s %q: %s", c.flag, v, stderr)
			require.Contains(t, stderr, c.flag, "%s %q: the message names the flag", c.flag, v)
			require.Equal(t, 1, strings.Count(strings.TrimRight(stderr, "\n"), "\n")+1, "%s %q: one line: %q", c.flag, v, stderr)
			require.NotContains(t, stderr, "goroutine")
			require.NotContains(t, stderr, "internal error", "%s %q: a panic was recovered", c.flag, v)
			require.Empty(t, stdout)
		}
	}
}

// The version line names the revision the go command stamped, its commit
// time and uncommitted changes; with no stamp it says so instead of
// guessing. (Field names as runtime/debug documents them: vcs.revision,
// vcs.time, vcs.modified.)
func TestVersionLineNamesTheRevision(t *testing.T) {
	stamped := &debug.BuildInfo{Settings: []debug.BuildSetting{
		{Key: "vcs", Value: "git"},
		{Key: "vcs.revision", Value: "0123456789abcdef0123456789abcdef01234567"},
		{Key: "vcs.time", Value: "2026-12-02T14:00:00Z"},
		{Key: "vcs.modified", Value: "false"},
	}}
	require.Equal(t, "crankside "+version+" (revision 0123456789abcdef0123456789abcdef01234567, committed 2026-12-02T14:00:00Z)", versionLine(stamped))
	stamped.Settings[3].Value = "true"
	require.Equal(t, "crankside "+version+" (revision 0123456789abcdef0123456789abcdef01234567, committed 2026-12-02T14:00:00Z, with uncommitted changes)", versionLine(stamped))
	unknown := "crankside " + version + " (revision unknown: this build carries no VCS stamp)"
	require.Equal(t, unknown, versionLine(&debug.BuildInfo{}), "go run and go test stamp nothing")
	require.Equal(t, unknown, versionLine(nil), "a binary without build information")

	// This test binary is what go test built: never stamped.
	stdout, stderr, status := runInProcess(t, "--version")
	require.Equal(t, 0, status, stderr)
	require.Equal(t, unknown+"\n", stdout)
}
