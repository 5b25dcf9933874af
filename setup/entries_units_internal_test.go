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
