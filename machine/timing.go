package machine

import (
	"errors"
	"fmt"
	"math"
)

// Motor is the wheel's drive. A fixed-speed motor has MinRPM = MaxRPM and
// StepRPM = 0. A variable motor runs at MinRPM + k StepRPM up to MaxRPM.
type Motor struct {
	MinRPM, MaxRPM, StepRPM float64
}

// FixedMotor is a motor with one speed.
func FixedMotor(rpm float64) Motor { return Motor{MinRPM: rpm, MaxRPM: rpm} }

// Fixed reports whether the motor has one speed.
func (m Motor) Fixed() bool { return m.StepRPM == 0 || m.MinRPM == m.MaxRPM }

// TopRPM is the fastest speed on the motor's step.
func (m Motor) TopRPM() float64 {
	if m.Fixed() {
		return m.MinRPM
	}
	k := math.Floor((m.MaxRPM-m.MinRPM)/m.StepRPM + 1e-9)
	return clean(m.MinRPM + k*m.StepRPM)
}

// Nearest is the settable speed nearest rpm, inside the range.
func (m Motor) Nearest(rpm float64) float64 {
	if m.Fixed() || rpm <= m.MinRPM {
		return m.MinRPM
	}
	if top := m.TopRPM(); rpm >= top {
		return top
	}
	return clean(m.MinRPM + math.Round((rpm-m.MinRPM)/m.StepRPM)*m.StepRPM)
}

// Settable reports whether rpm is one of the motor's speeds.
func (m Motor) Settable(rpm float64) bool {
	if m.Fixed() {
		return math.Abs(rpm-m.MinRPM) < 1e-9
	}
	if rpm < m.MinRPM-1e-9 || rpm > m.TopRPM()+1e-9 {
		return false
	}
	k := (rpm - m.MinRPM) / m.StepRPM
	return math.Abs(k-math.Round(k)) < 1e-6
}

// Controller is the dwell timer after each turn.
type Controller struct {
	DwellStepS float64
	MaxDwellS  float64
}

// MaxSettableDwellS is the longest dwell on the controller's step.
func (c Controller) MaxSettableDwellS() float64 {
	return clean(math.Floor(c.MaxDwellS/c.DwellStepS+1e-9) * c.DwellStepS)
}

// Settable reports whether a dwell is on the controller's step and range.
func (c Controller) Settable(dwellS float64) bool {
	if dwellS < -1e-9 || dwellS > c.MaxSettableDwellS()+1e-9 {
		return false
	}
	k := dwellS / c.DwellStepS
	return math.Abs(k-math.Round(k)) < 1e-6
}

// Timing is what one setting of speed and dwell does.
type Timing struct {
	RPM     float64
	DwellS  float64
	TurnS   float64 // one turn of the wheel
	TiS     float64 // the delivery part of the turn
	TeS     float64 // the rest of the breath: the refill part of the turn (half of it in-line) plus the dwell
	PeriodS float64
	RateBPM float64
	IE      float64 // E of 1:E, Te/Ti
}

// TimingOf is the timing of a speed and dwell for a crank whose delivery
// spans deliveryAngle radians.
func TimingOf(rpm, dwellS, deliveryAngle float64) Timing {
	turn := 60 / rpm
	ti := turn * deliveryAngle / (2 * math.Pi)
	period := turn + dwellS
	return Timing{
		RPM: rpm, DwellS: dwellS, TurnS: turn, TiS: ti, TeS: period - ti,
		PeriodS: period, RateBPM: 60 / period, IE: (period - ti) / ti,
	}
}

// Reach says how far the wanted timing could be met.
type Reach int

const (
	// Reached: the motor and controller can be set to it, up to their steps.
	Reached Reach = iota
	// SpeedLimited: the wanted Ti needs a speed outside the motor's range;
	// the nearest speed is used and Ti (and so I:E) differ.
	SpeedLimited
	// TooFast: even the fastest turn with no dwell is longer than the
	// wanted breath period.
	TooFast
	// TooSlow: the dwell needed is longer than the controller's maximum.
	TooSlow
)

// TimingPlan is a wanted rate and I:E turned into a settable timing.
type TimingPlan struct {
	Timing
	WantedRateBPM float64
	WantedIE      float64
	WantedTiS     float64
	WantedRPM     float64
	WantedDwellS  float64
	// Speed is SpeedLimited when the wanted speed was outside the motor's
	// range, otherwise Reached. Rate is TooFast or TooSlow when the breath
	// period cannot be reached at all, otherwise Reached.
	Speed, Rate Reach
	// Raised is true when the speed was raised above the nearest step
	// because the nearest would not leave a non-negative dwell.
	Raised bool
}

// ErrTiming is returned (wrapped) for a rate or I:E that is not a number
// the timing can use.
var ErrTiming = errors.New("machine: timing")

// PlanTiming turns a rate (breaths/min) and I:E (E of 1:E, at least 1) into
// the speed and dwell this motor and controller can really be set to, and
// the rate, Ti, Te and I:E they give.
func PlanTiming(m Motor, c Controller, deliveryAngle, rateBPM, ie float64) (TimingPlan, error) {
	if !(rateBPM > 0) || math.IsInf(rateBPM, 0) {
		return TimingPlan{}, fmt.Errorf("%w: rate %v must be positive", ErrTiming, rateBPM)
	}
	if !(ie >= 1) || math.IsInf(ie, 0) {
		return TimingPlan{}, fmt.Errorf("%w: I:E 1:%v must have E of at least 1", ErrTiming, ie)
	}
	if !(m.MinRPM > 0) || m.MaxRPM < m.MinRPM || m.StepRPM < 0 || !(c.DwellStepS > 0) || c.MaxDwellS < 0 {
		return TimingPlan{}, fmt.Errorf("%w: motor %+v or controller %+v is not usable", ErrTiming, m, c)
	}
	period := 60 / rateBPM
	ti := period / (1 + ie)
	turnW := ti * 2 * math.Pi / deliveryAngle
	tp := TimingPlan{WantedRateBPM: rateBPM, WantedIE: ie, WantedTiS: ti, WantedRPM: 60 / turnW}

	rpm := m.Nearest(tp.WantedRPM)
	const tol = 1e-9
	if tp.WantedRPM < m.MinRPM*(1-tol) || tp.WantedRPM > m.TopRPM()*(1+tol) {
		tp.Speed = SpeedLimited
	}
	if 60/rpm > period+tol {
		// A faster speed may still fit the period with no dwell.
		faster := m.fastestAtMost(period)
		switch {
		case faster == 0:
			tp.Rate = TooFast
			rpm = m.TopRPM()
		case faster != rpm:
			rpm, tp.Raised = faster, true
		}
	}
	tp.WantedDwellS = math.Max(0, period-60/rpm)
	dwell := clean(math.Round(tp.WantedDwellS/c.DwellStepS) * c.DwellStepS)
	if max := c.MaxSettableDwellS(); dwell > max {
		dwell, tp.Rate = max, TooSlow
	}
	tp.Timing = TimingOf(rpm, dwell, deliveryAngle)
	return tp, nil
}

// fastestAtMost returns the slowest settable speed whose turn fits in
// period seconds, or 0 if none does.
func (m Motor) fastestAtMost(period float64) float64 {
	need := 60 / period
	if m.Fixed() {
		if m.MinRPM >= need*(1-1e-12) {
			return m.MinRPM
		}
		return 0
	}
	if m.TopRPM() < need*(1-1e-12) {
		return 0
	}
	if need <= m.MinRPM {
		return m.MinRPM
	}
	return clean(m.MinRPM + math.Ceil((need-m.MinRPM)/m.StepRPM-1e-9)*m.StepRPM)
}

// clean removes the float noise of adding steps (8 + 0.1 x 3).
func clean(v float64) float64 { return math.Round(v*1e9) / 1e9 }
