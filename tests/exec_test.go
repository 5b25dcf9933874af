package tests

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/stretchr/testify/require"
)

// The tests here run the built command, as a shell does: for what only a
// process shows (its exit status, what the runtime would print on a crash,
// arguments of any size, the time zone and the terminal). The command's
// other end-to-end tests run in-process through run (../*_cli_test.go).

// binary is the crankside command, built once for these tests.
var binary string

func TestMain(m *testing.M) {
	dir, err := os.MkdirTemp("", "crankside-cli")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	binary = filepath.Join(dir, "crankside")
	build := exec.Command("go", "build", "-o", binary, "crankside")
	build.Stderr = os.Stderr
	if err := build.Run(); err != nil {
		fmt.Fprintln(os.Stderr, "building crankside:", err)
		os.RemoveAll(dir)
		os.Exit(1)
	}
	code := m.Run()
	os.RemoveAll(dir)
	os.Exit(code)
}

type result struct {
	stdout, stderr string
	status         int
}

// readSources opens every source file of the command. go test caches a
// result by the files the test opened; the command is built in a child
// process, so without this a change to main.go or ui/ would not rerun
// these tests. (Opens are only recorded once the tests run, not in
// TestMain.)
var readSources sync.Once

func crankside(t *testing.T, args ...string) result {
	t.Helper()
	readSources.Do(func() {
		filepath.WalkDir("..", func(path string, d os.DirEntry, err error) error {
			if err == nil && !d.IsDir() && (strings.HasSuffix(path, ".go") || strings.HasSuffix(path, ".json")) {
				os.ReadFile(path)
			}
			return nil
		})
	})
	cmd := exec.Command(binary, args...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	cmd.Env = append(os.Environ(), "XDG_CONFIG_HOME="+t.TempDir(), "HOME="+t.TempDir())
	err := cmd.Run()
	status := 0
	var ee *exec.ExitError
	if errors.As(err, &ee) {
		status = ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return result{out.String(), errb.String(), status}
}

func TestVersionAndHelp(t *testing.T) {
	r := crankside(t, "--version")
	require.Equal(t, 0, r.status)
	// The revision as the go command stamps it in a build made in a git
	// checkout (40 hex digits, RFC 3339 commit time), or said unknown when
	// the build has none (a worktree, -buildvcs=false).
	require.Regexp(t, `^crankside \d+\.\d+\.\d+ \((revision [0-9a-f]{40}, committed \S+Z(, with uncommitted changes)?|revision unknown: this build carries no VCS stamp)\)\n$`, r.stdout)
	for _, args := range [][]string{{"--help"}, {"plan", "--help"}, {"profiles", "--help"}} {
		r := crankside(t, args...)
		require.Equal(t, 0, r.status, "%v", args)
		require.Contains(t, r.stdout, "Usage")
	}
	r = crankside(t, "plan", "--help")
	require.Contains(t, r.stdout, "--height-cm")
	require.Contains(t, r.stdout, "responsible clinician")
}

func mustRead(t *testing.T, path string) string {
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	return string(data)
}
