package main

import (
	"bytes"
	"os"
	"testing"

	"github.com/stretchr/testify/require"
)

// The command's end-to-end tests that need no process of their own (no
// terminal, no time zone, no exit a shell sees) run in-process through
// run, with a fresh home and configuration folder each, as tests/ runs
// the built binary: what they print and the status they return are the
// program's, without starting a process for each.

type result struct {
	stdout, stderr string
	status         int
}

// crankside runs the command in-process with a fresh HOME and
// XDG_CONFIG_HOME, so that no profile or log of the machine running the
// tests is read. It sets the environment: its tests do not run in
// parallel.
func crankside(t *testing.T, args ...string) result {
	t.Helper()
	t.Setenv("XDG_CONFIG_HOME", t.TempDir())
	t.Setenv("HOME", t.TempDir())
	var out, errb bytes.Buffer
	status := run(args, &out, &errb)
	return result{out.String(), errb.String(), status}
}

func mustRead(t *testing.T, path string) string {
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	return string(data)
}
