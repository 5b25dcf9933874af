package setup

import "fmt"

// HistoryLine is one recorded check on one line, as the log listing and
// the screen's history both show it: when, who, the setting, what the
// patient got, and the highest caution.
func HistoryLine(r Record) string {
	line := fmt.Sprintf("%s UTC  %-4s  hole %s, %.1f rpm, dwell %.1f s, PEEP %.0f: %.0f mL %.1f mL/kg, %d caution(s)",
		r.Time.UTC().Format("2006-01-02 15:04"), r.Initials, r.Setting.Hole, r.Setting.RPM, r.Setting.DwellS,
		r.Setting.PEEPCmH2O, r.DeliveredVtML, r.MLPerKg, len(r.Cautions))
	if r.Unexplained() {
		line = fmt.Sprintf("%s UTC  %-4s  hole %s, %.1f rpm, dwell %.1f s, PEEP %.0f: STOP readings unexplained, volume not known, %d caution(s)",
			r.Time.UTC().Format("2006-01-02 15:04"), r.Initials, r.Setting.Hole, r.Setting.RPM, r.Setting.DwellS,
			r.Setting.PEEPCmH2O, len(r.Cautions))
	}
	if len(r.Cautions) > 0 {
		line += ", highest " + LevelWord(Highest(r.Cautions))
	}
	if r.Setting.O2LPerMin > 0 {
		line += fmt.Sprintf("; O2 %.1f L/min", r.Setting.O2LPerMin)
	}
	return line
}

// ProposalLine is a record's proposed setting on one line, or "".
func ProposalLine(r Record) string {
	if r.Proposed == nil {
		return ""
	}
	s := r.Proposed.Setting
	line := fmt.Sprintf("hole %s, %.1f rpm, dwell %.1f s, PEEP %.0f: %.0f mL %.1f mL/kg",
		s.Hole, s.RPM, s.DwellS, s.PEEPCmH2O, r.Proposed.DeliveredVtML, r.Proposed.MLPerKg)
	if s.O2LPerMin > 0 || r.Setting.O2LPerMin > 0 {
		// A step often changes only the O2 bleed: without it the line
		// would read as the setting itself.
		line += fmt.Sprintf("; O2 %.1f L/min", s.O2LPerMin)
	}
	switch r.ProposalFrom {
	case ProposalFromStep, ProposalEnteredAsStep:
		line += " (the protocol's step)"
	}
	return line
}
