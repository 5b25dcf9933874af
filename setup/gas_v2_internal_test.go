package setup

import (
	"math"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

var v2Today = time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC)

func openProfile(t *testing.T, id string) profiles.Profile {
	t.Helper()
	p, _, err := profiles.Open(id, "")
	require.NoError(t, err)
	return p
}

// sweep runs f for patients 150-200 cm, both sexes, the three lung
// conditions, on demo-a and demo-b.
func sweep(t *testing.T, f func(p profiles.Profile, pl Plan)) {
	for _, id := range []string{"demo-a", "demo-b"} {
		p := openProfile(t, id)
		for h := 150.0; h <= 200; h += 5 {
			for _, sex := range []physiology.Sex{physiology.Female, physiology.Male} {
				for _, lung := range []physiology.Lung{physiology.Normal, physiology.ARDS, physiology.Obstructive} {
					pl, err := MakePlan(Request{Patient: Patient{HeightCm: h, Sex: sex}, Targets: Targets{Lung: lung}, Now: v2Today}, p)
					require.NoError(t, err, "%s %v cm %v %v", id, h, sex, lung)
					f(p, pl)
				}
			}
		}
	}
}

// fineHoles is the reference: every hole from rest at the model's 1 ms.
func fineHoles(t *testing.T, p profiles.Profile, pl Plan) []HoleFigure {
	u, err := newUnit(p, v2Today)
	require.NoError(t, err)
	u.gas = pl.Gas
	ls := lungState{lung: machine.Lung{ComplianceMLPerCmH2O: pl.ComplianceMLPerCmH2O, ResistanceCmH2OPerLS: pl.ResistanceCmH2OPerLS},
		peep: pl.PEEPCmH2O, pbwKg: pl.PBWKg}
	var out []HoleFigure
	for _, h := range p.Crank.Holes {
		hf, err := deliveredFromRestAt(u, h, pl.Timing.RPM, ls, 0.001)
		require.NoError(t, err)
		out = append(out, hf)
	}
	return out
}

func TestHoleChoiceMatchesFineStep(t *testing.T) {
	// The plan scans at ScanStepS and re-makes close choices at 1 ms; the
	// reference simulates every hole at 1 ms (the model's default step) and
	// takes the nearest. Issue 13: the hole choice must not change.
	n := 0
	sweep(t, func(p profiles.Profile, pl Plan) {
		ref := fineHoles(t, p, pl)
		want := ref[leastVenting(ref, nearestHole(ref, pl.TargetVtML))].Label
		require.Equal(t, want, pl.Hole.Label, "%s %v cm %v %v", p.ID, pl.Patient.HeightCm, pl.Patient.Sex, pl.Lung)
		n++
	})
	require.Equal(t, 2*11*2*3, n)
}

func TestScanStepAgreesWithFineStep(t *testing.T) {
	// Every hole's delivered volume at ScanStepS against 1 ms: within 1e-4
	// (the bound ScanStepS's doc and CloseChoicePct rest on). The chosen
	// hole is replaced by its 1 ms steady breath in pl.Holes and skipped.
	sweep(t, func(p profiles.Profile, pl Plan) {
		ref := fineHoles(t, p, pl)
		for i, h := range pl.Holes {
			if h.Label == pl.Hole.Label {
				continue
			}
			require.InDelta(t, 0, h.DeliveredML/ref[i].DeliveredML-1, 1e-4, "%s hole %s", p.ID, h.Label)
		}
	})
}

func TestZeroLeakAndHighReliefChangeNothing(t *testing.T) {
	// Issue 13: a leak of 0 and a relief valve far above the peak change
	// nothing against no leak and no relief valve (relief 0 in the machine's
	// input means none): every figure is the same.
	for _, id := range []string{"demo-a", "demo-b"} {
		base := openProfile(t, id)
		base.Circuit.LeakLMinAt20CmH2O, base.Circuit.ReliefCmH2O = 0, 0
		high := base
		high.Circuit.ReliefCmH2O = 200 // far above any peak here (under 20 cmH2O)
		req := Request{Patient: Patient{HeightCm: 175, Sex: physiology.Male}, Now: v2Today}
		a, err := MakePlan(req, base)
		require.NoError(t, err)
		b, err := MakePlan(req, high)
		require.NoError(t, err)
		require.Less(t, a.PeakCmH2O, 20.0)
		require.False(t, b.PressureLimited)
		require.Equal(t, a.Figures, b.Figures, id)
		require.Equal(t, a.Holes, b.Holes, id)
	}
}

func TestVersion1LimitIsTheZeroGasPath(t *testing.T) {
	// The version 1 limit through the test hook (F exactly 1, no cylinder
	// gas, no leak, no relief valve) hands the machine a GasPath with F = 1
	// and nothing else, which machine's TestGasPathAtItsLimitIsVersion1
	// holds to the version 1 Simulate (derived limit of the equations).
	p := openProfile(t, "demo-a")
	p.Circuit.ReliefCmH2O = 0
	pl, err := MakePlan(V1Request(Request{Patient: Patient{HeightCm: 170, Sex: physiology.Female}, Now: v2Today}), p)
	require.NoError(t, err)
	gp := pl.Gas.patientPath()
	gp.BarometricCmH2O = 0 // used only with a head position
	require.Equal(t, machine.GasPath{BTPSFactor: 1}, gp)
	require.InDelta(t, 1, pl.BTPSFactor, 0)
	require.InDelta(t, 0, pl.CompressionLossML, 0)
	require.InDelta(t, pl.Hole.DeliveredML, pl.DeliveredRoomML, 1e-9)
	// Literal from TestPlanDemoA170Female (version 1, derived there): hole 6,
	// 10.056 mL trapped.
	require.Equal(t, "6", pl.Hole.Label)
	require.InDelta(t, 10.056, pl.TrappedML, 0.01)
	require.False(t, math.IsNaN(pl.PlateauCmH2O))
}
