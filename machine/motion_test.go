package machine

import (
	"testing"

	"github.com/stretchr/testify/require"
)

func TestSimulatorKeepsTheMotionOnlyForTheSameStroke(t *testing.T) {
	// Round-trip property: a Simulator that keeps the last stroke's motion
	// gives, stroke after stroke, what a fresh one gives, whether the next
	// stroke changes only the lung (as a fit's trial lungs do, the motion
	// kept) or the step, the speed, the calibration scale, the bore or the
	// crank (the motion computed again).
	base := demoStroke(2.8)
	base.Gas = demoGas()
	steps := []func(in *StrokeInput){
		func(in *StrokeInput) {},
		func(in *StrokeInput) { in.Lung = Lung{25, 20} },
		func(in *StrokeInput) { in.Lung = Lung{90, 6}; in.StartVolumeML = 0 },
		func(in *StrokeInput) { in.StepS = 0.010 },
		func(in *StrokeInput) { in.StepS = 0.010; in.Lung = Lung{25, 20} },
		func(in *StrokeInput) {},
		func(in *StrokeInput) { in.Stroke.RPM = 30 },
		func(in *StrokeInput) { in.Stroke.Scale = 0.9 },
		func(in *StrokeInput) { in.Stroke.BoreCm = 9 },
		func(in *StrokeInput) { in.Stroke.Crank.RadiusCm = 3.0 },
		func(in *StrokeInput) { in.Stroke.Crank.OffsetCm = 1.5 },
		func(in *StrokeInput) { in.Stroke.Crank.RodCm = 25 },
		func(in *StrokeInput) { in.Gas = GasPath{} },
		// Version 1 keeps its exact step for the last lung, circuit and
		// step: change each alone.
		func(in *StrokeInput) { in.Gas = GasPath{}; in.Lung = Lung{25, 12} },
		func(in *StrokeInput) { in.Gas = GasPath{}; in.Lung = Lung{25, 20} },
		func(in *StrokeInput) { in.Gas = GasPath{}; in.Lung = Lung{25, 20}; in.CircuitMLPerCmH2O = 3 },
		func(in *StrokeInput) {
			in.Gas = GasPath{}
			in.Lung = Lung{25, 20}
			in.CircuitMLPerCmH2O = 3
			in.StepS = 0.004
		},
		func(in *StrokeInput) { in.Gas = GasPath{}; in.Lung = Lung{25, 20}; in.CircuitMLPerCmH2O = 3 },
	}
	var sim Simulator
	for i, change := range steps {
		in := base
		change(&in)
		got, err := sim.SimulateStroke(in)
		require.NoError(t, err)
		require.Equal(t, run(t, in), got, "stroke %d: %+v", i, in)
	}
}

func TestNoTorqueLeavesEverythingElse(t *testing.T) {
	// Property: leaving the torque out changes no other figure of a
	// stroke, for the version 1 model, the version 2 gas path and a breath
	// the relief valve limits; the torque is then 0.
	for name, gas := range map[string]GasPath{"v1": {}, "v2": demoGas(), "relief": {ReliefCmH2O: 12, BTPSFactor: 1.1}} {
		in := demoStroke(4.0)
		in.Gas = gas
		full := run(t, in)
		require.Positive(t, full.PeakTorqueNm, name)
		require.Equal(t, name == "relief", full.Gas.PressureLimited, name)
		in.NoTorque = true
		lean := run(t, in)
		require.Zero(t, lean.PeakTorqueNm, name)
		lean.PeakTorqueNm = full.PeakTorqueNm
		require.Equal(t, full, lean, name)
	}
}
