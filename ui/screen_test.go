package ui

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
	"github.com/muesli/termenv"
	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/physiology"
	"crankside/setup"
)

// stopHandover is a check whose manometer reads peak 45 / end 38 cmH2O:
// above the 40 cmH2O the patient must never see (a STOP).
func stopHandover(t *testing.T) *Model {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, runes("45"), enter, runes("38"))
	require.NotNil(t, m.out.check)
	require.NotNil(t, setup.FirstStop(m.out.check.Current.Cautions))
	return m
}

// A STOP on the handover panel follows every panel: each status line
// starts with the word and where it is, and the plan's own level is still
// there after it.
func TestAStopHandoverIsOnEveryPanelsStatusLine(t *testing.T) {
	m := stopHandover(t)
	for i := range m.panels {
		press(m, fkey(i+1))
		line := ansi.Strip(m.summary())
		require.True(t, strings.HasPrefix(line, "STOP F6 set now"), "panel F%d: %q", i+1, line)
		if i != panelHandover {
			require.Contains(t, line, "Plan: WARN", "panel F%d: the plan's own level follows", i+1)
		}
		require.LessOrEqual(t, ansi.StringWidth(line), 80)
	}
	press(m, runes("?")) // over the panels too
	require.True(t, strings.HasPrefix(ansi.Strip(m.summary()), "STOP F6 set now"))
}

// The level words are drawn the same way on the status line, in the ward
// and the history, and the Cautions tab takes the colour of the highest.
func TestLevelWordsAreColouredAlike(t *testing.T) {
	lipgloss.SetColorProfile(termenv.ANSI256)
	defer lipgloss.SetColorProfile(termenv.Ascii)
	m := stopHandover(t)
	stop := m.styles.levelWord(setup.Stop)
	require.NotEqual(t, "STOP", stop, "the word is coloured")
	require.True(t, strings.HasPrefix(m.summary(), stop))
	ward := m.styles.withLevels("B4  hole 8: STOP readings unexplained, WARNING not a word, NOTE", m.styles.Value)
	require.Contains(t, ward, stop)
	require.Contains(t, ward, m.styles.levelWord(setup.Note))
	require.NotContains(t, ward, m.styles.levelWord(setup.Warn), "WARNING is not the word WARN")
	require.Contains(t, m.titleBar(), m.styles.LevelText[setup.Stop].Render(m.cautionCount(false)))
}

// The unit being planned for is named on every panel and view at every
// size from 80x24, id first; a second unit's id shows as itself.
func TestTheUnitIsNamedOnEveryPanel(t *testing.T) {
	for _, size := range [][2]int{{80, 24}, {120, 40}, {200, 60}} {
		p, src := demoProfile(t, "demo-b")
		logPath := filepath.Join(t.TempDir(), "log.jsonl")
		m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
		m.Update(tea.WindowSizeMsg{Width: size[0], Height: size[1]})
		press(m, runes("183"), enter, runes("m"))
		require.NotNil(t, m.out.plan)
		views := []tea.KeyMsg{fkey(1), fkey(2), fkey(3), fkey(4), fkey(5), fkey(6), {Type: tea.KeyF7}, esc, runes("?")}
		for _, k := range views {
			press(m, k)
			title := strings.Split(screen(m), "\n")[2]
			require.Contains(t, title, "unit demo-b", "%dx%d after %s: %q", size[0], size[1], k, title)
		}
		if size[0] >= 100 {
			require.Contains(t, screen(m), "unit demo-b: Demonstration unit B", "the label where it fits")
		}
	}
}

// A paste is text for the focused field: a pasted Tab, Enter and Ctrl+S
// neither move, nor record; the paste is refused whole and said.
func TestABracketedPasteIsTextOnly(t *testing.T) {
	m, logPath := handoverModel(t)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("B4\t7\r\x13"), Paste: true})
	require.Equal(t, panelHandover, m.focus, "the Tab did not move")
	require.Equal(t, 0, m.handover.form.cursor, "the Enter did not move")
	require.Equal(t, "", m.checkField("bed").Value(), "refused whole")
	note := ansi.Strip(m.summary())
	for _, want := range []string{"a Tab", "an Enter", "Ctrl+S", "nothing pasted"} {
		require.Contains(t, note, want)
	}
	_, err := os.Stat(logPath)
	require.ErrorIs(t, err, os.ErrNotExist, "nothing recorded")
	require.Empty(t, m.out.saveNote)

	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("B4"), Paste: true})
	require.Equal(t, "B4", m.checkField("bed").Value(), "a paste the field can hold goes in")
	require.Empty(t, m.checkField("bed").note, "the refusal before is gone")
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("12345678901234"), Paste: true})
	require.Equal(t, "B4", m.checkField("bed").Value(), "too long for the field: refused whole")

	press(m, fkey(4))
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("21"), Paste: true})
	require.Contains(t, ansi.Strip(m.summary()), "a paste goes only into an entry field")
	press(m, fkey(1), down)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("f"), Paste: true})
	require.Equal(t, "male", m.field("sex").Value(), "a choice is not pasted into")
}

// Esc and a key read together as an Alt chord the screen does not bind act
// as the two keys; a bound one (Alt+1 to Alt+7) keeps its meaning.
func TestEscFollowedByAKeyIsNotLost(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("1"), Alt: false}, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("8"), Alt: true})
	require.Equal(t, "18", m.field("height-cm").Value())
	press(m, runes("?"))
	require.NotNil(t, m.overlay)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("0"), Alt: true})
	require.Nil(t, m.overlay, "the Esc closed the keys")
	require.Equal(t, "180", m.field("height-cm").Value(), "and the key typed")
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("4"), Alt: true})
	require.Equal(t, panelSetting, m.focus, "Alt+4 is a panel key")
}

// NO_COLOR takes the colours away and keeps the cursor (inverse (reversed) colours) and
// bold.
func TestNoColorKeepsTheCursor(t *testing.T) {
	lipgloss.SetColorProfile(termenv.ANSI256)
	defer lipgloss.SetColorProfile(termenv.Ascii)
	p, src := demoProfile(t, "demo-a")
	for _, noColor := range []bool{false, true} {
		m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, NoColor: noColor})
		m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
		v := m.View()
		require.Contains(t, v, "\x1b[7m", "NoColor %v: the cursor is drawn in inverse (reversed) colours", noColor)
		require.Regexp(t, "\x1b\\[1[;m]", v, "NoColor %v: bold stays", noColor)
		// ANSI256 colours are "38;5;N" (text) and "48;5;N" (background).
		coloured := strings.Contains(v, "38;5;") || strings.Contains(v, "48;5;")
		require.Equal(t, !noColor, coloured, "NoColor %v", noColor)
	}
}

// A check started from a record that carried a proposal asks once whether
// it was applied, and fills the proposed setting when it was; the values
// are still to be confirmed at the machine.
func TestARecordsProposalIsAskedAbout(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "ward.jsonl")
	p, src := demoProfile(t, "demo-a")
	hole := "7"
	ck, err := setup.RunCheck(setup.CheckRequest{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: "8", RPM: 21, DwellS: 1.4, PEEPCmH2O: 5}, Proposal: setup.Proposal{Hole: &hole}, Now: testNow()}, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B4", "jk", testNow().Add(-55*60e9))
	require.NoError(t, err)
	require.NoError(t, logbook.AppendRecord(logPath, rec))
	for _, applied := range []bool{true, false} {
		t.Run(fmt.Sprint("applied ", applied), func(t *testing.T) {
			m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: logPath})
			m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
			press(m, tea.KeyMsg{Type: tea.KeyF7}, enter)
			require.NotNil(t, m.applied)
			require.Contains(t, ansi.Strip(m.summary()), "proposal applied")
			require.Contains(t, oneLine(m.handover.results()), "The record at 08:05 UTC proposed hole 7")
			press(m, runes("9"), fkey(1))
			require.NotNil(t, m.applied, "no other key acts before the answer")
			require.Equal(t, "8", m.checkField("hole").Value())
			if applied {
				press(m, tea.KeyMsg{Type: tea.KeyCtrlY})
				require.Equal(t, "7", m.checkField("hole").Value())
				require.Contains(t, m.checkField("hole").from, "proposal")
			} else {
				press(m, tea.KeyMsg{Type: tea.KeyCtrlN})
				require.Equal(t, "8", m.checkField("hole").Value())
			}
			require.Nil(t, m.applied, "asked once")
			require.Len(t, m.out.toConfirm, 5, "nothing is confirmed by the answer")
			require.NotContains(t, m.handover.results(), "Found as recorded")
		})
	}
}

// A second checker's initials, entered on the handover panel, go on the
// card (with a line to sign when the proposal changes the hole) and into
// the record; without the first's they are refused beside the field.
func TestASecondCheckerOnTheCardAndTheRecord(t *testing.T) {
	m := filledModel(t) // proposes hole 7 in place of 8
	m.checkField("second-initials").SetValue("cd")
	m.entryChanged()
	press(m, ctrlO)
	require.NotNil(t, m.overlay)
	require.Contains(t, m.overlay.text, "checked by AB, second check CD")
	require.Contains(t, m.overlay.text, "Hole or PEEP changes: second check by CD")
	press(m, esc, ctrlS)
	require.Contains(t, oneLine(m.handover.results()), "Recorded for bed B4")
	h, _, err := logbook.ReadBedHistory([]string{m.logPath}, "B4", 0)
	require.NoError(t, err)
	require.Len(t, h.Entries, 1)
	require.Equal(t, "CD", h.Entries[0].Record.SecondInitials)

	m.checkField("initials").SetValue("")
	m.entryChanged()
	press(m, ctrlO)
	require.Nil(t, m.overlay)
	require.Contains(t, m.checkField("second-initials").err, "goes with the first's initials")
}
