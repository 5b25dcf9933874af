package ui

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/exp/teatest"
	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/physiology"
	"crankside/setup"
)

// recordCheck appends one check of a bed to the log, at a time.
func recordCheck(t *testing.T, logPath, bed string, heightCm float64, sex physiology.Sex, hole string, rpm, dwell float64, at time.Time) {
	t.Helper()
	p, _ := demoProfile(t, "demo-a")
	ck, err := setup.RunCheck(setup.CheckRequest{Patient: setup.Patient{HeightCm: heightCm, Sex: sex},
		Setting: setup.Setting{Hole: hole, RPM: rpm, DwellS: dwell, PEEPCmH2O: 5}, Now: at}, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, bed, "jk", at)
	require.NoError(t, err)
	require.NoError(t, logbook.AppendRecord(logPath, rec))
}

func wardLog(t *testing.T) string {
	logPath := filepath.Join(t.TempDir(), "ward.jsonl")
	// testNow is 09:00 UTC: B7 was checked at 08:30, B2 at 03:00 (6 h ago:
	// overdue against the 4 h common-practice interval).
	recordCheck(t, logPath, "B7", 168, physiology.Female, "7", 21, 1.4, testNow().Add(-30*time.Minute))
	recordCheck(t, logPath, "B2", 181, physiology.Male, "9", 20, 1.5, testNow().Add(-6*time.Hour))
	return logPath
}

// The ward view lists every bed's last check, most urgent first, and
// Enter on a bed starts its next check from that record.
func TestWardViewStartsTheNextCheckFromTheRecord(t *testing.T) {
	logPath := wardLog(t)
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, tea.KeyMsg{Type: tea.KeyF7})
	require.NotNil(t, m.ward)
	v := screen(m)
	require.Contains(t, v, "2 beds, most urgent first")
	b2, b7 := strings.Index(v, "B2"), strings.Index(v, "B7")
	require.True(t, b2 >= 0 && b7 > b2, "the overdue bed first:\n%s", v)
	require.Contains(t, v, "OVERDUE")
	press(m, runes("9"))
	require.Contains(t, screen(m), "nothing to type into here")
	press(m, enter) // B2, the first row
	require.Nil(t, m.ward)
	require.Equal(t, panelHandover, m.focus)
	require.Equal(t, "181", m.field("height-cm").Value())
	require.Equal(t, "male", m.field("sex").Value())
	require.Equal(t, "9", m.checkField("hole").Value())
	require.Equal(t, "20", m.checkField("rpm").Value())
	require.Equal(t, "1.5", m.checkField("dwell-s").Value())
	require.Equal(t, "B2", m.checkField("bed").Value())
	require.Contains(t, m.checkField("hole").from, "from the record at 03:00")
	require.NotNil(t, m.out.check)
	// Nobody has looked at the machine yet: the check is not called found.
	require.NotContains(t, m.handover.View(), "Found as recorded")
	require.Contains(t, oneLine(m.handover.results()), "From the record at 03:00 UTC: confirm each value at the machine")
	// Enter on each of hole, speed, dwell, PEEP and O2 confirms it.
	m.handover.form.move(2)
	press(m, enter, enter, enter, enter, enter)
	require.Empty(t, m.out.toConfirm)
	require.Contains(t, m.handover.View(), "Found as recorded")
	// The machine is found at another speed: the difference shows.
	m.handover.form.move(3)
	press(m, runes("22"))
	require.Contains(t, m.handover.View(), "Found otherwise: Motor speed: 20 -> 22")
	require.Empty(t, m.checkField("rpm").from, "an edited value is no longer the record's")
}

// The same in a real terminal program.
func TestWardViewInATerminal(t *testing.T) {
	logPath := wardLog(t)
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
	tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(80, 24))
	tm.Send(tea.KeyMsg{Type: tea.KeyF7})
	teatest.WaitFor(t, tm.Output(), func(b []byte) bool { return strings.Contains(string(b), "most urgent first") },
		teatest.WithDuration(20*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
	tm.Send(tea.KeyMsg{Type: tea.KeyDown})
	tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
	teatest.WaitFor(t, tm.Output(), func(b []byte) bool { return strings.Contains(string(b), "from the record at 08:30") },
		teatest.WithDuration(20*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlC})
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlC})
	tm.WaitFinished(t, teatest.WithFinalTimeout(20*time.Second))
	final := tm.FinalModel(t).(*Model)
	require.Equal(t, "168", final.field("height-cm").Value())
	require.Equal(t, "7", final.checkField("hole").Value())
}

// A history of 30 checks: newest first, all of them reachable by
// scrolling, with a marker for what is below.
func TestHistoryNewestFirstAndScrolls(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "h.jsonl")
	for i := 0; i < 30; i++ {
		hole := []string{"7", "8"}[i%2]
		recordCheck(t, logPath, "B4", 175, physiology.Male, hole, 21, 1.4, testNow().Add(time.Duration(i-30)*time.Hour))
	}
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(6), runes("B4"), ctrlR)
	require.NotNil(t, m.overlay)
	v := screen(m)
	require.Contains(t, v, "30 checks, newest first")
	require.Contains(t, v, "2026-12-01 08:00", "the newest (08:00) is at the top:\n%s", v)
	require.Contains(t, v, "more lines below")
	for i := 0; i < 20; i++ {
		press(m, pgDn)
	}
	require.Contains(t, screen(m), "2026-11-30 03:00", "the oldest is reachable")
}

// Text from a file never reaches the terminal raw: a record whose
// initials and bed label hold escape sequences (clear screen, retitle,
// clipboard write), and a profile file whose name holds one, are shown
// escaped in the history, the ward view and the picker.
func TestNothingFromAFileReachesTheScreenRaw(t *testing.T) {
	logPath := wardLog(t)
	data, err := os.ReadFile(logPath)
	require.NoError(t, err)
	evil := strings.ReplaceAll(string(data), `"initials":"JK"`, `"initials":"\u001b[2J\u001b]0;pwned\u0007\u001b]52;c;ZXZpbA==\u0007\u009b31m\u202e"`)
	evil = strings.Replace(evil, `"bed":"B7"`, `"bed":"B7\u001b[2J"`, 1)
	require.NotEqual(t, string(data), evil)
	require.NoError(t, os.WriteFile(logPath, []byte(evil), 0o600))
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "evil\x1b]0;x\x07.json"), []byte("{"), 0o644))
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: dir, Now: testNow, LogPath: logPath})
	m.Update(tea.WindowSizeMsg{Width: 100, Height: 30})
	raw := func(v string) {
		t.Helper()
		for _, bad := range []string{"\x1b", "\x07", "\u009b", "\u202e"} {
			require.NotContains(t, v, bad, "a raw control or bidi character reached the screen")
		}
	}
	press(m, tea.KeyMsg{Type: tea.KeyF7})
	v := m.View()
	raw(v)
	require.Contains(t, v, `\x1b[2J`, "shown escaped")
	press(m, esc, fkey(6))
	m.checkField("bed").SetValue("B2")
	press(m, ctrlR)
	v = m.View()
	raw(v)
	require.Contains(t, v, `\x1b]0;pwned`, "the history shows the initials escaped")
	press(m, esc, fkey(3), ctrlP)
	v = m.View()
	raw(v)
	require.Contains(t, v, `\x1b]0;x\x07`)
}

// A surge ward of 30 beds at 80x24, where each bed's row wraps to two
// lines: the chosen bed is always in view, the page keys the "more"
// markers name move through the beds, a panel key leaves the ward for
// that panel, and a key that acts elsewhere is refused with a note.
func TestWardOf30BedsKeepsTheChosenBedInView(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "ward.jsonl")
	for i := 1; i <= 30; i++ {
		recordCheck(t, logPath, fmt.Sprintf("B%d", i), 175, physiology.Male, "8", 21, 1.4, testNow().Add(-time.Duration(i)*time.Minute))
	}
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, tea.KeyMsg{Type: tea.KeyF7})
	chosen := func() string {
		for _, l := range strings.Split(screen(m), "\n") {
			if f := strings.Fields(strings.Trim(l, "┃ ")); len(f) > 1 && f[0] == ">" {
				return f[1]
			}
		}
		return ""
	}
	require.Equal(t, "B1", chosen())
	for i := 0; i < 12; i++ {
		press(m, down)
	}
	require.Equal(t, "B13", chosen(), "the 13th bed is in view:\n%s", screen(m))
	press(m, tea.KeyMsg{Type: tea.KeyPgDown})
	require.Greater(t, m.ward.cursor, 12, "PgDn moves through the beds")
	require.Equal(t, m.ward.rows[m.ward.cursor].Bed, chosen())
	press(m, tea.KeyMsg{Type: tea.KeyEnd})
	require.Equal(t, "B30", chosen())
	require.NotContains(t, screen(m), "more lines below")
	press(m, tea.KeyMsg{Type: tea.KeyHome})
	require.Equal(t, "B1", chosen())
	require.NotContains(t, screen(m), "more line above", "the first screen again, from the top")
	require.Contains(t, screen(m), "enter start its check", "the help line is the ward's")

	press(m, ctrlS)
	require.NotNil(t, m.ward)
	require.Contains(t, screen(m), "in the ward: arrows choose a bed")
	before, err := os.ReadFile(logPath)
	require.NoError(t, err)
	press(m, fkey(6))
	require.Nil(t, m.ward, "F6 leaves the ward")
	require.Equal(t, panelHandover, m.focus)
	after, err := os.ReadFile(logPath)
	require.NoError(t, err)
	require.Equal(t, before, after, "nothing was recorded")
}

// Starting a bed's check from the ward brings only that bed's record:
// the blood gas, proposal, readings and cylinder of the check before, and
// the Patient panel's lung condition (not in a record), belonged to
// another bed and are cleared; the cursor is on the first field and the
// last record's note is gone.
func TestStartingABedFromTheWardCarriesNothingFromTheBedBefore(t *testing.T) {
	logPath := wardLog(t)
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	m.field("lung").SetValue("ards")
	press(m, tea.KeyMsg{Type: tea.KeyF7}, enter) // B2, the overdue bed
	require.Equal(t, "B2", m.checkField("bed").Value())
	for name, v := range map[string]string{"spo2": "90", "ph": "7,25", "paco2": "55", "propose-o2-lpm": "3.1", "peak": "17", "end-pressure": "14", "cylinder-l": "10", "cylinder-bar": "150", "initials": "ab"} {
		f := m.checkField(name)
		require.NotNil(t, f, name)
		f.SetValue(v)
	}
	m.entryChanged()
	press(m, ctrlS)
	require.Contains(t, oneLine(m.handover.results()), "not recorded: confirm at the machine first", "a check as the record gave it is not recorded as found")
	for _, name := range settingEntries {
		m.checkField(name).unconfirmed = false
	}
	m.entryChanged()
	press(m, ctrlS)
	require.Contains(t, screen(m), "Recorded for bed B2")
	press(m, tea.KeyMsg{Type: tea.KeyF7}, down, enter) // the next bed, B7
	require.Nil(t, m.ward, "nothing unrecorded: no question")
	require.Equal(t, "B7", m.checkField("bed").Value())
	for _, f := range m.handover.form.fields {
		switch f.name {
		case "bed", "hole", "rpm", "dwell-s", "peep", "o2-lpm":
		case "gas-unit":
			// The ward's unit for blood gases, kept between runs, not a bed's.
			require.Equal(t, "mmhg", f.Value())
		default:
			require.Empty(t, f.Value(), "%s is not B7's", f.name)
		}
	}
	require.Equal(t, "normal", m.field("lung").Value(), "the lung condition was the bed before's; the default again")
	require.Equal(t, 0, m.handover.form.cursor)
	require.NotContains(t, screen(m), "Recorded for bed B2")
}

// Entries typed on the handover panel and not recorded are never dropped
// without a question: not by Ctrl+C, complete check or not, and not by
// starting another bed's check from the ward.
func TestUnrecordedHandoverEntriesAreNotDroppedWithoutAsking(t *testing.T) {
	logPath := wardLog(t)
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath,
		Prefill: map[string]string{"height-cm": "175", "sex": "male"}})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(6), runes("B9"), enter, runes("zz"), enter, runes("8"), enter, runes("21"), enter)
	require.Nil(t, m.out.check, "the dwell is still blank")
	require.Nil(t, press(m, tea.KeyMsg{Type: tea.KeyCtrlC}), "Ctrl+C asks, it does not quit")
	require.True(t, m.confirmQuit)
	press(m, tea.KeyMsg{Type: tea.KeyEsc})
	require.False(t, m.confirmQuit)

	press(m, tea.KeyMsg{Type: tea.KeyF7}, enter)
	require.NotNil(t, m.ward, "Enter asked first")
	require.Contains(t, screen(m), "the check on F6 is not recorded")
	press(m, tea.KeyMsg{Type: tea.KeyEsc})
	require.NotNil(t, m.ward)
	require.Equal(t, "B9", m.checkField("bed").Value(), "Esc kept it")
	press(m, enter, enter)
	require.Nil(t, m.ward, "asked, then Enter again starts the bed")
	require.Equal(t, "B2", m.checkField("bed").Value())
	require.NotNil(t, press(m, tea.KeyMsg{Type: tea.KeyCtrlC}), "nothing typed since the start from the record: Ctrl+C quits")
}

// oneLine is a view's words on one line: a phrase wrapped across lines
// (and the frame's borders) is found whole.
func oneLine(v string) string {
	return strings.Join(strings.Fields(strings.NewReplacer("┃", " ", "│", " ").Replace(v)), " ")
}
