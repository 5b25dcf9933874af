package machine

import (
	"fmt"
	"math"
)

// The version 1 breath with a flow function: the reference the stroke
// simulation is checked against in this package's tests. The program
// itself runs strokes through Simulator, on the same exact step.

// BreathInput describes one delivery: a piston flow pushed through a circuit
// of compliance CircuitMLPerCmH2O into a Lung whose relaxed volume is at
// PEEPCmH2O, starting with StartVolumeML above that relaxed volume and with
// the circuit at the lung's alveolar pressure.
type BreathInput struct {
	Flow func(tS float64) float64 // piston flow, mL/s; nil when FlowSamples is set
	// FlowSamples, when set, is the piston flow at t = 0, h, 2h, ... DurationS
	// for the step h that StepGrid gives; it saves calling Flow.
	FlowSamples       []float64
	DurationS         float64
	Lung              Lung
	CircuitMLPerCmH2O float64
	PEEPCmH2O         float64
	StartVolumeML     float64
	StepS             float64 // 0 means DefaultStepS; the step is shortened so DurationS is a whole number of steps
	// Observe, when set, is called at t = 0 and after every step with the
	// circuit pressure (cmH2O), the patient flow (mL/s) and the lung volume
	// above relaxed (mL).
	Observe func(tS, circuitCmH2O, patientFlowMLPerS, volumeML float64)
}

// Simulate integrates the delivery. The circuit pressure Pc and the lung
// volume V obey
//
//	dPc/dt = (Qp - Qpat) / Cc,   Qpat = dV/dt = (Pc - PEEP - V/C) / R.
//
// The system is linear, so each step is solved exactly for a piston flow
// that varies linearly across the step (the matrix exponential of the system
// augmented with the flow and its slope, after Van Loan 1978). The method is
// stable for any circuit compliance, however small, and second-order
// accurate in the step for a smooth piston flow.
func Simulate(in BreathInput) (Breath, error) {
	if in.Flow == nil && in.FlowSamples == nil {
		panic("machine: Simulate needs a flow function or flow samples")
	}
	c, r, cc := in.Lung.ComplianceMLPerCmH2O, in.Lung.ResistanceCmH2OPerLS, in.CircuitMLPerCmH2O
	if err := checkBreath(c, r, cc, in.DurationS, in.PEEPCmH2O, in.StartVolumeML); err != nil {
		return Breath{}, err
	}
	n, h, err := StepGrid(in.DurationS, in.StepS)
	if err != nil {
		return Breath{}, err
	}
	flows := in.FlowSamples
	if flows != nil {
		if len(flows) != n+1 {
			panic(fmt.Sprintf("machine: %d flow samples for %d steps", len(flows), n))
		}
	} else {
		flows = make([]float64, n+1)
		for i := range flows {
			flows[i] = in.Flow(float64(i) * h)
		}
	}
	st := newStepper(c, r, cc, h)
	return runExact(&st, c, in.PEEPCmH2O, in.StartVolumeML, flows, in.Observe, nil)
}

// checkBreath refuses a lung, circuit, duration, PEEP or start volume the
// model cannot run.

// flow is the piston flow t seconds after the bottom dead centre, zero
// outside the delivery, for the reference Simulate.
func (k *kinematics) flow(tS float64) float64 {
	if tS < 0 || tS > k.durS*(1+1e-12) {
		return 0
	}
	_, dx := k.crank.Motion(math.Sincos(k.angle(tS)))
	return k.flowPerDxDTheta * dx
}
