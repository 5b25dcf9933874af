package profiles

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"time"
	"unicode/utf8"

	"crankside/profiles/safetext"
)

func sortStrings(s []string) { sort.Strings(s) }

// Limits on what a built machine can plausibly be; values outside are
// almost certainly a typing error (a radius in mm, a bore in m).
const (
	MaxHoles       = 64
	MaxBenchPoints = 200
	maxLabelLen    = 40
	maxIDLen       = 64
)

// requireFields names every required field that is missing. Which motor
// fields are required depends on the motor's kind.
func requireFields(present map[string]bool, p Profile) []FieldError {
	var out []FieldError
	need := func(path string) {
		if !present[path] {
			out = append(out, FieldError{Path: path, Problem: "is missing; it is required"})
		}
	}
	for _, f := range []string{"format", "id", "label", "cylinder", "cylinder.bore_cm", "cylinder.ring_friction_n",
		"crank", "crank.rod_cm", "crank.offset_cm", "crank.holes", "motor", "motor.kind", "motor.rated_torque_nm",
		"controller", "controller.dwell_step_s", "controller.max_dwell_s",
		"circuit", "circuit.compliance_ml_per_cmh2o", "circuit.expiratory_resistance_cmh2o_per_l_s", "circuit.relief_cmh2o"} {
		need(f)
	}
	for i := range p.Crank.Holes {
		need(fmt.Sprintf("crank.holes[%d].label", i))
		need(fmt.Sprintf("crank.holes[%d].radius_cm", i))
	}
	var motorFields, otherFields []string
	switch p.Motor.Kind {
	case MotorVariable:
		motorFields, otherFields = []string{"min_rpm", "max_rpm", "rpm_step"}, []string{"rpm"}
	case MotorFixed:
		motorFields, otherFields = []string{"rpm"}, []string{"min_rpm", "max_rpm", "rpm_step"}
	}
	for _, f := range motorFields {
		need("motor." + f)
	}
	for _, f := range otherFields {
		if present["motor."+f] {
			out = append(out, FieldError{Path: "motor." + f, Problem: fmt.Sprintf("is not used by a %s motor; remove it", p.Motor.Kind)})
		}
	}
	if p.Calibration != nil {
		need("calibration.date")
		need("calibration.points")
		for i := range p.Calibration.Points {
			for _, f := range []string{"hole", "test_lung_compliance_ml_per_cmh2o", "test_lung_resistance_cmh2o_per_l_s", "rpm", "measured_ml"} {
				need(fmt.Sprintf("calibration.points[%d].%s", i, f))
			}
		}
	}
	return out
}

type checker struct{ problems []FieldError }

func (c *checker) add(path, format string, args ...any) {
	c.problems = append(c.problems, FieldError{Path: path, Problem: fmt.Sprintf(format, args...)})
}

// between checks lo < v <= hi (open below when lo is exclusive) and says
// both the value and the allowed range when it is not.
func (c *checker) between(path string, v, lo, hi float64, loInclusive bool, unit string) bool {
	ok := v <= hi && (v > lo || (loInclusive && v == lo))
	if math.IsNaN(v) || math.IsInf(v, 0) || !ok {
		rel := "above"
		if loInclusive {
			rel = "from"
		}
		c.add(path, "%s %s is not allowed; it must be %s %s up to %s %s", num(v), unit, rel, num(lo), num(hi), unit)
		return false
	}
	return true
}

func num(v float64) string { return fmt.Sprintf("%g", v) }

// Plausible ranges of a home-built adult piston unit. They are engineering
// judgement (common practice for such units, no published source): wide
// enough for any unit we can imagine being built, narrow enough that a value
// in the wrong unit (mm for cm, m for cm) or a corrupted number is refused
// rather than planned. Both demos sit well inside them.
const (
	minBoreCm, maxBoreCm                     = 3.0, 30.0  // a 60 mL syringe to a large paint-tin cylinder
	minRodCm, maxRodCm                       = 2.0, 100.0 // the rod must also clear the largest radius
	minRadiusCm, maxRadiusCm                 = 0.2, 20.0  // a hole on a wheel a bench can hold
	maxOffsetCm                              = 20.0       // |e|, either side
	minClearanceCm, maxClearanceCm           = 0.1, 10.0  // the head must sit beyond top dead centre
	maxRingFrictionN                         = 500.0
	minCircuitComplianceML, maxCircuitCompML = 0.1, 10.0 // adult tubing is about 1-3 mL/cmH2O
	maxExpiratoryResistance                  = 50.0      // cmH2O/(L/s), the expiratory and PEEP valves
	minReliefCmH2O, maxReliefCmH2O           = 10.0, 80.0
	maxLeakLMin                              = 30.0 // L/min at 20 cmH2O
	// An oxygen flowmeter: 1 L/min is the least a bleed is set with; 70
	// L/min is a high-flow meter, far beyond a 15 L/min wall meter.
	minMaxO2FlowLMin, maxMaxO2FlowLMin = 1.0, 70.0
)

// plausible checks lo <= v <= hi for a physical size and gives the accepted
// range in the message.
func (c *checker) plausible(path string, v, lo, hi float64, unit string) bool {
	if math.IsNaN(v) || math.IsInf(v, 0) || v < lo || v > hi {
		c.add(path, "%s %s is outside the accepted range %s to %s %s for a home-built adult unit", num(v), unit, num(lo), num(hi), unit)
		return false
	}
	return true
}

func validate(p Profile) []FieldError {
	c := &checker{}
	if formatRank(p.Format) == 0 {
		c.add("format", "%s is not known; this version reads %q, %q and %q", quote(p.Format), FormatV1, FormatV2, FormatV3)
	}
	validText(c, "id", p.ID, maxIDLen, true)
	validText(c, "label", p.Label, maxLabelLen*2, false)
	c.plausible("cylinder.bore_cm", p.Cylinder.BoreCm, minBoreCm, maxBoreCm, "cm")
	c.plausible("cylinder.ring_friction_n", p.Cylinder.RingFrictionN, 0, maxRingFrictionN, "N")
	c.plausible("cylinder.clearance_cm", p.Cylinder.ClearanceCm, minClearanceCm, maxClearanceCm, "cm")
	c.plausible("oxygen.max_flow_l_min", p.Oxygen.MaxFlowLMin, minMaxO2FlowLMin, maxMaxO2FlowLMin, "L/min")
	rodOK := c.plausible("crank.rod_cm", p.Crank.RodCm, minRodCm, maxRodCm, "cm")
	offsetOK := c.plausible("crank.offset_cm", p.Crank.OffsetCm, -maxOffsetCm, maxOffsetCm, "cm")

	switch n := len(p.Crank.Holes); {
	case n == 0:
		c.add("crank.holes", "is empty; a machine needs at least one hole")
	case n > MaxHoles:
		c.add("crank.holes", "has %d holes; at most %d are allowed", n, MaxHoles)
	}
	labels := map[string]int{}
	largest := 0.0
	for i, h := range p.Crank.Holes {
		if i >= MaxHoles {
			break
		}
		path := fmt.Sprintf("crank.holes[%d]", i)
		validText(c, path+".label", h.Label, maxLabelLen, false)
		if j, dup := labels[h.Label]; dup && h.Label != "" {
			c.add(path+".label", "%s is already the label of crank.holes[%d]; labels must differ", quote(h.Label), j)
		}
		labels[h.Label] = i
		if c.plausible(path+".radius_cm", h.RadiusCm, minRadiusCm, maxRadiusCm, "cm") {
			largest = math.Max(largest, h.RadiusCm)
		}
	}
	if rodOK && offsetOK && largest > 0 && p.Crank.RodCm <= largest+math.Abs(p.Crank.OffsetCm) {
		c.add("crank.rod_cm", "%s cm is not longer than the largest radius %s cm plus |offset| %s cm; the rod could not turn the crank",
			num(p.Crank.RodCm), num(largest), num(math.Abs(p.Crank.OffsetCm)))
	}

	m := p.Motor
	switch m.Kind {
	case MotorVariable:
		minOK := c.between("motor.min_rpm", m.MinRPM, 0, 200, false, "rpm")
		maxOK := c.between("motor.max_rpm", m.MaxRPM, 0, 200, false, "rpm")
		if minOK && maxOK && m.MinRPM > m.MaxRPM {
			c.add("motor.min_rpm", "%s rpm is above motor.max_rpm %s rpm; min must not exceed max", num(m.MinRPM), num(m.MaxRPM))
		}
		c.between("motor.rpm_step", m.RPMStep, 0, 50, false, "rpm")
	case MotorFixed:
		c.between("motor.rpm", m.RPM, 0, 200, false, "rpm")
	default:
		c.add("motor.kind", "%s is not known; use %q or %q", quote(m.Kind), MotorVariable, MotorFixed)
	}
	c.between("motor.rated_torque_nm", m.RatedTorqueNm, 0, 1000, false, "N m")
	c.between("controller.dwell_step_s", p.Controller.DwellStepS, 0, 5, false, "s")
	c.between("controller.max_dwell_s", p.Controller.MaxDwellS, 0, 120, true, "s")
	c.plausible("circuit.compliance_ml_per_cmh2o", p.Circuit.ComplianceMLPerCmH2O, minCircuitComplianceML, maxCircuitCompML, "mL/cmH2O")
	c.plausible("circuit.expiratory_resistance_cmh2o_per_l_s", p.Circuit.ExpiratoryResistanceCmH2OPerLS, 0, maxExpiratoryResistance, "cmH2O/(L/s)")
	c.plausible("circuit.relief_cmh2o", p.Circuit.ReliefCmH2O, minReliefCmH2O, maxReliefCmH2O, "cmH2O")
	c.plausible("circuit.leak_l_min_at_20_cmh2o", p.Circuit.LeakLMinAt20CmH2O, 0, maxLeakLMin, "L/min")

	validateCalibration(c, p)
	return c.problems
}

// validateCalibration checks the bench calibration, when there is one.
func validateCalibration(c *checker, p Profile) {
	cal := p.Calibration
	if cal == nil {
		return
	}
	if _, err := time.Parse(time.DateOnly, cal.Date); err != nil {
		c.add("calibration.date", "%s is not a date written YYYY-MM-DD", quote(cal.Date))
	}
	if n := len(cal.Points); n > MaxBenchPoints {
		c.add("calibration.points", "has %d points; at most %d are allowed", n, MaxBenchPoints)
	}
	for i, pt := range cal.Points {
		if i >= MaxBenchPoints {
			break
		}
		path := fmt.Sprintf("calibration.points[%d]", i)
		if _, ok := p.HoleByLabel(pt.Hole); !ok {
			c.add(path+".hole", "%s is not a hole of this profile (holes: %s)", quote(pt.Hole), holeList(p))
		}
		c.between(path+".test_lung_compliance_ml_per_cmh2o", pt.TestLungComplianceMLPerCmH2O, 0, 500, false, "mL/cmH2O")
		c.between(path+".test_lung_resistance_cmh2o_per_l_s", pt.TestLungResistanceCmH2OPerLS, 0, 500, false, "cmH2O/(L/s)")
		if c.between(path+".rpm", pt.RPM, 0, 200, false, "rpm") {
			if why := benchSpeed(pt.RPM, p.Motor); why != "" && (p.Motor.Kind == MotorFixed || p.Motor.Kind == MotorVariable) {
				c.add(path+".rpm", "%s", why)
			}
		}
		c.between(path+".measured_ml", pt.MeasuredML, 0, 5000, false, "mL")
	}
}

func holeList(p Profile) string {
	var l []string
	for i, h := range p.Crank.Holes {
		if i == 12 {
			l = append(l, "...")
			break
		}
		l = append(l, h.Label)
	}
	return strings.Join(l, ", ")
}

func validText(c *checker, path, v string, max int, idLike bool) {
	switch {
	case strings.TrimSpace(v) == "":
		c.add(path, "is empty; it must be set")
		return
	case len(v) > max:
		c.add(path, "is %d characters; at most %d are allowed", len(v), max)
		return
	}
	if r, at, found := safetext.FirstUnsafe(v); found {
		c.add(path, "contains %s %s at position %d; remove it", safetext.Kind(r), codePoint(r), utf8.RuneCountInString(v[:at])+1)
		return
	}
	for _, r := range v {
		if idLike && !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == '-' || r == '_') {
			c.add(path, "%s may hold only lower-case letters, digits, - and _", quote(v))
			return
		}
	}
}

// codePoint writes r as U+200B for a message.
func codePoint(r rune) string { return fmt.Sprintf("U+%04X", r) }
