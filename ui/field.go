package ui

import (
	"strings"
	"unicode/utf8"

	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
)

// choice is one option of a choice field; its key picks it when typed.
type choice struct {
	key, label, value string
}

// field is one entry of a form: a number typed in, or a choice.
type field struct {
	name     string // the setup field it feeds ("height-cm"), used to place errors
	label    string
	unit     string
	hint     string // what leaving it empty means
	required bool
	allowed  string // runes a text field accepts
	input    textinput.Model
	choices  []choice
	chosen   int    // index into choices, -1 for none
	err      string // why the entry cannot be used, shown beside it
	note     string // a passing remark, such as "digits only"
	heading  string // a section title drawn above the field
}

const fieldWidth = 8

func numberField(name, label, unit, hint string, required bool) *field {
	return textField(name, label, unit, hint, required, "0123456789.")
}

func textField(name, label, unit, hint string, required bool, allowed string) *field {
	in := textinput.New()
	in.Prompt = ""
	in.CharLimit = 12
	in.Width = fieldWidth
	in.Placeholder = ""
	return &field{name: name, label: label, unit: unit, hint: hint, required: required, allowed: allowed, input: in, chosen: -1}
}

func choiceField(name, label, hint string, chosen int, choices ...choice) *field {
	return &field{name: name, label: label, hint: hint, choices: choices, chosen: chosen}
}

func (f *field) isText() bool { return f.choices == nil }

// Value is the text typed, or the chosen option's value ("" for none).
func (f *field) Value() string {
	if f.isText() {
		return strings.TrimSpace(f.input.Value())
	}
	if f.chosen < 0 {
		return ""
	}
	return f.choices[f.chosen].value
}

// SetValue fills the field, as a prefilled start does.
func (f *field) SetValue(v string) {
	if f.isText() {
		f.input.SetValue(v)
		f.input.CursorEnd()
		return
	}
	for i, c := range f.choices {
		if c.value == v {
			f.chosen = i
		}
	}
}

func (f *field) focus() tea.Cmd {
	if f.isText() {
		return f.input.Focus()
	}
	return nil
}

func (f *field) blur() {
	if f.isText() {
		f.input.Blur()
	}
}

// update handles a key for the field and reports whether its value changed.
func (f *field) update(msg tea.KeyMsg, keys formKeys) (bool, tea.Cmd) {
	f.note = ""
	if !f.isText() {
		return f.updateChoice(msg, keys), nil
	}
	if key.Matches(msg, keys.Clear) {
		f.input.SetValue("")
		return true, nil
	}
	if msg.Type == tea.KeyRunes {
		// A paste may carry terminal escape sequences: drop them whole
		// before keeping only the characters the field takes.
		kept := filterRunes([]rune(ansi.Strip(string(msg.Runes))), f.allowed)
		if len(kept) == 0 {
			f.note = "type " + allowedWords(f.allowed)
			return false, nil
		}
		if len(kept) < len(msg.Runes) {
			f.note = "kept only " + allowedWords(f.allowed)
		}
		room := f.input.CharLimit - utf8.RuneCountInString(f.input.Value())
		if room <= 0 {
			f.note = "that is as long as an entry can be"
			return false, nil
		}
		if len(kept) > room {
			kept = kept[:room]
			f.note = "cut to fit the field"
		}
		msg.Runes = kept
	}
	before := f.input.Value()
	var cmd tea.Cmd
	f.input, cmd = f.input.Update(msg)
	return f.input.Value() != before, cmd
}

func (f *field) updateChoice(msg tea.KeyMsg, keys formKeys) bool {
	before := f.chosen
	switch {
	case key.Matches(msg, keys.Left):
		if f.chosen <= 0 {
			f.chosen = len(f.choices) - 1
		} else {
			f.chosen--
		}
	case key.Matches(msg, keys.Right), msg.Type == tea.KeySpace:
		f.chosen = (f.chosen + 1) % len(f.choices)
	case msg.Type == tea.KeyRunes:
		typed := strings.ToLower(string(msg.Runes))
		for i, c := range f.choices {
			if typed == c.key {
				f.chosen = i
			}
		}
		if f.chosen == before {
			f.note = "type " + f.choiceKeys()
		}
	}
	return f.chosen != before
}

func (f *field) choiceKeys() string {
	var parts []string
	for _, c := range f.choices {
		parts = append(parts, c.key+" "+c.label)
	}
	return strings.Join(parts, ", ")
}

func filterRunes(rs []rune, allowed string) []rune {
	var out []rune
	for _, r := range rs {
		if strings.ContainsRune(allowed, r) {
			out = append(out, r)
		}
	}
	return out
}

func allowedWords(allowed string) string {
	switch {
	case strings.ContainsRune(allowed, ':'):
		return "digits and ':' (like 1:2)"
	case strings.ContainsRune(allowed, 'a') && strings.ContainsRune(allowed, '0'):
		return "letters, digits and - _ . /"
	case strings.ContainsRune(allowed, 'a'):
		return "letters"
	}
	return "digits and a decimal point"
}

// Runes a label field accepts: ASCII letters and digits and a few marks.
const (
	labelRunes   = "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789-_./"
	lettersRunes = "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ"
)
