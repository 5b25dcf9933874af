package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/profiles"
	"crankside/setup"
)

// picker lists the embedded profiles and those in the profiles directory;
// a bad file is listed with its error and cannot be chosen.
type picker struct {
	entries []profiles.Entry
	listErr string
	cursor  int
	keys    pickerKeys
	styles  *Styles
	dir     string
	note    string
}

func newPicker(dir string, current string, s *Styles) *picker {
	p := &picker{keys: newPickerKeys(), styles: s, dir: dir}
	entries, err := profiles.List(dir)
	if err != nil {
		p.listErr = err.Error()
	}
	p.entries = entries
	for i, e := range entries {
		if e.ID == current && e.Err == nil {
			p.cursor = i
		}
	}
	return p
}

// pickResult is what a key did in the picker.
type pickResult struct {
	chosen *profiles.Entry
	cancel bool
}

func (p *picker) update(msg tea.KeyMsg) pickResult {
	p.note = ""
	switch {
	case key.Matches(msg, p.keys.Cancel):
		return pickResult{cancel: true}
	case key.Matches(msg, p.keys.Up):
		if p.cursor > 0 {
			p.cursor--
		}
	case key.Matches(msg, p.keys.Down):
		if p.cursor < len(p.entries)-1 {
			p.cursor++
		}
	case key.Matches(msg, p.keys.Choose):
		if len(p.entries) == 0 {
			return pickResult{}
		}
		e := p.entries[p.cursor]
		if e.Err != nil {
			p.note = "this file cannot be loaded: fix it and open the picker again"
			return pickResult{}
		}
		return pickResult{chosen: &e}
	}
	return pickResult{}
}

func (p *picker) view(w, h int) string {
	s := p.styles
	var l []string
	l = append(l, s.Section.Render("LOAD A MACHINE PROFILE"))
	dir := p.dir
	if dir == "" {
		dir = "(none)"
	}
	l = append(l, s.Label.Render("profiles directory: "+dir))
	if p.listErr != "" {
		l = append(l, s.Error.Render("! "+p.listErr))
	}
	l = append(l, "")
	for i, e := range p.entries {
		mark := "  "
		if i == p.cursor {
			mark = s.FieldFocused.Render("> ")
		}
		if e.Err != nil {
			l = append(l, mark+s.Value.Render(fmt.Sprintf("%-14s", e.ID))+" "+s.levelWord(setup.Warn)+" "+s.Error.Render(e.Err.Error()))
			continue
		}
		l = append(l, mark+s.Value.Render(fmt.Sprintf("%-14s", e.ID))+" "+e.Label+s.Label.Render("  "+e.Source.String()))
	}
	if p.note != "" {
		l = append(l, "", s.Error.Render(p.note))
	}
	return fit(strings.Join(l, "\n"), w, h)
}

func (p *picker) ShortHelp() []key.Binding {
	return []key.Binding{p.keys.Up, p.keys.Down, p.keys.Choose, p.keys.Cancel}
}

func (p *picker) FullHelp() [][]key.Binding { return [][]key.Binding{p.ShortHelp()} }
