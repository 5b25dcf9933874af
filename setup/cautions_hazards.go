package setup

import (
	"fmt"
	"math"
	"strings"

	"crankside/physiology"
	"crankside/profiles"
)

// Hazards of an improvised unit that it cannot see itself: a patient
// breathing against it, oxygen beyond the flowmeter, a cylinder run to its
// reserve, no hole that suits a small patient, and the advice that suits
// an obstructive lung. assess calls each through a small hook.

const (
	// NoSuitableHolePct: the nearest hole more than a fifth off the target
	// volume delivers another tidal volume, not the one asked for
	// (common practice).
	NoSuitableHolePct = 20.0
	// DefaultCylinderReserveBar is the pressure at which a cylinder is
	// changed: about a fifth of a full 200-bar cylinder (common practice;
	// let the ward set it with --cylinder-reserve-bar).
	DefaultCylinderReserveBar = 40.0
	// CylinderReserveMinBar and CylinderReserveMaxBar bound an entered
	// reserve: half a full cylinder is far more than any ward keeps.
	CylinderReserveMinBar = 1.0
	CylinderReserveMaxBar = 150.0
)

const (
	srcPassive        = srcCommon + ": a unit that cannot sense a breath needs a passive patient (sedation as prescribed)"
	srcFlowmeter      = srcCommon + ": ordinary wall and cylinder flowmeters top out at 15 L/min"
	srcCylinderResv   = srcCommon + ": change a cylinder before empty; a reserve of about a fifth of a full cylinder is usual"
	srcNoSuitableHole = srcCommon + " (more than 20 % off the target); " + srcARDSNet + " (4-8 mL/kg PBW)"
	srcDefaultReserve = "common practice: about a fifth of a full 200-bar cylinder; let the ward set it"
)

// hazards are what assess needs beyond the figures to judge the hazards.
// Their zero values keep the cautions of a setting with no such hazard.
type hazards struct {
	lung             physiology.Lung // 0: not known (normal advice)
	breathingAgainst bool            // the patient breathes against the unit
	// maxO2FlowLPerMin is the flowmeter's maximum (0: not judged), with
	// where it comes from.
	maxO2FlowLPerMin float64
	maxO2FlowSource  string
	// noSmallerHole: the setting's hole is this machine's smallest.
	noSmallerHole bool
	// smallestHoleMLPerKg is what the smallest hole gives (0: not known,
	// as in a check, where only the hole in use is simulated).
	smallestHoleMLPerKg float64
	smallestHoleLabel   string
}

// hazardsOf fills what the profile says: its flowmeter and whether hole
// is its smallest (the swept volume grows with the radius).
func hazardsOf(p profiles.Profile, hole string, lung physiology.Lung) hazards {
	h := hazards{lung: lung, maxO2FlowLPerMin: p.Oxygen.MaxFlowLMin, maxO2FlowSource: srcProfile + " (oxygen.max_flow_l_min)"}
	if p.Defaulted("oxygen.max_flow_l_min") || h.maxO2FlowLPerMin == 0 {
		h.maxO2FlowLPerMin = profiles.DefaultMaxO2FlowLMin
		h.maxO2FlowSource = srcFlowmeter + " (default: the profile does not give oxygen.max_flow_l_min)"
	}
	if cur, ok := p.HoleByLabel(hole); ok {
		h.noSmallerHole = true
		for _, o := range p.Crank.Holes {
			if o.RadiusCm < cur.RadiusCm {
				h.noSmallerHole = false
			}
		}
	}
	return h
}

// patientTriggeringCaution is the stop for a patient breathing against the
// unit: it cannot follow the patient's breaths.
func patientTriggeringCaution(a assessment) []Caution {
	if !a.hz.breathingAgainst {
		return nil
	}
	return []Caution{{ID: CautionPatientTriggering, Level: Stop, Unit: "",
		Message: "the patient is breathing against the unit: it cannot follow the patient's breaths, and the readings are not valid",
		Advice:  "call the clinician now about sedation or another ventilator; meanwhile ventilate by bag if the patient is distressed",
		Source:  cautionRule(CautionPatientTriggering).Source}}
}

// o2FlowCautions judge the oxygen bleed against the flowmeter's maximum:
// above it the FiO2 shown is not reached, and the caution says what the
// maximum flow reaches.
func o2FlowCautions(a assessment) []Caution {
	f, max := a.f, a.hz.maxO2FlowLPerMin
	if !(max > 0) || !(f.O2FlowLPerMin > max+1e-9) {
		return nil
	}
	reached := physiology.FiO2FromPistonIntake(max, f.Hole.EffectiveSweptML, f.Timing.RateBPM)
	return []Caution{{ID: CautionO2FlowAboveFlowmeter, Level: Stop, Value: f.O2FlowLPerMin, Limit: max, Unit: "L/min",
		Message: fmt.Sprintf("the O2 bleed %.1f L/min for FiO2 %.2f is above the flowmeter's maximum %.0f L/min: at %.0f L/min the FiO2 reaches only %.2f",
			f.O2FlowLPerMin, f.FiO2, max, max, reached),
		Advice: fmt.Sprintf("do not plan on FiO2 %.2f: accept FiO2 %.2f at %.0f L/min, or a smaller hole or lower rate (the piston draws less), or a second oxygen supply; the clinician decides",
			f.FiO2, reached, max),
		Source: a.hz.maxO2FlowSource}}
}

// cylinderCautions: the cylinder's time to its reserve under two hours, and
// what happens at empty.
func cylinderCautions(a assessment) []Caution {
	f := a.f
	r, l, ok := judged(CautionO2CylinderLow, f.CylinderMinutes)
	if !f.CylinderGiven || !ok {
		return nil
	}
	empty := fmt.Sprintf("empty in %.0f min, and then FiO2 falls to 0.21 with no alarm", f.CylinderEmptyMinutes)
	msg := fmt.Sprintf("oxygen cylinder reaches its reserve of %.0f bar in %.0f min at %.1f L/min (under %.0f hours); %s",
		f.CylinderReserveBar, f.CylinderMinutes, f.O2FlowLPerMin, l.Value/60, empty)
	if f.CylinderMinutes <= 0 {
		msg = fmt.Sprintf("oxygen cylinder is at or below its reserve of %.0f bar; at %.1f L/min it is %s", f.CylinderReserveBar, f.O2FlowLPerMin, empty)
	}
	return []Caution{r.caution(l, f.CylinderMinutes, msg, "arrange a full cylinder now and change it at the reserve; watch the FiO2 and SpO2")}
}

// applyCylinderReserve sets the cylinder's time to its reserve (the time
// shown and judged) beside its time to empty.
func applyCylinderReserve(f *Figures, cylL, cylBar, reserveBar float64) {
	f.CylinderReserveBar = reserveBar
	f.CylinderEmptyMinutes = f.CylinderMinutes
	if !f.CylinderGiven || math.IsInf(f.CylinderMinutes, 0) {
		return
	}
	f.CylinderMinutes = physiology.CylinderMinutesLeft(cylL, math.Max(0, cylBar-reserveBar), f.O2FlowLPerMin)
}

// holeCautions: no hole that suits the patient (stop), or the nearest
// hole more than 10 % off the target (warn).
func holeCautions(a assessment) []Caution {
	hz := a.hz
	none := cautionRule(CautionNoSuitableHole)
	// The table's two limits: the nearest hole's distance from the
	// target, and what the smallest hole gives.
	offLimit, smallest := none.Limits[0], none.Limits[1]
	if smallest.crossed(hz.smallestHoleMLPerKg) {
		return []Caution{none.caution(smallest, hz.smallestHoleMLPerKg, fmt.Sprintf("the smallest hole (%s) gives %.1f mL/kg PBW, above %.0f: no hole of this machine suits this patient",
			hz.smallestHoleLabel, hz.smallestHoleMLPerKg, smallest.Value),
			"do not use this machine for this patient: a ventilator that can give 4-8 mL/kg PBW is needed")}
	}
	if !(a.targetMLPerK > 0) {
		return nil
	}
	off := math.Abs(a.offTargetPct)
	if offLimit.crossed(off) {
		return []Caution{none.caution(offLimit, a.offTargetPct, fmt.Sprintf("the nearest hole delivers %+.0f%% off the target volume (more than %.0f%%): no hole of this machine suits this patient", a.offTargetPct, offLimit.Value),
			"do not use this setting: review the target with the clinician, or use another ventilator")}
	}
	if r, l, ok := judged(CautionHoleOffTarget, off); ok {
		return []Caution{r.caution(l, a.offTargetPct, fmt.Sprintf("the nearest hole delivers %+.0f%% off the target volume (more than %.0f%%)", a.offTargetPct, l.Value),
			"no hole on this machine is closer; review the target")}
	}
	return nil
}

// heightCaution: below 152.4 cm the PBW formula is extrapolated, and both
// it and this unit are for adults.
func heightCaution(a assessment) []Caution {
	r, l, ok := judged(CautionHeightBelowFormula, a.heightCm)
	if !ok {
		return nil
	}
	return []Caution{r.caution(l, a.heightCm, fmt.Sprintf("height %.1f cm is below %.1f cm (60 in): the PBW formula and this unit are for adults; PBW is extrapolated", a.heightCm, l.Value),
		"a child or a very short adult needs settings and a ventilator made for them; check PBW against local tables")}
}

// smallerHoleAdvice is the advice of a high tidal volume: a smaller hole
// when the machine has one.
func smallerHoleAdvice(a assessment, stop bool) string {
	switch {
	case a.hz.noSmallerHole && stop:
		return "do not use: this is the machine's smallest hole; use another ventilator"
	case a.hz.noSmallerHole:
		return "lung-protective range is 4-8 mL/kg; this is the machine's smallest hole: review the target with the clinician"
	case stop:
		return "use a smaller hole"
	}
	return "lung-protective range is 4-8 mL/kg; consider a smaller hole"
}

// lowVentilationAdvice is the advice for a low minute ventilation, fitting
// the lung: an obstructive lung needs time to exhale, so a faster rate
// traps gas.
func lowVentilationAdvice(a assessment) string {
	if a.hz.lung == physiology.Obstructive {
		return "for an obstructive lung accept a higher PaCO2 while the pH allows (check blood gas) and watch intrinsic PEEP; keep the rate low and expiration long (a faster rate traps gas)"
	}
	return "expect CO2 to rise: raise the rate or the volume; check blood gas"
}

// ParseYesNo reads a yes/no entry: yes, y, true or no, n, false, in any
// case.
func ParseYesNo(s string) (bool, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "yes", "y", "true":
		return true, nil
	case "no", "n", "false":
		return false, nil
	}
	return false, fmt.Errorf("%s is not yes or no (y/n)", physiology.Quote(s))
}

// yesNo reads an optional yes/no entry; def when blank.
func (r *entryReader) yesNo(name string, def bool) bool {
	if !r.given(name) {
		return def
	}
	v, err := ParseYesNo(r.text(name))
	if err != nil {
		r.fail(name, err.Error())
		return def
	}
	return v
}

// cylinderReserve reads the reserve a cylinder's time runs to.
func (r *entryReader) cylinderReserve() float64 {
	v, ok := r.number("cylinder-reserve-bar")
	if !ok {
		return 0
	}
	if err := checkRange("cylinder-reserve-bar", "cylinder reserve", v, CylinderReserveMinBar, CylinderReserveMaxBar, "bar"); err != nil {
		r.problems = append(r.problems, err.(*InputError))
	}
	return v
}

// resolveReserve is the reserve entered, or the default with its source.
func resolveReserve(bar float64) (physiology.Value, error) {
	if bar == 0 {
		return physiology.Value{Value: DefaultCylinderReserveBar, Source: srcDefaultReserve}, nil
	}
	if err := checkRange("cylinder-reserve-bar", "cylinder reserve", bar, CylinderReserveMinBar, CylinderReserveMaxBar, "bar"); err != nil {
		return physiology.Value{}, err
	}
	return physiology.Value{Value: bar, Source: entered}, nil
}

// planHazards are a plan's hazards: the profile's, with the smallest hole's
// volume for this patient.
func planHazards(p profiles.Profile, pl Plan, r resolved) hazards {
	hz := hazardsOf(p, pl.Hole.Label, r.lung)
	for i, h := range pl.Holes {
		if i == 0 || h.MLPerKg < hz.smallestHoleMLPerKg {
			hz.smallestHoleMLPerKg, hz.smallestHoleLabel = h.MLPerKg, h.Label
		}
	}
	return hz
}

// checkHazards are the hazards of a setting s at a check.
func checkHazards(u unit, s Setting, req CheckRequest) hazards {
	hz := hazardsOf(u.p, s.Hole, req.Lung)
	hz.breathingAgainst = req.BreathingAgainst
	return hz
}

// BreathingAgainstQuestion is the handover's question behind the
// breathing-against entry.
const BreathingAgainstQuestion = "is the patient breathing against the unit?"
