package machine

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestGasCompliance(t *testing.T) {
	// Boyle, isothermal (derived): 500 mL of gas at 1 atm = 1033.2 cmH2O ->
	// 500 / 1033.2 = 0.484 mL/cmH2O.
	require.InDelta(t, 0.484, GasComplianceMLPerCmH2O(500, 1033.2), 0.0005)
	// Derived: at half an atmosphere the same gas is twice as compliant.
	require.InDelta(t, 0.968, GasComplianceMLPerCmH2O(500, 516.6), 0.001)
}
