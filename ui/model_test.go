package ui

import (
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/muesli/termenv"
	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// updating reports -update, the flag teatest's golden package defines and
// these golden screens share: go test ./ui -update rewrites testdata/.
func updating() bool {
	f := flag.Lookup("update")
	return f != nil && f.Value.String() == "true"
}

func TestMain(m *testing.M) {
	// Golden screens and assertions read plain text: no colour codes.
	lipgloss.SetColorProfile(termenv.Ascii)
	// Local times are read in UTC, whatever the TZ of the computer
	// running the tests, so that golden screens hold.
	time.Local = time.UTC
	os.Exit(m.Run())
}

var testNow = func() time.Time { return time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC) }

func demoProfile(t testing.TB, id string) (profiles.Profile, profiles.Source) {
	t.Helper()
	p, src, err := profiles.Open(id, "")
	require.NoError(t, err)
	return p, src
}

func newTestModel(t testing.TB, prefill map[string]string) *Model {
	t.Helper()
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Prefill: prefill, Now: testNow})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	return m
}

func runes(s string) tea.KeyMsg { return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(s)} }

var (
	enter    = tea.KeyMsg{Type: tea.KeyEnter}
	tab      = tea.KeyMsg{Type: tea.KeyTab}
	shiftTab = tea.KeyMsg{Type: tea.KeyShiftTab}
	esc      = tea.KeyMsg{Type: tea.KeyEsc}
	down     = tea.KeyMsg{Type: tea.KeyDown}
	ctrlU    = tea.KeyMsg{Type: tea.KeyCtrlU}
)

// press sends keys one by one, as a terminal would; typed text is split
// into single runes. The commands a key returns are run at once and their
// messages fed back, as the program does; it returns tea.Quit when one of
// them quit.
func press(m *Model, keys ...tea.KeyMsg) tea.Cmd {
	quit := false
	for _, k := range keys {
		if k.Type == tea.KeyRunes && len(k.Runes) > 1 && !k.Paste {
			for _, r := range k.Runes {
				_, cmd := m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
				quit = drain(m, cmd) || quit
			}
			continue
		}
		_, cmd := m.Update(k)
		quit = drain(m, cmd) || quit
	}
	if quit {
		return tea.Quit
	}
	return nil
}

// drain runs a command and every command its messages lead to, and
// reports whether one of them quit.
func drain(m *Model, cmd tea.Cmd) bool {
	if cmd == nil {
		return false
	}
	switch msg := cmd().(type) {
	case nil:
		return false
	case tea.QuitMsg:
		return true
	case pacingTick:
		// The pacing view asks for a tick forever while it is open: one
		// is handled, its next is not followed.
		m.Update(msg)
		return false
	case tea.BatchMsg:
		quit := false
		for _, c := range msg {
			quit = drain(m, c) || quit
		}
		return quit
	default:
		_, next := m.Update(msg)
		return drain(m, next)
	}
}

func isQuit(cmd tea.Cmd) bool {
	if cmd == nil {
		return false
	}
	_, ok := cmd().(tea.QuitMsg)
	return ok
}

// Action keys: never characters a field accepts.
var (
	fkey = func(n int) tea.KeyMsg {
		return tea.KeyMsg{Type: []tea.KeyType{tea.KeyF1, tea.KeyF2, tea.KeyF3, tea.KeyF4, tea.KeyF5, tea.KeyF6}[n-1]}
	}
	ctrlC = tea.KeyMsg{Type: tea.KeyCtrlC}
	ctrlS = tea.KeyMsg{Type: tea.KeyCtrlS}
	ctrlO = tea.KeyMsg{Type: tea.KeyCtrlO}
	ctrlR = tea.KeyMsg{Type: tea.KeyCtrlR}
	ctrlP = tea.KeyMsg{Type: tea.KeyCtrlP}
	ctrlB = tea.KeyMsg{Type: tea.KeyCtrlB}
	ctrlW = tea.KeyMsg{Type: tea.KeyCtrlW}
	pgDn  = tea.KeyMsg{Type: tea.KeyPgDown}
)

func screen(m *Model) string { return ansi.Strip(m.View()) }

func wantPlan(t *testing.T, heightCm float64, sex physiology.Sex, profileID string) setup.Plan {
	t.Helper()
	p, _ := demoProfile(t, profileID)
	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: heightCm, Sex: sex}, Now: testNow()}, p)
	require.NoError(t, err)
	return pl
}

func TestStartsInTheHeightField(t *testing.T) {
	m := newTestModel(t, nil)
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "height-cm", m.patient.form.current().name)
	require.True(t, m.panels[m.focus].Editing())
	require.Nil(t, m.out.plan)
	require.Contains(t, screen(m), "SETTING WAITING")
}

func TestNewPatientFlowReachesTheSetting(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, runes("175"), enter, runes("m"), fkey(4))
	require.Equal(t, panelSetting, m.focus)
	require.NotNil(t, m.out.plan)
	want := wantPlan(t, 175, physiology.Male, "demo-a")
	require.Equal(t, want.Hole.Label, m.out.plan.Hole.Label)
	require.Equal(t, want.Timing.RPM, m.out.plan.Timing.RPM)
	require.Equal(t, want.Timing.DwellS, m.out.plan.Timing.DwellS)
	v := screen(m)
	require.Regexp(t, `Pin hole\s+`+want.Hole.Label+` `, v)
	require.Contains(t, v, "Hole "+want.Hole.Label+" | "+f1(want.Timing.RPM)+" rpm | dwell "+f1(want.Timing.DwellS)+" s")
}

func TestALetterInAFieldNeverSwitchesOrQuits(t *testing.T) {
	m := newTestModel(t, nil)
	// (The height takes the letters of its units, cm, in, ft: not these.)
	for _, k := range []string{"q", "x", "y", "z"} {
		cmd := press(m, runes(k))
		require.False(t, isQuit(cmd), "%q quit from a field", k)
		require.Contains(t, m.field("height-cm").note, "nothing typed", "%q is refused visibly", k)
	}
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "", m.field("height-cm").Value())
	// A digit in a number field is typed, not a panel switch.
	press(m, runes("2"))
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "2", m.field("height-cm").Value())
	require.Empty(t, m.field("height-cm").note, "no note for a digit")
	press(m, runes("z"))
	require.Contains(t, m.field("height-cm").note, "takes a number")
	require.Equal(t, "2", m.field("height-cm").Value(), "a refused key changes nothing")
}

func TestPanelKeysAreNeverCharacters(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, enter) // on to the sex choice
	press(m, fkey(3))
	require.Equal(t, panelMachine, m.focus)
	press(m, tab)
	require.Equal(t, panelSetting, m.focus)
	press(m, shiftTab, shiftTab, shiftTab)
	require.Equal(t, panelPatient, m.focus)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("6"), Alt: true})
	require.Equal(t, panelHandover, m.focus)
	// A digit where no field has the focus is refused visibly, never a
	// panel switch.
	press(m, fkey(4), runes("3"))
	require.Equal(t, panelSetting, m.focus)
	require.Contains(t, screen(m), "nothing to type into here")
	require.True(t, isQuit(press(newTestModel(t, nil), ctrlC)))
	require.False(t, isQuit(press(m, runes("q"))), "q is a letter, never quit")
}

func TestValidationMessageBesideTheField(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, runes("300"))
	f := m.field("height-cm")
	require.Contains(t, f.err, "130-230")
	require.Contains(t, screen(m), "! height 300 cm is outside 130-230 cm")
	// Fix it, pick a sex, then break the I:E: the figures wait, never stale.
	press(m, ctrlU, runes("170"), enter, runes("f"))
	require.NotNil(t, m.out.plan)
	press(m, tab, down, down, runes("2:1"))
	require.Nil(t, m.out.plan)
	require.Contains(t, m.field("ie").err, "inverse")
	press(m, tab, tab)
	require.Equal(t, panelSetting, m.focus)
	v := screen(m)
	require.Contains(t, v, "WAITING")
	require.NotContains(t, v, "Pin hole")
	require.Contains(t, v, "SETTING WAITING")
}

func TestTypedZeroIsNotTheDefault(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "170", "sex": "female"})
	require.NotNil(t, m.out.plan)
	press(m, fkey(2)) // to targets: the cursor is on mL/kg
	press(m, runes("0"))
	require.Nil(t, m.out.plan)
	require.Contains(t, m.field("ml-per-kg").err, "blank for the default")
}

func TestPrefilledStart(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male", "lung": "ards", "fio2": "0.7"})
	require.Equal(t, panelSetting, m.focus)
	require.NotNil(t, m.out.plan)
	require.Equal(t, physiology.ARDS, m.out.plan.Lung)
	require.InDelta(t, 10, m.out.plan.PEEPCmH2O, 0) // ARDSNet 2000 table at FiO2 0.7
}

func TestPickerLoadsAnotherProfileAndListsBadFiles(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "broken.json"), []byte("{"), 0o644))
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: dir, Prefill: map[string]string{"height-cm": "175", "sex": "male"}, Now: testNow})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(3), ctrlP)
	require.NotNil(t, m.picker)
	v := screen(m)
	require.Contains(t, v, "broken")
	require.Contains(t, v, "WARN")
	require.Contains(t, v, "demo-b")
	press(m, esc)
	require.Nil(t, m.picker)
	press(m, ctrlP)
	for m.picker.entries[m.picker.cursor].ID != "demo-b" {
		press(m, down)
	}
	press(m, enter)
	require.Nil(t, m.picker)
	require.Equal(t, "demo-b", m.out.profile.ID)
	want := wantPlan(t, 175, physiology.Male, "demo-b")
	require.Equal(t, want.Hole.Label, m.out.plan.Hole.Label)
	require.InDelta(t, 20, m.out.plan.Timing.RPM, 0)
	// A bad file cannot be chosen.
	press(m, ctrlP)
	for m.picker.entries[m.picker.cursor].ID != "broken" {
		press(m, down)
	}
	press(m, enter)
	require.NotNil(t, m.picker)
	require.Contains(t, screen(m), "cannot be loaded")
}

func TestHelpViewAndTooSmall(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, runes("?"))
	require.NotNil(t, m.overlay)
	require.Equal(t, "Keys", m.overlay.title)
	require.Contains(t, screen(m), "Keys that act are never characters")
	press(m, pgDn)
	require.Contains(t, screen(m), "Levels: STOP")
	press(m, esc)
	require.Nil(t, m.overlay)
	m.Update(tea.WindowSizeMsg{Width: 40, Height: 10})
	require.Contains(t, screen(m), "Make the window larger")
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	require.Contains(t, screen(m), "F1 Patient")
}

func TestClinicalLineAndLevelWordsOnScreen(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male"})
	v := screen(m)
	require.Contains(t, v, "responsible clinician under local protocols")
	require.Contains(t, v, "Plan: WARN | Hole")
	for _, line := range strings.Split(v, "\n") {
		require.LessOrEqual(t, ansi.StringWidth(line), 80, "line wider than the window: %q", line)
	}
	require.Len(t, strings.Split(v, "\n"), 24)
}

func TestHostilePastesIntoFields(t *testing.T) {
	m := newTestModel(t, nil)
	// A page of digits is refused whole, with a note: never cut to fit.
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(strings.Repeat("9", 5000)), Paste: true})
	f := m.field("height-cm")
	require.Equal(t, "", f.Value())
	require.Contains(t, f.note, "nothing typed")
	// Escape sequences are dropped whole; a paste with any other
	// character a number cannot hold is refused, never reduced to its
	// digits.
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("1\x1b[2J75"), Paste: true})
	require.Equal(t, "", f.Value())
	require.Contains(t, f.note, "an Esc")
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("1\x007\x075"), Paste: true})
	require.Equal(t, "", f.Value())
	require.Contains(t, f.note, "control character")
	// Digits of other scripts are not read as numbers.
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("١٧٥"), Paste: true})
	require.Equal(t, "", f.Value())
	require.Contains(t, f.note, "takes a number")
	require.NotContains(t, screen(m), "\x1b[2J")
}
