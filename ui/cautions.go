package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/setup"
)

// cautionsPanel lists every caution with its advice and the source of its
// limit, most serious first.
type cautionsPanel struct {
	panelBase
	keys   scrollKeys
	offset int
}

func newCautionsPanel(s *Styles) *cautionsPanel {
	p := &cautionsPanel{keys: newScrollKeys()}
	p.styles = s
	return p
}

func (p *cautionsPanel) Title() string { return "Cautions" }

// SetOutcome also scrolls back to the top: the list is a new one.
func (p *cautionsPanel) SetOutcome(o *outcome) { p.out = o; p.offset = 0 }

func (p *cautionsPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok {
		return p, nil
	}
	switch {
	case key.Matches(km, p.keys.Down):
		if p.offset < len(p.lines())-p.h {
			p.offset++
		}
	case key.Matches(km, p.keys.Up):
		if p.offset > 0 {
			p.offset--
		}
	case key.Matches(km, p.keys.Advance):
		return p, ask(advanceRequested{})
	}
	return p, nil
}

// lines are the plan's cautions and, once the handover panel has a check,
// the check's (now and proposed) under their own headings: the handover's
// STOPs are never only on F6.
func (p *cautionsPanel) lines() []string {
	s := p.styles
	var l []string
	var ck *setup.Check
	if p.out != nil {
		ck = p.out.check
	}
	if ck != nil {
		l = append(l, s.Section.Render("HANDOVER CHECK (F6): what the machine is set to now"))
		l = append(l, p.cautionList(ck.Current.Cautions, "No cautions for the setting found.")...)
		if ck.Proposed != nil {
			l = append(l, "", s.Section.Render("HANDOVER CHECK (F6): the proposed change"))
			l = append(l, p.cautionList(ck.Proposed.Cautions, "No cautions for the proposed change.")...)
		}
		l = append(l, "", s.Section.Render("NEW PATIENT PLAN (F1-F4)"))
	}
	if p.out == nil || p.out.plan == nil {
		return append(l, strings.Split(s.waitingView(p.waiting()), "\n")...)
	}
	return append(l, p.cautionList(p.out.plan.Cautions, "No cautions for this setting.")...)
}

// cautionList is every caution with its level, value and limit, message,
// advice and source; none is cut short.
func (p *cautionsPanel) cautionList(cs []setup.Caution, none string) []string {
	s := p.styles
	if len(cs) == 0 {
		return []string{s.Value.Render(none), s.Hint.Render("Confirm it at the bedside all the same.")}
	}
	var l []string
	indent := "     "
	wrap := func(text string, st func(...string) string) {
		for _, line := range wrapWords(max(p.w-len(indent), 20), strings.Fields(text)...) {
			l = append(l, indent+st(line))
		}
	}
	for _, c := range cs {
		head := s.levelWord(c.Level) + " " + s.Value.Render(string(c.ID))
		if c.Value != 0 || c.Limit != 0 {
			head += s.Label.Render(fmt.Sprintf("  value %s, limit %s %s", trimFloat(c.Value), trimFloat(c.Limit), c.Unit))
		}
		l = append(l, head)
		wrap(c.Message, s.Value.Render)
		wrap("-> "+c.Advice+" ["+c.Source+"]", s.Hint.Render)
	}
	return l
}

func (p *cautionsPanel) View() string {
	l := p.lines()
	if off := min(p.offset, len(l)-1); off > 0 {
		l = append([]string{p.styles.Hint.Render(fmt.Sprintf("^ %d line%s above (up arrow)", off, plural(off)))}, l[off:]...)
	}
	return strings.Join(l, "\n")
}

func (p *cautionsPanel) ShortHelp() []key.Binding { return []key.Binding{p.keys.Down, p.keys.Advance} }
func (p *cautionsPanel) FullHelp() [][]key.Binding {
	return [][]key.Binding{{p.keys.Up, p.keys.Advance}}
}
