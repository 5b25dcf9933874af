package report

import (
	"crankside/setup"
	"fmt"
	"io"
	"strings"
	"time"
)

// Sheet is one page for the bed, at most CardWidth columns: the unit, the
// setting to dial, what to time to confirm it, the watch band, the alarm
// limits, what to do when a reading leaves the band, the power-cut
// rhythm, the checklist and the clinical caution; with a log, the bed's
// last record and when the next check is due. It is built from a plan or
// a check and holds no figure of its own.
type Sheet struct {
	From     string // "plan" or "check"
	Unit     string // the profile's id and label
	Bed      string // "" when none was given
	Patient  string
	Setting  setup.Setting
	Cautions []setup.Caution
	Timing   setup.TimingCheck
	// Watch is nil when no band is given (a stop, or readings no lung
	// explains); WhyNone then says why.
	Watch    *setup.WatchJSON
	WhyNone  string
	Inferred string // what a stopwatch check inferred
	// Unexplained is the check's fit problem, "" when the readings (if
	// any) are explained.
	Unexplained string
	// Schedule is the bed's last record and the next check due, when a
	// log was read or written (nil: no log).
	Schedule *setup.Schedule
	Printed  time.Time
}

// PlanSheet is the plan's bedside sheet, printed at now.
func PlanSheet(pl setup.Plan, now time.Time) Sheet {
	return Sheet{From: "plan", Unit: pl.ProfileID + " (" + pl.ProfileLabel + ")",
		Patient:  fmt.Sprintf("%.0f cm %s, PBW %.1f kg (no name or identifier)", pl.Patient.HeightCm, pl.Patient.Sex, pl.PBWKg),
		Setting:  setup.Setting{Hole: pl.Hole.Label, RPM: pl.Timing.RPM, DwellS: pl.Timing.DwellS, PEEPCmH2O: pl.PEEPCmH2O, O2LPerMin: pl.O2FlowLPerMin},
		Cautions: pl.Cautions, Timing: pl.TimingCheck.JSON(), Watch: pl.WatchToSet(), WhyNone: WhyNoWatch(false), Printed: now}
}

// CheckSheet is the check's bedside sheet for its current setting, printed at
// now; unit is the profile's label, bed the bed's label or "".
func CheckSheet(ck setup.Check, unit, bed string, now time.Time) Sheet {
	j := ck.JSON()
	return Sheet{From: "check", Unit: ck.ProfileID + " (" + unit + ")", Bed: bed,
		Patient: fmt.Sprintf("%.0f cm %s, PBW %.1f kg (no name or identifier)", ck.Patient.HeightCm, ck.Patient.Sex, ck.PBWKg),
		Setting: ck.Current.Setting, Cautions: ck.Current.Cautions, Timing: ck.TimingCheck.JSON(),
		Watch: checkWatchToSet(j), WhyNone: WhyNoWatch(ck.Unexplained()), Inferred: ck.Inferred, Unexplained: ck.FitProblem, Printed: now}
}

// Write prints the sheet.
func (s Sheet) Write(w io.Writer) error {
	rw := &reportWriter{width: CardWidth}
	rule := strings.Repeat("=", CardWidth)
	rw.line("%s", rule)
	rw.line("BEDSIDE SHEET  unit %s", s.Unit)
	bed := "bed not given"
	if s.Bed != "" {
		bed = "bed " + s.Bed
	}
	rw.line("%s; patient %s", bed, s.Patient)
	rw.line("From a %s, printed %s", s.From, setup.LocalDateTime(s.Printed))
	rw.line("%s", rule)
	s.settingPart(rw)
	s.watchPart(rw)
	if len(s.Cautions) == 0 {
		rw.line("CAUTIONS: none")
	} else {
		rw.line("CAUTIONS (%d, highest %s)", len(s.Cautions), setup.LevelWord(setup.Highest(s.Cautions)))
		for _, c := range s.Cautions {
			rw.line("  %-4s %s: %s", setup.LevelWord(c.Level), c.ID, c.Message)
		}
	}
	rw.line("BEDSIDE CHECKLIST")
	for _, l := range ChecklistLines(s.Watch) {
		rw.line("  %s", l)
	}
	s.schedulePart(rw)
	rw.line("%s", rule)
	rw.line("%s", setup.ClinicalCaution)
	_, err := io.WriteString(w, rw.b.String())
	return err
}

// settingPart is the setting under a heading that never tells a person to
// set a setting with a stop, and what to time to confirm it.
func (s Sheet) settingPart(rw *reportWriter) {
	if s.Unexplained != "" {
		rw.line("%s", UnexplainedLine(s.Unexplained))
	}
	if st := setup.FirstStop(s.Cautions); st != nil {
		rw.line("%s; %s", StopLine(s.Cautions), st.Advice)
	}
	rw.line("%s", SettingHeading(s.Cautions, "SET THE MACHINE TO"))
	var parts []string
	for _, r := range SettingRows(s.Setting, nil) {
		text := strings.TrimSpace(r.Now + " " + r.Unit)
		label := r.Label
		m := s.Setting.Measured
		switch {
		case r.ID == "o2_flow_l_min" && s.Setting.O2LPerMin <= 0:
			text = "none (room air)"
		case r.ID == "motor_rpm" && m != nil && m.TurnS != nil:
			label, text = "One turn", plain(*m.TurnS)+" s (timed)"
		case r.ID == "dwell_s" && m != nil && m.PauseS != nil:
			label, text = "Pause", plain(*m.PauseS)+" s (timed)"
		case r.ID == "dwell_s" && m != nil && m.BreathsPerMin != nil:
			text = fmt.Sprintf("%.2f s (from %s breaths/min counted)", s.Setting.DwellS, plain(*m.BreathsPerMin))
		}
		parts = append(parts, label+" "+text)
	}
	rw.line("  %s", strings.Join(parts, "; "))
	if s.Inferred != "" {
		rw.line("  %s", s.Inferred)
	}
	if setup.FirstStop(s.Cautions) != nil {
		rw.line("WHAT THIS SETTING TIMES AT (for reference only: it is not to be used)")
	} else {
		rw.line("TO CONFIRM IT, TIME IT")
	}
	rw.line("  %s", TimingLine(s.Timing))
}

// watchPart is the band, the alarm limits, what to do out of the band,
// and the power-cut rhythm; none of them for a setting not to be used.
func (s Sheet) watchPart(rw *reportWriter) {
	w := s.Watch
	if w == nil {
		rw.line("WATCH THE MANOMETER: no band and no alarm limits: %s", s.WhyNone)
		rw.line("IF THE POWER FAILS: bag the patient at the rate the responsible clinician sets (no rhythm is given for a setting not to be used)")
		return
	}
	basis := "on the assumed lung"
	if w.LungFitted {
		basis = "on the lung fitted to the readings"
	}
	rw.line("WATCH THE MANOMETER (%s)", basis)
	rw.line("  Peak                %s-%s cmH2O (predicted %.1f)", plain(w.ExpectedPeakCmH2O[0]), plain(w.ExpectedPeakCmH2O[1]), w.PredictedPeakCmH2O)
	rw.line("  End of inspiration  %s-%s cmH2O (predicted %.1f)", plain(w.ExpectedEndCmH2O[0]), plain(w.ExpectedEndCmH2O[1]), w.PredictedEndCmH2O)
	rw.line("  band: %s", w.BandRule)
	rw.line("SET THE EXTERNAL PRESSURE ALARM")
	rw.line("  HIGH %s cmH2O: %s", plain(w.AlarmHighCmH2O), w.AlarmHighRule)
	rw.line("  LOW / disconnection %s cmH2O: %s", plain(w.AlarmLowCmH2O), w.AlarmLowRule)
	for _, n := range w.Notes {
		rw.line("  NOTE  %s", n)
	}
	rw.line("IF A READING LEAVES THE BAND")
	rw.line("  %s", OutOfBandAdvice)
	rw.line("IF THE POWER FAILS")
	rw.line("  Turn the wheel by hand: one turn in %.2f s, then pause %.2f s (%.1f breaths/min)", w.HandTurn.TurnS, w.HandTurn.PauseS, w.HandTurn.BreathsPerMin)
	rw.line("  or bag at %.0f breaths/min (%s)", w.BagRateBPM, w.BagRateSource)
}

// schedulePart is the bed's last record and the next check due.
func (s Sheet) schedulePart(rw *reportWriter) {
	sc := s.Schedule
	if sc == nil {
		return
	}
	rw.line("CHECKS (every %g h: %s)", sc.Every.Hours(), sc.Source)
	due, ok := sc.Due()
	if !ok {
		rw.line("  no check of bed %s is recorded in %s: check now", s.Bed, sc.Log)
		return
	}
	rw.line("  last recorded %s; next check due %s", setup.LocalDateTime(*sc.Last), setup.LocalDateTime(due))
	if !due.After(s.Printed) {
		rw.line("  OVERDUE: the next check was due %s", setup.LocalDateTime(due))
	}
}

// DueLine is the bed's time since its last record and when the next check
// is due, for a status line: "B4 checked 1 h 20 min ago, next due 19:10
// UTC", "B4 OVERDUE: checked 5 h 10 min ago (every 4 h)", or "B4: no check
// in the log". last nil means no record; every 0 means DefaultCheckEvery.
func DueLine(bed string, last *time.Time, every time.Duration, now time.Time) string {
	if every <= 0 {
		every = setup.DefaultCheckEvery
	}
	if last == nil {
		return bed + ": no check in the log"
	}
	ago := agoText(now.Sub(*last))
	due := last.Add(every)
	if !now.Before(due) {
		return fmt.Sprintf("%s OVERDUE: checked %s ago (every %g h)", bed, ago, every.Hours())
	}
	return fmt.Sprintf("%s checked %s ago, next due %s", bed, ago, setup.LocalClock(due))
}

// agoText is a duration as a person says it: "35 min", "1 h 20 min".
func agoText(d time.Duration) string {
	if d < 0 {
		d = 0
	}
	m := int(d.Minutes())
	if m < 60 {
		return fmt.Sprintf("%d min", m)
	}
	return fmt.Sprintf("%d h %d min", m/60, m%60)
}
