package setup

import "crankside/physiology"

// The blood gas and oximeter entries of a check, each optional. Their
// hints say which goal of the ARDS Network protocol each serves.

// gas reads the gas entries; each one outside its plausible range is a
// problem of its own field.
func (r *entryReader) gas() GasReadings {
	var g GasReadings
	for _, e := range []struct {
		name string
		dst  **float64
	}{{"spo2", &g.SpO2Pct}, {"pao2", &g.PaO2MmHg}, {"ph", &g.PH}, {"paco2", &g.PaCO2MmHg}, {"dead-space-ml", &g.ApparatusDeadSpaceML}} {
		if v, ok := r.number(e.name); ok {
			*e.dst = &v
		}
	}
	for _, p := range CheckGasEntries(g) {
		if r.problems.Field(p.Field) == nil {
			r.problems = append(r.problems, p)
		}
	}
	return g
}

// gasHint is the hint of a gas entry, or "" for another entry.
func gasHint(name string) string {
	switch name {
	case "spo2":
		return "optional: oxygenation goal 88-95 % (ARDS Network protocol)"
	case "pao2":
		return "optional: oxygenation goal 55-80 mmHg (ARDS Network protocol); decides over SpO2"
	case "ph":
		return "optional: pH goal 7.30-7.45 (ARDS Network protocol); the rate step needs PaCO2 too"
	case "paco2":
		return "optional: with pH, for the new rate (Henderson-Hasselbalch, bicarbonate held)"
	case "dead-space-ml":
		return "blank: 0 mL apparatus assumed; tube, filter and connectors, for the rate step"
	}
	return ""
}

// GasGoal is the goal a gas entry serves, short enough for a column beside
// the field ("88-95 %"), or "" for another entry.
func GasGoal(name string) string {
	switch name {
	case "spo2":
		return physiology.PlainNumber(physiology.SpO2GoalLowPct) + "-" + physiology.PlainNumber(physiology.SpO2GoalHighPct) + " %"
	case "pao2":
		return physiology.PlainNumber(physiology.PaO2GoalLowMmHg) + "-" + physiology.PlainNumber(physiology.PaO2GoalHighMmHg) + " mmHg"
	case "ph":
		return "7.30-7.45"
	case "paco2":
		return "for the rate"
	}
	return ""
}
