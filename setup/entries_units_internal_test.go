package setup

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
)

// A conversion says a number as it was typed, every digit kept, but one
// too large or too small for a line in PlainNumber's words, from 1e9 and
// below 1e-4 (the ward's numbers, physiology.PlainNumber).
func TestTypedSaysEveryDigitOrPlainWords(t *testing.T) {
	require.Equal(t, "0.00012345", typed(0.00012345))
	require.Equal(t, "0", typed(0))
	require.Equal(t, physiology.PlainNumber(0.00001), typed(0.00001))
	require.Contains(t, typed(0.00001), "nearly zero")
	require.Equal(t, physiology.PlainNumber(1e9), typed(1e9))
	require.Equal(t, "999999999.5", typed(999999999.5))
}

// A height that tries to say its unit starts with a digit and holds a
// letter or a foot or inch mark (5'10", 70in, 178cm; common practice):
// each end of each range counts, the character just outside it does not.
func TestHeightWithUnitReadsEachRangeToItsEnds(t *testing.T) {
	for text, want := range map[string]bool{
		`5'10"`: true, "70in": true, "178cm": true, `70"`: true, "5'": true,
		"0a": true, "9z": true, "5A": true, "5Z": true,
		"170": false, "": false, "in70": false, "/a": false, ":a": false,
		"5`": false, "5{": false, "5@": false, "5[": false, "5-": false,
	} {
		require.Equal(t, want, heightWithUnit(text), "%q", text)
	}
}
