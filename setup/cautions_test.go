package setup

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/machine"
)

// clean is a setting inside every limit.
func clean() assessment {
	return assessment{
		heightCm: 170, pbwKg: 66,
		f: Figures{
			Hole:         HoleFigure{MLPerKg: 6},
			Timing:       machine.Timing{RateBPM: 14, TiS: 1.4},
			PEEPCmH2O:    5,
			PlateauCmH2O: 20, DrivingCmH2O: 10, PeakCmH2O: 25, IntrinsicPEEPCmH2O: 0.5,
			CylinderGiven: true, CylinderMinutes: 300, O2FlowLPerMin: 2,
			TorqueShareOfRating: 0.5, PeakTorqueNm: 6,
		},
		reliefCmH2O:  40,
		timing:       &machine.TimingPlan{WantedTiS: 1.4},
		targetMLPerK: 6, offTargetPct: 2,
		cal: CalibrationStatus{Calibration: machine.Calibration{K: 0.95}, Fit: &machine.Fit{}, AgeDays: 5, Holes: 4, Date: "2026-11-26",
			SweptMinML: 150, SweptMaxML: 1200},
		ratedTorque: 12,
	}
}

func find(cs []Caution, id CautionID) *Caution {
	for i := range cs {
		if cs[i].ID == id {
			return &cs[i]
		}
	}
	return nil
}

// namesAKnownSource is true when a caution's source is one the project
// cites: a published paper or specification, common practice, from memory,
// or this machine's own profile.
func namesAKnownSource(src string) bool {
	for _, s := range []string{"ARDS Network 2000", "Amato et al. 2015", "MHRA RMVS001", "ISO 80601-2-12",
		"Devine 1974", "common practice", "from memory", "this machine's profile"} {
		if strings.Contains(src, s) {
			return true
		}
	}
	return false
}

func TestCleanSettingHasNoCautions(t *testing.T) {
	require.Empty(t, assess(clean()))
}

func TestEachCautionAtItsLimit(t *testing.T) {
	cases := []struct {
		id     CautionID
		source string
		level  Level
		over   func(a *assessment) // builds the condition
		inside func(a *assessment) // just inside the limit
	}{
		{CautionTidalVolumeHigh, "ARDSNet 2000: 4-8 mL/kg", Warn,
			func(a *assessment) { a.f.Hole.MLPerKg = 8.01 }, func(a *assessment) { a.f.Hole.MLPerKg = 8.0 }},
		{CautionTidalVolumeHigh, "ARDSNet 2000 range 4-8; stop at 10 mL/kg (common practice)", Stop,
			func(a *assessment) { a.f.Hole.MLPerKg = 10 }, func(a *assessment) { a.f.Hole.MLPerKg = 9.99 }},
		{CautionTidalVolumeLow, "ARDSNet 2000: 4-8 mL/kg", Warn,
			func(a *assessment) { a.f.Hole.MLPerKg = 3.99 }, func(a *assessment) { a.f.Hole.MLPerKg = 4.0 }},
		{CautionPlateauHigh, "ARDSNet 2000: plateau <= 30", Warn,
			func(a *assessment) { a.f.PlateauCmH2O = 30.01 }, func(a *assessment) { a.f.PlateauCmH2O = 30 }},
		{CautionDrivingPressureHigh, "Amato 2015, 15 cmH2O common practice", Warn,
			func(a *assessment) { a.f.DrivingCmH2O = 15.01 }, func(a *assessment) { a.f.DrivingCmH2O = 15 }},
		{CautionPeakAboveRelief, "the profile's relief pressure", Stop,
			func(a *assessment) { a.reliefCmH2O = 30; a.f.PeakCmH2O = 30.01 }, func(a *assessment) { a.reliefCmH2O = 30; a.f.PeakCmH2O = 30 }},
		{CautionPeakHigh, "MHRA RMVS001: never more than 40", Stop,
			func(a *assessment) { a.reliefCmH2O = 60; a.f.PeakCmH2O = 40.01 }, func(a *assessment) { a.reliefCmH2O = 60; a.f.PeakCmH2O = 40 }},
		{CautionRateHigh, "ARDSNet 2000: rate <= 35", Warn,
			func(a *assessment) { a.f.Timing.RateBPM = 35.01 }, func(a *assessment) { a.f.Timing.RateBPM = 35 }},
		{CautionRateLow, "common practice: below 8", Warn,
			func(a *assessment) { a.f.Timing.RateBPM = 7.99 }, func(a *assessment) { a.f.Timing.RateBPM = 8 }},
		{CautionIntrinsicPEEP, "common practice: above 2 cmH2O", Warn,
			func(a *assessment) { a.f.IntrinsicPEEPCmH2O = 2.01 }, func(a *assessment) { a.f.IntrinsicPEEPCmH2O = 2 }},
		{CautionPEEPLow, "ARDSNet 2000: PEEP at least 5", Warn,
			func(a *assessment) { a.f.PEEPCmH2O = 4.99 }, func(a *assessment) { a.f.PEEPCmH2O = 5 }},
		{CautionRateUnreachable, "this machine's profile: not reachable by this motor", Stop,
			func(a *assessment) { a.timing.Rate = machine.TooFast }, func(a *assessment) { a.timing.Rate = machine.Reached }},
		{CautionRateUnreachable, "this machine's profile: not reachable by this controller", Stop,
			func(a *assessment) { a.timing.Rate = machine.TooSlow }, func(a *assessment) { a.timing.Rate = machine.Reached }},
		{CautionTiNotReachable, "this machine's profile: nearest reachable speed used", Warn,
			func(a *assessment) { a.timing.Speed = machine.SpeedLimited }, func(a *assessment) { a.timing.Speed = machine.Reached }},
		{CautionHoleOffTarget, "common practice: more than 10% off target", Warn,
			func(a *assessment) { a.offTargetPct = -10.01 }, func(a *assessment) { a.offTargetPct = -10 }},
		{CautionCalibrationMissing, "common practice: calibration missing", Warn,
			func(a *assessment) { a.cal.Fit = nil }, func(a *assessment) { a.cal.Fit = &machine.Fit{} }},
		{CautionCalibrationOld, "common practice: older than 30 days", Warn,
			func(a *assessment) { a.cal.AgeDays = 31 }, func(a *assessment) { a.cal.AgeDays = 30 }},
		{CautionCalibrationFuture, "common practice: a date in the future is a mistake", Warn,
			func(a *assessment) { a.cal.AgeDays = -1 }, func(a *assessment) { a.cal.AgeDays = 0 }},
		{CautionCalibrationResidual, "ISO 80601-2-12 (from memory)", Warn,
			func(a *assessment) { a.cal.Outside = 1 }, func(a *assessment) { a.cal.Outside = 0 }},
		{CautionCalibrationThin, "common practice: three holes for a line", Note,
			func(a *assessment) { a.cal.Holes = 2 }, func(a *assessment) { a.cal.Holes = 3 }},
		{CautionO2CylinderLow, "common practice: under 2 hours", Warn,
			func(a *assessment) { a.f.CylinderMinutes = 119.9 }, func(a *assessment) { a.f.CylinderMinutes = 120 }},
		{CautionTorqueHigh, "common practice: above 80% of rating", Warn,
			func(a *assessment) { a.f.TorqueShareOfRating = 0.801 }, func(a *assessment) { a.f.TorqueShareOfRating = 0.8 }},
		{CautionTorqueHigh, "this machine's profile: stop above 100%", Stop,
			func(a *assessment) { a.f.TorqueShareOfRating = 1.001 }, func(a *assessment) { a.f.TorqueShareOfRating = 1.0 }},
		{CautionHeightBelowFormula, "Devine 1974: formula stated above 60 in", Warn,
			func(a *assessment) { a.heightCm = 152.3 }, func(a *assessment) { a.heightCm = 152.4 }},
	}
	for _, c := range cases {
		t.Run(string(c.id)+"/"+c.level.String(), func(t *testing.T) {
			a := clean()
			tp := *a.timing
			a.timing = &tp
			c.over(&a)
			got := find(assess(a), c.id)
			require.NotNil(t, got, "%s (%s) must appear", c.id, c.source)
			require.Equal(t, c.level, got.Level, "%s level", c.id)
			require.NotEmpty(t, got.Message)
			require.NotEmpty(t, got.Advice)
			require.True(t, namesAKnownSource(got.Source), "%s: source %q names no published source, "+
				"\"common practice\", \"from memory\" or the machine's profile", c.id, got.Source)

			b := clean()
			tp2 := *b.timing
			b.timing = &tp2
			c.over(&b)
			c.inside(&b)
			if inside := find(assess(b), c.id); inside != nil && inside.Level >= c.level {
				t.Errorf("%s must not be at level %v just inside its limit: %s", c.id, c.level, inside.Message)
			}
		})
	}
}

func TestCautionsAreOrderedStopFirst(t *testing.T) {
	a := clean()
	a.f.PlateauCmH2O = 35
	a.f.TorqueShareOfRating = 1.2
	a.cal.Holes = 1
	cs := assess(a)
	require.GreaterOrEqual(t, len(cs), 3)
	for i := 1; i < len(cs); i++ {
		require.GreaterOrEqual(t, cs[i-1].Level, cs[i].Level)
	}
	require.Equal(t, Stop, Highest(cs))
}
