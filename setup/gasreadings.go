package setup

import "crankside/physiology"

// GasReadings are the blood gas and oximeter entries of a check and the
// apparatus dead space: one type (physiology's) from the entries to the
// protocol step, the gas cautions, the check's JSON (gas_readings) and the
// record. A nil field was not entered.
type GasReadings = physiology.GasReadings

// roundedGas is the readings as a report prints them, each to 4 decimals.
func roundedGas(g GasReadings) *GasReadings {
	cp := func(v *float64) *float64 {
		if v == nil {
			return nil
		}
		x := r4(*v)
		return &x
	}
	return &GasReadings{SpO2Pct: cp(g.SpO2Pct), PaO2MmHg: cp(g.PaO2MmHg), PH: cp(g.PH), PaCO2MmHg: cp(g.PaCO2MmHg),
		ApparatusDeadSpaceML: cp(g.ApparatusDeadSpaceML)}
}
