package setup

import (
	"errors"
	"math"
	"time"
)

// Pacer is a setting's rhythm for a person who turns the wheel by hand or
// squeezes a bag when the motor stops: one turn, then a pause, again and
// again. Its phase at a moment comes from the clock (At), never from a
// count of frames, so a slow screen does not drift it.
type Pacer struct {
	TurnS  float64 // one turn of the wheel, s
	PauseS float64 // the pause after it (the dwell), s
	TiS    float64 // the delivery part of the turn: a bag is squeezed for this long
	// Setting says which setting the rhythm is, in words.
	Setting string
}

// Phase names of the pacing rhythm.
const (
	PhaseTurn  = "TURN"
	PhasePause = "PAUSE"
)

// PaceState is the rhythm at one moment.
type PaceState struct {
	Phase  string  // PhaseTurn or PhasePause
	LeftS  float64 // seconds left in this phase
	Breath int     // the breath under way, counted from 1 at the start
}

// ErrNoPacing is why a setting with a stop gets no rhythm: a person should
// not keep a patient on a setting that is not to be used.
var ErrNoPacing = errors.New("setup: no rhythm is given for a setting with a stop: bag at the rate the responsible clinician sets")

// Pacer is the plan's rhythm; a plan with a stop has none.
func (pl Plan) Pacer() (Pacer, error) {
	if FirstStop(pl.Cautions) != nil {
		return Pacer{}, ErrNoPacing
	}
	return pacerOf(pl.Figures), nil
}

// Pacer is the check's current rhythm; a check with a stop (readings no
// lung explains among them) has none.
func (ck Check) Pacer() (Pacer, error) {
	if FirstStop(ck.Current.Cautions) != nil {
		return Pacer{}, ErrNoPacing
	}
	return pacerOf(ck.Current.Figures), nil
}

func pacerOf(f Figures) Pacer {
	t := f.Timing
	return Pacer{TurnS: t.TurnS, PauseS: t.DwellS, TiS: t.TiS,
		Setting: "hole " + f.Hole.Label + ", " + plain(math.Round(t.RPM*100)/100) + " rpm, dwell " + plain(math.Round(t.DwellS*100)/100) + " s"}
}

// At is the rhythm at now for a count started at start: breath n begins
// at start + (n-1) x (turn + pause), turns for TurnS, then pauses. A now
// before start is the start.
func (p Pacer) At(start, now time.Time) PaceState {
	period := p.TurnS + p.PauseS
	if period <= 0 {
		return PaceState{Phase: PhaseTurn, Breath: 1}
	}
	elapsed := math.Max(now.Sub(start).Seconds(), 0)
	n := math.Floor(elapsed / period)
	within := elapsed - n*period
	st := PaceState{Breath: int(n) + 1}
	if within < p.TurnS {
		st.Phase, st.LeftS = PhaseTurn, p.TurnS-within
	} else {
		st.Phase, st.LeftS = PhasePause, period-within
	}
	return st
}

// PerMinute is the rhythm's breaths per minute.
func (p Pacer) PerMinute() float64 { return 60 / (p.TurnS + p.PauseS) }
