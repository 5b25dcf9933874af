package setup_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/setup"
)

// A profile whose cylinder clearance is the format's default gets the
// clearance-default note on every setting judged: the plan's, a check's
// current and proposed settings, and the protocol step's proposal. The
// step's caution inputs were once built by hand without the note; the one
// constructor (newAssessment) reads it from the machine.
func TestClearanceDefaultOnEverySettingJudged(t *testing.T) {
	p := profile(t, "demo-a")
	p.Defaults = append(p.Defaults, "cylinder.clearance_cm")

	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 182, Sex: physiology.Male}, Now: today}, p)
	require.NoError(t, err)
	require.True(t, hasLeveledCaution(pl.Cautions, setup.CautionClearanceDefault, setup.Note), "plan")

	req := atHeight(protocolReq("8", 21, 1.4, 5, 0), 182)
	peep := 8.0
	req.Proposal = setup.Proposal{PEEPCmH2O: &peep}
	ck, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	require.True(t, hasLeveledCaution(ck.Current.Cautions, setup.CautionClearanceDefault, setup.Note), "check, current")
	require.NotNil(t, ck.Proposed)
	require.True(t, hasLeveledCaution(ck.Proposed.Cautions, setup.CautionClearanceDefault, setup.Note), "check, proposed by hand")

	// ARDS Network protocol card: SpO2 85 on room air is below the goal,
	// so the step moves to FiO2 0.3: a proposal other than the setting.
	res, err := setup.ProtocolProposal(atHeight(protocolReq("8", 21, 1.4, 5, 0), 182), setup.GasReadings{SpO2Pct: gas(85)}, p)
	require.NoError(t, err)
	require.NotNil(t, res.Check.Proposed)
	require.True(t, hasLeveledCaution(res.Check.Proposed.Cautions, setup.CautionClearanceDefault, setup.Note), "protocol step")
}
