package setup_test

import (
	"fmt"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/profiles"
	"crankside/setup"
)

// sparseProfile is demo-b with only the holes named (and the bench points
// on them): holes far enough apart that a step of 1 mL/kg PBW leaves the
// hole in use the nearest to the step's volume.
func sparseProfile(t *testing.T, labels ...string) profiles.Profile {
	t.Helper()
	p := profile(t, "demo-b")
	keep := map[string]bool{}
	for _, l := range labels {
		keep[l] = true
	}
	var holes []profiles.Hole
	for _, h := range p.Crank.Holes {
		if keep[h.Label] {
			holes = append(holes, h)
		}
	}
	var points []profiles.BenchPoint
	for _, pt := range p.Calibration.Points {
		if keep[pt.Hole] {
			points = append(points, pt)
		}
	}
	p.Crank.Holes, p.Calibration.Points = holes, points
	require.Len(t, p.Crank.Holes, len(labels))
	return p
}

// A plateau above 30 cmH2O takes the tidal volume down 1 mL/kg PBW (ARDS
// Network protocol card). When the hole nearest that volume is still the
// hole in use, the step takes the next smaller hole if it keeps 4 mL/kg
// PBW or more (the protocol's floor), so that the step takes effect; if
// the smaller hole would go below 4 mL/kg the hole stays and says so.
// Demo-b with holes B and F only, F at 20 rpm and 1.0 s dwell, PEEP 10,
// an assumed compliance of 20 mL/cmH2O.
//
// Derived: PBW 175 cm male = 50 + 0.91 x (175 - 152.4) = 70.566 kg and
// 182 cm male = 50 + 0.91 x 29.6 = 76.936 kg (ARDSNet 2000); 4 mL/kg is
// 282.3 mL and 307.7 mL. Hole B is calibrated near 300 mL (bench 287 mL
// into a 50 mL/cmH2O test lung): between the two, so B keeps the floor for
// the shorter man and not for the taller. F gives about 235 mL more than
// B, more than twice a step (2 x 70.6 = 141 mL; 2 x 76.9 = 154 mL), so F
// stays the hole nearest the step's volume for both.
func TestPlateauStepTakesTheNextSmallerHoleOnlyAboveTheFloor(t *testing.T) {
	p := sparseProfile(t, "B", "F")
	run := func(heightCm float64) setup.ProtocolStepResult {
		req := protocolReq("F", 20, 1.0, 10, 0)
		req.Patient.HeightCm = heightCm
		req.ComplianceMLPerCmH2O = 20
		res, err := setup.ProtocolProposal(req, setup.GasReadings{}, p)
		require.NoError(t, err)
		require.Greater(t, res.Check.Current.Figures.PlateauCmH2O, 30.0, "the premise: a plateau above 30")
		require.True(t, res.Step.VtChanged)
		require.InDelta(t, res.Check.Current.Figures.Hole.MLPerKg-1, res.TargetMLPerKg, 1e-9, "down 1 mL/kg PBW")
		return res
	}

	// 175 cm: B keeps 4 mL/kg or more, and is taken.
	res := run(175)
	cur := res.Check.Current.Figures.Hole
	require.NotNil(t, res.Check.Proposed)
	b := res.Check.Proposed.Figures.Hole
	require.Equal(t, "B", res.Proposed.Hole, "notes: %q", res.Notes)
	require.Greater(t, cur.DeliveredML-b.DeliveredML, 2*70.566, "the premise: F is nearest the step's volume")
	require.InDelta(t, 282.3, 4*70.566, 0.05)
	require.GreaterOrEqual(t, b.DeliveredML, 282.3, "the premise: B keeps 4 mL/kg for 70.566 kg")
	require.Less(t, b.DeliveredML, 307.7, "the premise: B does not keep 4 mL/kg for 76.936 kg")
	require.InDelta(t, b.DeliveredML/70.566, b.MLPerKg, 0.01, "mL/kg of PBW 70.566 kg")
	notes := strings.Join(res.Notes, "\n")
	require.Contains(t, notes, fmt.Sprintf("the hole nearest %.0f mL is the one in use (F); the next smaller hole B (%.0f mL, %.1f mL/kg PBW) is taken so that the plateau step takes effect",
		res.TargetVtML, b.DeliveredML, b.DeliveredML/70.566))
	c, ok := hasChange(res.Changes, "tidal volume")
	require.True(t, ok, "%+v", res.Changes)
	require.InDelta(t, res.TargetVtML, c.Wanted, 1e-9)
	// The change is the hole's volume from rest, the proposal's figure that of
	// its evaluation: the same hole within half a millilitre.
	require.InDelta(t, b.DeliveredML, c.Got, 0.5)

	// 182 cm: B would give under 4 mL/kg; the hole stays F and the note says
	// the volume does not change on this machine.
	res = run(182)
	require.Equal(t, "F", res.Proposed.Hole, "notes: %q", res.Notes)
	notes = strings.Join(res.Notes, "\n")
	require.Contains(t, notes, fmt.Sprintf("the hole nearest %.0f mL is the one in use (F): the tidal volume does not change on this machine", res.TargetVtML))
	require.NotContains(t, notes, "next smaller hole")
}
