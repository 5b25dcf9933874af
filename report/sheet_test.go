package report_test

import (
	"bytes"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

func sheetText(t *testing.T, s report.Sheet) string {
	t.Helper()
	var b bytes.Buffer
	require.NoError(t, s.Write(&b))
	return b.String()
}

// requireFits80: every line of the sheet fits 80 columns (issue 23), at
// most report.CardWidth, and none is cut short.
func requireFits80(t *testing.T, text string) {
	t.Helper()
	for _, l := range strings.Split(text, "\n") {
		require.LessOrEqual(t, len([]rune(l)), 80, "line too wide: %q", l)
		require.LessOrEqual(t, len([]rune(l)), report.CardWidth, "line too wide: %q", l)
		require.False(t, strings.HasSuffix(l, "…"), l)
	}
}

// TestSheetCarriesEverySection: the plan's sheet for the 175 cm man on
// demo-a carries every section issue 23 lists, with the figures the watch
// band's rules give (derived in watch_internal_test.go: peak 14.5 -> 12-17,
// alarms 24 and 10), and fits 80 columns.
func TestSheetCarriesEverySection(t *testing.T) {
	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male}, Now: today}, profile(t, "demo-a"))
	require.NoError(t, err)
	last := today.Add(-90 * time.Minute)
	sh := report.PlanSheet(pl, today)
	sh.Bed = "B4"
	sh.Schedule = &setup.Schedule{Log: "ward.jsonl", Last: &last, Every: 4 * time.Hour, Source: "entered"}
	text := sheetText(t, sh)
	requireFits80(t, text)
	for _, want := range []string{
		"BEDSIDE SHEET  unit demo-a", "bed B4",
		"SET THE MACHINE TO", "Hole 7; Motor speed 21.0 rpm; Dwell 1.4 s; PEEP valve 5 cmH2O",
		"TO CONFIRM IT, TIME IT", "one turn 2.86 s, then a pause of 1.40 s",
		"WATCH THE MANOMETER", "Peak                12-17 cmH2O",
		"SET THE EXTERNAL PRESSURE ALARM", "HIGH 24 cmH2O", "LOW / disconnection 10 cmH2O",
		"IF A READING LEAVES THE BAND", "IF THE POWER FAILS", "one turn in 2.86 s, then pause 1.40 s", "bag at 14 breaths/min",
		"CAUTIONS (1, highest WARN)", "WARN calibration-missing:",
		"BEDSIDE CHECKLIST", "self-inflating bag", "heat-and-moisture exchanger", "away from the motor", "passive",
		"CHECKS (every 4 h: entered)",
		setup.ClinicalCaution[:40],
	} {
		require.Contains(t, text, want)
	}
	// derived: 90 min ago + 4 h = due in 2.5 h: not overdue.
	require.Contains(t, text, "next check due "+setup.LocalDateTime(last.Add(4*time.Hour)))
	require.NotContains(t, text, "OVERDUE")
	// derived: 5 h ago + 4 h was due 1 h ago.
	old := today.Add(-5 * time.Hour)
	sh.Schedule.Last = &old
	require.Contains(t, sheetText(t, sh), "OVERDUE: the next check was due "+setup.LocalDateTime(today.Add(-time.Hour)))
	sh.Schedule.Last = nil
	require.Contains(t, sheetText(t, sh), "no check of bed B4 is recorded in ward.jsonl: check now")
}

// TestSheetOfAStop: a plan with a stop never shows its setting under a
// heading that says to set it, gives no band, no alarm limits and no
// hand rhythm.
func TestSheetOfAStop(t *testing.T) {
	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male}, Targets: setup.Targets{ComplianceMLPerCmH2O: 12}, Now: today}, profile(t, "demo-a"))
	require.NoError(t, err)
	require.NotNil(t, setup.FirstStop(pl.Cautions))
	text := sheetText(t, report.PlanSheet(pl, today))
	requireFits80(t, text)
	require.NotContains(t, text, "SET THE MACHINE TO")
	require.NotContains(t, text, "TO CONFIRM IT")
	require.Contains(t, text, "STOP: DO NOT USE THIS SETTING")
	require.NotContains(t, text, "HIGH ")
	require.NotContains(t, text, "Turn the wheel by hand")
	require.Contains(t, text, "no band and no alarm limits")
	require.Contains(t, text, "BEDSIDE CHECKLIST")
}

// TestSheetOfATimedCheck: the sheet of a stopwatch check shows what was
// timed as timed, not a rounded speed.
func TestSheetOfATimedCheck(t *testing.T) {
	ck, err := runEntries(t, "demo-a", entries("turn-s", "2.86", "pause-s", "1.43", "peak", "17", "end-pressure", "14"))
	require.NoError(t, err)
	text := sheetText(t, report.CheckSheet(ck, "Demonstration unit A", "B4", today))
	requireFits80(t, text)
	require.Contains(t, text, "One turn 2.86 s (timed); Pause 1.43 s (timed)")
	require.Contains(t, text, "WATCH THE MANOMETER (on the lung fitted to the readings)")
	// derived: readings 17 / 14 +/- one step of 1 cmH2O.
	require.Contains(t, text, "Peak                16-18 cmH2O")
	require.Contains(t, text, "End of inspiration  13-15 cmH2O")
}

// TestDueLine: the status line's time since the bed's last record and the
// next check due, just inside and just outside the interval (derived:
// 4 h after the record is due; 3 h 59 min is not yet).
func TestDueLine(t *testing.T) {
	last := today
	require.Equal(t, "B4 checked 3 h 59 min ago, next due "+setup.LocalClock(today.Add(4*time.Hour)),
		report.DueLine("B4", &last, 0, today.Add(239*time.Minute)))
	require.Equal(t, "B4 OVERDUE: checked 4 h 0 min ago (every 4 h)", report.DueLine("B4", &last, 0, today.Add(4*time.Hour)))
	require.Equal(t, "B4 checked 35 min ago, next due "+setup.LocalClock(today.Add(2*time.Hour)),
		report.DueLine("B4", &last, 2*time.Hour, today.Add(35*time.Minute)))
	require.Equal(t, "B4 OVERDUE: checked 2 h 1 min ago (every 2 h)", report.DueLine("B4", &last, 2*time.Hour, today.Add(121*time.Minute)))
	require.Equal(t, "B4: no check in the log", report.DueLine("B4", nil, 0, today))
}
