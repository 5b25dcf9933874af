package main

import (
	"testing"

	"github.com/stretchr/testify/require"
)

// A second checker's initials go on the card with the first's; a proposal
// that changes the hole leaves a line for the second signature.
func TestCheckSecondInitials(t *testing.T) {
	args := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--bed", "B4", "--card", "--propose-hole", "7"}
	r := crankside(t, append(args, "--initials", "jk", "--second-initials", "ab")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "checked by JK, second check AB")
	require.Contains(t, r.stdout, "Hole or PEEP changes: second check by AB")

	r = crankside(t, append(args, "--second-initials", "ab")...)
	require.Equal(t, 2, r.status)
	require.Contains(t, r.stderr, "--second-initials goes with --initials")

	r = crankside(t, append(args, "--initials", "jk", "--second-initials", "a1")...)
	require.Equal(t, 2, r.status)
	require.Contains(t, r.stderr, `--second-initials: "a1"`)
}
