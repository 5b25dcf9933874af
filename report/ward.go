package report

import (
	"crankside/logbook"
	"crankside/setup"
	"fmt"
)

// WardLine is one ward row as text for a terminal: bed, last check and its
// age, the setting found (each number with its unit), mL/kg or, for
// readings no lung explains, the first stop the readings raised, the
// highest caution, whether a change was proposed (": STOP" when the
// proposal has a stop), and OVERDUE when it is.
func WardLine(r logbook.WardRow) string {
	level := "no cautions"
	if r.HighestLevel != 0 {
		level = setup.LevelWord(r.HighestLevel)
	}
	age := fmt.Sprintf("%.0f min ago", r.AgeMinutes)
	switch {
	case r.AgeMinutes < 0:
		age = "IN THE FUTURE: check this terminal's clock"
	case r.AgeMinutes >= 120:
		age = fmt.Sprintf("%.1f h ago", r.AgeMinutes/60)
	}
	when := setup.LocalShort(r.CheckedAt)
	if r.AgeMinutes < -logbook.FutureSkew.Minutes() {
		when = setup.LocalDateTime(r.CheckedAt) // its year: 2099 must not read as this year
	}
	line := fmt.Sprintf("%-8s %s (%s)  %s %s", r.Bed, when, age, r.ProfileID,
		SettingText(setup.Setting{Hole: r.Hole, RPM: r.MotorRPM, DwellS: r.DwellS, PEEPCmH2O: r.PEEPCmH2O}))
	switch {
	case r.Record.Unexplained() && r.HighestLevel == setup.Stop:
		// The level first, then which stop: an over-pressure and a
		// disconnection must not read the same.
		line += ": STOP readings unexplained"
		if why := UnexplainedReason(r.Record.Cautions); why != "" {
			line += " (" + why + ")"
		}
	case r.Record.Unexplained() || r.MLPerKg == nil:
		line += ": readings unexplained, " + level
	default:
		line += fmt.Sprintf(": %s%.1f mL/kg, %s", setup.AtMost(r.Record.CheckJSON), *r.MLPerKg, level)
	}
	if r.Proposed {
		line += ", change proposed"
		if p := r.Record.Proposed; p != nil && setup.Highest(p.Cautions) == setup.Stop {
			line += ": STOP"
		}
	}
	if g := setup.GasRecordText(r.Record); g != "" {
		line += "; " + g
	}
	if r.Overdue {
		line += "  OVERDUE"
	}
	if r.Conflict != "" {
		line += "  " + r.Conflict
	}
	if !r.FutureAt.IsZero() && !r.FutureAt.Equal(r.CheckedAt) {
		line += fmt.Sprintf("  (a record dated %s, in the future, from %s: check that terminal's clock)", setup.LocalDateTime(r.FutureAt), r.FutureLog)
	}
	return line
}
