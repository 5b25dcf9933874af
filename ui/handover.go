package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"crankside/setup"
)

// handoverKeys save the check, show the card and the bed's history.
type handoverKeys struct {
	Save, Card, History key.Binding
}

func newHandoverKeys() handoverKeys {
	return handoverKeys{
		Save:    key.NewBinding(key.WithKeys("ctrl+s"), key.WithHelp("ctrl+s", "record")),
		Card:    key.NewBinding(key.WithKeys("ctrl+o"), key.WithHelp("ctrl+o", "card")),
		History: key.NewBinding(key.WithKeys("ctrl+r"), key.WithHelp("ctrl+r", "history")),
	}
}

// handoverPanel asks what the machine is set to and what the manometer
// reads, and shows what the patient gets, the lung the readings imply and a
// proposed change beside the current setting.
type handoverPanel struct {
	formPanel
	keys handoverKeys
}

func newHandoverPanel(s *Styles) *handoverPanel {
	f := newForm(s,
		textField("bed", "Bed label", "", "like B4", true, labelRunes),
		textField("initials", "Initials", "", "", true, lettersRunes),
		textField("hole", "Hole", "", "", true, labelRunes),
		numberField("rpm", "Motor rpm", "rpm", "", true),
		numberField("dwell-s", "Dwell s", "s", "", true),
		numberField("peep-valve", "PEEP valve", "cmH2O", "blank: 5", false),
		numberField("o2-lpm", "O2 L/min", "L/min", "blank: none", false),
		numberField("peak", "Peak", "cmH2O", "", false),
		numberField("end-pressure", "End insp.", "cmH2O", "", false),
		numberField("cylinder-l", "Cyl. L", "L", "", false),
		numberField("cylinder-bar", "Cyl. bar", "bar", "", false),
		textField("propose-hole", "Hole", "", "", false, labelRunes),
		numberField("propose-rpm", "Motor rpm", "rpm", "", false),
		numberField("propose-dwell-s", "Dwell s", "s", "", false),
		numberField("propose-peep", "PEEP", "cmH2O", "", false),
	)
	f.compact = true
	f.fields[0].heading = "THE MACHINE IS SET TO"
	f.fields[7].heading = "MANOMETER READS"
	f.fields[9].heading = "O2 CYLINDER"
	f.fields[11].heading = "PROPOSE"
	p := &handoverPanel{keys: newHandoverKeys()}
	p.styles, p.form = s, f
	return p
}

func (p *handoverPanel) Title() string { return "Handover" }

func (p *handoverPanel) SetSize(w, h int) {
	p.w, p.h = w, h
	p.form.width, p.form.height = formColumn, h
}

// formColumn is the width of the entries beside the results.
const formColumn = 26

func (p *handoverPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok {
		return p, nil
	}
	switch {
	case key.Matches(km, p.keys.Save):
		p.sig.save = true
		return p, nil
	case key.Matches(km, p.keys.Card):
		p.sig.card = true
		return p, nil
	case key.Matches(km, p.keys.History):
		p.sig.history = true
		return p, nil
	}
	return p, p.updateForm(km)
}

func (p *handoverPanel) View() string {
	left := lipgloss.NewStyle().Width(formColumn).Render(fit(p.form.view(), formColumn, p.h))
	right := fit(p.results(), max(p.w-formColumn-2, 10), p.h)
	return fit(lipgloss.JoinHorizontal(lipgloss.Top, left, "  ", right), p.w, p.h)
}

func (p *handoverPanel) results() string {
	s := p.styles
	o := p.out
	var l []string
	add := func(x string) { l = append(l, x) }
	if o != nil && o.saveNote != "" {
		add(o.saveNote)
	} else {
		add(s.Hint.Render("Bed label only: no name or identifier is kept."))
	}
	if o == nil || o.check == nil {
		var reasons []string
		if o != nil {
			reasons = o.checkWaiting
		}
		add(s.waitingView(reasons))
		return strings.Join(l, "\n")
	}
	ck := o.check
	lung := fmt.Sprintf("C %.0f mL/cmH2O, R %.0f cmH2O/(L/s)", ck.Mechanics.Value, ck.Resistance.Value)
	if ck.Fitted != nil {
		add(s.Label.Render("Fitted lung ") + s.Value.Render(lung))
	} else {
		add(s.Label.Render("Assumed lung ") + s.Value.Render(lung))
	}
	if ck.FitProblem != "" {
		add(s.Error.Render("! " + ck.FitProblem))
	}
	for _, w := range o.checkWaiting {
		add(s.Hint.Render(w))
	}
	cur := ck.Current.Figures
	var prop *setup.Figures
	if ck.Proposed != nil {
		prop = &ck.Proposed.Figures
	}
	head := fmt.Sprintf("%-15s %8s", "", "now")
	if prop != nil {
		head += fmt.Sprintf(" %9s %7s", "proposed", "change")
	}
	add(s.Section.Render(head))
	row := func(label, unit string, get func(f setup.Figures) float64, format string) {
		line := s.Label.Render(fmt.Sprintf("%-15s", label)) + s.Value.Render(fmt.Sprintf(" %8s", fmt.Sprintf(format, get(cur))))
		if prop != nil {
			d := get(*prop) - get(cur)
			line += s.Value.Render(fmt.Sprintf(" %9s", fmt.Sprintf(format, get(*prop)))) + s.Unit.Render(fmt.Sprintf(" %+7.1f", d))
		}
		add(line + " " + s.Unit.Render(unit))
	}
	row("Tidal volume", "mL", func(f setup.Figures) float64 { return f.Hole.DeliveredML }, "%.0f")
	row("  per kg PBW", "mL/kg", func(f setup.Figures) float64 { return f.Hole.MLPerKg }, "%.1f")
	row("Rate", "/min", func(f setup.Figures) float64 { return f.Timing.RateBPM }, "%.1f")
	row("Ti", "s", func(f setup.Figures) float64 { return f.Timing.TiS }, "%.2f")
	row("I:E  1:", "", func(f setup.Figures) float64 { return f.Timing.IE }, "%.1f")
	row("Minute vent.", "L/min", func(f setup.Figures) float64 { return f.MinuteVentLPerMin }, "%.1f")
	row("Peak flow", "L/min", func(f setup.Figures) float64 { return f.PeakFlowLPerMin }, "%.0f")
	row("Peak", "cmH2O", func(f setup.Figures) float64 { return f.PeakCmH2O }, "%.1f")
	row("Plateau", "cmH2O", func(f setup.Figures) float64 { return f.PlateauCmH2O }, "%.1f")
	row("Driving", "cmH2O", func(f setup.Figures) float64 { return f.DrivingCmH2O }, "%.1f")
	row("Intrinsic PEEP", "cmH2O", func(f setup.Figures) float64 { return f.IntrinsicPEEPCmH2O }, "%.1f")
	row("FiO2", "", func(f setup.Figures) float64 { return f.FiO2 }, "%.2f")
	if cur.CylinderGiven {
		row("Cylinder left", "min", func(f setup.Figures) float64 { return f.CylinderMinutes }, "%.0f")
	}
	cautions := func(label string, cs []setup.Caution) {
		if len(cs) == 0 {
			add(s.Label.Render(label + ": no cautions"))
			return
		}
		add(s.Label.Render(fmt.Sprintf("%s: %d, highest ", label, len(cs))) + s.levelWord(setup.Highest(cs)) + " " + s.Caution.Render(cs[0].Message))
	}
	cautions("Now", ck.Current.Cautions)
	if ck.Proposed != nil {
		cautions("Proposed", ck.Proposed.Cautions)
	}
	return strings.Join(l, "\n")
}

func (p *handoverPanel) ShortHelp() []key.Binding {
	k := p.form.keys
	return []key.Binding{k.Advance, p.keys.Save, p.keys.Card, p.keys.History}
}

func (p *handoverPanel) FullHelp() [][]key.Binding {
	k := p.form.keys
	return [][]key.Binding{{k.Advance, k.Up, k.Down, k.Clear}, {p.keys.Save, p.keys.Card, p.keys.History}}
}
