package ui

import (
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
)

// patientPanel asks who the machine is for: height, sex, lung condition,
// and optionally FiO2, PEEP and known mechanics.
type patientPanel struct {
	form   form
	styles *Styles
	out    *outcome
	sig    signals
	w, h   int
}

func newPatientPanel(s *Styles) *patientPanel {
	return &patientPanel{styles: s, form: newForm(s,
		numberField("height-cm", "Height", "cm", "required, 130-230 cm", true),
		choiceField("sex", "Sex", "required: m or f", -1, choice{"m", "male", "male"}, choice{"f", "female", "female"}),
		choiceField("lung", "Lung condition", "", 0,
			choice{"n", "normal", "normal"}, choice{"a", "ARDS", "ards"}, choice{"o", "obstructive", "obstructive"}),
		numberField("fio2", "FiO2 wanted", "", "blank: 0.21, no oxygen", false),
		numberField("peep", "PEEP", "cmH2O", "blank: 5; ARDS: table", false),
		numberField("compliance", "Compliance", "mL/cmH2O", "blank: by condition", false),
		numberField("resistance", "Resistance", "cmH2O/(L/s)", "blank: by condition", false),
	)}
}

func (p *patientPanel) Init() tea.Cmd         { return nil }
func (p *patientPanel) Title() string         { return "Patient" }
func (p *patientPanel) Editing() bool         { return p.form.editing() }
func (p *patientPanel) Focus() tea.Cmd        { return p.form.focus() }
func (p *patientPanel) Blur()                 { p.form.blur() }
func (p *patientPanel) SetOutcome(o *outcome) { p.out = o }
func (p *patientPanel) SetSize(w, h int)      { p.w, p.h = w, h; p.form.width = w }

func (p *patientPanel) Signals() signals {
	s := p.sig
	p.sig = signals{}
	return s
}

func (p *patientPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok {
		return p, nil
	}
	r, cmd := p.form.update(km)
	p.sig.changed = p.sig.changed || r.changed
	p.sig.advance = p.sig.advance || r.leave
	return p, cmd
}

func (p *patientPanel) View() string {
	s := p.styles
	body := p.form.view()
	foot := s.Hint.Render("No name or other identifier is asked for or kept.")
	if p.out != nil && p.out.plan != nil {
		pl := p.out.plan
		foot = s.Label.Render("PBW ") + s.Value.Render(f1(pl.PBWKg)) + s.Unit.Render(" kg") +
			s.Label.Render("  (ARDS Network 2000 formula)") + "\n" + foot
	}
	return fit(body+"\n\n"+foot, p.w, p.h)
}

func (p *patientPanel) ShortHelp() []key.Binding {
	k := p.form.keys
	if p.form.current().isText() {
		return []key.Binding{k.Advance, k.Up, k.Down}
	}
	return []key.Binding{k.Left, k.Advance, k.Up, k.Down}
}

func (p *patientPanel) FullHelp() [][]key.Binding {
	k := p.form.keys
	return [][]key.Binding{{k.Advance, k.Up, k.Down}, {k.Left, k.Clear}}
}
