package main

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

// flagHelp is each "--name text" line of a command's help, by name.
func flagHelp(help string) map[string]string {
	out := map[string]string{}
	for _, line := range strings.Split(help, "\n") {
		if f := strings.Fields(line); len(f) > 1 && strings.HasPrefix(f[0], "--") {
			out[strings.TrimPrefix(f[0], "--")] = strings.Join(f[1:], " ")
		}
	}
	return out
}

// The entries that mean the same to plan and check are explained the same
// way by both (their help was written twice and had drifted: the height's
// range was in one and not the other).
func TestPlanAndCheckExplainTheirCommonEntriesAlike(t *testing.T) {
	plan := flagHelp(crankside(t, "plan", "--help").stdout)
	check := flagHelp(crankside(t, "check", "--help").stdout)
	for _, name := range []string{"height-cm", "height-in", "sex", "cylinder-l", "cylinder-bar", "cylinder-reserve-bar",
		"room-c", "room-rh", "barometric-mmhg", "barometric-hpa"} {
		require.NotEmpty(t, plan[name], "plan --%s", name)
		require.Equal(t, plan[name], check[name], "--%s", name)
	}
	// DESIGN.md: heights outside 130-230 cm are refused; derived: 1 in =
	// 2.54 cm, 130/2.54 = 51.18 -> 51.2 in, 230/2.54 = 90.55 -> 90.6 in.
	require.Contains(t, plan["height-cm"], "(130-230)")
	require.Contains(t, plan["height-in"], "(51.2-90.6)")
}
