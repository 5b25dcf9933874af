package setup_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

func TestProposedEntries(t *testing.T) {
	hole, rpm, o2 := "7", 24.0, 1.5
	rec := proposedRecord(t, setup.Proposal{Hole: &hole, RPM: &rpm, O2LPerMin: &o2})
	e := setup.ProposedEntries(rec)
	// The proposal as given above, in the entries' own words.
	require.Equal(t, "7", e["hole"])
	require.Equal(t, "24", e["rpm"])
	require.Equal(t, "1.4", e["dwell-s"]) // unchanged by the proposal
	require.Equal(t, "5", e["peep"])
	require.Equal(t, "1.5", e["o2-lpm"])
	require.Equal(t, "B4", e["bed"])
	require.Equal(t, "175", e["height-cm"])
	// Without a proposal: the entries found.
	plain := proposedRecord(t, setup.Proposal{})
	require.Equal(t, setup.RecordEntries(plain), setup.ProposedEntries(plain))
	_, hasO2 := setup.ProposedEntries(plain)["o2-lpm"]
	require.False(t, hasO2)
}
