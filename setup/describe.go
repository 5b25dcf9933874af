package setup

import (
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
