package report

import (
	"crankside/setup"
	"fmt"
	"io"
	"strings"
)

// ProfileText prints the summary with units on every number.
func ProfileText(w io.Writer, s setup.ProfileSummary) error {
	var b strings.Builder
	p := s.Profile
	fmt.Fprintf(&b, "%s\n", p.Label)
	crank := "in-line"
	if !s.InLine {
		crank = fmt.Sprintf("offset %.2f cm", p.Crank.OffsetCm)
	}
	fmt.Fprintf(&b, "Cylinder    bore %.2f cm, ring friction %.0f N\n", p.Cylinder.BoreCm, p.Cylinder.RingFrictionN)
	fmt.Fprintf(&b, "Crank       rod %.1f cm, %s, %d holes\n", p.Crank.RodCm, crank, len(p.Crank.Holes))
	if p.Motor.Fixed() {
		fmt.Fprintf(&b, "Motor       fixed speed %.1f rpm, rated %.1f N m\n", p.Motor.RPM, p.Motor.RatedTorqueNm)
	} else {
		fmt.Fprintf(&b, "Motor       %.1f-%.1f rpm in %.2f rpm steps, rated %.1f N m\n", p.Motor.MinRPM, p.Motor.MaxRPM, p.Motor.RPMStep, p.Motor.RatedTorqueNm)
	}
	fmt.Fprintf(&b, "Controller  dwell in %.2f s steps up to %.1f s\n", p.Controller.DwellStepS, p.Controller.MaxDwellS)
	fmt.Fprintf(&b, "Circuit     compliance %.2f mL/cmH2O, expiratory valve %.1f cmH2O/(L/s), relief %.0f cmH2O, leak %.2f L/min at 20 cmH2O\n",
		p.Circuit.ComplianceMLPerCmH2O, p.Circuit.ExpiratoryResistanceCmH2OPerLS, p.Circuit.ReliefCmH2O, p.Circuit.LeakLMinAt20CmH2O)
	fmt.Fprintf(&b, "Oxygen      flowmeter up to %.1f L/min (%s)\n", s.MaxO2FlowLPerMin.Value, s.MaxO2FlowLPerMin.Source)
	c := s.Calibration
	switch {
	case c.Fit == nil && c.Date == "":
		fmt.Fprintf(&b, "Calibration NONE: volumes are geometric (k 1, b 0 mL)\n")
	case c.Fit == nil:
		fmt.Fprintf(&b, "Calibration dated %s but has no bench points: volumes are geometric\n", c.Date)
	case c.AgeDays < 0:
		// The calibration-future caution below says what to do.
		fmt.Fprintf(&b, "Calibration %s (WARN: dated in the future), k %.4f, b %.1f mL, %d points on %d holes\n", c.Date, c.K, c.BML, c.Points, c.Holes)
	default:
		fmt.Fprintf(&b, "Calibration %s (%d days old), k %.4f, b %.1f mL, %d points on %d holes\n", c.Date, c.AgeDays, c.K, c.BML, c.Points, c.Holes)
	}
	fmt.Fprintf(&b, "\n  %-6s %10s %10s %10s %12s\n", "hole", "radius cm", "stroke cm", "swept mL", "calibr. mL")
	for _, h := range s.Holes {
		fmt.Fprintf(&b, "  %-6s %10.2f %10.2f %10.1f %12.1f\n", h.Label, h.RadiusCm, h.StrokeCm, h.SweptML, h.EffectiveSweptML)
	}
	if len(s.Cautions) > 0 {
		fmt.Fprintf(&b, "\nCAUTIONS (%d, highest %s)\n", len(s.Cautions), setup.LevelWord(setup.Highest(s.Cautions)))
	}
	for _, c := range s.Cautions {
		fmt.Fprintf(&b, "  %-4s %s: %s; %s [%s]\n", setup.LevelWord(c.Level), c.ID, c.Message, c.Advice, c.Source)
	}
	_, err := io.WriteString(w, b.String())
	return err
}
