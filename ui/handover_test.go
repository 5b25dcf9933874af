package ui

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

// runCmd runs a command the way the program would and feeds its message back.
func runCmd(m *Model, cmd tea.Cmd) {
	if cmd == nil {
		return
	}
	if msg := cmd(); msg != nil {
		m.Update(msg)
	}
}

func handoverModel(t *testing.T) (*Model, string) {
	p, src := demoProfile(t, "demo-a")
	logPath := filepath.Join(t.TempDir(), "handover.jsonl")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath,
		Prefill: map[string]string{"height-cm": "175", "sex": "male"}})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(6))
	require.Equal(t, panelHandover, m.focus)
	return m, logPath
}

func TestHandoverCheckMatchesSetup(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, runes("17"), enter, runes("14"), enter,
		enter, enter, enter, enter, enter, enter, // the gas unit as it is, the blood gas left blank
		enter, enter, runes("7"))
	require.NotNil(t, m.out.check, "%v", m.out.checkWaiting)
	p, _ := demoProfile(t, "demo-a")
	hole := "7"
	want, err := setup.RunCheck(setup.CheckRequest{
		Patient:  setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting:  setup.Setting{Hole: "8", RPM: 21, DwellS: 1.4, PEEPCmH2O: 5},
		Readings: &physiology.Readings{PeakCmH2O: 17, EndCmH2O: 14}, Proposal: setup.Proposal{Hole: &hole}, Now: testNow(),
	}, p)
	require.NoError(t, err)
	got := m.out.check
	require.InDelta(t, want.Fitted.ComplianceMLPerCmH2O, got.Fitted.ComplianceMLPerCmH2O, 1e-9)
	require.InDelta(t, want.Current.Figures.Hole.DeliveredML, got.Current.Figures.Hole.DeliveredML, 1e-9)
	require.InDelta(t, want.Proposed.Figures.Hole.DeliveredML, got.Proposed.Figures.Hole.DeliveredML, 1e-9)
	v := screen(m)
	require.Contains(t, v, "Fitted lung C "+f0(want.Fitted.ComplianceMLPerCmH2O))
	require.Contains(t, v, "proposed")
	require.Contains(t, m.handover.View(), "no name is kept", "the record note is on the panel, below the figures")
}

func TestHandoverRefusesWhatTheMachineCannotRun(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21.3"), enter, runes("1.4"))
	require.Nil(t, m.out.check)
	require.Contains(t, m.checkField("rpm").err, "0.5 rpm steps")
	require.Contains(t, screen(m), "WAITING")
}

func TestHandoverRecordQuitAndHistory(t *testing.T) {
	m, logPath := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"))
	require.NotNil(t, m.out.check)
	// Unrecorded: quitting asks first, and n stays.
	require.False(t, isQuit(press(m, tea.KeyMsg{Type: tea.KeyCtrlC})))
	require.True(t, m.confirmQuit)
	require.Contains(t, screen(m), "Not recorded")
	press(m, runes("n"))
	require.True(t, m.confirmQuit, "a letter does not answer the question")
	press(m, esc)
	require.False(t, m.confirmQuit)
	// Record it: one line in the log, and quitting no longer asks.
	runCmd(m, press(m, tea.KeyMsg{Type: tea.KeyCtrlS}))
	require.Contains(t, screen(m), "Recorded for bed B4")
	h, sum, err := logbook.ReadBedHistory([]string{logPath}, "B4", 0)
	require.NoError(t, err)
	require.Zero(t, sum.Damaged)
	require.Len(t, h.Entries, 1)
	require.Equal(t, "B4", h.Entries[0].Record.Bed)
	require.Equal(t, "AB", h.Entries[0].Record.Initials)
	// The history overlay lists it.
	runCmd(m, press(m, tea.KeyMsg{Type: tea.KeyCtrlR}))
	require.NotNil(t, m.overlay)
	require.Contains(t, screen(m), "Bed B4: earlier checks")
	press(m, esc)
	// The card overlay.
	press(m, tea.KeyMsg{Type: tea.KeyCtrlO})
	require.Contains(t, screen(m), "HANDOVER CARD")
	press(m, esc)
	require.True(t, isQuit(press(m, tea.KeyMsg{Type: tea.KeyCtrlC})))
}

func TestHandoverBedLabelThatLooksLikeAName(t *testing.T) {
	m, logPath := handoverModel(t)
	press(m, runes("Smith"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"))
	require.NotNil(t, m.out.check)
	runCmd(m, press(m, tea.KeyMsg{Type: tea.KeyCtrlS}))
	require.Contains(t, screen(m), "not recorded")
	require.Contains(t, m.checkField("bed").err, "never a patient's name")
	_, err := os.Stat(logPath)
	require.ErrorIs(t, err, os.ErrNotExist, "nothing was written")
}

// Ctrl+S pressed with the panel scrolled down still shows what became of
// the record: "Recorded", and before a second record of the same check
// the question; both are at the top of the results, where the panel now
// scrolls back to.
func TestRecordingShowsItsOutcomeWhenThePanelIsScrolled(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, runes("17"), enter, runes("14"))
	press(m, tea.KeyMsg{Type: tea.KeyPgDown}, tea.KeyMsg{Type: tea.KeyPgDown})
	require.Positive(t, m.scroll[panelHandover])
	press(m, ctrlS)
	require.Contains(t, screen(m), "Recorded for bed B4")
	press(m, tea.KeyMsg{Type: tea.KeyPgDown}, ctrlS)
	require.Contains(t, screen(m), "this check was already recorded at")
}

// A proposal typed by hand that has a STOP (hole 22 of demo-a gives 12.7
// mL/kg PBW: above 10, ARDS Network 2000 protocol) is said as loudly as a
// stop of the setting: above the comparison, and on the strip beside the
// panel; and the strip never shows the plan's figures as the bed's while
// the check waits.
func TestAProposalWithAStopIsSaidAboveTheComparison(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter)
	require.Nil(t, m.out.check)
	require.Contains(t, screen(m), "CHECK WAITING for")
	require.NotContains(t, screen(m), "Plan: ", "the plan's figures would read as the bed's")
	press(m, runes("1.4"), enter, enter, enter, runes("22"), enter, runes("18"))
	m.checkField("propose-hole").SetValue("22")
	m.entryChanged()
	v := screen(m)
	stop := strings.Index(v, "DO NOT MAKE THE PROPOSED CHANGE AS")
	require.Contains(t, v, "tidal volume 12.7 mL/kg PBW is at")
	table := strings.Index(v, "SETTING ")
	require.True(t, stop >= 0 && table > stop, "the stop comes before the comparison:\n%s", v)
	require.Contains(t, v, "STOP F6 proposal | Set now: WARN")
}

// The Cautions panel lists the handover check's cautions too: with the
// manometer at 120/100 (above 40 cmH2O: MHRA RMVS001) its STOPs are on
// F5 under their own heading, and the tab counts them after a "+".
func TestTheCautionsPanelListsTheChecksCautions(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, runes("120"), enter, runes("100"))
	require.NotNil(t, m.out.check)
	n := len(m.out.check.Current.Cautions)
	// The count says what it counts: in full where it fits, its total at 80 columns.
	require.Contains(t, m.titleBar(), fmt.Sprintf("Cautions(%d in all)", len(m.out.plan.Cautions)+n))
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	require.Contains(t, m.titleBar(), fmt.Sprintf("Cautions(plan %d, F6 %d)", len(m.out.plan.Cautions), n))
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(5))
	v := strings.Join(m.panels[panelCautions].(*cautionsPanel).lines(), "\n")
	require.Contains(t, v, "HANDOVER CHECK (F6): what the machine is set to now")
	require.Contains(t, v, "NEW PATIENT PLAN (F1-F4)")
	check := v[:strings.Index(v, "NEW PATIENT PLAN")]
	words := 0
	for _, l := range strings.Split(check, "\n") {
		if strings.HasPrefix(l, "STOP ") || strings.HasPrefix(l, "WARN ") || strings.HasPrefix(l, "NOTE ") {
			words++
		}
	}
	require.Equal(t, n, words, "every caution of the check, with its level word:\n%s", v)
	require.Contains(t, v, "STOP")
}

// The compact handover form says, above it, what the focused entry is and
// what a blank one is taken to be: a blank PEEP valve is checked as 5
// cmH2O (ARDS Network 2000 protocol: at least 5), whatever the plan's PEEP.
func TestTheHandoverSaysWhatABlankEntryIsTakenToBe(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter)
	require.Equal(t, "peep", m.handover.form.current().name)
	require.Contains(t, screen(m), "PEEP cmH2O: what the PEEP valve is set to; blank: 5 cmH2O assumed")
	press(m, enter, enter)
	require.Equal(t, "peak", m.handover.form.current().name)
	require.Contains(t, screen(m), "Peak cmH2O: the manometer at the peak of delivery")
}

// The card on screen at 80x24 is not wrapped a second time: each of its
// lines fits the frame (report.CardWidth), so no line is a fragment of
// the one before.
func TestTheCardFitsTheFrameAt80x24(t *testing.T) {
	m := filledModel(t)
	press(m, tea.KeyMsg{Type: tea.KeyCtrlO})
	require.NotNil(t, m.overlay)
	fw, _ := m.panelFrame()
	require.LessOrEqual(t, report.CardWidth, m.w-fw)
	for _, l := range strings.Split(m.overlay.text, "\n") {
		require.LessOrEqual(t, len([]rune(l)), m.w-fw, "a card line wider than the frame: %q", l)
	}
}

// A manometer reading of 120 cmH2O is a stop before any patient is
// entered (above 40: MHRA RMVS001): the check that waits for the height
// never shows it only as "waiting".
func TestAnAlarmingReadingIsAStopWhileTheCheckWaits(t *testing.T) {
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(6), runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, runes("120"), enter, runes("100"))
	require.Nil(t, m.out.check, "no patient yet")
	v := screen(m)
	require.Contains(t, v, "STOP the manometer reads a peak of 120.0")
	require.NotContains(t, v, "CHECK WAITING", "the strip says the stop, not that it waits")
}
