package ui

import (
	"strings"
	"unicode/utf8"

	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"

	"crankside/setup"
)

// fieldKind is what a field holds; it decides which characters it takes.
type fieldKind int

const (
	kindNumber   fieldKind = iota // digits and one decimal mark (point or comma)
	kindRatio                     // an I:E like 1:2
	kindLabel                     // a bed or hole label: letters, digits, - _ . /
	kindInitials                  // letters
	kindChoice                    // one of a few options, picked by letter or arrows
	kindHeight                    // a height: cm, or with its unit (70in, 5'10")
)

// allowedRunes are the characters each kind of text field takes.
var allowedRunes = map[fieldKind]string{
	kindNumber:   "0123456789.,",
	kindRatio:    "0123456789.,:",
	kindLabel:    "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789-_./",
	kindInitials: "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ",
	kindHeight:   "0123456789.,'\" cmintfeohsCMINTFEOHS", // the letters of cm, in, inch(es), ft, feet, foot
}

var kindWords = map[fieldKind]string{
	kindNumber:   "a number (digits and one decimal point or comma)",
	kindRatio:    "a ratio like 1:2",
	kindLabel:    "letters, digits and - _ . /",
	kindInitials: "letters",
	kindHeight:   `a number of cm (178), or inches with their unit (70in, 5'10")`,
}

// choice is one option of a choice field; its key picks it when typed.
type choice struct {
	key, label, value string
}

// field is one entry of a form: a number or label typed in, or a choice.
type field struct {
	name    string // the flag name it feeds ("height-cm"), used to place problems
	label   string
	unit    string
	hint    string // what leaving it empty means
	kind    fieldKind
	input   textinput.Model
	choices []choice
	chosen  int    // index into choices, -1 for none
	err     string // why the entry cannot be used, shown beside it
	note    string // a passing remark, such as why a key was refused
	// selected is true when the field took the focus holding a value: the
	// first character typed replaces it; an arrow, Home or End edits it.
	selected bool
	// from says where a value came from when it was not typed here
	// ("from the record at 14:05").
	from string
	// unconfirmed is true while a value filled from a record has been
	// neither confirmed (Enter) nor changed at the machine.
	unconfirmed bool
}

const fieldWidth = 8

func numberField(name, label, unit, hint string) *field {
	return textField(name, label, unit, hint, kindNumber)
}

func textField(name, label, unit, hint string, kind fieldKind) *field {
	in := textinput.New()
	in.Prompt = ""
	in.CharLimit = 12
	in.Width = fieldWidth
	in.Placeholder = ""
	// A steady cursor: nothing runs in the background between keys.
	in.Cursor.SetMode(cursor.CursorStatic)
	return &field{name: name, label: label, unit: unit, hint: hint, kind: kind, input: in, chosen: -1}
}

func choiceField(name, label, hint string, chosen int, choices ...choice) *field {
	return &field{name: name, label: label, hint: hint, kind: kindChoice, choices: choices, chosen: chosen}
}

func (f *field) isText() bool { return f.kind != kindChoice }

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
	// A prefilled choice may be its value ("male") or its key ("m").
	for i, c := range f.choices {
		if strings.EqualFold(c.value, v) || strings.EqualFold(c.key, v) {
			f.chosen = i
		}
	}
}

func (f *field) focus() tea.Cmd {
	if !f.isText() {
		return nil
	}
	f.selected = f.Value() != ""
	f.input.CursorEnd()
	return f.input.Focus()
}

func (f *field) blur() {
	f.selected = false
	if f.isText() {
		f.input.Blur()
	}
}

// echo is what a number entry was read as, when that differs from the
// text typed (a decimal comma): shown beside the field.
func (f *field) echo() string {
	text := f.Value()
	if f.kind == kindHeight {
		// A height in inches is echoed in cm; the conversion is setup's.
		return setup.HeightEcho(text)
	}
	if f.kind != kindNumber || !strings.Contains(text, ",") {
		return ""
	}
	if v, ok := setup.Understood(text); ok {
		return "read as " + v
	}
	return ""
}

// update handles a key for the field and reports whether its value
// changed; a changed value is no longer the one from a record.
func (f *field) update(msg tea.KeyMsg, keys formKeys) (bool, tea.Cmd) {
	changed, cmd := f.edit(msg, keys)
	if changed {
		f.from = ""
		f.unconfirmed = false
	}
	return changed, cmd
}

func (f *field) edit(msg tea.KeyMsg, keys formKeys) (bool, tea.Cmd) {
	f.note = ""
	if !f.isText() {
		return f.updateChoice(msg, keys), nil
	}
	before := f.input.Value()
	switch {
	case key.Matches(msg, keys.Clear):
		f.input.SetValue("")
		f.selected = false
		return before != "", nil
	case msg.Type == tea.KeyRunes || msg.Type == tea.KeySpace:
		if msg.Type == tea.KeySpace {
			msg.Runes = []rune{' '}
		}
		if !f.typeRunes(msg.Runes) {
			return false, nil
		}
		return f.input.Value() != before, nil
	case msg.Type == tea.KeyBackspace || msg.Type == tea.KeyDelete:
		if f.selected {
			f.input.SetValue("")
			f.selected = false
			return before != "", nil
		}
	default:
		// An arrow, Home or End moves into the value to edit it.
		f.selected = false
	}
	var cmd tea.Cmd
	f.input, cmd = f.input.Update(msg)
	return f.input.Value() != before, cmd
}

// typeRunes types characters into the field, or refuses them all with a
// note: text is never reduced to the characters that happen to fit.
func (f *field) typeRunes(rs []rune) bool {
	// A paste may carry terminal escape sequences: drop them whole.
	rs = []rune(ansi.Strip(string(rs)))
	allowed := allowedRunes[f.kind]
	for _, r := range rs {
		if !strings.ContainsRune(allowed, r) {
			f.note = quoteRune(r) + " cannot go here: " + f.label + " takes " + kindWords[f.kind] + "; nothing typed"
			return false
		}
	}
	if len(rs) == 0 {
		return false
	}
	if f.selected {
		f.input.SetValue("")
		f.selected = false
	}
	room := f.input.CharLimit - utf8.RuneCountInString(f.input.Value())
	if len(rs) > room {
		f.note = "that is longer than an entry can be; nothing typed"
		return false
	}
	f.input, _ = f.input.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: rs})
	return true
}

func quoteRune(r rune) string {
	switch {
	case r < 0x20 || r == 0x7f:
		return "a control character"
	case r == ' ':
		return "a space"
	}
	return "'" + string(r) + "'"
}

func (f *field) updateChoice(msg tea.KeyMsg, keys formKeys) bool {
	before := f.chosen
	// Only typing keys choose: a letter, or Space for the next option.
	// Arrows never change a value, so an arrow pressed to move on can
	// never change the patient's sex or lung condition.
	switch {
	case msg.Type == tea.KeySpace:
		f.chosen = (f.chosen + 1) % len(f.choices)
	case msg.Type == tea.KeyRunes:
		typed := strings.ToLower(string(msg.Runes))
		found := false
		for i, c := range f.choices {
			if typed == c.key {
				f.chosen, found = i, true
			}
		}
		switch {
		case !found:
			f.note = "'" + string(msg.Runes) + "' is not a choice here: type " + f.choiceKeys()
		case f.chosen == before:
			f.note = "already " + f.choices[f.chosen].label
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
