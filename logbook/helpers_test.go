package logbook_test

import (
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// The checks these tests record: the log's tests need a real check to
// write, not any particular figure, so the check is the program's own
// (version 2 gas path), on an invented demo profile.

var today = time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC)

func profile(t testing.TB, id string) profiles.Profile {
	t.Helper()
	p, _, err := profiles.Open(id, "")
	require.NoError(t, err)
	return p
}

// checkReq is a check of a 175 cm man's observed setting.
func checkReq(hole string, rpm, dwell float64) setup.CheckRequest {
	return setup.CheckRequest{
		Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: hole, RPM: rpm, DwellS: dwell, PEEPCmH2O: 5},
		Now:     today,
	}
}

// unexplainedCheck is a handover whose readings no lung explains: the
// manometer reads 120 at the peak and 100 at the end of delivery on hole 8
// of demo-a (the fit would need R above 100).
func unexplainedCheck(t *testing.T, propose bool) setup.Check {
	t.Helper()
	req := checkReq("8", 21, 1.4)
	req.Readings = &physiology.Readings{PeakCmH2O: 120, EndCmH2O: 100}
	if propose {
		hole := "7"
		req.Proposal.Hole = &hole
	}
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.NotEmpty(t, ck.FitProblem)
	return ck
}
