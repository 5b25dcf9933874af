package report

import (
	"crankside/setup"
	"fmt"
	"strings"
)

// TimingLine is what to time, in one sentence: "one turn 2.86 s, then a
// pause of 1.40 s; 14 breaths in one minute (14.1 /min); 10 breaths take
// 42.6 s".
func TimingLine(t setup.TimingCheck) string {
	return fmt.Sprintf("one turn %.2f s, then a pause of %.2f s; %.0f breaths in one minute (%.1f /min); 10 breaths take %.1f s",
		t.TurnS, t.PauseS, t.BreathsIn60S, t.BreathsIn60S, t.SecondsFor10Breaths)
}

// BandLines are the watch band in words, one line each: the two bands,
// the two alarm limits, each with its rule.
func BandLines(j setup.WatchJSON) []string {
	out := []string{
		fmt.Sprintf("Peak on the gauge   %s-%s cmH2O (predicted %.1f)", plain(j.ExpectedPeakCmH2O[0]), plain(j.ExpectedPeakCmH2O[1]), j.PredictedPeakCmH2O),
		fmt.Sprintf("End of inspiration  %s-%s cmH2O (predicted %.1f)", plain(j.ExpectedEndCmH2O[0]), plain(j.ExpectedEndCmH2O[1]), j.PredictedEndCmH2O),
		"  band: " + j.BandRule,
		fmt.Sprintf("Alarm HIGH pressure %s cmH2O: %s", plain(j.AlarmHighCmH2O), j.AlarmHighRule),
		fmt.Sprintf("Alarm LOW pressure / disconnection %s cmH2O: %s", plain(j.AlarmLowCmH2O), j.AlarmLowRule),
	}
	for _, n := range j.Notes {
		out = append(out, "NOTE  "+n)
	}
	return out
}

// PowerCutLine is the rhythm to keep if the motor stops.
func PowerCutLine(j setup.WatchJSON) string {
	return fmt.Sprintf("If the power fails: turn the wheel by hand, one turn in %.2f s, then pause %.2f s (%.1f breaths/min); or bag at %.0f breaths/min",
		j.HandTurn.TurnS, j.HandTurn.PauseS, j.HandTurn.BreathsPerMin, j.BagRateBPM)
}

// OutOfBandAdvice is what to do when a reading leaves the band.
const OutOfBandAdvice = "A reading outside the band, or any alarm: look at the patient first, then the circuit (disconnection, kinks, secretions, the PEEP valve), then do a check with both readings; bag the patient if in doubt (common practice)."

// WatchLine is one line of the watch section for a screen: a heading or
// an indented line.
type WatchLine struct {
	Heading bool
	Text    string
}

// PlanWatchLines are the plan's watch section (what to time, the band, the
// alarm limits, the power-cut rhythm, the checklist) as a screen shows it.
func PlanWatchLines(pl setup.Plan) []WatchLine {
	rw := &reportWriter{}
	rw.watchSection(pl.WatchToSet(), pl.TimingCheck.JSON(), WhyNoWatch(false))
	var out []WatchLine
	for _, l := range strings.Split(strings.TrimRight(rw.b.String(), "\n"), "\n") {
		out = append(out, WatchLine{Heading: !strings.HasPrefix(l, " "), Text: strings.TrimSpace(l)})
	}
	return out
}

// watchSection prints what to time, the watch band, the alarm limits, the
// power-cut rhythm and the checklist; w nil (a stop, or readings no lung
// explains) gives no band and no limits, and says why.
func (rw *reportWriter) watchSection(w *setup.WatchJSON, t setup.TimingCheck, whyNone string) {
	rw.line("TO CONFIRM BY STOPWATCH  %s", TimingLine(t))
	if w == nil {
		rw.line("WATCH AT THE BED: no band and no alarm limits are given: %s", whyNone)
	} else {
		basis := "on the assumed lung: after the first minutes, do a check with both readings"
		if w.LungFitted {
			basis = "on the lung fitted to the readings"
		}
		rw.line("WATCH AT THE BED (the manometer between checks; %s)", basis)
		for _, l := range BandLines(*w) {
			rw.line("  %s", l)
		}
		rw.line("  %s", OutOfBandAdvice)
		rw.line("  %s", PowerCutLine(*w))
	}
	rw.line("BEDSIDE CHECKLIST")
	for _, l := range ChecklistLines(w) {
		rw.line("  %s", l)
	}
}

// WhyNoWatch says why a plan or check gives no watch band: readings no
// lung explains, or else a stop.
func WhyNoWatch(unexplained bool) string {
	if unexplained {
		return "no lung explains the readings; re-take both readings once the patient and the circuit are checked"
	}
	return "this setting has a stop and is not to be used"
}

// ChecklistLines are the checklist as lines of text, each with its source.
func ChecklistLines(w *setup.WatchJSON) []string {
	var out []string
	for _, it := range setup.Checklist(w) {
		out = append(out, fmt.Sprintf("[ ] %s [%s]", it.Text, it.Source))
	}
	return out
}
