package main

import (
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// A folder of more logs than --max-files: one line on stderr naming the
// count, the limit and the flag, exit 2, nothing on stdout; raised to the
// count, every bed is read.
func TestLogCommandsRefuseMoreFilesThanMaxFiles(t *testing.T) {
	dir := t.TempDir()
	for i := 1; i <= 3; i++ {
		_, errs, status := runInProcess(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
			"--bed", fmt.Sprintf("B%d", i), "--initials", "ab", "--log", filepath.Join(dir, fmt.Sprintf("t%d.jsonl", i)))
		require.Equal(t, 0, status, errs)
	}
	for _, cmd := range [][]string{{"log", "beds"}, {"log", "show"}, {"log", "beds", "--json"}} {
		out, errs, status := runInProcess(t, append(cmd, "--log", dir, "--max-files", "2")...)
		require.Equal(t, 2, status, "%v: %s", cmd, errs)
		require.Empty(t, out, cmd)
		require.Equal(t, 1, strings.Count(errs, "\n"), "%v: one line: %s", cmd, errs)
		require.Contains(t, errs, "--max-files: 3 log files found, more than the limit of 2: nothing was read; to read them all, give --max-files 3", cmd)

		out, errs, status = runInProcess(t, append(cmd, "--log", dir, "--max-files", "3")...)
		require.Equal(t, 0, status, "%v: %s", cmd, errs)
		for _, bed := range []string{"B1", "B2", "B3"} {
			require.Contains(t, out, bed, cmd)
		}
		require.NotContains(t, errs, "files...", "a quick read says nothing of its progress")
	}
	_, errs, status := runInProcess(t, "log", "beds", "--log", dir, "--max-files", "0")
	require.Equal(t, 2, status)
	require.Contains(t, errs, "--max-files: number of log files 0 files is outside 1-10000000 files")

	out, _, status := runInProcess(t, "log", "beds", "--help")
	require.Equal(t, 0, status)
	require.Contains(t, out, "--max-files")
	require.Contains(t, out, "default 10 000: a ward's folder holds")
}
