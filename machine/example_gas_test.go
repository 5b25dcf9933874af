package machine_test

import (
	"fmt"

	"crankside/machine"
)

// A version 2 stroke on an invented unit: room air at 22 C and 50 % (BTPS
// factor 1.105 from physiology.BTPSFactor), the head 1 cm beyond the
// largest hole's top dead centre, a leak of 2 L/min at 20 cmH2O and a
// 40 cmH2O relief valve. One Simulator serves every stroke of a plan.
func ExampleSimulator() {
	var sim machine.Simulator
	largest := machine.Crank{RadiusCm: 6.2, RodCm: 22}
	in := machine.StrokeInput{
		Stroke: machine.Stroke{Crank: machine.Crank{RadiusCm: 2.4, RodCm: 22}, BoreCm: 10, RPM: 21, Scale: 1},
		Lung:   machine.Lung{ComplianceMLPerCmH2O: 60, ResistanceCmH2OPerLS: 10}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 5,
		Gas: machine.GasPath{BTPSFactor: 1.105, HeadPositionCm: machine.CylinderHeadCm(largest, 1),
			LeakLPerMinAt20CmH2O: 2, ReliefCmH2O: 40},
	}
	r, _ := sim.SimulateStroke(in)
	fmt.Printf("delivered %.0f mL at BTPS (%.0f mL of room air), peak %.1f cmH2O\n", r.DeliveredML, r.Gas.DeliveredRoomML, r.PeakCmH2O)
	fmt.Printf("cylinder gas %.1f mL, leak %.1f mL, vented %.1f mL\n", r.Gas.CompressionLossML, r.Gas.LeakedML, r.Gas.ReliefVentedML)
	// Output:
	// delivered 370 mL at BTPS (335 mL of room air), peak 13.1 cmH2O
	// cylinder gas 8.0 mL, leak 24.4 mL, vented 0.0 mL
}
