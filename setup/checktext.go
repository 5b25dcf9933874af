package setup

import (
	"fmt"
	"io"
	"strings"
)

// WriteText prints a check for a person: the setting, the lung used, the
// figures (beside a proposed change's, with the difference), and the
// cautions of each.
func (ck Check) WriteText(w io.Writer) error {
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("crankside check on %s: %.0f cm %s, PBW %.1f kg\n", ck.ProfileID, ck.Patient.HeightCm, ck.Patient.Sex, ck.PBWKg)
	cur := ck.Current.Setting
	if ck.Proposed == nil {
		p("Setting   hole %s, motor %.1f rpm, dwell %.1f s, PEEP valve %.0f cmH2O, O2 %.1f L/min\n",
			cur.Hole, cur.RPM, cur.DwellS, cur.PEEPCmH2O, cur.O2LPerMin)
	} else {
		n := ck.Proposed.Setting
		p("%-22s %12s %12s\n", "SETTING", "now", "proposed")
		p("%-22s %12s %12s\n", "hole", cur.Hole, n.Hole)
		p("%-22s %12.1f %12.1f\n", "motor speed (rpm)", cur.RPM, n.RPM)
		p("%-22s %12.1f %12.1f\n", "dwell (s)", cur.DwellS, n.DwellS)
		p("%-22s %12.0f %12.0f\n", "PEEP valve (cmH2O)", cur.PEEPCmH2O, n.PEEPCmH2O)
	}
	if ck.Readings != nil {
		p("Manometer peak %.1f cmH2O, end of inspiration %.1f cmH2O\n", ck.Readings.PeakCmH2O, ck.Readings.EndCmH2O)
	}
	p("Lung      C %.1f mL/cmH2O, R %.1f cmH2O/(L/s) (%s)\n", ck.Mechanics.Value, ck.Resistance.Value, ck.Mechanics.Source)
	if ck.FitProblem != "" {
		p("READINGS  %s\n", ck.FitProblem)
	}
	if ck.Proposed == nil {
		f := ck.Current.Figures
		p("\nTHE PATIENT GETS\n")
		p("  Tidal volume  %.0f mL = %.1f mL/kg PBW\n", f.Hole.DeliveredML, f.Hole.MLPerKg)
		p("  Rate          %.1f /min, Ti %.2f s, Te %.2f s, I:E 1:%.1f\n", f.Timing.RateBPM, f.Timing.TiS, f.Timing.TeS, f.Timing.IE)
		p("  Minute vent.  %.1f L/min, peak flow %.0f L/min\n", f.MinuteVentLPerMin, f.PeakFlowLPerMin)
		p("  Pressures     peak %.1f, end of inspiration %.1f, plateau %.1f, driving %.1f cmH2O\n", f.PeakCmH2O, f.EndInspCmH2O, f.PlateauCmH2O, f.DrivingCmH2O)
		p("  Trapped gas   %.0f mL, intrinsic PEEP %.1f cmH2O\n", f.TrappedML, f.IntrinsicPEEPCmH2O)
		p("  FiO2          %.2f estimated\n", f.FiO2)
		if f.CylinderGiven {
			p("  O2 cylinder   %.0f min left\n", f.CylinderMinutes)
		}
		p("  Crank torque  %.2f N m peak, %.0f%% of the motor's rating\n", f.PeakTorqueNm, 100*f.TorqueShareOfRating)
		writeCautions(&b, ck.Current.Cautions)
	} else {
		p("\n%-34s %10s %10s %10s\n", "FIGURE", "now", "proposed", "change")
		for _, d := range ck.Differences {
			label := d.What
			if d.Unit != "" {
				label += " (" + d.Unit + ")"
			}
			p("%-34s %10.2f %10.2f %+10.2f\n", label, d.Current, d.Proposed, d.Change)
		}
		p("\nNOW")
		writeCautionList(&b, ck.Current.Cautions)
		p("PROPOSED")
		writeCautionList(&b, ck.Proposed.Cautions)
		p("\n%s\n", ClinicalCaution)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

func writeCautionList(b *strings.Builder, cs []Caution) {
	if len(cs) == 0 {
		b.WriteString(": no cautions\n")
		return
	}
	fmt.Fprintf(b, ": %d caution(s), highest %s\n", len(cs), LevelWord(Highest(cs)))
	for _, c := range cs {
		fmt.Fprintf(b, "  %-4s %s: %s\n", LevelWord(c.Level), c.ID, c.Message)
	}
}
