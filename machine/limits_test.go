package machine

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestStepGridWorkedCases(t *testing.T) {
	// Derived: the largest step no longer than the one asked that divides
	// the duration evenly. 1.5 s at 0.5 s: exactly 3 steps (an exact
	// multiple is not rounded up to 4); 1.0 s at 0.3 s: ceil(3.33) = 4
	// steps of 0.25 s; 0 means the default 1 ms: 0.25 s is 250 steps.
	for _, c := range []struct {
		dur, step float64
		n         int
		h         float64
	}{{1.5, 0.5, 3, 0.5}, {1.0, 0.3, 4, 0.25}, {0.25, 0, 250, 0.001}, {0.0004, 0.001, 1, 0.0004}} {
		n, h, err := StepGrid(c.dur, c.step)
		require.NoError(t, err, "%+v", c)
		require.Equal(t, c.n, n, "%+v", c)
		require.InDelta(t, c.h, h, 1e-15, "%+v", c)
	}
	// The limit of 2 000 000 steps: exactly at it is run, one step beyond
	// is refused (maxSteps).
	n, _, err := StepGrid(2e6, 1)
	require.NoError(t, err)
	require.Equal(t, 2_000_000, n)
	_, _, err = StepGrid(2e6+1, 1)
	require.ErrorIs(t, err, ErrBadBreath)
	// No duration, or a negative step, is no grid.
	for _, c := range [][2]float64{{0, 0.001}, {-1, 0.001}, {1, -0.001}, {math.Inf(1), 0.001}, {1, math.Inf(1)}} {
		_, _, err := StepGrid(c[0], c[1])
		require.ErrorIs(t, err, ErrBadBreath, "%v", c)
	}
}

func TestCrankValidateAtItsLimits(t *testing.T) {
	// DESIGN: a hole is usable only when L > r + |e|. Just inside and just
	// outside, with the offset on either side, and a radius of zero.
	for _, c := range []struct {
		crank Crank
		ok    bool
	}{
		{Crank{RadiusCm: 3, RodCm: 5.5, OffsetCm: 2.5}, false}, // L = r + |e|
		{Crank{RadiusCm: 3, RodCm: 5.5, OffsetCm: -2.5}, false},
		{Crank{RadiusCm: 3, RodCm: 5.51, OffsetCm: 2.5}, true},
		{Crank{RadiusCm: 3, RodCm: 5.51, OffsetCm: -2.5}, true},
		{Crank{RadiusCm: 3, RodCm: 5.49, OffsetCm: 0}, true},
		{Crank{RadiusCm: 0, RodCm: 22}, false},
		{Crank{RadiusCm: -1, RodCm: 22}, false},
		{Crank{RadiusCm: 2, RodCm: -22}, false},
	} {
		err := c.crank.Validate()
		require.Equal(t, c.ok, err == nil, "%+v: %v", c.crank, err)
	}
}

func TestTopDeadCentreWithAnOffset(t *testing.T) {
	// Derived (DESIGN kinematics): at the top dead centre crank and rod
	// are in line, so x_max = sqrt((L + r)^2 - e^2): r 3, L 20, e 5 gives
	// sqrt(529 - 25) = sqrt(504) = 22.449944; a head 1 cm beyond it sits
	// at 23.449944 cm.
	c := Crank{RadiusCm: 3, RodCm: 20, OffsetCm: 5}
	require.InDelta(t, 23.449944, CylinderHeadCm(c, 1), 1e-6)
	// A head exactly at the top dead centre leaves the cylinder no gas: refused.
	in := demoStroke(2.8)
	in.Gas = GasPath{HeadPositionCm: CylinderHeadCm(in.Stroke.Crank, 0)}
	_, err := SimulateStroke(in)
	require.ErrorIs(t, err, ErrBadBreath)
	in.Gas.HeadPositionCm += 0.01
	_, err = SimulateStroke(in)
	require.NoError(t, err)
}

func TestReliefAtPEEPIsRefused(t *testing.T) {
	// A relief valve must open above PEEP (8 cmH2O here): at PEEP it is
	// refused, just above it the stroke runs, pressure-limited.
	in := demoStroke(2.8)
	in.Gas = GasPath{ReliefCmH2O: in.PEEPCmH2O}
	_, err := SimulateStroke(in)
	require.ErrorIs(t, err, ErrBadBreath)
	in.Gas.ReliefCmH2O = in.PEEPCmH2O + 0.5
	r, err := SimulateStroke(in)
	require.NoError(t, err)
	require.True(t, r.Gas.PressureLimited)
}

func TestGasBlocksAreSixteenMilliseconds(t *testing.T) {
	// gasBlockS: a frozen cylinder-gas compliance serves 16 ms of steps,
	// at least one step: 16 steps of 1 ms, 2 of 10 ms (16/10 rounds to 2),
	// 1 of 50 ms.
	require.Equal(t, 16, gasBlockSteps(0.001))
	require.Equal(t, 2, gasBlockSteps(0.010))
	require.Equal(t, 1, gasBlockSteps(0.050))
}

// nortonTorqueNm is the crank torque by the textbook formula (Norton,
// Design of Machinery), written here apart from the code: T = F r
// sin(theta + phi) / cos(phi), sin(phi) = (r sin(theta) - e) / L, F in N,
// r in m.
func nortonTorqueNm(c Crank, theta, forceN float64) float64 {
	phi := math.Asin((c.RadiusCm*math.Sin(theta) - c.OffsetCm) / c.RodCm)
	return forceN * c.RadiusCm / 100 * math.Sin(theta+phi) / math.Cos(phi)
}

func TestTorqueIsNortons(t *testing.T) {
	// TorqueNm from the piston's dx/dtheta equals Norton's formula, in
	// line and offset, over the delivery half-turn.
	for _, c := range []Crank{{RadiusCm: 2.8, RodCm: 22}, {RadiusCm: 4, RodCm: 18, OffsetCm: 1.5}} {
		for _, theta := range []float64{3.3, 4.0, 4.7, 5.5, 6.1} {
			s, co := math.Sincos(theta)
			_, dx := c.Motion(s, co)
			require.InDelta(t, nortonTorqueNm(c, theta, 250), TorqueNm(250, dx), 1e-12, "%+v at %v rad", c, theta)
		}
	}
}

func TestPeakTorqueFollowsThePressureTrace(t *testing.T) {
	// The stroke's peak torque is the largest |Norton torque| over its
	// grid, with the force (circuit pressure in Pa) x bore area + ring
	// friction (DESIGN torque; 1 cmH2O = 98.0665 Pa, NIST SP 811), the
	// pressure taken from the trace the stroke reports. Version 1, and
	// version 2 without the cylinder's gas (with it, the piston's pressure
	// before the outlet valve opens is not the circuit's).
	for name, gas := range map[string]GasPath{"v1": {}, "v2 no cylinder gas": {BTPSFactor: 1.1, ReliefCmH2O: 60}} {
		in := demoStroke(4.0)
		in.Gas = gas
		in.RingFrictionN = 30
		k := in.Stroke.kinematics()
		area := math.Pi * 0.10 * 0.10 / 4 // bore 10 cm, in m2
		want := 0.0
		in.Observe = func(tS, pc, _, _ float64) {
			f := pc*98.0665*area + in.RingFrictionN
			want = math.Max(want, math.Abs(nortonTorqueNm(in.Stroke.Crank, k.bottom+k.omega*tS, f)))
		}
		r, err := SimulateStroke(in)
		require.NoError(t, err)
		require.InEpsilon(t, want, r.PeakTorqueNm, 1e-9, name)
		// Without friction the peak is lower by at most 30 N x r (0.04 m).
		in.RingFrictionN = 0
		want = 0
		r0, err := SimulateStroke(in)
		require.NoError(t, err)
		require.InEpsilon(t, want, r0.PeakTorqueNm, 1e-9, name)
		require.Less(t, r0.PeakTorqueNm, r.PeakTorqueNm, name)
		require.LessOrEqual(t, r.PeakTorqueNm-r0.PeakTorqueNm, 30*0.04*1.1, name)
	}
}

func TestAStrokeStartsAtTheAlveolarPressure(t *testing.T) {
	// DESIGN: the circuit starts at the alveolar pressure, PEEP + V0 / C:
	// 8 + 60/40 = 9.5 cmH2O, with no flow into the lung; the volume
	// reported is the start volume at body conditions (60 mL) whatever the
	// BTPS factor, in version 1 and version 2.
	for name, gas := range map[string]GasPath{"v1": {}, "v2": demoGas()} {
		in := demoStroke(2.8)
		in.Gas = gas
		first := true
		in.Observe = func(tS, pc, q, v float64) {
			if !first {
				return
			}
			first = false
			require.Zero(t, tS, name)
			require.InDelta(t, 9.5, pc, 1e-9, name)
			require.InDelta(t, 0, q, 1e-9, name)
			require.InDelta(t, 60, v, 1e-9, name)
		}
		_, err := SimulateStroke(in)
		require.NoError(t, err)
		require.False(t, first, name)
	}
}

func TestFitCalibrationRefusesEachNonPositiveField(t *testing.T) {
	// Each field of a bench point must be positive: a zero swept volume,
	// gain or measured volume in the second point is refused, naming it.
	good := BenchPoint{SweptML: 400, Gain: 0.9, MeasuredML: 342}
	for _, bad := range []BenchPoint{{0, 0.9, 342}, {400, 0, 342}, {400, 0.9, 0}, {math.Inf(1), 0.9, 342}} {
		_, err := FitCalibration([]BenchPoint{good, bad})
		require.ErrorIs(t, err, ErrCalibration, "%+v", bad)
		require.Contains(t, err.Error(), "point 2 ", "%+v", bad)
	}
	// A flat line (the same effective volume at two swept volumes, k = 0)
	// is no calibration.
	_, err := FitCalibration([]BenchPoint{{300, 1, 350}, {500, 1, 350}})
	require.ErrorIs(t, err, ErrCalibration)
}

func TestFitCalibrationResidualPercent(t *testing.T) {
	// Worked by hand (least squares, derived): effective volumes 81/0.9 =
	// 90, 171/0.9 = 190 and 300/1 = 300 mL at swept 100, 200, 300. Mean x
	// 200, mean y 193.333; Sxy = (-100)(-103.333) + (100)(106.667) = 21000,
	// Sxx = 20000: k = 1.05, b = 193.333 - 210 = -16.667 mL. Point 1
	// predicts 0.9 x (105 - 16.667) = 79.5 mL, so its residual is 81 -
	// 79.5 = 1.5 mL, 100 x 1.5 / 79.5 = 1.8868 % of the prediction.
	fit, err := FitCalibration([]BenchPoint{{100, 0.9, 81}, {200, 0.9, 171}, {300, 1, 300}})
	require.NoError(t, err)
	require.InDelta(t, 1.05, fit.K, 1e-12)
	require.InDelta(t, 79.5, fit.Residuals[0].PredictedML, 1e-9)
	require.InDelta(t, 1.5, fit.Residuals[0].ResidualML, 1e-9)
	require.InDelta(t, 1.8868, fit.Residuals[0].ResidualPct, 1e-4)
}

func TestTheOutletValveOpensWhereBoyleSays(t *testing.T) {
	// Derived (Boyle, isothermal, no leak): the cylinder's 785.40 mL at
	// the bottom dead centre must be pushed to the circuit's 8 cmH2O,
	// which takes 785.40 x 8 / (1033.23 + 8) = 6.0343 mL of the piston's
	// travel (TestPreCompressionIsBoyles); the time at which the piston has
	// moved that far, from x(t) = r cos(theta) + sqrt(L^2 - r^2 sin^2
	// theta), theta = pi + omega t, is found here by bisection, apart from
	// the code's grid. The valve opens inside a 1 ms step, interpolated to
	// within 1e-5 s of it.
	in := demoStroke(2.8)
	in.StartVolumeML = 0
	in.Gas = GasPath{HeadPositionCm: 29.2}
	r := run(t, in)
	omega := 2 * math.Pi * 21 / 60
	pos := func(ts float64) float64 {
		s, c := math.Sincos(math.Pi + omega*ts)
		return 2.8*c + math.Sqrt(22*22-2.8*2.8*s*s)
	}
	area := math.Pi * 25
	need := area * (29.2 - pos(0)) * 8 / (101325/98.0665 + 8)
	lo, hi := 0.0, 1.0
	for range 60 {
		if mid := (lo + hi) / 2; area*(pos(mid)-pos(0)) < need {
			lo = mid
		} else {
			hi = mid
		}
	}
	require.InDelta(t, lo, r.Gas.ValveOpensS, 1e-5)
	require.InDelta(t, need, r.Gas.PreCompressionML, 1e-4)
}

func TestAValveThatNeverOpensDeliversNothing(t *testing.T) {
	// Derived: with the lung at 1000 cmH2O (40 000 mL over 40 mL/cmH2O,
	// far beyond any patient, only to reach the case), the smallest hole's
	// whole stroke (78.54 x 2 x 1.4 = 219.9 mL) cannot compress the
	// cylinder's 78.54 x (29.2 - 20.6) = 675.4 mL to it (Boyle: that needs
	// 675.4 x 1000 / 2033 = 332 mL), so the outlet valve never opens: the
	// valve "opens" at the stroke's end, the whole displacement is
	// pre-compression, nothing reaches the lung, and the piston's pressure
	// at the end is Boyle's 1033.23 x 219.9 / (675.4 - 219.9) = 498.8
	// cmH2O, whose force through the crank sets the peak torque (at least
	// the end's, where dx/dtheta is 0, so this is a lower bound only on the
	// force: 498.8 cmH2O x 98.0665 Pa x 0.007854 m2 = 384 N).
	in := demoStroke(1.4)
	in.StartVolumeML, in.Lung = 40000, Lung{40, 12}
	in.PEEPCmH2O = 0
	in.Gas = GasPath{HeadPositionCm: 29.2}
	r := run(t, in)
	durS := math.Pi / (2 * math.Pi * 21 / 60)
	require.InDelta(t, durS, r.Gas.ValveOpensS, 1e-9)
	require.InDelta(t, 219.9, r.Gas.PreCompressionML, 0.1)
	require.InDelta(t, 0, r.DeliveredML, 1e-9)
	require.Equal(t, 1429, r.Steps, "ceil(1428.57) steps of 1 ms")
	// The torque: Norton's formula at each grid point with Boyle's
	// pressure for the travel so far (from the analytic x(t)), apart from
	// the code's summed flows.
	k := in.Stroke.kinematics()
	want := 0.0
	n := r.Steps
	for i := 0; i <= n; i++ {
		th := k.bottom + k.omega*durS*float64(i)/float64(n)
		s, c := math.Sincos(th)
		x := 1.4*c + math.Sqrt(22*22-1.4*1.4*s*s)
		d := math.Pi * 25 * (x - (22 - 1.4))
		pc := (101325 / 98.0665) * d / (675.44 - d)
		want = math.Max(want, math.Abs(nortonTorqueNm(in.Stroke.Crank, th, pc*98.0665*math.Pi*0.01/4+in.RingFrictionN)))
	}
	require.InEpsilon(t, want, r.PeakTorqueNm, 1e-3)
}

func TestStepsAreReported(t *testing.T) {
	// 21 rpm in line: the delivery takes 60 / (2 x 21) = 1.428571 s, so
	// ceil(1428.57) = 1429 steps of 1.428571/1429 s, in both versions.
	for name, gas := range map[string]GasPath{"v1": {}, "v2": demoGas()} {
		in := demoStroke(2.8)
		in.Gas = gas
		r := run(t, in)
		require.Equal(t, 1429, r.Steps, name)
		require.InDelta(t, 60.0/42/1429, r.StepS, 1e-15, name)
	}
}

func TestAStrokeAccountsForEveryMillilitre(t *testing.T) {
	// Conservation of volume (derived: each step's exact map conserves
	// it, DESIGN version 2): with no leak, what the piston displaced is what
	// entered the lung (room volume), what compressing the cylinder's gas
	// took, what the relief valve vented, and what the circuit's compliance
	// holds at the end over the start (Cc x the rise in circuit pressure,
	// which starts at V0/C above PEEP) - with and without the relief valve
	// venting, on small and large holes. The piston's displacement is the
	// hole's swept volume (78.54 cm2 x 2r) to the trapezoid rule's 1e-6.
	for _, relief := range []float64{0, 14, 30} {
		for _, radius := range []float64{1.4, 2.8, 6.2} {
			in := demoStroke(radius)
			in.Gas = demoGas()
			in.Gas.LeakLPerMinAt20CmH2O = 0
			in.Gas.ReliefCmH2O = relief
			r := run(t, in)
			rise := r.EndCmH2O - in.PEEPCmH2O - in.StartVolumeML/in.Lung.ComplianceMLPerCmH2O
			shared := r.Gas.DeliveredRoomML + r.Gas.CompressionLossML + r.Gas.ReliefVentedML + in.CircuitMLPerCmH2O*rise
			require.InDelta(t, r.Gas.PistonML, shared, 1e-8, "relief %v radius %v", relief, radius)
			require.InEpsilon(t, math.Pi*25*2*radius, r.Gas.PistonML, 1e-6, "radius %v", radius)
			if relief != 30 { // at 30 only the largest hole reaches the valve
				require.Equal(t, relief == 14, r.Gas.PressureLimited, "relief %v radius %v", relief, radius)
			}
		}
	}
}

func TestTheLeakIsConductanceTimesPressure(t *testing.T) {
	// DESIGN version 2: Qleak = G x Pc, G = 2 L/min at 20 cmH2O = 1.6667
	// mL/s per cmH2O. Integrated by the trapezoid rule over the circuit
	// pressure the stroke reports at each grid point (from the valve's
	// first opening step on too), it is the leak the stroke counts, to
	// 1e-6.
	for _, radius := range []float64{1.4, 2.8, 6.2} {
		in := demoStroke(radius)
		in.Gas = demoGas()
		var ts, ps []float64
		in.Observe = func(tS, pc, _, _ float64) { ts = append(ts, tS); ps = append(ps, pc) }
		r := run(t, in)
		want := 0.0
		for i := 1; i < len(ts); i++ {
			want += 2000.0 / 60 / 20 * (ps[i-1] + ps[i]) / 2 * (ts[i] - ts[i-1])
		}
		require.InEpsilon(t, want, r.Gas.LeakedML, 1e-6, "radius %v", radius)
	}
}

func TestSettableSpeedsAndDwells(t *testing.T) {
	// Derived from the motor and controller rules: a variable motor of
	// 8-40 rpm in 0.5 rpm steps sets 8, 8.5 ... 40 and nothing between or
	// beyond; 8-39.8 in 0.5 steps tops at 39.5; a fixed motor at 20 rpm
	// sets 20 only; a controller of 0.1 s steps up to 10 s sets 0, 0.1 ...
	// 10 (and 9.95 up to 9.9 when its maximum is 9.95).
	m := Motor{MinRPM: 8, MaxRPM: 40, StepRPM: 0.5}
	for rpm, ok := range map[float64]bool{8: true, 8.5: true, 21: true, 40: true, 7.5: false, 8.25: false, 40.5: false, 39.75: false} {
		require.Equal(t, ok, m.Settable(rpm), "%v rpm on 8-40/0.5", rpm)
	}
	odd := Motor{MinRPM: 8, MaxRPM: 39.8, StepRPM: 0.5}
	require.InDelta(t, 39.5, odd.TopRPM(), 1e-12)
	require.True(t, odd.Settable(39.5))
	require.False(t, odd.Settable(40))
	fixed := FixedMotor(20)
	for rpm, ok := range map[float64]bool{20: true, 20.5: false, 19.5: false, 21: false} {
		require.Equal(t, ok, fixed.Settable(rpm), "%v rpm on a fixed 20", rpm)
	}
	c := Controller{DwellStepS: 0.1, MaxDwellS: 10}
	for d, ok := range map[float64]bool{0: true, 0.1: true, 1.4: true, 10: true, -0.1: false, 0.05: false, 10.1: false} {
		require.Equal(t, ok, c.Settable(d), "dwell %v s on 0.1/10", d)
	}
	short := Controller{DwellStepS: 0.1, MaxDwellS: 9.95}
	require.InDelta(t, 9.9, short.MaxSettableDwellS(), 1e-12)
	require.True(t, short.Settable(9.9))
	require.False(t, short.Settable(10))
}

func TestAStrokeRefusesWhatNoMachineIs(t *testing.T) {
	// A stroke with no bore, no speed, an infinite speed or bore, a
	// negative or undefined calibration scale, or a negative ring friction
	// is refused as a bad breath; a scale of 0 (a calibration that
	// delivers nothing) runs.
	for name, mod := range map[string]func(*StrokeInput){
		"bore 0":         func(in *StrokeInput) { in.Stroke.BoreCm = 0 },
		"bore Inf":       func(in *StrokeInput) { in.Stroke.BoreCm = math.Inf(1) },
		"rpm 0":          func(in *StrokeInput) { in.Stroke.RPM = 0 },
		"rpm Inf":        func(in *StrokeInput) { in.Stroke.RPM = math.Inf(1) },
		"scale -0.1":     func(in *StrokeInput) { in.Stroke.Scale = -0.1 },
		"scale NaN":      func(in *StrokeInput) { in.Stroke.Scale = math.NaN() },
		"scale Inf":      func(in *StrokeInput) { in.Stroke.Scale = math.Inf(1) },
		"friction -1":    func(in *StrokeInput) { in.RingFrictionN = -1 },
		"friction NaN":   func(in *StrokeInput) { in.RingFrictionN = math.NaN() },
		"rod too short":  func(in *StrokeInput) { in.Stroke.Crank.RodCm = 2.8 },
		"start NaN":      func(in *StrokeInput) { in.StartVolumeML = math.NaN() },
		"PEEP Inf":       func(in *StrokeInput) { in.PEEPCmH2O = math.Inf(1) },
		"compliance 0":   func(in *StrokeInput) { in.Lung.ComplianceMLPerCmH2O = 0 },
		"circuit Inf":    func(in *StrokeInput) { in.CircuitMLPerCmH2O = math.Inf(1) },
		"step -0.001 s":  func(in *StrokeInput) { in.StepS = -0.001 },
		"resistance NaN": func(in *StrokeInput) { in.Lung.ResistanceCmH2OPerLS = math.NaN() },
	} {
		in := demoStroke(2.8)
		mod(&in)
		_, err := SimulateStroke(in)
		if name == "rpm 0" { // refused as a speed, not later as an endless delivery
			require.ErrorContains(t, err, "speed 0 rpm must be positive", name)
		}
		if name == "rod too short" { // the crank's own refusal (Crank.Validate)
			require.ErrorContains(t, err, "must be longer than radius", name)
			continue
		}
		require.ErrorIs(t, err, ErrBadBreath, name)
	}
	in := demoStroke(2.8)
	in.Stroke.Scale = 0
	r := run(t, in)
	require.InDelta(t, 0, r.Gas.PistonML+r.PeakPistonFlowMLPerS, 1e-12)
}
