package setup_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/setup"
)

// Design rule (DESIGN.md, Cautions, version 2: "readings no lung explains
// (stop)"; DEVELOPERS.md: a measured alarm is never hidden by a
// prediction): a proposal evaluated on the assumed lung while the
// manometer's readings are unexplained is itself a stop, naming the
// readings at the current setting.
func TestProposalOnUnexplainedReadingsIsAStop(t *testing.T) {
	ck := unexplainedCheck(t, true)
	require.NotNil(t, ck.Proposed)
	require.Equal(t, setup.Stop, setup.Highest(ck.Proposed.Cautions))
	c := setup.FirstStop(ck.Proposed.Cautions)
	require.NotNil(t, c)
	require.Equal(t, "proposal-on-assumed-lung", c.ID)
	require.Contains(t, c.Message, "120/100 cmH2O", "the readings at the current setting")
	require.Contains(t, c.Message, "ASSUMED lung")
	require.Contains(t, c.Advice, "before any change is made")

	var text bytes.Buffer
	require.NoError(t, ck.WriteText(&text))
	require.Contains(t, text.String(), "STOP proposal-on-assumed-lung")
	require.NotContains(t, text.String(), "highest WARN)\n  WARN proposal-on-assumed-lung")

	rec, err := setup.NewRecord(ck, "B4", "jk", today)
	require.NoError(t, err)
	require.Equal(t, setup.Stop, setup.Highest(rec.Proposed.Cautions), "the record carries it")
	var card bytes.Buffer
	require.NoError(t, setup.WriteCard(&card, rec))
	require.Contains(t, strings.Join(strings.Fields(card.String()), " "), "STOP proposal-on-assumed-lung")
}

// An explained check's proposal has no such caution.
func TestProposalOnExplainedReadingsHasNoAssumedLungStop(t *testing.T) {
	req := checkReq("8", 21, 1.4)
	req.Readings = &physiology.Readings{PeakCmH2O: 17, EndCmH2O: 14}
	hole := "7"
	req.Proposal.Hole = &hole
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.Empty(t, ck.FitProblem)
	_, ok := ids(ck.Proposed.Cautions)["proposal-on-assumed-lung"]
	require.False(t, ok)
}
