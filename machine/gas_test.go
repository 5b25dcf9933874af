package machine

import (
	"fmt"
	"math"
	"testing"

	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/mat"
)

// demoStroke is an invented unit like the demonstration profile: bore 10 cm,
// rod 22 cm, the largest hole 6.2 cm and the head 1 cm beyond its top dead
// centre, at 21 rpm.
func demoStroke(radiusCm float64) StrokeInput {
	s := Stroke{Crank: Crank{RadiusCm: radiusCm, RodCm: 22}, BoreCm: 10, RPM: 21, Scale: 1}
	return StrokeInput{Stroke: s, Lung: Lung{40, 12}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 8, StartVolumeML: 60, RingFrictionN: 12}
}

func demoGas() GasPath {
	return GasPath{BTPSFactor: 1.105, HeadPositionCm: CylinderHeadCm(Crank{RadiusCm: 6.2, RodCm: 22}, 1), LeakLPerMinAt20CmH2O: 2}
}

func run(t *testing.T, in StrokeInput) StrokeResult {
	t.Helper()
	r, err := SimulateStroke(in)
	require.NoError(t, err)
	return r
}

func relDiff(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-12) }

func TestPropMatchesGonumMatrixExponential(t *testing.T) {
	// gonum mat.Exp of the system augmented with the input and its slope
	// (Van Loan 1978) against the closed form, with and without a leak.
	for _, c := range []struct{ ct, rML, cl, g, h float64 }{
		{1.5, 0.012, 40, 0, 0.001}, {2.2, 0.012, 36, 1.67, 0.001}, {0.3, 0.001, 200, 5, 0.002}, {1.8, 0.1, 5, 0.5, 0.0005},
	} {
		a := 1 / c.ct
		m := mat.NewDense(4, 4, []float64{
			-a * (1/c.rML + c.g), a / (c.rML * c.cl), a, 0,
			1 / c.rML, -1 / (c.rML * c.cl), 0, 0,
			0, 0, 0, 1,
			0, 0, 0, 0,
		})
		m.Scale(c.h, m)
		var e mat.Dense
		e.Exp(m)
		pr := newProp(c.ct, c.rML, c.cl, c.g, c.h)
		got := []float64{pr.pp, pr.pv, pr.pw, pr.pd, pr.vp, pr.vv, pr.vw, pr.vd}
		want := []float64{e.At(0, 0), e.At(0, 1), e.At(0, 2), e.At(0, 3), e.At(1, 0), e.At(1, 1), e.At(1, 2), e.At(1, 3)}
		for i := range got {
			// Each entry to 1e-9 of itself: the slope's entries are O(h^2),
			// far below 1, and an absolute tolerance would pass them blind.
			require.InDelta(t, want[i], got[i], 1e-9*math.Abs(want[i]), "%+v entry %d", c, i)
		}
	}
}

func TestGasPathAtItsLimitIsVersion1(t *testing.T) {
	// Limit (derived): with F = 1, no leak, no relief and the cylinder's gas
	// incompressible, the version 2 equations are version 1's. The version 2
	// path runs (F is set), against the version 1 Simulate on the same flow.
	for _, radius := range []float64{1.4, 2.8, 6.2} {
		in := demoStroke(radius)
		k := in.Stroke.kinematics()
		want, err := Simulate(BreathInput{Flow: k.flow, DurationS: k.durS, Lung: in.Lung, CircuitMLPerCmH2O: in.CircuitMLPerCmH2O,
			PEEPCmH2O: in.PEEPCmH2O, StartVolumeML: in.StartVolumeML})
		require.NoError(t, err)
		g := demoGas()
		g.BTPSFactor, g.LeakLPerMinAt20CmH2O, g.noCylinderGas = 1, 0, true
		in.Gas = g
		got := run(t, in)
		for _, f := range []struct {
			name      string
			got, want float64
		}{{"delivered", got.DeliveredML, want.DeliveredML}, {"peak", got.PeakCmH2O, want.PeakCmH2O},
			{"end", got.EndCmH2O, want.EndCmH2O}, {"peak patient flow", got.PeakPatientFlowMLPerS, want.PeakPatientFlowMLPerS}} {
			require.Less(t, relDiff(f.got, f.want), 1e-9, "radius %v %s: v2 %v v1 %v", radius, f.name, f.got, f.want)
		}
		require.Zero(t, got.Gas.CompressionLossML)
		require.Zero(t, got.Gas.LeakedML)
		require.False(t, got.Gas.PressureLimited)
		v1 := in
		v1.Gas = GasPath{}
		require.Less(t, relDiff(got.PeakTorqueNm, run(t, v1).PeakTorqueNm), 1e-9, "torque")
	}
}

func TestNoLeakAndAHighReliefChangeNothing(t *testing.T) {
	// Limit (derived): a leak of 0 and a relief valve far above the peak
	// take no volume and change no pressure.
	in := demoStroke(2.8)
	in.Gas = demoGas()
	in.Gas.LeakLPerMinAt20CmH2O = 0
	a := run(t, in)
	in.Gas.ReliefCmH2O = 120
	b := run(t, in)
	require.Equal(t, a.Breath, b.Breath)
	require.Zero(t, b.Gas.ReliefVentedML)
	require.Zero(t, b.Gas.LeakedML)
	require.False(t, b.Gas.PressureLimited)
}

func TestReliefLimitsTheBreath(t *testing.T) {
	// Relief valve (DESIGN version 2): the circuit never exceeds the relief
	// pressure, the excess vents, and the patient gets less.
	in := demoStroke(4.0)
	in.Lung = Lung{20, 12}
	in.Gas = demoGas()
	free := run(t, in)
	relief := 30.0
	require.Greater(t, free.PeakCmH2O, relief+5, "the unlimited breath must go well above the relief for this test")
	in.Gas.ReliefCmH2O = relief
	var highest float64
	in.Observe = func(_, pc, _, _ float64) { highest = max(highest, pc) }
	lim := run(t, in)
	require.InDelta(t, relief, lim.PeakCmH2O, 1e-9)
	require.LessOrEqual(t, highest, relief+1e-9)
	require.Less(t, lim.DeliveredML, free.DeliveredML)
	require.True(t, lim.Gas.PressureLimited)
	require.Greater(t, lim.Gas.ReliefVentedML, 0.0)
	// Derived: the leak is G x the integral of the circuit pressure, here by
	// the trapezoid rule over the observed pressures (G = 2 L/min / 20 cmH2O).
	var integral, lastT, lastP float64
	in.Observe = func(ts, pc, _, _ float64) {
		if ts > 0 {
			integral += (pc + lastP) / 2 * (ts - lastT)
		}
		lastT, lastP = ts, pc
	}
	lim = run(t, in)
	want := 2000.0 / 60 / 20 * integral
	require.InDelta(t, want, lim.Gas.LeakedML, 0.005*want, "leak %v vs G x integral of Pc %v", lim.Gas.LeakedML, want)
}

func TestVersion2ConvergesAsStepHalves(t *testing.T) {
	// Issue 13: halving the step changes no figure by more than 0.1 %, over
	// a sweep of holes, lungs, relief pressures (0: none) and PEEPs.
	for _, radius := range []float64{1.4, 3.0, 4.6, 6.2} {
		for _, lung := range []Lung{{15, 20}, {30, 12}, {60, 10}, {120, 5}} {
			for _, relief := range []float64{0, 20, 35, 60} {
				for _, peep := range []float64{0, 5, 15} {
					if relief != 0 && relief <= peep+1 {
						continue
					}
					in := demoStroke(radius)
					in.Lung, in.PEEPCmH2O = lung, peep
					in.Gas = demoGas()
					in.Gas.ReliefCmH2O = relief
					in.StepS = 0.001
					a := run(t, in)
					in.StepS = 0.0005
					b := run(t, in)
					requireHalvingClose(t, a, b, fmt.Sprintf("radius %v lung %+v relief %v PEEP %v", radius, lung, relief, peep))
				}
			}
		}
	}
}

func requireHalvingClose(t *testing.T, a, b StrokeResult, name string) {
	t.Helper()
	for _, f := range []struct {
		name   string
		ga, gb float64
	}{{"delivered", a.DeliveredML, b.DeliveredML}, {"peak", a.PeakCmH2O, b.PeakCmH2O}, {"end", a.EndCmH2O, b.EndCmH2O},
		{"compression", a.Gas.CompressionLossML, b.Gas.CompressionLossML}, {"leak", a.Gas.LeakedML, b.Gas.LeakedML},
		{"vented", a.Gas.ReliefVentedML, b.Gas.ReliefVentedML}, {"torque", a.PeakTorqueNm, b.PeakTorqueNm},
		{"peak flow", a.PeakPatientFlowMLPerS, b.PeakPatientFlowMLPerS}, {"valve opens", a.Gas.ValveOpensS, b.Gas.ValveOpensS}} {
		if f.gb == 0 && f.ga == 0 {
			continue
		}
		require.Less(t, relDiff(f.ga, f.gb), 0.001, "%s %s: 1 ms %v, 0.5 ms %v", name, f.name, f.ga, f.gb)
	}
}

func TestPascalPerCmH2O(t *testing.T) {
	// NIST SP 811, appendix B.8: 1 cmH2O (conventional) = 98.0665 Pa; 1 atm = 101325 Pa = 1033.23 cmH2O.
	require.Equal(t, 98.0665, pascalPerCmH2O)
	require.InDelta(t, 1033.23, cmH2OPerAtm, 0.005)
}

func TestGasPathRefusesBadInput(t *testing.T) {
	for name, mod := range map[string]func(*GasPath){
		"negative BTPS":       func(g *GasPath) { g.BTPSFactor = -1 },
		"NaN leak":            func(g *GasPath) { g.LeakLPerMinAt20CmH2O = math.NaN() },
		"head inside stroke":  func(g *GasPath) { g.HeadPositionCm = 24 },
		"relief below PEEP":   func(g *GasPath) { g.ReliefCmH2O = 6 },
		"infinite barometric": func(g *GasPath) { g.BarometricCmH2O = math.Inf(1) },
	} {
		in := demoStroke(2.8)
		in.Gas = demoGas()
		mod(&in.Gas)
		_, err := SimulateStroke(in)
		require.ErrorIs(t, err, ErrBadBreath, name)
	}
}

func TestSimulatorReuseGivesTheSameFigures(t *testing.T) {
	// Round-trip property: a Simulator reused across different strokes gives
	// what a fresh one gives, for version 1 and version 2 inputs.
	var sim Simulator
	for _, radius := range []float64{6.2, 1.4, 2.8, 2.8} {
		for _, gas := range []GasPath{{}, demoGas()} {
			in := demoStroke(radius)
			in.Gas = gas
			a, err := sim.SimulateStroke(in)
			require.NoError(t, err)
			require.Equal(t, run(t, in), a, "radius %v gas %+v", radius, gas)
		}
	}
}

// A Simulator reused across strokes that differ in one thing only (the
// circuit's compliance, the lung's resistance or compliance, the leak, the
// step) gives what a fresh one gives: what it keeps from the last stroke
// is kept only while all of them stay the same.
func TestSimulatorReuseSeesEachChangeAlone(t *testing.T) {
	base := demoStroke(2.8)
	base.Gas = demoGas()
	base.StepS = 0.001
	for name, mod := range map[string]func(*StrokeInput){
		"circuit compliance": func(in *StrokeInput) { in.CircuitMLPerCmH2O = 3 },
		"lung resistance":    func(in *StrokeInput) { in.Lung.ResistanceCmH2OPerLS = 25 },
		"lung compliance":    func(in *StrokeInput) { in.Lung.ComplianceMLPerCmH2O = 20 },
		"leak":               func(in *StrokeInput) { in.Gas.LeakLPerMinAt20CmH2O = 6 },
		"step":               func(in *StrokeInput) { in.StepS = 0.0005 },
	} {
		var sim Simulator
		_, err := sim.SimulateStroke(base)
		require.NoError(t, err)
		in := base
		mod(&in)
		got, err := sim.SimulateStroke(in)
		require.NoError(t, err)
		require.Equal(t, run(t, in), got, name)
	}
}

func BenchmarkSimulateStrokeV2(b *testing.B) {
	in := demoStroke(2.8)
	in.Lung = Lung{60, 10}
	in.PEEPCmH2O, in.StartVolumeML = 5, 0
	in.Gas = demoGas()
	in.Gas.ReliefCmH2O = 40
	var sim Simulator
	for b.Loop() {
		if _, err := sim.SimulateStroke(in); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSimulateStrokeReused(b *testing.B) {
	s := Stroke{Crank: Crank{RadiusCm: 2.8, RodCm: 22}, BoreCm: 10, RPM: 21, Scale: 1}
	in := StrokeInput{Stroke: s, Lung: Lung{60, 10}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 5, RingFrictionN: 12}
	var sim Simulator
	for b.Loop() {
		if _, err := sim.SimulateStroke(in); err != nil {
			b.Fatal(err)
		}
	}
}

func TestPreCompressionIsBoyles(t *testing.T) {
	// Derived (Boyle, isothermal): with no leak the circuit stays at PEEP
	// (8 cmH2O) until the valve opens, so the piston first displaces
	// V0 x P / (Patm + P) of the cylinder's V0 = area x (head - x at the
	// bottom dead centre) = 78.540 cm2 x (29.2 - 19.2) cm = 785.40 mL:
	// 785.40 x 8 / (1033.23 + 8) = 6.0343 mL.
	in := demoStroke(2.8)
	in.StartVolumeML = 0
	in.Gas = GasPath{HeadPositionCm: 29.2}
	r := run(t, in)
	require.InDelta(t, 6.0343, r.Gas.PreCompressionML, 0.0005)
	// To the opening's solve (50 halvings of a 1 ms step), not to the
	// grid: 785.398 x 8 / (1033.227 + 8) to 1e-6 mL (derived).
	require.InDelta(t, math.Pi*25*10*8/(cmH2OPerAtm+8), r.Gas.PreCompressionML, 1e-6)
	// The valve opens where the piston has moved that far: in-line crank,
	// x = r cos(theta) + sqrt(L^2 - r^2 sin^2 theta), from theta = pi.
	omega := 2 * math.Pi * 21 / 60
	pos := func(ts float64) float64 {
		s, c := math.Sincos(math.Pi + omega*ts)
		return 2.8*c + math.Sqrt(22*22-2.8*2.8*s*s)
	}
	moved := math.Pi * 25 * (pos(r.Gas.ValveOpensS) - pos(0))
	require.InDelta(t, 6.0343, moved, 0.005, "opening at %v s", r.Gas.ValveOpensS)
	// The flow is linear across a step, so the opening is found to the
	// step's cubic error, about 1e-6 mL at 1 ms (measured; derived order).
	require.InDelta(t, math.Pi*25*10*8/(cmH2OPerAtm+8), moved, 1e-5, "opening at %v s", r.Gas.ValveOpensS)
	require.Greater(t, r.Gas.CompressionLossML, r.Gas.PreCompressionML, "the gas is compressed further while delivering")
}

func TestReliefHoldsAcrossHolesAndLungs(t *testing.T) {
	// Relief valve (DESIGN version 2), over a sweep of holes, lungs and
	// relief pressures: the circuit never exceeds the relief, the limited
	// breath never delivers more than the free one, and every figure is finite.
	for _, radius := range []float64{1.4, 3.0, 4.6, 6.2} {
		for _, lung := range []Lung{{15, 20}, {30, 12}, {60, 10}, {120, 5}} {
			for _, relief := range []float64{20, 35, 60} {
				in := demoStroke(radius)
				in.Lung = lung
				in.Gas = demoGas()
				free := run(t, in)
				in.Gas.ReliefCmH2O = relief
				var highest float64
				in.Observe = func(_, pc, _, _ float64) { highest = max(highest, pc) }
				lim := run(t, in)
				name := []any{"radius %v lung %+v relief %v", radius, lung, relief}
				require.LessOrEqual(t, highest, relief+1e-9, name...)
				require.LessOrEqual(t, lim.PeakCmH2O, relief+1e-9, name...)
				require.LessOrEqual(t, lim.DeliveredML, free.DeliveredML+1e-9, name...)
				require.Equal(t, free.PeakCmH2O > relief, lim.Gas.PressureLimited, name...)
				for _, v := range []float64{lim.DeliveredML, lim.Gas.LeakedML, lim.Gas.ReliefVentedML, lim.Gas.CompressionLossML, lim.PeakTorqueNm} {
					require.False(t, math.IsNaN(v) || math.IsInf(v, 0), name...)
				}
			}
		}
	}
}

// Observe sees every grid point once, in order, at k x the step from 0 to
// the end of the delivery (the stroke's own grid: Steps + 1 points), with
// the cylinder's gas, the leak and the relief valve in play alike.
func TestObserveSeesEachGridPointAtItsTime(t *testing.T) {
	for name, gas := range map[string]GasPath{"v1": {}, "v2": demoGas(), "relief": func() GasPath { g := demoGas(); g.ReliefCmH2O = 20; return g }()} {
		in := demoStroke(4.0)
		in.Gas = gas
		var times, vols []float64
		var fastest float64
		in.Observe = func(ts, _, q, v float64) {
			times, vols = append(times, ts), append(vols, v)
			fastest = max(fastest, q)
		}
		r := run(t, in)
		require.Len(t, times, r.Steps+1, name)
		for k, ts := range times {
			require.Equal(t, float64(k)*r.StepS, ts, "%s: point %d", name, k)
		}
		// The lung's volume and flow as the breath reports them (BTPS):
		// the volume rises by the delivered volume, and with no relief
		// the fastest flow seen is the peak flow.
		require.InDelta(t, r.DeliveredML, vols[len(vols)-1]-vols[0], 1e-9, name)
		if name != "relief" {
			require.InDelta(t, r.PeakPatientFlowMLPerS, fastest, 1e-9, name)
		}
	}
}

// A breath whose leak outruns the piston never rises above where it
// started: with 300 mL left in a 20 mL/cmH2O lung over PEEP 5 the circuit
// starts at 5 + 300 / 20 = 20 cmH2O (derived), a 60 L/min leak at 20 cmH2O
// empties it faster than the smallest hole fills it, so the peak is the
// start and the lung's flow never goes above 0 (it only empties).
func TestAPeakCanBeWhereTheBreathStarts(t *testing.T) {
	in := demoStroke(1.4)
	in.Lung, in.StartVolumeML, in.PEEPCmH2O = Lung{20, 12}, 300, 5
	in.Gas = demoGas()
	in.Gas.LeakLPerMinAt20CmH2O = 60
	r := run(t, in)
	require.InDelta(t, 20, r.PeakCmH2O, 1e-9)
	require.Less(t, r.EndCmH2O, 20.0)
	require.Less(t, r.DeliveredML, 0.0, "the lung lost gas")
	require.InDelta(t, 0, r.PeakPatientFlowMLPerS, 1e-9)
}
