package physiology

import (
	"testing"

	"github.com/stretchr/testify/require"
)

// Oxygen bled into the intake reservoir: FiO2 = 0.21 + 0.79 Q/VE, capped at
// 1 (REFERENCES.md). 2 L/min into 10 L/min: 0.21 + 0.79 x 0.2 = 0.368; no
// flow is room air whatever is drawn, and oxygen with nothing drawn is all
// oxygen (the reservoir fills with it); nothing into nothing is room air,
// not a division by zero (derived).
func TestFiO2FromBleedEdges(t *testing.T) {
	require.InDelta(t, 0.368, FiO2FromBleed(2, 10), 1e-12)
	require.InDelta(t, 1.0, FiO2FromBleed(12, 10), 1e-12, "capped at 1")
	require.Equal(t, RoomAirFiO2, FiO2FromBleed(0, 10))
	require.Equal(t, 1.0, FiO2FromBleed(2, 0))
	require.Equal(t, RoomAirFiO2, FiO2FromBleed(0, 0))
	// The inverse: 0.368 at 10 L/min needs 2 L/min (derived).
	require.InDelta(t, 2.0, O2FlowForFiO2(0.368, 10), 1e-12)
}
