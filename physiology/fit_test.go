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
