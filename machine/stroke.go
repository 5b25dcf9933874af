package machine

import (
	"fmt"
	"math"
)

// Stroke is one delivery half-turn of a crank hole at a motor speed.
type Stroke struct {
	Crank  Crank
	BoreCm float64
	RPM    float64
	// Scale multiplies the geometric piston flow: the calibrated effective
	// swept volume over the geometric one (1 with no calibration). The
	// model is linear in the piston's amplitude, so this is how a bench
	// calibration enters it.
	Scale float64
}

// Omega is the crank's angular speed in rad/s.
func (s Stroke) Omega() float64 { return 2 * math.Pi * s.RPM / 60 }

// DurationS is the time of the delivery: the delivery angle at Omega.
func (s Stroke) DurationS() float64 { return s.Crank.DeliveryAngle() / s.Omega() }

// SweptML is the geometric swept volume of the hole.
func (s Stroke) SweptML() float64 { return SweptVolumeML(s.BoreCm, s.Crank) }

// kinematics holds what a stroke's piston flow needs, computed once.
type kinematics struct {
	crank               Crank
	bottom, omega, durS float64
	flowPerDxDTheta     float64 // scale x area x omega, mL/s per cm/rad
}

func (s Stroke) kinematics() kinematics {
	bottom, _ := s.Crank.DeadCentres()
	omega := s.Omega()
	return kinematics{
		crank: s.Crank, bottom: bottom, omega: omega,
		durS:            s.Crank.DeliveryAngle() / omega,
		flowPerDxDTheta: s.Scale * BoreAreaCm2(s.BoreCm) * omega,
	}
}

func (k *kinematics) angle(tS float64) float64 { return k.bottom + k.omega*tS }

func (k *kinematics) flow(tS float64) float64 {
	if tS < 0 || tS > k.durS*(1+1e-12) {
		return 0
	}
	return k.flowPerDxDTheta * k.crank.DxDTheta(k.angle(tS))
}

// dxSamples is dx/dtheta at t = 0, h, ... n h into the delivery. The crank
// angle advances by the same amount each step, so sin and cos are carried
// forward by a rotation instead of being recomputed, and resynchronised
// every 128 steps to keep the rounding from drifting.
func (k *kinematics) dxSamples(n int, h float64) []float64 {
	out := make([]float64, n+1)
	rs, rc := math.Sincos(k.omega * h)
	r, l2, e := k.crank.RadiusCm, k.crank.RodCm*k.crank.RodCm, k.crank.OffsetCm
	var sin, cos float64
	for i := range out {
		if i%128 == 0 {
			sin, cos = math.Sincos(k.angle(float64(i) * h))
		} else {
			sin, cos = sin*rc+cos*rs, cos*rc-sin*rs
		}
		s := r*sin - e
		out[i] = -r*sin - s*r*cos/math.Sqrt(l2-s*s)
	}
	out[n] = 0 // the top dead centre, exactly
	return out
}

// PistonFlowMLPerS is bore area x omega x dx/dtheta, times Scale, t seconds
// after the bottom dead centre. It is zero outside the delivery.
func (s Stroke) PistonFlowMLPerS(tS float64) float64 {
	k := s.kinematics()
	return k.flow(tS)
}

func (s Stroke) validate() error {
	if err := s.Crank.Validate(); err != nil {
		return err
	}
	if !(s.BoreCm > 0) || !(s.RPM > 0) || math.IsInf(s.RPM, 0) || math.IsInf(s.BoreCm, 0) {
		return fmt.Errorf("%w: bore %v cm and speed %v rpm must be positive", ErrBadBreath, s.BoreCm, s.RPM)
	}
	if s.Scale < 0 || math.IsNaN(s.Scale) || math.IsInf(s.Scale, 0) {
		return fmt.Errorf("%w: calibration scale %v must be zero or positive", ErrBadBreath, s.Scale)
	}
	return nil
}

// StrokeInput is a stroke pushed into a lung.
type StrokeInput struct {
	Stroke            Stroke
	Lung              Lung
	CircuitMLPerCmH2O float64
	PEEPCmH2O         float64
	StartVolumeML     float64
	RingFrictionN     float64
	StepS             float64
	Observe           func(tS, circuitCmH2O, patientFlowMLPerS, volumeML float64)
}

// StrokeResult is a simulated delivery with the crank torque it needs.
type StrokeResult struct {
	Breath
	PeakPistonFlowMLPerS float64
	PeakTorqueNm         float64
}

// SimulateStroke runs the breath model for one delivery half-turn and finds
// the peak crank torque: the force on the piston, (Pc in Pa) x bore area +
// ring friction, times |dx/dtheta|.
func SimulateStroke(in StrokeInput) (StrokeResult, error) {
	if err := in.Stroke.validate(); err != nil {
		return StrokeResult{}, err
	}
	if in.RingFrictionN < 0 || math.IsNaN(in.RingFrictionN) || math.IsInf(in.RingFrictionN, 0) {
		return StrokeResult{}, fmt.Errorf("%w: ring friction %v N must be zero or positive", ErrBadBreath, in.RingFrictionN)
	}
	k := in.Stroke.kinematics()
	n, h, err := StepGrid(k.durS, in.StepS)
	if err != nil {
		return StrokeResult{}, err
	}
	dx := k.dxSamples(n, h)
	flows := make([]float64, len(dx))
	for i, d := range dx {
		flows[i] = k.flowPerDxDTheta * d
	}
	areaM2 := BoreAreaCm2(in.Stroke.BoreCm) / 1e4
	var out StrokeResult
	i := 0 // Simulate observes each grid point once, in order
	observe := func(t, pc, q, v float64) {
		force := pc*pascalPerCmH2O*areaM2 + in.RingFrictionN
		out.PeakTorqueNm = max(out.PeakTorqueNm, force*math.Abs(dx[i])/100)
		out.PeakPistonFlowMLPerS = max(out.PeakPistonFlowMLPerS, flows[i])
		i++
		if in.Observe != nil {
			in.Observe(t, pc, q, v)
		}
	}
	b, err := Simulate(BreathInput{
		FlowSamples:       flows,
		DurationS:         k.durS,
		Lung:              in.Lung,
		CircuitMLPerCmH2O: in.CircuitMLPerCmH2O,
		PEEPCmH2O:         in.PEEPCmH2O,
		StartVolumeML:     in.StartVolumeML,
		StepS:             in.StepS,
		Observe:           observe,
	})
	if err != nil {
		return StrokeResult{}, err
	}
	out.Breath = b
	return out, nil
}

// pascalPerCmH2O is the conventional centimetre of water (NIST SP 811).
const pascalPerCmH2O = 98.0665
