package setup

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
	if l := GasGoalLine(name); l != "" {
		return "optional: " + l
	}
	return ""
}

// GasGoalLine is the goal a gas entry serves and the rule that reads it,
// short enough for one line beside a form, or "" for another entry.
func GasGoalLine(name string) string {
	switch name {
	case "spo2":
		return "oxygenation goal SpO2 88-95 % (ARDS Network protocol)"
	case "pao2":
		return "oxygenation goal PaO2 55-80 mmHg (ARDS Network); decides over SpO2"
	case "ph":
		return "pH goal 7.30-7.45 (ARDS Network protocol); the rate step needs PaCO2"
	case "paco2":
		return "with pH: the new rate holds the bicarbonate (Henderson-Hasselbalch)"
	case "dead-space-ml":
		return "apparatus dead space (tube, filter, connectors); blank: 0 mL assumed"
	}
	return ""
}
