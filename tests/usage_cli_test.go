package tests

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// usageLines are the "crankside ..." lines of a help text's Usage block.
func usageLines(help string) []string {
	var out []string
	for _, line := range strings.Split(help, "\n") {
		if strings.HasPrefix(line, "  crankside ") {
			out = append(out, strings.TrimSpace(line))
		}
	}
	return out
}

// A command's usage lines are the same in the top-level help and in its
// own --help (they once drifted: "--sex S --hole L" in one, "--sex
// male|female --hole LABEL" in the other).
func TestUsageLinesAgreeBetweenTopHelpAndCommandHelp(t *testing.T) {
	top := crankside(t, "--help")
	require.Equal(t, 0, top.status, top.stderr)
	topLines := usageLines(top.stdout)
	for _, cmd := range []string{"plan", "check", "log", "profiles", "calibrate"} {
		r := crankside(t, cmd, "--help")
		require.Equal(t, 0, r.status, "%s: %s", cmd, r.stderr)
		require.True(t, strings.HasPrefix(r.stdout, "Usage:\n  crankside "+cmd+" "), "%s --help starts with its usage: %q", cmd, r.stdout)
		own := usageLines(strings.SplitN(r.stdout, "\n\n", 2)[0])
		require.NotEmpty(t, own, cmd)
		var inTop []string
		for _, l := range topLines {
			if strings.HasPrefix(l, "crankside "+cmd+" ") {
				inTop = append(inTop, l)
			}
		}
		require.Equal(t, own, inTop, "%s: the usage lines of its help and of the top-level help", cmd)
	}
}
