package machine

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// DefaultStepS is the simulation step used when BreathInput.StepS is zero.
const DefaultStepS = 0.001

// maxSteps bounds the work of one simulation (an hour at 1 ms would be far
// outside any breath); longer requests are refused rather than run.
const maxSteps = 2_000_000

// Lung is a single-compartment lung: compliance in mL/cmH2O and airway
// resistance (tube included) in cmH2O/(L/s).
type Lung struct {
	ComplianceMLPerCmH2O float64
	ResistanceCmH2OPerLS float64
}

// Breath is the outcome of one delivery.
type Breath struct {
	DeliveredML           float64 // lung volume at the end minus at the start
	PeakCmH2O             float64 // highest circuit pressure
	EndCmH2O              float64 // circuit pressure at the end of the delivery
	PeakPatientFlowMLPerS float64 // highest flow into the lung
	StepS                 float64 // the step actually used
	Steps                 int
}

// ErrBadBreath is returned (wrapped) for inputs the model cannot run.
var ErrBadBreath = errors.New("machine: breath input")

func checkBreath(c, r, cc, durS, peep, startML float64) error {
	for _, v := range []struct {
		name string
		v    float64
	}{{"lung compliance", c}, {"lung resistance", r}, {"circuit compliance", cc}, {"duration", durS}} {
		if !(v.v > 0) || math.IsInf(v.v, 0) {
			return fmt.Errorf("%w: %s %v must be positive and finite", ErrBadBreath, v.name, v.v)
		}
	}
	if math.IsNaN(peep) || math.IsInf(peep, 0) || math.IsNaN(startML) || math.IsInf(startML, 0) {
		return fmt.Errorf("%w: PEEP %v and start volume %v must be finite", ErrBadBreath, peep, startML)
	}
	return nil
}

// torqueTrack follows the crank torque of a stroke as the simulation
// passes each grid point (the peak piston flow, which does not depend on
// the pressure, is the motion's).
type torqueTrack struct {
	dx                        []float64
	newtonPerCmH2O, frictionN float64
	peakTorqueNm              float64
}

// peak is the highest torque followed, 0 when none was (tr nil).
func (tr *torqueTrack) peak() float64 {
	if tr == nil {
		return 0
	}
	return tr.peakTorqueNm
}

func (tr *torqueTrack) at(i int, pistonCmH2O float64) {
	force := pistonCmH2O*tr.newtonPerCmH2O + tr.frictionN
	if t := math.Abs(TorqueNm(force, tr.dx[i])); t > tr.peakTorqueNm {
		tr.peakTorqueNm = t
	}
}

// runExact steps the version 1 model over the piston flow samples with the
// exact one-step map st. Observe and tr, when not nil, see every grid point.
func runExact(st *stepper, c, peep, startML float64, flows []float64, observe func(tS, circuitCmH2O, patientFlowMLPerS, volumeML float64), tr *torqueTrack) (Breath, error) {
	n, h := len(flows)-1, st.h
	// p is the circuit pressure above PEEP, v the lung volume above relaxed.
	v := startML
	p := v / c
	u := flows[0]
	invC, invR := 1/c, 1/st.rML
	patient := func(p, v float64) float64 { return (p - v*invC) * invR }
	peak, peakFlow := p, patient(p, v)
	if tr != nil {
		tr.at(0, p+peep)
	}
	if observe != nil {
		observe(0, p+peep, peakFlow, v)
	}
	for i := 1; i <= n; i++ {
		un := flows[i]
		p, v = st.advance(p, v, u, un)
		u = un
		q := patient(p, v)
		if p > peak {
			peak = p
		}
		if q > peakFlow {
			peakFlow = q
		}
		if tr != nil {
			tr.at(i, p+peep)
		}
		if observe != nil {
			observe(float64(i)*h, p+peep, q, v)
		}
	}
	out := Breath{PeakCmH2O: peak + peep, PeakPatientFlowMLPerS: peakFlow, StepS: h, Steps: n}
	out.DeliveredML = v - startML
	out.EndCmH2O = p + peep
	if math.IsNaN(out.DeliveredML) || math.IsInf(out.DeliveredML, 0) || math.IsNaN(out.PeakCmH2O) {
		return Breath{}, fmt.Errorf("%w: the simulation did not give a finite result", ErrBadBreath)
	}
	return out, nil
}

// StepGrid is the number of steps and the step that Simulate uses for a
// duration: the largest step no longer than step (0 means DefaultStepS)
// that divides the duration evenly.
func StepGrid(durationS, step float64) (int, float64, error) {
	if step == 0 {
		step = DefaultStepS
	}
	if !(step > 0) || math.IsInf(step, 0) {
		return 0, 0, fmt.Errorf("%w: step %v must be positive", ErrBadBreath, step)
	}
	if !(durationS > 0) || math.IsInf(durationS, 0) {
		return 0, 0, fmt.Errorf("%w: duration %v must be positive and finite", ErrBadBreath, durationS)
	}
	steps := math.Ceil(durationS/step - 1e-9)
	if steps > maxSteps {
		return 0, 0, fmt.Errorf("%w: %g s at a %g s step is more than %d steps", ErrBadBreath, durationS, step, maxSteps)
	}
	n := max(int(steps), 1)
	return n, durationS / float64(n), nil
}

// stepper holds the exact one-step map of the linear system for a piston
// flow that is linear across the step.
type stepper struct {
	rML            float64 // resistance in cmH2O per mL/s
	pp, pv, pu, pd float64 // new p from p, v, u and the flow's slope
	vp, vv, vu, vd float64
	h              float64
}

func newStepper(c, rLPerS, cc, h float64) stepper {
	r := rLPerS / 1000
	// z = [p, v, u, du/dt]; dz/dt = M z.
	m := mat.NewDense(4, 4, []float64{
		-1 / (r * cc), 1 / (r * c * cc), 1 / cc, 0,
		1 / r, -1 / (r * c), 0, 0,
		0, 0, 0, 1,
		0, 0, 0, 0,
	})
	m.Scale(h, m)
	var e mat.Dense
	e.Exp(m)
	return stepper{
		rML: r, h: h,
		pp: e.At(0, 0), pv: e.At(0, 1), pu: e.At(0, 2), pd: e.At(0, 3),
		vp: e.At(1, 0), vv: e.At(1, 1), vu: e.At(1, 2), vd: e.At(1, 3),
	}
}

// stepperCache keeps the last exact one-step map: its matrix exponential
// depends only on the lung, the circuit and the step.
type stepperCache struct {
	ok          bool
	c, r, cc, h float64
	st          stepper
}

func (sc *stepperCache) get(c, r, cc, h float64) *stepper {
	if !sc.ok || sc.c != c || sc.r != r || sc.cc != cc || sc.h != h {
		sc.st = newStepper(c, r, cc, h)
		sc.ok, sc.c, sc.r, sc.cc, sc.h = true, c, r, cc, h
	}
	return &sc.st
}

func (s *stepper) advance(p, v, u, un float64) (float64, float64) {
	d := (un - u) / s.h
	return s.pp*p + s.pv*v + s.pu*u + s.pd*d,
		s.vp*p + s.vv*v + s.vu*u + s.vd*d
}
