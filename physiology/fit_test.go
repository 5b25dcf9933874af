package physiology

import (
	"errors"
	"testing"

	"github.com/stretchr/testify/require"
)

// equationOfMotion is the single-compartment model at two instants of a
// constant-flow breath of 0.5 L at 0.5 L/s (Chatburn 2014): the peak at the
// end of flow and the end pressure after a short decay to 20% of the
// resistive part (an invented but well-posed second equation).
func equationOfMotion(peep float64) PressureModel {
	return func(c, r float64) (float64, float64, error) {
		return AirwayPressureCmH2O(peep, 500, c, r, 0.5), AirwayPressureCmH2O(peep, 500, c, r, 0.1), nil
	}
}

func TestFitMechanicsSolvesBothEquations(t *testing.T) {
	// Readings worked by hand from the equation of motion (Chatburn 2014,
	// derived): peak = 5 + 500/C + 0.5 R, end = 5 + 500/C + 0.1 R.
	// C 50, R 10: 5 + 10 + 5 = 20 and 5 + 10 + 1 = 16;
	// C 25, R 15: 5 + 20 + 7.5 = 32.5 and 5 + 20 + 1.5 = 26.5;
	// C 80, R 5: 5 + 6.25 + 2.5 = 13.75 and 5 + 6.25 + 0.5 = 11.75;
	// C 40, R 30: 5 + 12.5 + 15 = 32.5 and 5 + 12.5 + 3 = 20.5.
	for _, k := range []struct{ peak, end, c, r float64 }{
		{20, 16, 50, 10}, {32.5, 26.5, 25, 15}, {13.75, 11.75, 80, 5}, {32.5, 20.5, 40, 30},
	} {
		m, err := FitMechanics(Readings{k.peak, k.end}, 5, equationOfMotion(5))
		require.NoError(t, err)
		require.InEpsilon(t, k.c, m.ComplianceMLPerCmH2O, 1e-6, "peak %v end %v: C (derived)", k.peak, k.end)
		require.InEpsilon(t, k.r, m.ResistanceCmH2OPerLS, 1e-6, "peak %v end %v: R (derived)", k.peak, k.end)
	}
}

func TestFitMechanicsSaysWhichReadingToRetake(t *testing.T) {
	cases := []struct {
		rd     Readings
		retake string
	}{
		{Readings{20, 5}, "end pressure"},
		{Readings{12, 14}, "both readings"},
		{Readings{6, 5.5}, "end pressure"}, // C 1000 mL/cmH2O: not a lung
	}
	for _, c := range cases {
		_, err := FitMechanics(c.rd, 5, equationOfMotion(5))
		var re *ReadingError
		require.True(t, errors.As(err, &re), "%+v: %v", c.rd, err)
		require.Equal(t, c.retake, re.Retake, "%+v", c.rd)
		require.ErrorIs(t, err, ErrNoMechanics)
	}
}

// limited is equationOfMotion with the peak held at a relief valve of 40
// cmH2O (the excess vents): where the model's peak is flat, Newton's
// steps on it stall, and the bracketing solve must still find the lung.
func limited(peep float64) PressureModel {
	return func(c, r float64) (float64, float64, error) {
		p, e, _ := equationOfMotion(peep)(c, r)
		return min(p, 40), min(e, 40), nil
	}
}

func TestFitMechanicsBelowAFlattenedPeak(t *testing.T) {
	// Derived by hand from the equation of motion (Chatburn 2014): C 20,
	// R 16: peak 5 + 25 + 8 = 38, end 5 + 25 + 1.6 = 31.6 (below 40, so
	// the relief does not touch them); C 12.5, R 2: peak 5 + 40 + 1 = 46
	// would vent, so a reading of 39.5/37 needs C 500/(37 - 5 - 0.1 R),
	// R from 39.5 - 37 = 0.4 R: R 6.25, C 500/31.375 = 15.936.
	for _, k := range []struct{ peak, end, c, r float64 }{
		{38, 31.6, 20, 16}, {39.5, 37, 500 / 31.375, 6.25},
	} {
		m, err := FitMechanics(Readings{k.peak, k.end}, 5, limited(5))
		require.NoError(t, err, "%+v", k)
		require.InEpsilon(t, k.c, m.ComplianceMLPerCmH2O, 1e-4, "peak %v end %v: C (derived)", k.peak, k.end)
		require.InEpsilon(t, k.r, m.ResistanceCmH2OPerLS, 1e-4, "peak %v end %v: R (derived)", k.peak, k.end)
		require.False(t, m.EndOnly)
	}
}

func TestFitMechanicsNearGivesTheSameLung(t *testing.T) {
	// Round trip (named as such): started from a lung far off, the fit
	// reaches the hand-worked C 25, R 15 of TestFitMechanicsSolvesBothEquations.
	for _, near := range []Mechanics{{ComplianceMLPerCmH2O: 150, ResistanceCmH2OPerLS: 2}, {ComplianceMLPerCmH2O: 6, ResistanceCmH2OPerLS: 90}} {
		m, err := FitMechanicsNear(Readings{32.5, 26.5}, 5, near, equationOfMotion(5))
		require.NoError(t, err)
		require.InEpsilon(t, 25, m.ComplianceMLPerCmH2O, 1e-6)
		require.InEpsilon(t, 15, m.ResistanceCmH2OPerLS, 1e-6)
	}
}

func TestFitMechanicsFromACoarseFit(t *testing.T) {
	// The hand-worked C 25, R 15 of TestFitMechanicsSolvesBothEquations
	// (peak 32.5, end 26.5), started from a lung a coarser model might
	// give: reached to the full fit's residual of 1e-9 cmH2O, so within
	// 1e-9 relative (derived: near the solution the readings move by about
	// 500/C = 20 cmH2O per unit of log C and 0.4 x 15 = 6 per unit of
	// log R, so a residual of 1e-9 leaves log C and log R within about
	// 1e-10). A start that is no lung starts from the physical estimate.
	for _, near := range []Mechanics{{ComplianceMLPerCmH2O: 25.01, ResistanceCmH2OPerLS: 14.99}, {ComplianceMLPerCmH2O: 31, ResistanceCmH2OPerLS: 9}, {}} {
		m, err := FitMechanicsFrom(Readings{32.5, 26.5}, 5, near, equationOfMotion(5))
		require.NoError(t, err)
		require.InEpsilon(t, 25, m.ComplianceMLPerCmH2O, 1e-9, "from %+v", near)
		require.InEpsilon(t, 15, m.ResistanceCmH2OPerLS, 1e-9, "from %+v", near)
	}
	_, err := FitMechanicsFrom(Readings{20, 5}, 5, Mechanics{ComplianceMLPerCmH2O: 50, ResistanceCmH2OPerLS: 10}, equationOfMotion(5))
	require.ErrorIs(t, err, ErrNoMechanics, "an end at PEEP is refused whatever the start")
}

func TestFitComplianceFromEndAlone(t *testing.T) {
	// Derived: at R 10 the end reading is 5 + 500/C + 1, so an end of 16
	// gives C 50 and an end of 26 gives C 25 (Chatburn 2014 equation of
	// motion); the peak is not used.
	for _, k := range []struct{ end, c float64 }{{16, 50}, {26, 25}} {
		m, err := FitComplianceFromEnd(k.end, 5, 10, limited(5))
		require.NoError(t, err)
		require.InEpsilon(t, k.c, m.ComplianceMLPerCmH2O, 1e-6, "end %v (derived)", k.end)
		require.Equal(t, 10.0, m.ResistanceCmH2OPerLS, "the resistance given, not fitted")
		require.True(t, m.EndOnly)
	}
	// End 6.5 at R 10 needs 500/C = 0.5, C 1000: above FitCMax (200).
	_, err := FitComplianceFromEnd(6.5, 5, 10, limited(5))
	var re *ReadingError
	require.True(t, errors.As(err, &re))
	require.Equal(t, "end pressure", re.Retake)
	require.Contains(t, re.Reason, "above 200")
}

func TestFitMechanicsOutsideTheRangesIsRefused(t *testing.T) {
	// Derived from the equation of motion: a gap of 0.4 R = 48 needs R 120
	// (above FitRMax 100): re-take the peak; an end of 5.5 with a gap of
	// 0.5 needs C near 1000 (above 200): re-take the end pressure.
	for _, k := range []struct {
		peak, end float64
		retake    string
		says      string
	}{{68, 20, "peak", "above 100"}, {6, 5.5, "end pressure", "above 200"}} {
		_, err := FitMechanics(Readings{k.peak, k.end}, 5, equationOfMotion(5))
		var re *ReadingError
		require.True(t, errors.As(err, &re), "%+v: %v", k, err)
		require.Equal(t, k.retake, re.Retake)
		require.Contains(t, re.Reason, k.says)
	}
}
