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
	for _, truth := range [][2]float64{{50, 10}, {25, 15}, {80, 5}, {40, 30}} {
		peak, end, _ := equationOfMotion(5)(truth[0], truth[1])
		m, err := FitMechanics(Readings{peak, end}, 5, equationOfMotion(5))
		require.NoError(t, err)
		require.InEpsilon(t, truth[0], m.ComplianceMLPerCmH2O, 1e-6)
		require.InEpsilon(t, truth[1], m.ResistanceCmH2OPerLS, 1e-6)
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
