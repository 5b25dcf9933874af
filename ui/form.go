package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
)

// form is a column of fields with a cursor; the patient and targets panels
// are built on it.
type form struct {
	fields  []*field
	cursor  int
	focused bool
	keys    formKeys
	styles  *Styles
	width   int
	// compact drops units and hints and narrows labels, for a form drawn
	// beside its results; errors are then listed with the results.
	compact bool
	// height, when set, is the most lines the form may draw; it then
	// scrolls to keep the cursor in view.
	height int
	// headings are the section titles drawn above their first field.
	headings map[*field]string
}

// section is a titled group of a form's fields; the title may be empty.
type section struct {
	title  string
	fields []*field
}

func newForm(styles *Styles, sections ...section) form {
	f := form{keys: newFormKeys(), styles: styles, headings: map[*field]string{}}
	for _, sec := range sections {
		if sec.title != "" && len(sec.fields) > 0 {
			f.headings[sec.fields[0]] = sec.title
		}
		f.fields = append(f.fields, sec.fields...)
	}
	return f
}

func (f *form) current() *field { return f.fields[f.cursor] }

func (f *form) focus() tea.Cmd {
	f.focused = true
	return f.current().focus()
}

func (f *form) blur() {
	f.focused = false
	for _, fl := range f.fields {
		fl.blur()
	}
}

func (f *form) move(to int) tea.Cmd {
	f.current().blur()
	f.cursor = to
	return f.current().focus()
}

// formResult says what a key did to the form.
type formResult struct {
	changed bool // a value changed: recompute
	leave   bool // Enter on the last field: on to the next panel
}

func (f *form) update(msg tea.KeyMsg) (formResult, tea.Cmd) {
	switch {
	case key.Matches(msg, f.keys.Down):
		if f.cursor < len(f.fields)-1 {
			return formResult{}, f.move(f.cursor + 1)
		}
		return formResult{}, nil
	case key.Matches(msg, f.keys.Up):
		if f.cursor > 0 {
			return formResult{}, f.move(f.cursor - 1)
		}
		return formResult{}, nil
	case key.Matches(msg, f.keys.Advance):
		// Enter on a value from a record confirms it as found at the
		// machine (the check then stops asking for it).
		confirmed := f.current().unconfirmed
		f.current().unconfirmed = false
		if f.cursor < len(f.fields)-1 {
			return formResult{changed: confirmed}, f.move(f.cursor + 1)
		}
		return formResult{changed: confirmed, leave: true}, nil
	}
	changed, cmd := f.current().update(msg, f.keys)
	return formResult{changed: changed}, cmd
}

func (f *form) byName(name string) *field {
	for _, fl := range f.fields {
		if fl.name == name {
			return fl
		}
	}
	return nil
}

func (f *form) clearErrors() {
	for _, fl := range f.fields {
		fl.err = ""
	}
}

const labelWidth = 15

// view draws one line per field: label, entry, unit, then the error, the
// passing note or the hint.
func (f *form) view() string {
	s := f.styles
	lw := labelWidth
	if f.compact {
		lw = compactLabelWidth
	}
	var lines []string
	cursorLine := 0
	for i, fl := range f.fields {
		if h := f.headings[fl]; h != "" {
			lines = append(lines, s.Section.Render(h))
		}
		if i == f.cursor {
			cursorLine = len(lines)
		}
		mark := "  "
		label := s.Label.Render(fmt.Sprintf("%-*s", lw, fl.label))
		if f.focused && i == f.cursor {
			mark = s.FieldFocused.Render("> ")
			label = s.FieldFocused.Render(fmt.Sprintf("%-*s", lw, fl.label))
		}
		var entry string
		switch {
		case fl.isText() && fl.selected && f.focused && i == f.cursor:
			// The value is selected: the first character typed replaces it.
			entry = "[" + s.Selected.Render(fl.input.Value()) + padRight("", fieldWidth+1-lipgloss.Width(fl.input.Value())) + "]"
		case fl.isText():
			entry = "[" + padRight(fl.input.View(), fieldWidth+1) + "]"
		default:
			entry = f.choiceView(fl, f.focused && i == f.cursor)
		}
		line := mark + label + entry
		if f.compact {
			switch {
			case fl.err != "":
				line += s.Error.Render("!")
			case fl.echo() != "":
				line += s.Value.Render("=" + strings.TrimPrefix(fl.echo(), "read as "))
			case fl.unconfirmed:
				line += s.Error.Render("?") // from a record, not yet confirmed
			}
			lines = append(lines, line)
			continue
		}
		if fl.unit != "" && !(fl.kind == kindHeight && fl.echo() != "" && !strings.Contains(fl.Value(), ",")) {
			// A height typed with its own unit (70in) is not followed by "cm".
			line += " " + s.Unit.Render(fl.unit)
		}
		after := ""
		switch {
		case fl.err != "":
			after = s.Error.Render("! " + fl.err)
		case fl.note != "" && f.focused && i == f.cursor:
			after = s.Error.Render(fl.note)
		case fl.selected && f.focused && i == f.cursor:
			// Said in words too: a reversed highlight is not drawn without colour.
			after = s.Hint.Render("typing replaces " + fl.Value() + "; an arrow edits it")
		case fl.echo() != "":
			after = s.Value.Render(fl.echo())
		case fl.from != "":
			after = s.Hint.Render(fl.from)
		case fl.Value() == "" && fl.hint != "":
			after = s.Hint.Render(fl.hint)
		}
		if after != "" {
			line += "  " + after
		}
		lines = append(lines, line)
	}
	return strings.Join(scrollTo(lines, cursorLine, f.height), "\n")
}

// scrollTo keeps line at in view within h lines (h 0: no limit), marking
// hidden lines above and below.
func scrollTo(lines []string, at, h int) []string {
	if h <= 0 || len(lines) <= h {
		return lines
	}
	start := min(max(at-h/2, 0), len(lines)-h)
	out := append([]string(nil), lines[start:start+h]...)
	if start > 0 {
		out[0] = "  ^ more above"
	}
	if start+h < len(lines) {
		out[h-1] = "  v more below"
	}
	return out
}

const compactLabelWidth = 11

func (f *form) choiceView(fl *field, active bool) string {
	if f.compact {
		return f.compactChoiceView(fl, active)
	}
	var parts []string
	for i, c := range fl.choices {
		word := c.label
		if i == fl.chosen {
			word = "(" + c.key + ") " + c.label
			if strings.ToLower(c.label) == c.label {
				// A word gets a capital; a unit (mmHg) or ARDS stays as written.
				word = "(" + c.key + ") " + strings.ToUpper(c.label[:1]) + c.label[1:]
			}
			parts = append(parts, f.styles.Value.Render("["+word+"]"))
			continue
		}
		if active {
			word = "(" + c.key + ") " + word
		}
		parts = append(parts, f.styles.Label.Render(" "+word+" "))
	}
	return strings.Join(parts, "")
}

// compactChoiceView fits a narrow column: the option chosen, and while
// the field is active the others with their keys ("[kPa]  m mmHg").
func (f *form) compactChoiceView(fl *field, active bool) string {
	out := f.styles.Value.Render("[none]")
	if fl.chosen >= 0 {
		out = f.styles.Value.Render("[" + fl.choices[fl.chosen].label + "]")
	}
	if !active {
		return out
	}
	for i, c := range fl.choices {
		if i != fl.chosen {
			out += f.styles.Label.Render("  " + c.key + " " + c.label)
		}
	}
	return out
}

func padRight(s string, w int) string {
	if n := lipgloss.Width(s); n < w {
		return s + strings.Repeat(" ", w-n)
	}
	return s
}
