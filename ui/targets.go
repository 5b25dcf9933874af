package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/physiology"
	"crankside/setup"
)

// targetsPanel shows PBW and the target volume and asks for mL/kg, rate
// and I:E; the PEEP shown is the patient panel's, with the table's range.
type targetsPanel struct {
	formPanel
}

func newTargetsPanel(s *Styles) *targetsPanel {
	p := &targetsPanel{}
	p.styles = s
	p.form = newForm(s, section{fields: []*field{
		numberField("ml-per-kg", "Tidal volume", "mL/kg PBW", setup.Hint("ml-per-kg", physiology.Normal)),
		numberField("rate", "Rate", "/min", setup.Hint("rate", physiology.Normal)),
		textField("ie", "I:E", "", setup.Hint("ie", physiology.Normal), kindRatio),
	}})
	return p
}

func (p *targetsPanel) Title() string { return "Targets" }

func (p *targetsPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	if km, ok := msg.(tea.KeyMsg); ok {
		return p, p.updateForm(km)
	}
	return p, nil
}

func (p *targetsPanel) View() string {
	s := p.styles
	var b strings.Builder
	b.WriteString(p.form.view() + "\n\n")
	if p.out == nil || p.out.plan == nil {
		b.WriteString(s.waitingView(p.waiting()))
		return b.String()
	}
	pl := p.out.plan
	src := func(v string) string { return s.Hint.Render("  " + v) }
	lines := []string{
		s.kv("PBW", f1(pl.PBWKg), "kg") + src("ARDS Network 2000, after Devine"),
		s.kv("Target Vt", f0(pl.TargetVtML), "mL") + s.Unit.Render(fmt.Sprintf(" = %.1f mL/kg x %.1f kg", pl.MLPerKg.Value, pl.PBWKg)),
		s.kv("Rate", f0(pl.Rate.Value), "/min") + src(pl.Rate.Source),
		s.kv("I:E", "1:"+trimFloat(pl.IE.Value), "") + src(pl.IE.Source),
		s.kv("PEEP", f0(pl.PEEP.Value), "cmH2O") + src(pl.PEEP.Source),
		s.kv("PEEP table", fmt.Sprintf("%.0f-%.0f", pl.PEEPTable.LowestCmH2O, pl.PEEPTable.HighestCmH2O), "cmH2O") +
			src(fmt.Sprintf("lower-PEEP/FiO2 table at FiO2 %.1f", pl.PEEPTable.FiO2Step)),
		s.kv("FiO2", f2(pl.FiO2.Value), "") + src(pl.FiO2.Source),
		s.kv("Lung model", fmt.Sprintf("C %.0f", pl.Compliance.Value), "mL/cmH2O") + s.Value.Render(fmt.Sprintf("  R %.0f", pl.Resistance.Value)) + " " + s.Unit.Render("cmH2O/(L/s)") +
			src(pl.Compliance.Source),
	}
	b.WriteString(strings.Join(lines, "\n"))
	return b.String()
}

func trimFloat(v float64) string {
	return strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.2f", v), "0"), ".")
}

func (p *targetsPanel) ShortHelp() []key.Binding {
	k := p.form.keys
	return []key.Binding{k.Advance, k.Up, k.Down}
}

func (p *targetsPanel) FullHelp() [][]key.Binding {
	k := p.form.keys
	return [][]key.Binding{{k.Advance, k.Up, k.Down, k.Clear}}
}
