package main

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

var checkBase = []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4"}

// Issue rule: an assumed lung given beside readings that give the lung is
// not dropped without a word.
func TestCheckSaysAnAssumedLungBesideReadingsIsNotUsed(t *testing.T) {
	for _, flag := range []string{"--compliance", "--resistance"} {
		r := crankside(t, append(checkBase, "--peak", "25", "--end-pressure", "20", flag, "30")...)
		require.Equal(t, 0, r.status, r.stderr)
		require.Contains(t, r.stderr, flag+" 30 is not used: the readings give the lung")
	}
	// Without readings it is the lung used, and nothing is said.
	r := crankside(t, append(checkBase, "--compliance", "30")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Empty(t, r.stderr)
}

// Issue rule: --card and --json together would drop the card: refused.
func TestCheckRefusesCardWithJSON(t *testing.T) {
	r := crankside(t, append(checkBase, "--bed", "B4", "--card", "--json")...)
	require.Equal(t, 2, r.status, r.stdout)
	require.Empty(t, r.stdout)
	require.Contains(t, r.stderr, "--card and --json")
	require.Equal(t, 1, strings.Count(strings.TrimSpace(r.stderr), "\n")+1, r.stderr)
}

// A manometer reading outside 0-150 cmH2O (common practice: the scale of a
// ventilator's airway manometer) is a typing slip, refused naming the flag.
func TestCheckRefusesReadingsOutsideTheManometer(t *testing.T) {
	for _, c := range []struct{ peak, end, flag string }{
		{"-17", "10", "--peak"}, {"1e9", "10", "--peak"}, {"151", "10", "--peak"},
		{"25", "-1", "--end-pressure"}, {"25", "200", "--end-pressure"},
	} {
		r := crankside(t, append(checkBase, "--peak", c.peak, "--end-pressure", c.end)...)
		require.Equal(t, 2, r.status, "peak %s end %s: %s", c.peak, c.end, r.stdout)
		require.Empty(t, r.stdout)
		require.Contains(t, r.stderr, c.flag[2:], c)
		require.Contains(t, r.stderr, "0-150 cmH2O", c)
	}
	// The edges are readings.
	r := crankside(t, append(checkBase, "--peak", "150", "--end-pressure", "0")...)
	require.Equal(t, 3, r.status, "read, and a STOP (peak above 40 cmH2O, MHRA RMVS001 2020): %s", r.stderr)
}
