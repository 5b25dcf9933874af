package setup

import (
	"fmt"
	"math"
	"strings"
)

// A unit with no speed display is checked with a stopwatch: one turn of
// the wheel timed (turn-s) gives the motor speed, 60 / turn; the pause
// after it timed (pause-s) is the dwell, or the breaths counted in a
// minute (breaths-per-min) give it as 60 / count - turn. What was measured
// is evaluated as measured: a timed turn never lands on the motor's step,
// and rounding it to the step would put a figure the person did not see in
// place of one they did. The check therefore runs at the measured speed
// and dwell, refuses only what no stopwatch error explains (a speed or
// dwell beyond the machine's range by more than StopwatchTolerancePct),
// and says what it inferred and which dial step is nearest.

// StopwatchTolerancePct is how far outside the motor's speed range (or
// the controller's dwell range) a timed value may fall and still be taken
// as this machine with a stopwatch's error: a hand-held stopwatch is good
// to about 0.2 s, some 5-10 % of a turn of 2-4 s (common practice).
const StopwatchTolerancePct = 10.0

// Stopwatch entry ranges: a turn of 0.5-30 s (120 to 2 rpm) and a pause
// of 0-30 s cover any unit of this kind; 4-60 breaths counted in a minute.
const (
	TurnSMin, TurnSMax                 = 0.5, 30.0
	PauseSMax                          = 30.0
	BreathsPerMinMin, BreathsPerMinMax = 4.0, 60.0
)

// MeasuredTiming is what was timed or counted at the bed in place of the
// speed and dwell dials; nil fields were not measured.
type MeasuredTiming struct {
	TurnS         *float64 `json:"turn_s,omitempty"`
	PauseS        *float64 `json:"pause_s,omitempty"`
	BreathsPerMin *float64 `json:"breaths_per_min,omitempty"`
}

// speedTimed and dwellTimed say which of the setting's values came from a
// stopwatch.
func (m *MeasuredTiming) speedTimed() bool { return m != nil && m.TurnS != nil }
func (m *MeasuredTiming) dwellTimed() bool {
	return m != nil && (m.PauseS != nil || m.BreathsPerMin != nil)
}

// keepOnly drops what a proposal replaced: its own speed or dwell is
// dialled, not timed.
func (m *MeasuredTiming) keepOnly(speed, dwell bool) *MeasuredTiming {
	if m == nil {
		return nil
	}
	out := *m
	if !speed {
		out.TurnS = nil
	}
	if !dwell {
		out.PauseS, out.BreathsPerMin = nil, nil
	}
	if out.TurnS == nil && out.PauseS == nil && out.BreathsPerMin == nil {
		return nil
	}
	return &out
}

// timing reads the speed and dwell: dialled (rpm, dwell-s) or timed
// (turn-s, pause-s, breaths-per-min), one way each.
func (r *entryReader) timing(s *Setting) {
	var m MeasuredTiming
	switch {
	case r.given("rpm") && r.given("turn-s"):
		r.fail("turn-s", "give the motor speed one way: rpm (read on the dial) or turn-s (one turn timed), not both")
	case r.given("turn-s"):
		if v, ok := r.number("turn-s"); ok && r.inRange("turn-s", "one turn", v, TurnSMin, TurnSMax, "s") {
			m.TurnS = &v
			s.RPM = 60 / v
		}
	case r.given("rpm"):
		s.RPM, _ = r.number("rpm")
	default:
		r.missing("rpm", "required: the motor speed set, or one turn timed with a stopwatch (turn-s)")
	}
	given := 0
	for _, n := range []string{"dwell-s", "pause-s", "breaths-per-min"} {
		if r.given(n) {
			given++
		}
	}
	switch {
	case given > 1:
		r.fail("pause-s", "give the dwell one way: dwell-s (set), pause-s (timed) or breaths-per-min (counted), not two")
	case r.given("pause-s"):
		if v, ok := r.number("pause-s"); ok && r.inRange("pause-s", "the pause", v, 0, PauseSMax, "s") {
			m.PauseS = &v
			s.DwellS = v
		}
	case r.given("breaths-per-min"):
		r.fromCount(s, &m)
	case r.given("dwell-s"):
		s.DwellS, _ = r.number("dwell-s")
	default:
		r.missing("dwell-s", "required: the dwell set, or the pause timed (pause-s), or the breaths counted in a minute (breaths-per-min)")
	}
	if m.TurnS != nil || m.PauseS != nil || m.BreathsPerMin != nil {
		s.Measured = &m
	}
}

// fromCount infers the dwell from breaths counted in a minute and the
// turn: one breath lasts 60 / count, the turn takes its part.
func (r *entryReader) fromCount(s *Setting, m *MeasuredTiming) {
	v, ok := r.number("breaths-per-min")
	if !ok || !r.inRange("breaths-per-min", "breaths counted", v, BreathsPerMinMin, BreathsPerMinMax, "/min") {
		return
	}
	if s.RPM <= 0 {
		r.fail("breaths-per-min", "needs the turn: time one turn (turn-s) or give the motor speed (rpm)")
		return
	}
	turn := 60 / s.RPM
	breath := 60 / v
	if breath < turn {
		r.fail("breaths-per-min", fmt.Sprintf("%s breaths/min is one breath every %.2f s, shorter than the turn of %.2f s: re-count for a whole minute, or re-time the turn",
			plain(v), breath, turn))
		return
	}
	m.BreathsPerMin = &v
	s.DwellS = breath - turn
}

// inRange marks a value outside [lo, hi] as a problem of its field.
func (r *entryReader) inRange(name, what string, v, lo, hi float64, unit string) bool {
	if err := checkRange(name, what, v, lo, hi, unit); err != nil {
		if r.problems.Field(name) == nil {
			r.problems = append(r.problems, err.(*InputError))
		}
		return false
	}
	return true
}

// checkTimed refuses a timed speed or dwell that no stopwatch error
// explains on this machine; a dialled one must be on the step (checkSetting).
func checkTimed(u unit, s Setting, prefix string) error {
	m := s.Measured
	tol := 1 + StopwatchTolerancePct/100
	if m.speedTimed() {
		lo, hi := u.motor.MinRPM, u.motor.TopRPM()
		if s.RPM < lo/tol || s.RPM > hi*tol {
			return &InputError{Field: prefix + "turn-s", Reason: fmt.Sprintf("one turn in %s s is %.2f rpm, outside this motor's %s-%s rpm by more than a stopwatch's %s %%: re-time one turn (or several, and divide)",
				plain(*m.TurnS), s.RPM, plain(lo), plain(hi), plain(StopwatchTolerancePct))}
		}
	}
	if m.dwellTimed() {
		field := prefix + "pause-s"
		if m.BreathsPerMin != nil {
			field = prefix + "breaths-per-min"
		}
		if max := u.controller.MaxSettableDwellS(); s.DwellS > max*tol {
			return &InputError{Field: field, Reason: fmt.Sprintf("a pause of %.2f s is longer than this controller's %s s by more than a stopwatch's %s %%: re-time it",
				s.DwellS, plain(max), plain(StopwatchTolerancePct))}
		}
	}
	return nil
}

// inferredLine says what a stopwatch check inferred, with the measured
// values as entered and the nearest dial steps; "" when nothing was timed.
func inferredLine(u unit, s Setting) string {
	m := s.Measured
	if m == nil {
		return ""
	}
	var parts []string
	if m.TurnS != nil {
		parts = append(parts, fmt.Sprintf("motor speed %.3f rpm from one turn timed at %s s (nearest motor step %s rpm)",
			s.RPM, plain(*m.TurnS), plain(u.motor.Nearest(s.RPM))))
	}
	nearestDwell := math.Round(s.DwellS/u.controller.DwellStepS) * u.controller.DwellStepS
	switch {
	case m.PauseS != nil:
		parts = append(parts, fmt.Sprintf("dwell %s s, the pause as timed (nearest controller step %s s)", plain(*m.PauseS), plain(clean4(nearestDwell))))
	case m.BreathsPerMin != nil:
		parts = append(parts, fmt.Sprintf("dwell %.3f s from %s breaths counted in a minute less the turn (nearest controller step %s s)",
			s.DwellS, plain(*m.BreathsPerMin), plain(clean4(nearestDwell))))
	}
	return "TIMED AT THE BED: " + strings.Join(parts, "; ") + ". Nothing measured was rounded: the check runs at these values."
}
