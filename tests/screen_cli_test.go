package tests

import (
	"bytes"
	"errors"
	"os"
	"os/exec"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// TERM=dumb cannot draw the screen: the command says so in one plain line,
// as it does without a terminal, and names the sub-commands; it draws
// nothing on stdout and exits 1.
func TestDumbTerminalIsRefusedInPlainText(t *testing.T) {
	crankside(t, "--version") // builds and records the sources read
	cmd := exec.Command(binary, "--profile", "demo-b")
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	cmd.Env = append(os.Environ(), "TERM=dumb", "XDG_CONFIG_HOME="+t.TempDir(), "HOME="+t.TempDir())
	err := cmd.Run()
	var ee *exec.ExitError
	require.True(t, errors.As(err, &ee), "exits with a status: %v", err)
	require.Equal(t, 1, ee.ExitCode())
	require.Empty(t, out.String(), "nothing drawn")
	msg := errb.String()
	require.Equal(t, 1, strings.Count(msg, "\n"), "one line: %q", msg)
	require.Contains(t, msg, "TERM=dumb")
	require.Contains(t, msg, "'crankside plan'")
	require.NotContains(t, msg, "\x1b", "plain text, no escape sequence")
}
