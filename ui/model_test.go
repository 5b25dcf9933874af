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

// press sends keys one by one; typed text is split into single runes.
func press(m *Model, keys ...tea.KeyMsg) tea.Cmd {
	var last tea.Cmd
	for _, k := range keys {
		if k.Type == tea.KeyRunes && len(k.Runes) > 1 && !k.Paste {
			for _, r := range k.Runes {
				_, last = m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune{r}})
			}
			continue
		}
		_, last = m.Update(k)
	}
	return last
}

func isQuit(cmd tea.Cmd) bool {
	if cmd == nil {
		return false
	}
	_, ok := cmd().(tea.QuitMsg)
	return ok
}

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
	press(m, runes("175"), enter, runes("m"), runes("4"))
	require.Equal(t, panelSetting, m.focus)
	require.NotNil(t, m.out.plan)
	want := wantPlan(t, 175, physiology.Male, "demo-a")
	require.Equal(t, want.Hole.Label, m.out.plan.Hole.Label)
	require.Equal(t, want.Timing.RPM, m.out.plan.Timing.RPM)
	require.Equal(t, want.Timing.DwellS, m.out.plan.Timing.DwellS)
	v := screen(m)
	require.Contains(t, v, "Pin hole     "+want.Hole.Label+" ")
	require.Contains(t, v, "Hole "+want.Hole.Label+" | "+f1(want.Timing.RPM)+" rpm | dwell "+f1(want.Timing.DwellS)+" s")
}

func TestALetterInAFieldNeverSwitchesOrQuits(t *testing.T) {
	m := newTestModel(t, nil)
	for _, k := range []string{"q", "x", "?"} {
		cmd := press(m, runes(k))
		require.False(t, isQuit(cmd), "%q quit from a field", k)
	}
	m.showHelp = false
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "", m.field("height-cm").Value())
	// A digit in a number field is typed, not a panel switch.
	press(m, runes("2"))
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "2", m.field("height-cm").Value())
	require.Contains(t, m.field("height-cm").note, "", "no note for a digit")
	press(m, runes("z"))
	require.Contains(t, m.field("height-cm").note, "digits")
}

func TestPanelKeysWorkOutsideTextFields(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, enter) // on to the sex choice: not a text field
	require.False(t, m.panels[m.focus].Editing())
	press(m, runes("3"))
	require.Equal(t, panelMachine, m.focus)
	press(m, tab)
	require.Equal(t, panelSetting, m.focus)
	press(m, shiftTab, shiftTab, shiftTab)
	require.Equal(t, panelPatient, m.focus)
	require.True(t, isQuit(press(m, runes("3"), runes("q"))))
	require.True(t, isQuit(press(newTestModel(t, nil), tea.KeyMsg{Type: tea.KeyCtrlC})))
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
	require.Contains(t, v, "waiting")
	require.NotContains(t, v, "Pin hole")
	require.Contains(t, v, "SETTING WAITING")
}

func TestTypedZeroIsNotTheDefault(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "170", "sex": "female"})
	require.NotNil(t, m.out.plan)
	press(m, runes("2")) // to targets: the cursor is on mL/kg
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
	press(m, runes("3"), runes("p"))
	require.NotNil(t, m.picker)
	v := screen(m)
	require.Contains(t, v, "broken")
	require.Contains(t, v, "WARN")
	require.Contains(t, v, "demo-b")
	press(m, esc)
	require.Nil(t, m.picker)
	press(m, runes("p"))
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
	press(m, runes("p"))
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
	require.True(t, m.showHelp)
	require.Contains(t, screen(m), "Ctrl+C still work")
	press(m, esc)
	require.False(t, m.showHelp)
	m.Update(tea.WindowSizeMsg{Width: 40, Height: 10})
	require.Contains(t, screen(m), "Make the window larger")
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	require.Contains(t, screen(m), "1 Patient")
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
	// A page of digits is cut to the field's length, with a note.
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(strings.Repeat("9", 5000)), Paste: true})
	f := m.field("height-cm")
	require.LessOrEqual(t, len(f.Value()), 12)
	require.Contains(t, f.note, "cut")
	require.NotEmpty(t, f.err, "999999999999 cm is refused")
	press(m, ctrlU)
	// Control characters and escape sequences are dropped; digits kept.
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("1\x00\x1b[2J7\x075"), Paste: true})
	require.Equal(t, "175", f.Value())
	require.Contains(t, f.note, "kept only")
	press(m, ctrlU)
	// Digits of other scripts are not read as numbers.
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("١٧٥"), Paste: true})
	require.Equal(t, "", f.Value())
	require.Contains(t, f.note, "digits")
	require.NotContains(t, screen(m), "\x1b[2J")
}
