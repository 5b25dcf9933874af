package report

import (
	"crankside/setup"
	"fmt"
)

// HistoryLine is one recorded check on one line, as the log listing and
// the screen's history both show it: when, who, the setting, what the
// patient got, and the highest caution. Every number carries its unit.
func HistoryLine(r setup.Record) string {
	who := r.Initials
	if r.SecondInitials != "" {
		who += "+" + r.SecondInitials
	}
	head := fmt.Sprintf("%s  %-4s  %s", setup.LocalDateTime(r.Time), who, SettingText(r.Setting))
	var line string
	if lung := r.LungFiguresJSON; lung != nil {
		line = fmt.Sprintf("%s: %s%.0f mL %.1f mL/kg, %d caution(s)", head, setup.AtMost(r.CheckJSON), lung.DeliveredVtML, lung.MLPerKg, len(r.Cautions))
	} else {
		line = fmt.Sprintf("%s: STOP readings unexplained, volume not known, %d caution(s)", head, len(r.Cautions))
	}
	if len(r.Cautions) > 0 {
		line += ", highest " + setup.LevelWord(setup.Highest(r.Cautions))
	}
	if r.Setting.O2LPerMin > 0 {
		line += fmt.Sprintf("; O2 %.1f L/min", r.Setting.O2LPerMin)
	}
	if g := setup.GasRecordText(r); g != "" {
		line += "; " + g
	}
	return line
}

// SettingText is a setting's hole, speed, dwell and PEEP valve, each
// number with its unit.
func SettingText(s setup.Setting) string {
	return fmt.Sprintf("hole %s, %.1f rpm, dwell %.1f s, PEEP %.0f cmH2O", s.Hole, s.RPM, s.DwellS, s.PEEPCmH2O)
}

// ProposalLine is a record's proposed setting on one line, or "": its
// figures, its highest caution, and whether it rests on the assumed lung
// because the record's readings are unexplained.
func ProposalLine(r setup.Record) string {
	if r.Proposed == nil {
		return ""
	}
	s := r.Proposed.Setting
	line := SettingText(s) + ": figures not known"
	if lung := r.Proposed.LungFiguresJSON; lung != nil {
		line = fmt.Sprintf("%s: %.0f mL %.1f mL/kg", SettingText(s), lung.DeliveredVtML, lung.MLPerKg)
	}
	if len(r.Proposed.Cautions) > 0 {
		line += ", highest " + setup.LevelWord(setup.Highest(r.Proposed.Cautions))
	}
	if s.O2LPerMin > 0 || r.Setting.O2LPerMin > 0 {
		// A step often changes only the O2 bleed: without it the line
		// would read as the setting itself.
		line += fmt.Sprintf("; O2 %.1f L/min", s.O2LPerMin)
	}
	if r.Unexplained() {
		line += " (ASSUMED lung: readings unexplained)"
	}
	switch r.ProposalFrom {
	case setup.ProposalFromStep, setup.ProposalEnteredAsStep:
		line += " (the protocol's step)"
	}
	return line
}

// UnexplainedReason is the short reason a record's readings are
// unexplained, for a ward line: the first stop the readings themselves
// raised, in a few words with its reading ("peak 120 cmH2O above 40"), or
// "" when only the unexplained stop was raised.
func UnexplainedReason(cs []setup.Caution) string {
	for _, c := range cs {
		if c.Level != setup.Stop || c.ID == setup.CautionReadingsUnexplained {
			continue
		}
		switch c.ID {
		case setup.CautionMeasuredPeakHigh, setup.CautionMeasuredPeakAboveRelief, setup.CautionMeasuredEndAtOrBelowPEEP,
			setup.CautionMeasuredPeakBelowEnd, setup.CautionReadingsNotNumbers:
			r, _ := setup.CautionRuleOf(c.ID)
			return r.Ward(c)
		}
		return string(c.ID)
	}
	return ""
}
