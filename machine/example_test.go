package machine_test

import (
	"fmt"

	"crankside/machine"
)

func ExampleSimulateStroke() {
	s := machine.Stroke{Crank: machine.Crank{RadiusCm: 2.4, RodCm: 22}, BoreCm: 10, RPM: 21, Scale: 1}
	r, _ := machine.SimulateStroke(machine.StrokeInput{Stroke: s, Lung: machine.Lung{60, 10}, CircuitMLPerCmH2O: 1.5, PEEPCmH2O: 5})
	fmt.Printf("swept %.0f mL, delivered %.0f mL, peak %.1f cmH2O\n", s.SweptML(), r.DeliveredML, r.PeakCmH2O)
	// Output: swept 377 mL, delivered 368 mL, peak 13.2 cmH2O
}
