package physiology_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
)

// A comma between digits is a decimal mark (common practice: much of the
// world writes 0,9 for 0.9); anything else with a comma is refused, never
// reduced to its digits.
func TestParseNumberDecimalComma(t *testing.T) {
	for text, want := range map[string]float64{"0,9": 0.9, "1,5": 1.5, " 175,5 ": 175.5, "-0,5": -0.5, "12": 12} {
		got, err := physiology.ParseNumber(text)
		require.NoError(t, err, "%q", text)
		require.InDelta(t, want, got, 1e-12, "%q", text)
	}
	for _, text := range []string{"1,5,0", "1.5,0", "1,", ",5", "1,,5", "1 5", "15a"} {
		_, err := physiology.ParseNumber(text)
		require.Error(t, err, "%q must be refused", text)
	}
}

// Messages print plain decimals, never an exponent (common practice: a
// bedside reader should not decode 1.402e+05).
func TestRangeErrorsPrintPlainDecimals(t *testing.T) {
	err := physiology.CheckRange("height", 140200, 130, 230, "cm")
	require.EqualError(t, err, "height 140200 cm is outside 130-230 cm")
	require.Equal(t, "0.0001", physiology.PlainNumber(0.0001))
	require.Equal(t, "more than 1000000000", physiology.PlainNumber(1e300))
}
