package setup_test

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/setup"
)

// checkReq is a check in the version 1 limit (setup.V1CheckRequest; see
// plan in plan_test.go): these tests' literals are version 1 derivations.
func checkReq(hole string, rpm, dwell float64) setup.CheckRequest {
	return setup.V1CheckRequest(setup.CheckRequest{
		Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: hole, RPM: rpm, DwellS: dwell, PEEPCmH2O: 5},
		Now:     today,
	})
}

func TestCheckOfAnObservedSetting(t *testing.T) {
	ck, err := setup.RunCheck(checkReq("8", 21, 1.4), profile(t, "demo-a"))
	require.NoError(t, err)
	// Round trip: the plan for 175 cm male (hole 8, 21 rpm, 1.4 s), checked as
	// an observed setting, gives the plan's figures.
	pl := plan(t, "demo-a", setup.Patient{HeightCm: 175, Sex: physiology.Male}, setup.Targets{})
	require.Equal(t, "8", pl.Hole.Label)
	// Derived: 439.823 mL swept x 60/61.5 = 429.10 mL (tolerance 0.5%).
	require.InDelta(t, 429.10, ck.Current.Figures.Hole.DeliveredML, 2.2, "delivered (derived)")
	require.InDelta(t, pl.Hole.DeliveredML, ck.Current.Figures.Hole.DeliveredML, 1e-9)
	// The plan starts its steady state from the 10 ms scan's volume, the
	// check from a 1 ms one: the trapped gas differs by under 0.001 mL, the
	// peak by about 1e-5 cmH2O.
	require.InDelta(t, pl.PeakCmH2O, ck.Current.Figures.PeakCmH2O, 1e-4)
	require.InDelta(t, pl.Timing.RateBPM, ck.Current.Figures.Timing.RateBPM, 1e-9)
	// Minute ventilation = Vt x rate (derived): hole 8 (439.823 mL swept x
	// 60/61.5 = 429.10 mL) at 2100/149 = 14.094/min (21 rpm, 1.4 s dwell) is
	// 6.0477 L/min (tolerance 0.5% for the C/(C+Cc) share).
	f := ck.Current.Figures
	require.InDelta(t, 6.0477, f.MinuteVentLPerMin, 0.03, "minute ventilation (derived)")
}

func TestCheckRefusesASettingTheMachineCannotRun(t *testing.T) {
	cases := []struct {
		profile, hole string
		rpm, dwell    float64
		field         string
	}{
		{"demo-a", "26", 21, 1.4, "hole"},
		{"demo-a", "8", 21.3, 1.4, "rpm"}, // off the 0.5 rpm step
		{"demo-a", "8", 45, 1.4, "rpm"},   // above 40 rpm
		{"demo-a", "8", 21, 1.45, "dwell-s"},
		{"demo-a", "8", 21, 12, "dwell-s"},
		{"demo-b", "C", 21, 1.3, "rpm"}, // fixed at 20
	}
	for _, c := range cases {
		_, err := setup.RunCheck(checkReq(c.hole, c.rpm, c.dwell), profile(t, c.profile))
		var ie *setup.InputError
		require.True(t, errors.As(err, &ie), "%+v: %v", c, err)
		require.Equal(t, c.field, ie.Field)
	}
}

func TestReadingsRoundTrip(t *testing.T) {
	// Readings synthesised by the model from a known lung give that lung back:
	// C within 2%, R within 5% (issue's acceptance limits).
	cases := []struct {
		profile, hole string
		rpm, dwell    float64
		c, r          float64
	}{
		{"demo-a", "8", 21, 1.4, 60, 10},
		{"demo-a", "6", 27, 1.1, 30, 12},
		{"demo-a", "10", 16, 2.5, 90, 6},
		{"demo-a", "5", 30, 0.4, 20, 18},
		{"demo-b", "D", 20, 1.3, 45, 25},
		{"demo-b", "B", 20, 2.0, 25, 8},
	}
	for _, c := range cases {
		t.Run(fmt.Sprintf("%s-%s-C%v-R%v", c.profile, c.hole, c.c, c.r), func(t *testing.T) {
			p := profile(t, c.profile)
			req := checkReq(c.hole, c.rpm, c.dwell)
			req.ComplianceMLPerCmH2O, req.ResistanceCmH2OPerLS = c.c, c.r
			truth, err := setup.RunCheck(req, p)
			require.NoError(t, err)
			req.ComplianceMLPerCmH2O, req.ResistanceCmH2OPerLS = 0, 0
			req.Readings = &physiology.Readings{PeakCmH2O: truth.Current.Figures.PeakCmH2O, EndCmH2O: truth.Current.Figures.EndInspCmH2O}
			ck, err := setup.RunCheck(req, p)
			require.NoError(t, err)
			require.Empty(t, ck.FitProblem)
			require.NotNil(t, ck.Fitted)
			require.InEpsilon(t, c.c, ck.Fitted.ComplianceMLPerCmH2O, 0.02)
			require.InEpsilon(t, c.r, ck.Fitted.ResistanceCmH2OPerLS, 0.05)
			// Every prediction is redone with the fitted lung.
			require.InDelta(t, truth.Current.Figures.PlateauCmH2O, ck.Current.Figures.PlateauCmH2O, 0.05)
			require.Equal(t, "fitted to the manometer readings", ck.Mechanics.Source)
		})
	}
}

func TestReadingsWithNoSolution(t *testing.T) {
	cases := []struct {
		name      string
		peak, end float64
		retake    string
	}{
		{"end at PEEP", 15, 5, "the end pressure"},
		{"end below PEEP", 15, 3, "the end pressure"},
		{"peak below end", 10, 12, "both readings"},
		// A peak of 95 is above demo-a's relief valve at 40: the version 2
		// breath never goes above it, so no lung gives that peak.
		{"absurdly stiff", 95, 90, "the peak"},
		{"NaN", math.NaN(), 12, "both readings"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			req := checkReq("8", 21, 1.4)
			req.Readings = &physiology.Readings{PeakCmH2O: c.peak, EndCmH2O: c.end}
			ck, err := setup.RunCheck(req, profile(t, "demo-a"))
			require.NoError(t, err, "the check still shows what it can")
			require.Nil(t, ck.Fitted)
			require.Contains(t, ck.FitProblem, "re-take "+c.retake)
			require.Equal(t, 60.0, ck.Mechanics.Value, "falls back to the assumed lung")
			require.NotZero(t, ck.Current.Figures.Hole.DeliveredML)
		})
	}
}

func TestProposedChangeSideBySide(t *testing.T) {
	req := checkReq("8", 21, 1.4)
	hole, peep := "7", 8.0
	req.Proposal = setup.Proposal{Hole: &hole, PEEPCmH2O: &peep}
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.NotNil(t, ck.Proposed)
	require.Equal(t, "7", ck.Proposed.Setting.Hole)
	require.Equal(t, 21.0, ck.Proposed.Setting.RPM)
	var vt setup.Difference
	for _, d := range ck.Differences {
		if d.What == "tidal volume" && d.Unit == "mL" {
			vt = d
		}
	}
	require.Less(t, vt.Change, 0.0, "a smaller hole delivers less")
	// Derived: hole 8 delivers about 439.823 x 60/61.5 = 429.10 mL, hole 7
	// 408.407 x 60/61.5 = 398.45 mL; PEEP does not change the volume of this
	// linear model, so the change is -30.65 mL (tolerance 0.5% of each).
	require.InDelta(t, 429.10, vt.Current, 2.2, "current tidal volume (derived)")
	require.InDelta(t, 398.45, vt.Proposed, 2.0, "proposed tidal volume (derived)")
	require.InDelta(t, -30.65, vt.Change, 0.5, "change (derived)")
	// A proposal the machine cannot run is refused, naming the proposal's flag.
	bad := 33.3
	req.Proposal = setup.Proposal{RPM: &bad}
	_, err = setup.RunCheck(req, profile(t, "demo-a"))
	var ie *setup.InputError
	require.True(t, errors.As(err, &ie))
	require.Equal(t, "propose-rpm", ie.Field)
}

func TestCheckCylinderAndFiO2(t *testing.T) {
	req := checkReq("8", 21, 1.4)
	req.Setting.O2LPerMin = 2
	req.CylinderWaterL, req.CylinderBar = 2, 30
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	f := ck.Current.Figures
	// FiO2 = 0.21 + 0.79 x 2 / (what the piston draws) (DESIGN version 2,
	// derived): hole 8 sweeps 439.823 mL (no calibration on demo-a) at
	// 2100/149 = 14.094/min, 6.1988 L/min: 0.21 + 1.58 / 6.1988 = 0.46489;
	// 2 L x 30 bar = 60 L -> 30 min to empty (common practice); 30 bar is
	// already below the default reserve of 40 bar, so 0 min to it.
	require.InDelta(t, 0.46489, f.FiO2, 0.0001, "FiO2 at the piston's intake (derived)")
	require.InDelta(t, 30, f.CylinderEmptyMinutes, 1e-9)
	require.InDelta(t, 0, f.CylinderMinutes, 1e-9)
	require.True(t, hasCaution(ck.Current.Cautions, setup.CautionO2CylinderLow))
}

func hasCaution(cs []setup.Caution, id setup.CautionID) bool {
	for _, c := range cs {
		if c.ID == id {
			return true
		}
	}
	return false
}

func BenchmarkMechanicsFit(b *testing.B) {
	p := profile(b, "demo-a")
	req := checkReq("8", 21, 1.4)
	req.Readings = &physiology.Readings{PeakCmH2O: 17, EndCmH2O: 14}
	for b.Loop() {
		if _, err := setup.RunCheck(req, p); err != nil {
			b.Fatal(err)
		}
	}
}

// A hole label matches whatever its letter case when only one hole does
// (common practice: "c" typed for hole C); demo-b has no hole I, so "i"
// is refused naming the holes.
func TestHoleLabelIgnoresCaseWhenUnambiguous(t *testing.T) {
	req := checkReq("c", 20, 1.3)
	ck, err := setup.RunCheck(req, profile(t, "demo-b"))
	require.NoError(t, err)
	require.Equal(t, "C", ck.Current.Setting.Hole)
	_, err = setup.RunCheck(checkReq("i", 20, 1.3), profile(t, "demo-b"))
	require.Error(t, err)
	require.Contains(t, err.Error(), "J")
}
