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

// fillMotion writes dx/dtheta at t = 0, h, ... n h into the delivery into
// dx[0..n], and the piston's position into x when x is not nil. The crank
// angle advances by the same amount each step, so sin and cos are carried
// forward by a rotation instead of being recomputed, and resynchronised
// every 128 steps to keep the rounding from drifting.
func (k *kinematics) fillMotion(dx, x []float64, h float64) {
	n := len(dx) - 1
	rs, rc := math.Sincos(k.omega * h)
	var sin, cos float64
	for i := range dx {
		if i%128 == 0 {
			sin, cos = math.Sincos(k.angle(float64(i) * h))
		} else {
			sin, cos = sin*rc+cos*rs, cos*rc-sin*rs
		}
		xi, d := k.crank.Motion(sin, cos)
		dx[i] = d
		if x != nil {
			x[i] = xi
		}
	}
	dx[n] = 0 // the top dead centre, exactly
	if x != nil {
		x[n] = k.crank.topCm()
	}
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
	// Gas is the version 2 physics (body conditions, the cylinder's gas,
	// the leak, the relief valve); the zero value is the version 1 model,
	// exactly.
	Gas GasPath
	// NoTorque leaves the crank torque out (PeakTorqueNm is then 0): a
	// caller that needs only the pressures and volumes, as a fit's trial
	// lungs do, saves following it at every step. Nothing else changes.
	NoTorque bool
}

// StrokeResult is a simulated delivery with the crank torque it needs.
type StrokeResult struct {
	Breath
	PeakPistonFlowMLPerS float64
	PeakTorqueNm         float64
	// Gas is what version 2 adds; zero when the input's Gas was zero.
	Gas GasOutcome
}

// SimulateStroke runs the breath model for one delivery half-turn and finds
// the peak crank torque: the force on the piston, (cylinder pressure in Pa)
// x bore area + ring friction, through the crank (TorqueNm). With a zero
// Gas it is the version 1 model; see GasPath for version 2. It uses a fresh
// Simulator: a caller running many strokes should keep one instead.
func SimulateStroke(in StrokeInput) (StrokeResult, error) {
	var sim Simulator
	return sim.SimulateStroke(in)
}

// Simulator runs strokes one after another and keeps what they share: the
// exact one-step map of the last lung, circuit and step (a matrix
// exponential, recomputed only when one of them changes) and the piston's
// motion on the last strokes' grids (its position, dx/dtheta and flow at
// every step, which depend on the crank, the speed and the step but not on
// the lung), so that a fit running one stroke for many trial lungs
// computes the crank's motion once, and a stroke allocates nothing once
// the buffers have grown. The zero value is ready to use. A Simulator is
// not safe for use by more than one goroutine at a time; give each
// goroutine its own. Its results are exactly SimulateStroke's.
type Simulator struct {
	v1     stepperCache
	v2     propCache
	motion motionCache
}

// SimulateStroke is the package function SimulateStroke, reusing the
// Simulator's cached step and buffers.
func (sim *Simulator) SimulateStroke(in StrokeInput) (StrokeResult, error) {
	if err := in.Stroke.validate(); err != nil {
		return StrokeResult{}, err
	}
	if in.RingFrictionN < 0 || math.IsNaN(in.RingFrictionN) || math.IsInf(in.RingFrictionN, 0) {
		return StrokeResult{}, fmt.Errorf("%w: ring friction %v N must be zero or positive", ErrBadBreath, in.RingFrictionN)
	}
	c, r, cc := in.Lung.ComplianceMLPerCmH2O, in.Lung.ResistanceCmH2OPerLS, in.CircuitMLPerCmH2O
	k := in.Stroke.kinematics()
	if err := checkBreath(c, r, cc, k.durS, in.PEEPCmH2O, in.StartVolumeML); err != nil {
		return StrokeResult{}, err
	}
	n, h, err := StepGrid(k.durS, in.StepS)
	if err != nil {
		return StrokeResult{}, err
	}
	v2 := in.Gas.active()
	if v2 {
		if err := in.Gas.validate(in.Stroke.Crank, in.PEEPCmH2O); err != nil {
			return StrokeResult{}, err
		}
	}
	m := sim.motion.get(in.Stroke, &k, n, h)
	var tr *torqueTrack // nil: no torque asked for
	if !in.NoTorque {
		tr = &torqueTrack{dx: m.dx, frictionN: in.RingFrictionN,
			newtonPerCmH2O: pascalPerCmH2O * BoreAreaCm2(in.Stroke.BoreCm) / 1e4}
	}
	if v2 {
		return sim.strokeV2(in, m, tr, h)
	}
	b, err := runExact(sim.v1.get(c, r, cc, h), c, in.PEEPCmH2O, in.StartVolumeML, m.flows, in.Observe, tr)
	if err != nil {
		return StrokeResult{}, err
	}
	return StrokeResult{Breath: b, PeakPistonFlowMLPerS: m.peakFlow, PeakTorqueNm: tr.peak()}, nil
}

// pascalPerCmH2O is the conventional centimetre of water (NIST SP 811,
// B.8). physiology.PascalPerCmH2O is the exported constant for everyone
// else; machine may import only the standard library and gonum, so this
// unexported copy serves the torque and the standard atmosphere here, and
// TestPascalPerCmH2O holds it to the NIST value.
const pascalPerCmH2O = 98.0665

// cmH2OPerAtm is one standard atmosphere (101325 Pa) in cmH2O, about 1033.2.
const cmH2OPerAtm = 101325 / pascalPerCmH2O
