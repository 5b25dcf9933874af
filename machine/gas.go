package machine

import (
	"fmt"
	"math"
)

// GasPath is the version 2 physics of a stroke: what happens to the gas
// between the room and the lung. Each field's zero value leaves its effect
// out, and a zero GasPath is the version 1 model exactly.
type GasPath struct {
	// BTPSFactor F is the volume one unit of room air takes in the lung (at
	// 37 C, saturated): the lung's compliance seen from the room side is
	// C / F and the delivered volume is F x the room volume that entered.
	// Start volumes and the reported lung volumes are at body conditions.
	// 0 means 1 (the room already at body conditions).
	BTPSFactor float64
	// HeadPositionCm is the cylinder head's distance from the wheel's centre
	// along the piston's line (CylinderHeadCm gives it from the largest hole
	// and the clearance). The gas between piston and head is compressible:
	// Cg = bore area x (head - x) / barometric. Until the outlet valve opens
	// the piston's effective displacement (Stroke.Scale included) compresses
	// that gas from the room's pressure to the circuit's (Boyle, exactly).
	// 0: the cylinder's gas is not modelled (as in version 1).
	HeadPositionCm float64
	// BarometricCmH2O is the room's pressure; 0 means one standard
	// atmosphere (about 1033.2 cmH2O). It matters only with a head position.
	BarometricCmH2O float64
	// LeakLPerMinAt20CmH2O is the machine's and circuit's leak, the flow in
	// L/min at 20 cmH2O in the circuit, linear in the circuit pressure. 0: no leak.
	LeakLPerMinAt20CmH2O float64
	// ReliefCmH2O is the relief valve's pressure: the circuit never rises
	// above it and the excess vents. 0: no relief valve.
	ReliefCmH2O float64

	// noCylinderGas, for tests only, runs the version 2 model with the
	// cylinder's gas incompressible (Cg = 0, no pre-compression).
	noCylinderGas bool
}

// GasOutcome is what the version 2 model adds to a stroke's result. The
// piston's volume is shared out as PistonML = DeliveredRoomML +
// CompressionLossML + LeakedML + ReliefVentedML + what the circuit's
// compliance holds at the end, to the model's step accuracy.
type GasOutcome struct {
	BTPSFactor      float64 // the F used (1 when the input's was 0)
	DeliveredRoomML float64 // room volume that entered the lung; Breath.DeliveredML is F x this
	PistonML        float64 // the piston's effective displacement over the stroke
	// CompressionLossML is the displacement spent compressing the cylinder's
	// gas: PreCompressionML before the outlet valve opened, then Cg x the
	// rise in circuit pressure while delivering.
	CompressionLossML float64
	PreCompressionML  float64
	ValveOpensS       float64 // from the bottom dead centre to the outlet valve opening; the stroke's duration if it never opened
	LeakedML          float64
	ReliefVentedML    float64
	PressureLimited   bool // the relief valve opened: the breath is the vented one
}

// CylinderHeadCm is the head position for a cylinder whose head sits
// clearanceCm beyond the top dead centre of the largest hole's crank.
func CylinderHeadCm(largest Crank, clearanceCm float64) float64 {
	return largest.topCm() + clearanceCm
}

// LeakMLPerSPerCmH2O is the leak conductance G (mL/s per cmH2O of circuit
// pressure) of a leak of lPerMinAt20 L/min at 20 cmH2O.
func LeakMLPerSPerCmH2O(lPerMinAt20 float64) float64 {
	return lPerMinAt20 * 1000 / 60 / 20
}

func (g GasPath) active() bool {
	return g != GasPath{}
}

func (g GasPath) validate(c Crank, peep float64) error {
	for _, f := range []struct {
		name string
		v    float64
	}{{"BTPS factor", g.BTPSFactor}, {"cylinder head position (cm)", g.HeadPositionCm}, {"barometric pressure (cmH2O)", g.BarometricCmH2O},
		{"leak (L/min at 20 cmH2O)", g.LeakLPerMinAt20CmH2O}, {"relief pressure (cmH2O)", g.ReliefCmH2O}} {
		if !(f.v >= 0) || math.IsInf(f.v, 0) {
			return fmt.Errorf("%w: %s %v must be zero or positive and finite", ErrBadBreath, f.name, f.v)
		}
	}
	if g.HeadPositionCm != 0 && g.HeadPositionCm <= c.topCm() {
		return fmt.Errorf("%w: cylinder head position %v cm must be beyond this hole's top dead centre at %.4g cm", ErrBadBreath, g.HeadPositionCm, c.topCm())
	}
	if g.ReliefCmH2O != 0 && g.ReliefCmH2O <= peep {
		return fmt.Errorf("%w: relief pressure %v cmH2O must be above PEEP %v cmH2O", ErrBadBreath, g.ReliefCmH2O, peep)
	}
	return nil
}

// gasBlockS is how long one frozen cylinder-gas compliance, taken at the
// block's middle, is used for: a whole number of steps, at least one. Cg
// changes smoothly over a stroke; against an RK4 reference at 0.1 ms
// (gas_rk4_test.go) blocks of 1, 8 and 32 ms all agree within 2e-5 of the
// delivered volume, so 16 ms costs a tenth of a step-by-step update at the
// default step, and coarser steps do not lengthen the blocks.
const gasBlockS = 0.016

func gasBlockSteps(h float64) int { return max(1, int(math.Round(gasBlockS/h))) }

// v2run is one version 2 stroke in progress. p is the circuit pressure
// above PEEP, v the lung volume above relaxed in room mL.
type v2run struct {
	f, cl, rML, cc, g, peep, patm, reliefP float64
	invCl, invR                            float64
	area, head                             float64
	gasOn                                  bool
	h                                      float64
	flows, x                               []float64
	tr                                     *torqueTrack
	observe                                func(tS, circuitCmH2O, patientFlowMLPerS, volumeML float64)
	base                                   *prop

	p, v, peak, peakQ float64
	out               GasOutcome
}

func (r *v2run) patient(p, v float64) float64 { return (p - v*r.invCl) * r.invR }

// mark records the state at grid point i, with the piston's own pressure.
func (r *v2run) mark(i int, pistonCmH2O float64) {
	q := r.patient(r.p, r.v)
	r.peak, r.peakQ = max(r.peak, r.p), max(r.peakQ, q)
	if r.tr != nil {
		r.tr.at(i, pistonCmH2O)
	}
	if r.observe != nil {
		r.observe(float64(i)*r.h, r.p+r.peep, r.f*q, r.f*r.v)
	}
}

// cylinderML is the gas volume between piston and head at grid position xCm.
func (r *v2run) cylinderML(xCm float64) float64 { return r.area * (r.head - xCm) }

// needML is the displacement that raises the cylinder's gas, isothermally,
// from the room's pressure to a circuit pressure pcCmH2O.
func (r *v2run) needML(pcCmH2O float64) float64 {
	if pcCmH2O <= 0 {
		return 0
	}
	return r.cylinderML(r.x[0]) * pcCmH2O / (r.patm + pcCmH2O)
}

func (sim *Simulator) strokeV2(in StrokeInput, m *motion, tr *torqueTrack, h float64) (StrokeResult, error) {
	g := in.Gas
	f := g.BTPSFactor
	if f == 0 {
		f = 1
	}
	r := v2run{
		f: f, cl: in.Lung.ComplianceMLPerCmH2O / f, rML: in.Lung.ResistanceCmH2OPerLS / 1000, cc: in.CircuitMLPerCmH2O,
		g: LeakMLPerSPerCmH2O(g.LeakLPerMinAt20CmH2O), peep: in.PEEPCmH2O, patm: g.BarometricCmH2O,
		reliefP: math.Inf(1), area: BoreAreaCm2(in.Stroke.BoreCm), head: g.HeadPositionCm,
		gasOn: g.HeadPositionCm > 0 && !g.noCylinderGas, h: h, flows: m.flows, x: m.x, tr: tr, observe: in.Observe,
	}
	r.invCl, r.invR = 1/r.cl, 1/r.rML
	if r.patm == 0 {
		r.patm = cmH2OPerAtm
	}
	if g.ReliefCmH2O > 0 {
		r.reliefP = g.ReliefCmH2O - r.peep
	}
	r.base = sim.v2.get(r.cc, r.rML, r.cl, r.g, h)
	r.v = in.StartVolumeML / f
	r.p = r.v / r.cl
	start := r.v
	r.peak, r.peakQ = r.p, r.patient(r.p, r.v)
	r.out.BTPSFactor = f
	i0 := 0
	if r.gasOn {
		i0 = r.precompress()
		r.out.CompressionLossML += r.out.PreCompressionML
	} else {
		r.mark(0, r.p+r.peep)
	}
	r.deliver(i0)
	r.out.PistonML = m.pistonML
	res := StrokeResult{PeakPistonFlowMLPerS: m.peakFlow, PeakTorqueNm: tr.peak(), Gas: r.out}
	res.Gas.DeliveredRoomML = r.v - start
	if r.g > 0 {
		// Each step's exact map conserves volume, so the leak is what the
		// piston moved less what everything else took.
		res.Gas.LeakedML = r.out.PistonML - res.Gas.DeliveredRoomML - r.out.CompressionLossML - r.out.ReliefVentedML -
			r.cc*(r.p-start/r.cl)
	}
	res.Breath = Breath{
		DeliveredML: f * (r.v - start), PeakCmH2O: r.peak + r.peep, EndCmH2O: r.p + r.peep,
		PeakPatientFlowMLPerS: f * r.peakQ, StepS: h, Steps: len(r.flows) - 1,
	}
	if math.IsNaN(res.DeliveredML) || math.IsInf(res.DeliveredML, 0) || math.IsNaN(res.PeakCmH2O) || math.IsNaN(res.Gas.LeakedML) {
		return StrokeResult{}, fmt.Errorf("%w: the simulation did not give a finite result", ErrBadBreath)
	}
	return res, nil
}

// precompress runs the start of the stroke with the outlet valve shut: the
// piston compresses the cylinder's gas while the lung and circuit see only
// the leak. The valve opens when the gas reaches the circuit's pressure;
// the step in which that happens is split there. It returns the grid index
// from which delivery continues.
func (r *v2run) precompress() int {
	n := len(r.flows) - 1
	v0 := r.cylinderML(r.x[0])
	shut := func(d float64) float64 { return r.patm * d / (v0 - d) }
	need := r.needML(r.p + r.peep)
	r.mark(0, 0)
	if need <= 0 {
		return 0
	}
	gp := r.g * r.peep
	var d float64
	for i := 0; i < n; i++ {
		u0, u1 := r.flows[i], r.flows[i+1]
		d1 := d + (u0+u1)/2*r.h
		p1, v1 := r.base.advance(r.p, r.v, -gp, -gp)
		need1 := r.needML(p1 + r.peep)
		if d1 < need1 {
			r.p, r.v, d, need = p1, v1, d1, need1
			r.mark(i+1, shut(d))
			continue
		}
		// The valve opens at a fraction tau of this step: the displacement,
		// quadratic in tau for the linear flow, meets what the circuit's
		// pressure (linear in tau across the step) needs.
		gap := func(tau float64) float64 {
			return d + r.h*(u0*tau+(u1-u0)*tau*tau/2) - (need + (need1-need)*tau)
		}
		lo, hi := 0.0, 1.0
		for range 50 {
			if mid := (lo + hi) / 2; gap(mid) < 0 {
				lo = mid
			} else {
				hi = mid
			}
		}
		tau := (lo + hi) / 2
		r.out.PreCompressionML = d + r.h*(u0*tau+(u1-u0)*tau*tau/2)
		r.out.ValveOpensS = (float64(i) + tau) * r.h
		first := newProp(r.cc, r.rML, r.cl, r.g, tau*r.h)
		pa, va := first.advance(r.p, r.v, -gp, -gp)
		r.p, r.v = pa, va
		xMid := r.x[i] + (r.x[i+1]-r.x[i])*(1+tau)/2
		ctot := r.cc + GasComplianceMLPerCmH2O(r.cylinderML(xMid), r.patm)
		rest := newProp(ctot, r.rML, r.cl, r.g, (1-tau)*r.h)
		pb, vb := rest.advance(r.p, r.v, u0+(u1-u0)*tau-gp, u1-gp)
		r.p, r.v = r.limit(r.p, pb, ctot), vb
		r.mark(i+1, r.p+r.peep)
		return i + 1
	}
	r.out.PreCompressionML = d
	r.out.ValveOpensS = float64(n) * r.h // never: the whole stroke went into the cylinder's gas
	return n
}

// deliver runs the steps from grid index i0 to the end with the outlet valve
// open: cylinder and circuit are one compartment of compliance Cc + Cg(t).
// The loop keeps its state in locals (it is most of a plan's time) and
// does what mark does for each grid point.
func (r *v2run) deliver(i0 int) {
	n := len(r.flows) - 1
	pr, ctot := r.base, r.cc
	var blk prop
	flows, tr, gp, block := r.flows, r.tr, r.g*r.peep, gasBlockSteps(r.h)
	p, v, peak, peakQ := r.p, r.v, r.peak, r.peakQ
	for i := i0; i < n; i++ {
		if r.gasOn && (i-i0)%block == 0 {
			// The middle of the block; x is sampled on the grid, so for an
			// odd block it is half a step off the middle.
			ctot = r.cc + r.cylinderML(r.x[min(i+block/2, n)])/r.patm
			blk = newProp(ctot, r.rML, r.cl, r.g, r.h)
			pr = &blk
		}
		u0, u1 := flows[i], flows[i+1]
		// A step that would end above the relief vents from where it
		// crosses it; one that starts at the relief (the valve open) crosses
		// at once and is held there for the whole step.
		p1, v1 := pr.advance(p, v, u0-gp, u1-gp)
		if p1 > r.reliefP {
			var qCross float64
			p, v, qCross = r.enterRelief(p, v, p1, u0, u1, ctot)
			// The lung's flow peaks where the pressure stops rising, between grid points.
			peakQ = max(peakQ, qCross)
		} else {
			p, v = r.limit(p, p1, ctot), v1
		}
		q := (p - v*r.invCl) * r.invR
		if p > peak {
			peak = p
		}
		if q > peakQ {
			peakQ = q
		}
		if tr != nil {
			tr.at(i+1, p+r.peep)
		}
		if r.observe != nil {
			r.observe(float64(i+1)*r.h, p+r.peep, r.f*q, r.f*v)
		}
	}
	r.p, r.v, r.peak, r.peakQ = p, v, peak, peakQ
}

// limit takes a step's end pressure p1 from p0 with the compliance ctot,
// holds it at the relief pressure if it went above, venting the excess, and
// counts what the cylinder's gas took. It returns the pressure kept.
func (r *v2run) limit(p0, p1, ctot float64) float64 {
	if p1 > r.reliefP {
		r.out.ReliefVentedML += ctot * (p1 - r.reliefP)
		p1 = r.reliefP
		r.out.PressureLimited = true
	}
	r.out.CompressionLossML += (ctot - r.cc) * (p1 - p0)
	return p1
}

// enterRelief redoes a step whose end pressure p1 went above the relief:
// open up to where the pressure reaches it (by linear interpolation of p
// across the step), then held at the relief for the rest of the step (all
// of it when the step starts at the relief, the valve already open). The
// crossing then costs O(h^2), not O(h).
// It returns the new pressure and volume and the lung's flow at the crossing.
func (r *v2run) enterRelief(p0, v0, p1, u0, u1, ctot float64) (float64, float64, float64) {
	tau := min(1, max(0, (r.reliefP-p0)/(p1-p0)))
	gp := r.g * r.peep
	ua := u0 + (u1-u0)*tau
	pa, va := p0, v0
	if tau > 0 {
		first := newProp(ctot, r.rML, r.cl, r.g, tau*r.h)
		pa, va = first.advance(p0, v0, u0-gp, ua-gp)
	}
	rest := (1 - tau) * r.h
	veq := r.cl * r.reliefP
	v1 := veq + (va-veq)*math.Exp(-rest/(r.rML*r.cl))
	leak := r.g * (r.reliefP + r.peep) * rest
	// What the piston moved in the rest of the step, less the lung's share,
	// the leak and what brings the compliances from pa to the relief, vents.
	r.out.ReliefVentedML += (ua+u1)/2*rest - (v1 - va) - leak - ctot*(r.reliefP-pa)
	r.out.CompressionLossML += (ctot - r.cc) * (r.reliefP - p0)
	r.out.PressureLimited = true
	return r.reliefP, v1, r.patient(min(pa, r.reliefP), va)
}

// GasComplianceMLPerCmH2O is the isothermal (Boyle) compliance of a volume
// of gas at a pressure (absolute, cmH2O): V / P, in mL per cmH2O. The
// cylinder's own gas enters the simulation this way.
func GasComplianceMLPerCmH2O(volumeML, pressureCmH2O float64) float64 {
	return volumeML / pressureCmH2O
}
