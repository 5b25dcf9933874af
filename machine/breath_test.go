package machine

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/integrate"
)

func TestConstantFlowFollowsEquationOfMotion(t *testing.T) {
	// Chatburn, Respir Care 2014 (equation of motion): with a circuit that
	// holds almost nothing, constant flow Q gives Paw = PEEP + R Q + V/C once
	// the circuit's tiny transient (R Cc = 10 us here) has passed.
	const (
		q    = 500.0 // mL/s
		c    = 50.0  // mL/cmH2O
		r    = 10.0  // cmH2O/(L/s)
		peep = 5.0
		dur  = 1.0
	)
	var lastT, lastP, lastV float64
	b, err := Simulate(BreathInput{
		Flow: func(float64) float64 { return q }, DurationS: dur,
		Lung: Lung{c, r}, CircuitMLPerCmH2O: 0.001, PEEPCmH2O: peep,
		Observe: func(ts, pc, _, v float64) { lastT, lastP, lastV = ts, pc, v },
	})
	require.NoError(t, err)
	// V = Q t less what the circuit holds (0.001 x 30 cmH2O) (derived).
	require.InDelta(t, q*dur, b.DeliveredML, 0.05, "delivered")
	want := peep + r*q/1000 + lastV/c
	require.InDelta(t, want, lastP, 1e-3, "Paw at t=%v: got %v want %v", lastT, lastP, want)
	// Chatburn 2014 check values: 0.5 L into 0.05 L/cmH2O at 1 L/s, R 10 -> 25.
	b2, err := Simulate(BreathInput{
		Flow: func(float64) float64 { return 1000 }, DurationS: 0.5,
		Lung: Lung{50, 10}, CircuitMLPerCmH2O: 0.001, PEEPCmH2O: 5,
	})
	require.NoError(t, err)
	require.InDelta(t, 25, b2.EndCmH2O, 0.01, "Chatburn 2014: 25 cmH2O at the end of a 0.5 L breath at 1 L/s")
}

func TestDeliveredTendsToComplianceShare(t *testing.T) {
	// Derived: once the flow stops and the circuit and lung equalise, a
	// volume pushed out of the piston is shared as C / (C + Cc).
	s := Stroke{Crank: Crank{RadiusCm: 3, RodCm: 22}, BoreCm: 10, RPM: 20, Scale: 1}
	k := s.kinematics()
	for _, cc := range []float64{0.5, 1.5, 5} {
		c := 40.0
		b, err := Simulate(BreathInput{
			Flow: k.flow, DurationS: k.durS + 3, // 3 s is many R Cc after the stroke
			Lung: Lung{c, 15}, CircuitMLPerCmH2O: cc,
		})
		require.NoError(t, err)
		want := s.SweptML() * c / (c + cc)
		require.InDelta(t, want, b.DeliveredML, 1e-6*want, "Cc %v", cc)
	}
}

func TestSimulationConvergesAsStepHalves(t *testing.T) {
	s := Stroke{Crank: Crank{RadiusCm: 4, RodCm: 22}, BoreCm: 10, RPM: 25, Scale: 1}
	run := func(step float64) Breath {
		r, err := SimulateStroke(StrokeInput{Stroke: s, Lung: Lung{30, 12}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 5, StepS: step})
		require.NoError(t, err)
		return r.Breath
	}
	a, b, c := run(0.002), run(0.001), run(0.0005)
	d1, d2 := math.Abs(a.DeliveredML-b.DeliveredML), math.Abs(b.DeliveredML-c.DeliveredML)
	require.Less(t, d2, d1, "difference must shrink as the step halves")
	// Second order: each halving cuts the error about fourfold (derived).
	if d2 > 0 {
		require.Greater(t, d1/d2, 3.0, "convergence ratio %v", d1/d2)
	}
	require.InDelta(t, b.DeliveredML, c.DeliveredML, 1e-3, "1 ms is converged to a micro-litre")
	require.InDelta(t, b.PeakCmH2O, c.PeakCmH2O, 0.01)
}

func TestDeliveredEqualsQuadratureOfPatientFlow(t *testing.T) {
	// gonum integrate.Simpsons of the simulated patient flow gives the same
	// volume as the model's lung volume change.
	s := Stroke{Crank: Crank{RadiusCm: 3.4, RodCm: 22}, BoreCm: 10, RPM: 18, Scale: 1}
	var ts, qs []float64
	r, err := SimulateStroke(StrokeInput{Stroke: s, Lung: Lung{45, 11}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 5, StartVolumeML: 30,
		Observe: func(t, _, q, _ float64) { ts, qs = append(ts, t), append(qs, q) }})
	require.NoError(t, err)
	if len(ts)%2 == 0 { // Simpson's rule wants an odd number of points
		ts, qs = ts[:len(ts)-1], qs[:len(qs)-1]
	}
	got := integrate.Simpsons(ts, qs)
	// The dropped last step carries at most a few microlitres.
	require.InDelta(t, r.DeliveredML, got, 0.05, "delivered %v vs integral of patient flow %v", r.DeliveredML, got)
}

func TestSweptEqualsQuadratureOfPistonFlow(t *testing.T) {
	// gonum integrate.Simpsons of piston flow over the delivery half-turn
	// gives bore area x stroke, in-line and offset.
	for _, cr := range []Crank{{RadiusCm: 3, RodCm: 22}, {RadiusCm: 5, RodCm: 20, OffsetCm: 2}, {RadiusCm: 6.2, RodCm: 22, OffsetCm: -1.5}} {
		s := Stroke{Crank: cr, BoreCm: 10, RPM: 20, Scale: 1}
		n := 4001
		ts := make([]float64, n)
		qs := make([]float64, n)
		d := s.DurationS()
		for i := range ts {
			ts[i] = d * float64(i) / float64(n-1)
			qs[i] = s.PistonFlowMLPerS(ts[i])
		}
		require.InDelta(t, s.SweptML(), integrate.Simpsons(ts, qs), 1e-6*s.SweptML(), "crank %+v", cr)
	}
}

func TestOffsetDeliveryAngle(t *testing.T) {
	// Derived: the delivery spans the angle between the dead centres,
	// pi + asin(e/(L+r)) - asin(e/(L-r)); in-line it is exactly pi.
	require.InDelta(t, math.Pi, Crank{RadiusCm: 3, RodCm: 22}.DeliveryAngle(), 1e-12)
	c := Crank{RadiusCm: 5, RodCm: 20, OffsetCm: 2}
	want := math.Pi + math.Asin(2.0/25) - math.Asin(2.0/15)
	require.InDelta(t, want, c.DeliveryAngle(), 1e-12)
}

func TestSimulateRefusesBadInput(t *testing.T) {
	flow := func(float64) float64 { return 100 }
	good := BreathInput{Flow: flow, DurationS: 1, Lung: Lung{50, 10}, CircuitMLPerCmH2O: 1}
	for name, mod := range map[string]func(*BreathInput){
		"zero compliance":   func(b *BreathInput) { b.Lung.ComplianceMLPerCmH2O = 0 },
		"NaN resistance":    func(b *BreathInput) { b.Lung.ResistanceCmH2OPerLS = math.NaN() },
		"negative circuit":  func(b *BreathInput) { b.CircuitMLPerCmH2O = -1 },
		"infinite duration": func(b *BreathInput) { b.DurationS = math.Inf(1) },
		"too many steps":    func(b *BreathInput) { b.DurationS = 1e6 },
		"NaN PEEP":          func(b *BreathInput) { b.PEEPCmH2O = math.NaN() },
	} {
		in := good
		mod(&in)
		_, err := Simulate(in)
		require.ErrorIs(t, err, ErrBadBreath, name)
	}
}

func BenchmarkSimulateStroke(b *testing.B) {
	s := Stroke{Crank: Crank{RadiusCm: 2.8, RodCm: 22}, BoreCm: 10, RPM: 21, Scale: 1}
	in := StrokeInput{Stroke: s, Lung: Lung{60, 10}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 5, RingFrictionN: 12}
	for b.Loop() {
		if _, err := SimulateStroke(in); err != nil {
			b.Fatal(err)
		}
	}
}
