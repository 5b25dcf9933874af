package setup

import (
	"fmt"
	"io"
	"strings"
	"time"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// HoleGeometry is one hole's geometry and calibrated volume.
type HoleGeometry struct {
	Label            string
	RadiusCm         float64
	StrokeCm         float64
	SweptML          float64
	EffectiveSweptML float64
}

// ProfileSummary is what a therapist reviews about a built machine.
type ProfileSummary struct {
	Profile     profiles.Profile
	Holes       []HoleGeometry
	Calibration CalibrationStatus
	InLine      bool
	// MaxO2FlowLPerMin is the flowmeter's maximum, with where it comes
	// from (the profile, or the default of common practice).
	MaxO2FlowLPerMin physiology.Value
	// Cautions are the profile's own (ProfileCautions): a relief valve
	// above 40 cmH2O, and the calibration's: missing, old, dated ahead,
	// points outside tolerance, too few holes, an implausible k, an
	// effective volume above the geometric one.
	Cautions []Caution
}

// DescribeProfile computes each hole's swept volume and the calibration's
// fit and age as of now.
func DescribeProfile(p profiles.Profile, now time.Time) (ProfileSummary, error) {
	u, err := newUnit(p, now)
	if err != nil {
		return ProfileSummary{}, err
	}
	s := ProfileSummary{Profile: p, Calibration: u.cal, InLine: p.Crank.OffsetCm == 0, Cautions: profileCautions(p, u.cal)}
	hz := hazardsOf(p, "", 0)
	s.MaxO2FlowLPerMin = physiology.Value{Value: hz.maxO2FlowLPerMin, Source: hz.maxO2FlowSource}
	for _, h := range p.Crank.Holes {
		c := u.crank(h)
		swept := machine.SweptVolumeML(p.Cylinder.BoreCm, c)
		s.Holes = append(s.Holes, HoleGeometry{Label: h.Label, RadiusCm: h.RadiusCm, StrokeCm: c.StrokeCm(),
			SweptML: swept, EffectiveSweptML: u.cal.EffectiveSweptML(swept)})
	}
	return s, nil
}

// WriteText prints the summary with units on every number.
func (s ProfileSummary) WriteText(w io.Writer) error {
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
		fmt.Fprintf(&b, "\nCAUTIONS (%d, highest %s)\n", len(s.Cautions), LevelWord(Highest(s.Cautions)))
	}
	for _, c := range s.Cautions {
		fmt.Fprintf(&b, "  %-4s %s: %s; %s [%s]\n", LevelWord(c.Level), c.ID, c.Message, c.Advice, c.Source)
	}
	_, err := io.WriteString(w, b.String())
	return err
}
