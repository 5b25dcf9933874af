package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
)

// A terminal delivers a bracketed paste as one tea.KeyMsg with Paste set
// and the whole text in Runes, control characters included. A paste is
// text: it goes into the field with the cursor, whole or not at all, and
// nothing in it ever acts (a pasted Tab, Enter or Ctrl+S is refused, never
// pressed).

// paster is a panel that takes a paste into its focused field; it returns
// a note when the paste is refused.
type paster interface {
	paste(rs []rune) (tea.Cmd, string)
}

// paste routes a paste: into the focused field, or refused with a note
// where no field has the cursor.
func (m *Model) paste(msg tea.KeyMsg) tea.Cmd {
	if m.w < MinWidth || m.h < MinHeight {
		return nil // nothing can be seen: nothing is taken
	}
	p, ok := m.panels[m.focus].(paster)
	if m.confirmQuit || m.overlay != nil || m.picker != nil || m.ward != nil || !ok || !m.panels[m.focus].Editing() {
		m.note = "a paste goes only into an entry field with the cursor: nothing pasted"
		return nil
	}
	cmd, note := p.paste(msg.Runes)
	m.note = note
	return cmd
}

// pasteControls names the control characters a paste holds ("a Tab, an
// Enter and Ctrl+S"), or "" when it holds none.
func pasteControls(rs []rune) string {
	var names []string
	seen := map[string]bool{}
	for _, r := range rs {
		name := ""
		switch {
		case r == '\t':
			name = "a Tab"
		case r == '\r' || r == '\n':
			name = "an Enter"
		case r == 0x1b:
			name = "an Esc"
		case r < 0x20:
			name = "Ctrl+" + string(rune('@'+r))
		case r == 0x7f || (r >= 0x80 && r < 0xa0):
			name = "a control character"
		}
		if name != "" && !seen[name] {
			seen[name] = true
			names = append(names, name)
		}
	}
	switch len(names) {
	case 0:
		return ""
	case 1:
		return names[0]
	}
	return strings.Join(names[:len(names)-1], ", ") + " and " + names[len(names)-1]
}

// refusedPaste is the note for a paste holding control characters.
func refusedPaste(controls string) string {
	return fmt.Sprintf("nothing pasted: the paste holds %s (a paste is text only, no control character acts)", controls)
}

func (p *formPanel) paste(rs []rune) (tea.Cmd, string) {
	f := p.form.current()
	f.note = ""
	if c := pasteControls(rs); c != "" {
		f.note = refusedPaste(c)
		return nil, f.note
	}
	if !f.isText() {
		f.note = f.label + " is a choice (a letter or Space): nothing pasted"
		return nil, f.note
	}
	before := f.input.Value()
	if !f.typeRunes(rs) {
		return nil, f.note
	}
	if f.input.Value() == before {
		return nil, ""
	}
	f.from = ""
	f.unconfirmed = false
	return ask(entryChanged{}), ""
}

// paste puts a pasted path into the bench file's entry.
func (p *machinePanel) paste(rs []rune) (tea.Cmd, string) {
	if c := pasteControls(rs); c != "" {
		return nil, refusedPaste(c)
	}
	if len([]rune(p.path.Value()))+len(rs) > p.path.CharLimit {
		return nil, "the paste is longer than a path can be here: nothing pasted"
	}
	p.path, _ = p.path.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: rs})
	return nil, ""
}

// boundAlt reports whether an Alt chord is one of the screen's keys (Alt+1
// to Alt+7): any other arrives only as Esc pressed just before a key.
func (m *Model) boundAlt(msg tea.KeyMsg) bool {
	return m.isPanelKey(msg) || key.Matches(msg, m.keys.Ward)
}

// escThenKey handles Esc and a key that arrived together (read by the
// terminal as one Alt chord that the screen does not bind) as the two keys
// they were: both act, in order, and neither is lost.
func (m *Model) escThenKey(msg tea.KeyMsg) tea.Cmd {
	first := m.handleKey(tea.KeyMsg{Type: tea.KeyEsc})
	escNote := m.note
	msg.Alt = false
	second := m.handleKey(msg)
	if m.note == "" {
		m.note = escNote
	}
	return tea.Batch(first, second)
}
