package tests

import (
	"os"
	"path/filepath"
	"runtime"
	"testing"

	"github.com/stretchr/testify/require"
)

// Issue rule: one log in a folder that fails the log checks (here a group-
// and world-readable one) does not hide every other bed of the ward: it is
// skipped, said loudly on stderr, and the exit is 1 after the rest is
// printed. The same file named directly is still refused.
func TestAFolderOfLogsSkipsAFileThatFailsTheChecks(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("mode bits")
	}
	dir := t.TempDir()
	good, bad := filepath.Join(dir, "a.jsonl"), filepath.Join(dir, "b.jsonl")
	for _, c := range []struct{ log, bed string }{{good, "B4"}, {bad, "B7"}} {
		r := crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
			"--bed", c.bed, "--initials", "ab", "--log", c.log)
		require.Equal(t, 0, r.status, r.stderr)
	}
	require.NoError(t, os.Chmod(bad, 0o644))

	for _, cmd := range [][]string{{"log", "beds"}, {"log", "show"}, {"log", "beds", "--json"}, {"log", "show", "--json"}} {
		r := crankside(t, append(cmd, "--log", dir)...)
		require.Equal(t, 1, r.status, "%v: %s", cmd, r.stderr)
		require.Contains(t, r.stdout, "B4", "%v: the readable log's bed is shown", cmd)
		require.NotContains(t, r.stdout, "B7", cmd)
		require.Contains(t, r.stderr, "log "+bad+" skipped: has mode 0644", cmd)
		require.Contains(t, r.stderr, "its beds are not shown", cmd)
	}

	// Named directly, the file is refused as before (usage, exit 2).
	r := crankside(t, "log", "beds", "--log", bad)
	require.Equal(t, 2, r.status, r.stdout)
	require.Contains(t, r.stderr, "mode 0644")
	require.NotContains(t, r.stdout, "B4")

	// A folder whose every log is skipped shows nothing and fails.
	require.NoError(t, os.Chmod(good, 0o640))
	r = crankside(t, "log", "beds", "--log", dir)
	require.Equal(t, 1, r.status, r.stdout)
	require.Contains(t, r.stderr, "no log could be read")
}
