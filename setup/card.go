package setup

import (
	"fmt"
	"io"
	"strings"
)

// CardWidth is the widest line of a handover card.
const CardWidth = 80

// WriteCard prints a handover card: plain text, at most 80 columns, for a
// printer or the bedside folder.
func WriteCard(w io.Writer, r Record) error {
	var b strings.Builder
	line := func(format string, args ...any) {
		for _, l := range wrap(fmt.Sprintf(format, args...), CardWidth) {
			b.WriteString(l + "\n")
		}
	}
	rule := strings.Repeat("=", CardWidth)
	b.WriteString(rule + "\n")
	by := r.Initials
	if by == "" {
		by = "(initials not given)"
	}
	line("HANDOVER CARD  bed %s  %s UTC  checked by %s", r.Bed, r.Time.UTC().Format("2006-01-02 15:04"), by)
	line("Machine %s, calibration %s", r.ProfileID, orNone(r.CalibrationDate))
	line("Patient %.0f cm %s, PBW %.1f kg (no name or identifier recorded)", r.HeightCm, r.Sex, r.PBWKg)
	b.WriteString(rule + "\n")
	s := r.Setting
	line("LEAVE THE MACHINE SET TO")
	line("  hole %s   motor %.1f rpm   dwell %.1f s   PEEP valve %.0f cmH2O   O2 %.1f L/min",
		s.Hole, s.RPM, s.DwellS, s.PEEPCmH2O, s.O2LPerMin)
	if r.Readings != nil {
		line("MANOMETER  peak %.1f cmH2O, end of inspiration %.1f cmH2O", r.Readings.PeakCmH2O, r.Readings.EndCmH2O)
	}
	if r.FittedComplianceMLPerCmH2O != nil {
		line("LUNG (fitted)  C %.0f mL/cmH2O, R %.0f cmH2O/(L/s)", *r.FittedComplianceMLPerCmH2O, *r.FittedResistanceCmH2OPerLS)
	} else {
		line("LUNG (assumed)  C %.0f mL/cmH2O, R %.0f cmH2O/(L/s)", r.ComplianceMLPerCmH2O, r.ResistanceCmH2OPerLS)
	}
	if r.FitProblem != "" {
		line("  readings: %s", r.FitProblem)
	}
	f := r.FiguresJSON
	line("THE PATIENT GETS")
	line("  tidal volume %.0f mL = %.1f mL/kg PBW   rate %.1f /min   I:E 1:%.1f", f.DeliveredVtML, f.MLPerKg, f.RateBPM, f.IERatio)
	line("  Ti %.2f s   Te %.2f s   minute ventilation %.1f L/min   peak flow %.0f L/min", f.TiS, f.TeS, f.MinuteVentilationLMin, f.PeakFlowLMin)
	line("  peak %.1f   plateau %.1f   driving %.1f   intrinsic PEEP %.1f cmH2O", f.PeakPressureCmH2O, f.PlateauPressureCmH2O, f.DrivingPressureCmH2O, f.IntrinsicPEEPCmH2O)
	line("  FiO2 %.2f estimated", f.FiO2)
	if f.CylinderMinutes != nil {
		line("  oxygen cylinder: %.0f min left at %.1f L/min", *f.CylinderMinutes, f.O2FlowLMin)
	}
	if len(r.Cautions) == 0 {
		line("CAUTIONS: none")
	} else {
		line("CAUTIONS (%d, highest %s)", len(r.Cautions), LevelWord(Highest(r.Cautions)))
		for _, c := range r.Cautions {
			line("  %s %s", LevelWord(c.Level), c.Message)
		}
	}
	b.WriteString(rule + "\n")
	line("%s", ClinicalCaution)
	_, err := io.WriteString(w, b.String())
	return err
}

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}

// wrap breaks text at spaces into lines of at most width; continuation
// lines are indented by four spaces.
func wrap(text string, width int) []string {
	var out []string
	for len(text) > width {
		cut := strings.LastIndexByte(text[:width], ' ')
		if cut <= 4 {
			cut = width
		}
		out = append(out, strings.TrimRight(text[:cut], " "))
		text = "    " + strings.TrimLeft(text[cut:], " ")
	}
	return append(out, text)
}
