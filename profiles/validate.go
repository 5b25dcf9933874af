package profiles

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"time"
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

func validate(p Profile) []FieldError {
	c := &checker{}
	if p.Format != FormatV1 {
		c.add("format", "%s is not known; this version reads %q", quote(p.Format), FormatV1)
	}
	validText(c, "id", p.ID, maxIDLen, true)
	validText(c, "label", p.Label, maxLabelLen*2, false)
	c.between("cylinder.bore_cm", p.Cylinder.BoreCm, 0, 40, false, "cm")
	c.between("cylinder.ring_friction_n", p.Cylinder.RingFrictionN, 0, 2000, true, "N")
	rodOK := c.between("crank.rod_cm", p.Crank.RodCm, 0, 200, false, "cm")
	offsetOK := c.between("crank.offset_cm", math.Abs(p.Crank.OffsetCm), 0, 50, true, "cm (absolute)")

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
		if c.between(path+".radius_cm", h.RadiusCm, 0, 50, false, "cm") {
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
	c.between("circuit.compliance_ml_per_cmh2o", p.Circuit.ComplianceMLPerCmH2O, 0, 50, false, "mL/cmH2O")
	c.between("circuit.expiratory_resistance_cmh2o_per_l_s", p.Circuit.ExpiratoryResistanceCmH2OPerLS, 0, 200, true, "cmH2O/(L/s)")
	c.between("circuit.relief_cmh2o", p.Circuit.ReliefCmH2O, 0, 120, false, "cmH2O")

	if cal := p.Calibration; cal != nil {
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
	return c.problems
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
	for _, r := range v {
		if r < 0x20 || r == 0x7f {
			c.add(path, "%s holds a control character", quote(v))
			return
		}
		if idLike && !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == '-' || r == '_') {
			c.add(path, "%s may hold only lower-case letters, digits, - and _", quote(v))
			return
		}
	}
}
