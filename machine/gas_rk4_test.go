package machine

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
)

// rk4Case is a version 2 stroke written out for an independent integration.
type rk4Case struct {
	boreCm, radiusCm, rodCm, rpm        float64
	c, rLPerS, cc, peep, startBTPSML    float64
	f, headCm, patmCmH2O, leakLPerMin20 float64
}

// rk4Stroke integrates the version 2 equations of DESIGN.md with classical
// fourth-order Runge-Kutta at a fixed 0.1 ms step, written out from the
// design, not from the code under test: an in-line crank from the bottom
// dead centre (theta = pi) at constant speed; while the outlet valve is shut
// the piston's displacement D compresses the cylinder's gas (Boyle:
// P = Patm D / (V0 - D)) and the circuit sees only the leak; once that
// pressure reaches the circuit's, (Cc + A (head - x)/Patm) dPc/dt =
// Qp - Qpat - G Pc, Qpat = (Pc - PEEP - V/(C/F)) / R. It returns the
// delivered volume at body conditions, the peak circuit pressure, the
// volume spent on the cylinder's gas (D at the opening, then the sum of
// Cg x the pressure's rise) and the leak (the trapezoid sum of G Pc).
func rk4Stroke(k rk4Case) (deliveredML, peakCmH2O, compressionML, leakML float64) {
	const h = 1e-4
	area := math.Pi * k.boreCm * k.boreCm / 4
	omega := 2 * math.Pi * k.rpm / 60
	dur := math.Pi / omega
	pos := func(t float64) float64 {
		th := math.Pi + omega*t
		s := k.radiusCm * math.Sin(th)
		return k.radiusCm*math.Cos(th) + math.Sqrt(k.rodCm*k.rodCm-s*s)
	}
	qp := func(t float64) float64 {
		th := math.Pi + omega*t
		s, c := math.Sincos(th)
		w := math.Sqrt(k.rodCm*k.rodCm - k.radiusCm*k.radiusCm*s*s)
		return area * omega * (-k.radiusCm*s - k.radiusCm*k.radiusCm*s*c/w)
	}
	cl, r := k.c/k.f, k.rLPerS/1000
	g := k.leakLPerMin20 * 1000 / 60 / 20
	v0 := area * (k.headCm - pos(0))
	// y = [Pc above PEEP, V room mL, D displacement]
	open := false
	deriv := func(t float64, y [3]float64) [3]float64 {
		q := (y[0] - y[1]/cl) / r
		leak := g * (y[0] + k.peep)
		if !open {
			return [3]float64{(-q - leak) / k.cc, q, qp(t)}
		}
		ct := k.cc + area*(k.headCm-pos(t))/k.patmCmH2O
		return [3]float64{(qp(t) - q - leak) / ct, q, qp(t)}
	}
	y := [3]float64{k.startBTPSML / k.f / cl, k.startBTPSML / k.f, 0}
	startV := y[1]
	peak := y[0]
	n := int(math.Round(dur / h))
	hh := dur / float64(n)
	for i := 0; i < n; i++ {
		if !open && k.patmCmH2O*y[2]/(v0-y[2]) >= y[0]+k.peep {
			open = true
			compressionML = y[2]
		}
		t := float64(i) * hh
		p0 := y[0]
		k1 := deriv(t, y)
		var y2, y3, y4 [3]float64
		for j := range y {
			y2[j] = y[j] + hh/2*k1[j]
		}
		k2 := deriv(t+hh/2, y2)
		for j := range y {
			y3[j] = y[j] + hh/2*k2[j]
		}
		k3 := deriv(t+hh/2, y3)
		for j := range y {
			y4[j] = y[j] + hh*k3[j]
		}
		k4 := deriv(t+hh, y4)
		for j := range y {
			y[j] += hh / 6 * (k1[j] + 2*k2[j] + 2*k3[j] + k4[j])
		}
		peak = max(peak, y[0])
		leakML += g * ((p0+y[0])/2 + k.peep) * hh
		if open {
			compressionML += area * (k.headCm - pos(t+hh/2)) / k.patmCmH2O * (y[0] - p0)
		}
	}
	return k.f * (y[1] - startV), peak + k.peep, compressionML, leakML
}

func TestVersion2AgreesWithAnIndependentRK4(t *testing.T) {
	// Issue 13: an independent fine-step integration (RK4 at 0.1 ms, above)
	// agrees within 0.5 % on delivered volume and peak; and on what the
	// cylinder's gas and the leak took.
	head := CylinderHeadCm(Crank{RadiusCm: 6.2, RodCm: 22}, 1)
	for _, k := range []rk4Case{
		{10, 2.8, 22, 21, 40, 12, 1.5, 8, 60, 1.105, head, 1033.2, 2},
		{10, 4.0, 22, 18, 20, 15, 1.5, 12, 40, 1.091, head, 1033.2, 4},
		{10, 1.4, 22, 30, 60, 10, 0.8, 5, 0, 1.0, head, 800, 0},
		{10, 6.2, 22, 12, 30, 25, 2.5, 0, 0, 1.12, head + 2, 1033.2, 1},
	} {
		wantV, wantP, wantComp, wantLeak := rk4Stroke(k)
		in := StrokeInput{
			Stroke: Stroke{Crank: Crank{RadiusCm: k.radiusCm, RodCm: k.rodCm}, BoreCm: k.boreCm, RPM: k.rpm, Scale: 1},
			Lung:   Lung{k.c, k.rLPerS}, CircuitMLPerCmH2O: k.cc, PEEPCmH2O: k.peep, StartVolumeML: k.startBTPSML,
			Gas: GasPath{BTPSFactor: k.f, HeadPositionCm: k.headCm, BarometricCmH2O: k.patmCmH2O, LeakLPerMinAt20CmH2O: k.leakLPerMin20},
		}
		got := run(t, in)
		// The exact step is exact for a piston flow linear across the step,
		// so a 5 ms step (which a plan may choose for speed) stays within
		// 0.05 % as well.
		in.StepS = 0.005
		coarse := run(t, in)
		require.Less(t, relDiff(coarse.DeliveredML, wantV), 0.0005, "%+v delivered at 5 ms: got %v, RK4 %v", k, coarse.DeliveredML, wantV)
		require.Less(t, relDiff(coarse.PeakCmH2O, wantP), 0.0005, "%+v peak at 5 ms: got %v, RK4 %v", k, coarse.PeakCmH2O, wantP)
		require.Less(t, relDiff(got.DeliveredML, wantV), 0.005, "%+v delivered: got %v, RK4 %v", k, got.DeliveredML, wantV)
		require.Less(t, relDiff(got.PeakCmH2O, wantP), 0.005, "%+v peak: got %v, RK4 %v", k, got.PeakCmH2O, wantP)
		require.Less(t, relDiff(got.Gas.CompressionLossML, wantComp), 0.005, "%+v compression: got %v, RK4 %v", k, got.Gas.CompressionLossML, wantComp)
		require.InDelta(t, wantLeak, got.Gas.LeakedML, 0.005*wantLeak+1e-9, "%+v leak: got %v, RK4 %v", k, got.Gas.LeakedML, wantLeak)
		t.Logf("r %v: delivered %.3f (5 ms %.3f, RK4 %.3f) peak %.4f (5 ms %.4f, RK4 %.4f) compression %.3f (RK4 %.3f) leak %.3f (RK4 %.3f)",
			k.radiusCm, got.DeliveredML, coarse.DeliveredML, wantV, got.PeakCmH2O, coarse.PeakCmH2O, wantP,
			got.Gas.CompressionLossML, wantComp, got.Gas.LeakedML, wantLeak)
	}
}
