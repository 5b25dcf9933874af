package ui

import (
	"fmt"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

// Keys that type, as a tired person might press them anywhere: digits,
// letters (including those that other screens use as commands), the
// decimal point and comma.
var typingKeys = func() []tea.KeyMsg {
	var ks []tea.KeyMsg
	for _, r := range "0258qQyYnmfaopbwjkI.,:-" {
		ks = append(ks, runes(string(r)))
	}
	return append(ks, tea.KeyMsg{Type: tea.KeySpace})
}()

// Keys that act or navigate: never characters a field accepts.
var actionKeys = []tea.KeyMsg{
	fkey(1), fkey(2), fkey(3), fkey(4), fkey(5), fkey(6),
	{Type: tea.KeyRunes, Runes: []rune("2"), Alt: true}, {Type: tea.KeyRunes, Runes: []rune("5"), Alt: true},
	tab, shiftTab, enter, esc, down, {Type: tea.KeyUp}, {Type: tea.KeyLeft}, {Type: tea.KeyRight},
	{Type: tea.KeyHome}, {Type: tea.KeyEnd}, pgDn, {Type: tea.KeyPgUp},
	ctrlS, ctrlO, ctrlR, ctrlP, ctrlB, runes("?"),
}

// values is every entry of every form, by form and field name.
func values(m *Model) map[string]string {
	out := map[string]string{}
	for pi, f := range []*form{&m.patient.form, &m.targets.form, &m.handover.form} {
		for _, fl := range f.fields {
			out[fmt.Sprintf("%d/%s", pi, fl.name)] = fl.Value()
		}
	}
	return out
}

// focusStates are every panel, and on a form panel every field: each
// place the cursor can be.
func focusStates(m *Model) [][2]int {
	var out [][2]int
	for i, p := range m.panels {
		n := 1
		if fp, ok := p.(interface{ formFields() int }); ok {
			n = fp.formFields()
		}
		for f := 0; f < n; f++ {
			out = append(out, [2]int{i, f})
		}
	}
	return out
}

func (p *formPanel) formFields() int { return len(p.form.fields) }

// filledModel has a patient, a check and a proposal entered, so that a key
// that wrongly changed an entry would show.
func filledModel(t *testing.T) *Model {
	m, _ := handoverModel(t)
	for name, v := range map[string]string{"bed": "B4", "initials": "ab", "hole": "8", "rpm": "21", "dwell-s": "1.4",
		"peak": "17", "end-pressure": "14", "propose-hole": "7"} {
		m.checkField(name).SetValue(v)
	}
	m.recompute()
	require.NotNil(t, m.out.check)
	return m
}

func goTo(m *Model, st [2]int) {
	m.focusPanel(st[0])
	if fp, ok := m.panels[st[0]].(interface{ formFields() int }); ok && fp.formFields() > 0 {
		var f *form
		switch st[0] {
		case panelPatient:
			f = &m.patient.form
		case panelTargets:
			f = &m.targets.form
		case panelHandover:
			f = &m.handover.form
		}
		f.move(st[1])
	}
}

// A typing key changes only the focused field, or is refused with a note
// that can be seen; it never switches the panel (issue: a digit typed as a
// panel number once became a PEEP of 4).
func TestTypingKeysOnlyTypeIntoTheFocusedField(t *testing.T) {
	base := filledModel(t)
	walk := keyWalk(focusStates(base), typingKeys)
	for _, st := range focusStates(base) {
		for _, k := range walk[st] {
			m := filledModel(t)
			goTo(m, st)
			before := values(m)
			press(m, k)
			require.Equal(t, st[0], m.focus, "%v at %v switched the panel", k, st)
			after := values(m)
			var changed []string
			for name, v := range after {
				if before[name] != v {
					changed = append(changed, name)
				}
			}
			var focused string
			if f := focusedField(m); f != nil {
				focused = f.name
			}
			require.LessOrEqual(t, len(changed), 1, "%v at %v changed %v", k, st, changed)
			if len(changed) == 1 {
				require.True(t, strings.HasSuffix(changed[0], "/"+focused), "%q at %v changed %v, not the focused %q", k.String(), st, changed, focused)
				continue
			}
			// Nothing changed: a value replaced by the same text, or a
			// refusal that is visible.
			if focused != "" && string(k.Runes) != "" && strings.TrimSpace(before[fmt.Sprintf("%d/%s", formIndex(st[0]), focused)]) == string(k.Runes) {
				continue
			}
			v := screen(m)
			note := m.note
			if f := focusedField(m); f != nil && note == "" {
				note = f.note
			}
			if note == "" && m.panels[m.focus].Editing() && m.machine.mode == machinePath {
				continue // the bench path takes any character
			}
			require.NotEmpty(t, note, "%q at %v: nothing changed and nothing said", k.String(), st)
			require.Contains(t, v, firstWords(note), "%q at %v: the note is on screen", k.String(), st)
		}
	}
}

func firstWords(s string) string {
	w := strings.Fields(s)
	if len(w) > 3 {
		w = w[:3]
	}
	return strings.Join(w, " ")
}

// focusedField is the field with the cursor, if the focused panel has one.
func focusedField(m *Model) *field {
	switch m.focus {
	case panelPatient:
		return m.patient.form.current()
	case panelTargets:
		return m.targets.form.current()
	case panelHandover:
		return m.handover.form.current()
	}
	return nil
}

// An action key never changes an entry, wherever the cursor is.
func TestActionKeysNeverChangeAField(t *testing.T) {
	base := filledModel(t)
	walk := keyWalk(focusStates(base), actionKeys)
	for _, st := range focusStates(base) {
		for _, k := range walk[st] {
			m := filledModel(t)
			goTo(m, st)
			before := values(m)
			press(m, k)
			require.Equal(t, before, values(m), "%q at %v changed an entry", k.String(), st)
		}
	}
}

// The key sequences that once changed clinical entries, replayed: none of
// them switches a panel, and what they type is in the field that took it.
func TestQuotedSequencesReplayed(t *testing.T) {
	// "183 Enter m Enter a Enter 0.6 Enter 4": the 4 is typed into PEEP,
	// on screen, and the panel stays the patient's.
	m := newTestModel(t, nil)
	press(m, runes("183"), enter, runes("m"), enter, runes("a"), enter, runes("0.6"), enter, runes("4"))
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "4", m.field("peep").Value())
	require.Regexp(t, `> PEEP\s+\[4\s*\]`, screen(m))
	// "Tab from Patient then 4": typed into the tidal volume, shown there.
	m = newTestModel(t, nil)
	press(m, tab, runes("4"))
	require.Equal(t, panelTargets, m.focus)
	require.Equal(t, "4", m.field("ml-per-kg").Value())
	require.Regexp(t, `> Tidal volume\s+\[4\s*\]`, screen(m))
	// "6" at launch, then a handover typed: everything goes into the
	// height field in view, none of it to another panel.
	m = newTestModel(t, nil)
	press(m, runes("6"), runes("B4"), enter, runes("8"))
	require.Equal(t, panelPatient, m.focus)
	require.Equal(t, "64", m.field("height-cm").Value(), "B refused (the height takes a number), 6 and 4 typed where they can be seen")
	require.Contains(t, screen(m), "[64")
	require.Equal(t, "", m.checkField("bed").Value())
}

// A decimal comma is a decimal mark on the screen as on the command line,
// and what was read is shown beside the field.
func TestDecimalCommaOnScreen(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1,4"), enter, enter, runes("1,5"))
	require.NotNil(t, m.out.check, "%v", m.out.checkWaiting)
	require.InDelta(t, 1.4, m.out.check.Current.Setting.DwellS, 1e-12)
	require.InDelta(t, 1.5, m.out.check.Current.Setting.O2LPerMin, 1e-12)
	require.Contains(t, screen(m), "=1.5")
	m = newTestModel(t, nil)
	press(m, runes("175"), enter, runes("m"), enter, enter, runes("0,4"))
	require.Contains(t, screen(m), "read as 0.4")
	require.InDelta(t, 0.4, m.out.plan.FiO2.Value, 1e-12)
}

// A field that receives the focus holding a value shows it selected: the
// first character typed replaces it (140 does not become 140165); an
// arrow moves into it for editing instead.
func TestReplaceOnType(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "140", "sex": "male"})
	m.focusPanel(panelPatient)
	require.True(t, m.field("height-cm").selected)
	press(m, runes("165"))
	require.Equal(t, "165", m.field("height-cm").Value())
	press(m, down, tea.KeyMsg{Type: tea.KeyUp}, tea.KeyMsg{Type: tea.KeyEnd}, runes("5"))
	require.Equal(t, "1655", m.field("height-cm").Value(), "after End the key appends")
	press(m, down, tea.KeyMsg{Type: tea.KeyUp}, tea.KeyMsg{Type: tea.KeyBackspace})
	require.Equal(t, "", m.field("height-cm").Value(), "Backspace on a selected value clears it")
}

// Nothing safety-relevant is cut short at 80x24: every panel, in states
// with long text, is walked and no line may end in an ellipsis.
func TestNothingCutShortAt80x24(t *testing.T) {
	states := map[string]func(t *testing.T) *Model{
		"stop plan": func(t *testing.T) *Model {
			return newTestModel(t, map[string]string{"height-cm": "175", "sex": "male", "ml-per-kg": "9.5", "compliance": "12"})
		},
		"handover with proposal": filledModel,
		"unexplained readings": func(t *testing.T) *Model {
			m, _ := handoverModel(t)
			press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
				enter, enter, runes("120"), enter, runes("100"))
			return m
		},
		"leak reading": func(t *testing.T) *Model {
			m, _ := handoverModel(t)
			press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
				enter, enter, runes("17"), enter, runes("3"))
			return m
		},
		"not recorded": func(t *testing.T) *Model {
			m := filledModel(t)
			m.logPath = ""
			press(m, ctrlS)
			return m
		},
	}
	for name, build := range states {
		m := build(t)
		for i := range m.panels {
			m.focusPanel(i)
			for page := 0; page < 6; page++ {
				for _, line := range strings.Split(screen(m), "\n") {
					trimmed := strings.TrimRight(strings.TrimRight(strings.TrimSpace(line), "┃┗┛━"), " ")
					require.False(t, strings.HasSuffix(trimmed, "…"), "%s, panel %d: a line is cut short: %q", name, i+1, line)
				}
				press(m, pgDn)
			}
		}
		press(m, ctrlO)
		for page := 0; page < 6; page++ {
			for _, line := range strings.Split(screen(m), "\n") {
				require.NotContains(t, line, "…", "%s, card: a line is cut short: %q", name, line)
			}
			press(m, pgDn)
		}
	}
}

// formIndex is the index values() gives a panel's form.
func formIndex(panel int) int {
	switch panel {
	case panelTargets:
		return 1
	case panelHandover:
		return 2
	}
	return 0
}

// The handover form beside the results is compact: a selected value is
// said in words above it, since without colour (this test's profile,
// as under NO_COLOR) the highlight is not drawn.
func TestCompactFormSaysASelectedValueInWords(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, tea.KeyMsg{Type: tea.KeyUp})
	require.True(t, m.checkField("initials").selected)
	require.Contains(t, screen(m), "Initials: typing replaces ab; an arrow edits it")
	press(m, runes("cd"))
	require.Equal(t, "cd", m.checkField("initials").Value(), "the first key replaced it")
	require.NotContains(t, screen(m), "typing replaces")
}

// An action key pressed on a panel that has no such action is said where
// it acts, never dropped without a word; Ctrl+T with no step says why.
func TestAnActionKeyElsewhereSaysWhereItActs(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male"})
	m.focusPanel(panelTargets)
	press(m, ctrlS)
	require.Contains(t, screen(m), "ctrl+s record: on F6 Handover")
	press(m, tea.KeyMsg{Type: tea.KeyCtrlB})
	require.Contains(t, screen(m), "ctrl+b refit from a bench file: on F3 Machine")
	press(m, fkey(6), tea.KeyMsg{Type: tea.KeyCtrlT})
	require.Contains(t, screen(m), "no protocol step to take")
	require.Contains(t, screen(m), "ctrl+s record", "on the handover panel its own keys come first in the help line")
}

// In a window too small to show anything, no key acts unseen, and the
// question before quitting an unrecorded check is in the small view.
func TestATooSmallWindowActsOnNoKeyButQuit(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"))
	m.Update(tea.WindowSizeMsg{Width: 60, Height: 20})
	press(m, fkey(4), runes("9"))
	require.Equal(t, panelHandover, m.focus, "F4 did nothing unseen")
	require.Equal(t, "B4", m.checkField("bed").Value(), "nothing typed unseen")
	require.Nil(t, press(m, tea.KeyMsg{Type: tea.KeyCtrlC}))
	require.Contains(t, screen(m), "Ctrl+C again: quit anyway")
	require.NotNil(t, press(m, tea.KeyMsg{Type: tea.KeyCtrlC}))
}
