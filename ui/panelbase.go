package ui

import tea "github.com/charmbracelet/bubbletea"

// panelBase is what every panel holds and does the same way: the shared
// styles and outcome, and the size.
type panelBase struct {
	styles *Styles
	out    *outcome
	w, h   int
}

func (b *panelBase) Init() tea.Cmd         { return nil }
func (b *panelBase) SetOutcome(o *outcome) { b.out = o }
func (b *panelBase) SetSize(w, h int)      { b.w, b.h = w, h }
func (b *panelBase) Focus() tea.Cmd        { return nil }
func (b *panelBase) Blur()                 {}
func (b *panelBase) Editing() bool         { return false }

// waiting is the reasons the figures are not shown, if any.
func (b *panelBase) waiting() []string {
	if b.out == nil {
		return nil
	}
	return b.out.waiting
}

// formPanel is a panel built on a form: its keys move the cursor and
// change the entries, and a change asks the root to recompute.
type formPanel struct {
	panelBase
	form form
}

func (p *formPanel) Editing() bool  { return p.form.focused }
func (p *formPanel) Focus() tea.Cmd { return p.form.focus() }
func (p *formPanel) Blur()          { p.form.blur() }

func (p *formPanel) SetSize(w, h int) {
	p.w, p.h = w, h
	p.form.width = w
}

// updateForm passes a key to the form and asks the root for what it
// needs: a recompute after a change, the next panel after the last field.
func (p *formPanel) updateForm(km tea.KeyMsg) tea.Cmd {
	r, cmd := p.form.update(km)
	var cmds []tea.Cmd
	if r.changed {
		cmds = append(cmds, ask(entryChanged{}))
	}
	if r.leave {
		cmds = append(cmds, ask(advanceRequested{}))
	}
	return tea.Batch(append(cmds, cmd)...)
}
