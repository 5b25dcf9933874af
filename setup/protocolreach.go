package setup

import (
	"fmt"
	"math"
	"sort"

	"crankside/machine"
	"crankside/physiology"
)

// What the protocol's step becomes on a machine that cannot make it: the
// best reachable setting, with a warn that names what it could not do and
// the protocol's next lever, and one rate in the text (wanted, then what
// this machine sets).

// stepTimingChanges are the machine's changes to the step's timing, with
// the rate wanted as the protocol's step gave it: one wanted rate, one set.
func (res *ProtocolStepResult) stepTimingChanges() []Change {
	cs := timingChanges(*res.Timing)
	for i := range cs {
		if cs[i].What == "rate" {
			cs[i].Wanted = res.Step.RateBPM
		}
	}
	if math.Abs(res.Timing.RateBPM-res.Step.RateBPM) > 0.05 && !hasChange(cs, "rate") {
		cs = append(cs, Change{What: "rate", Wanted: res.Step.RateBPM, Got: res.Timing.RateBPM, Unit: "/min"})
	}
	return cs
}

func hasChange(cs []Change, what string) bool {
	for _, c := range cs {
		if c.What == what {
			return true
		}
	}
	return false
}

// bestReachable turns the rate-unreachable stop of the step's own setting
// into a warn: the step is then this machine's best reachable setting,
// and the caution says what it could not do and the protocol's next lever.
// A rate the person proposed by hand keeps its stop.
func (res *ProtocolStepResult) bestReachable(cs []Caution) []Caution {
	tp := res.Timing
	if tp == nil || (tp.Rate != machine.TooFast && tp.Rate != machine.TooSlow) {
		return cs
	}
	for i, c := range cs {
		if c.ID != CautionRateUnreachable {
			continue
		}
		what := "fastest"
		if tp.Rate == machine.TooSlow {
			what = "slowest"
		}
		cs[i] = Caution{ID: CautionProtocolRateNotReached, Level: Warn, Value: res.Step.RateBPM, Limit: tp.RateBPM, Unit: "/min",
			Message: fmt.Sprintf("the protocol's rate %.1f /min cannot be reached on this machine: its %s, %.1f /min, is set here as the best it can do", res.Step.RateBPM, what, tp.RateBPM),
			Advice:  res.nextLever(), Source: cautionRule(CautionProtocolRateNotReached).Source}
	}
	sort.SliceStable(cs, func(i, j int) bool { return cs[i].Level > cs[j].Level })
	return cs
}

// nextLever is what the protocol does next when the rate it wants is out
// of this machine's reach.
func (res *ProtocolStepResult) nextLever() string {
	pH := res.Readings.PH
	switch {
	case pH != nil && *pH < physiology.PHSevere-1e-9:
		return "the protocol's next lever below pH 7.15 is Vt up in 1 mL/kg steps (the plateau goal of 30 may then be exceeded); the clinician decides, and whether another ventilator is needed"
	case pH != nil && *pH < physiology.PHGoalLow:
		return "the protocol has no further rate step on this machine; below pH 7.15 its next lever is Vt up in 1 mL/kg steps; call the clinician"
	}
	return "the protocol has no other lever for this: the clinician decides"
}
