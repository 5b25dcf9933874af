package ui

import (
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/physiology"
	"crankside/setup"
)

// patientPanel asks who the machine is for: height, sex, lung condition,
// and optionally FiO2, PEEP and known mechanics. The hints beside empty
// fields come from setup, with their sources.
type patientPanel struct {
	formPanel
}

func newPatientPanel(s *Styles) *patientPanel {
	p := &patientPanel{}
	p.styles = s
	p.form = newForm(s, section{fields: []*field{
		textField("height-cm", "Height", "cm", setup.Hint("height-cm", physiology.Normal), kindHeight),
		choiceField("sex", "Sex", setup.Hint("sex", physiology.Normal), -1, choice{"m", "male", "male"}, choice{"f", "female", "female"}),
		choiceField("lung", "Lung condition", "", 0,
			choice{"n", "normal", "normal"}, choice{"a", "ARDS", "ards"}, choice{"o", "obstructive", "obstructive"}),
		numberField("fio2", "FiO2 wanted", "", setup.Hint("fio2", physiology.Normal)),
		numberField("peep", "PEEP", "cmH2O", setup.Hint("peep", physiology.Normal)),
		numberField("compliance", "Compliance", "mL/cmH2O", setup.Hint("compliance", physiology.Normal)),
		numberField("resistance", "Resistance", "cmH2O/(L/s)", setup.Hint("resistance", physiology.Normal)),
	}})
	return p
}

// setHints shows the defaults of the lung condition chosen.
func (p *patientPanel) setHints(lung physiology.Lung) {
	for _, fl := range p.form.fields {
		if h := setup.Hint(fl.name, lung); h != "" && fl.name != "lung" {
			fl.hint = h
		}
	}
}

func (p *patientPanel) Title() string { return "Patient" }

func (p *patientPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	if km, ok := msg.(tea.KeyMsg); ok {
		return p, p.updateForm(km)
	}
	return p, nil
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
	if p.out != nil && p.out.logNote != "" {
		// Where checks are recorded, and whether they can be, is said on
		// the first screen, not first at Ctrl+S.
		st := s.Hint
		if strings.HasPrefix(p.out.logNote, "CANNOT") {
			st = s.Error
		}
		foot += "\n" + st.Render(p.out.logNote)
	}
	return body + "\n\n" + foot
}

func (p *patientPanel) ShortHelp() []key.Binding {
	k := p.form.keys
	if p.form.current().isText() {
		return []key.Binding{k.Advance, k.Up, k.Down}
	}
	return []key.Binding{k.Choose, k.Advance, k.Up, k.Down}
}

func (p *patientPanel) FullHelp() [][]key.Binding {
	k := p.form.keys
	return [][]key.Binding{{k.Advance, k.Up, k.Down}, {k.Choose, k.Left, k.Clear}}
}
