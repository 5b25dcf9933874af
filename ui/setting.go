package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"crankside/setup"
)

// settingPanel is what to set on the machine and what the patient gets,
// with one breath drawn beside it when there is room.
type settingPanel struct {
	panelBase
	keys scrollKeys
}

func newSettingPanel(s *Styles) *settingPanel {
	p := &settingPanel{keys: newScrollKeys()}
	p.styles = s
	return p
}

func (p *settingPanel) Title() string { return "Setting" }

func (p *settingPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	if km, ok := msg.(tea.KeyMsg); ok && key.Matches(km, p.keys.Advance) {
		p.sig.advance = true
	}
	return p, nil
}

// detailWidth is the width of the figures column beside the chart.
const detailWidth = 44

func (p *settingPanel) View() string {
	s := p.styles
	if p.out == nil || p.out.plan == nil {
		return fit(s.waitingView(p.waiting()), p.w, p.h)
	}
	details := p.details(p.out.plan)
	chartW := p.w - detailWidth - 2
	if chartW >= 30 && p.h >= 12 {
		chart := breathChart(p.out.trace, chartW, p.h, s)
		left := lipgloss.NewStyle().Width(detailWidth).Render(fit(details, detailWidth, p.h))
		return fit(lipgloss.JoinHorizontal(lipgloss.Top, left, "  ", chart), p.w, p.h)
	}
	return fit(details, p.w, p.h)
}

func (p *settingPanel) details(pl *setup.Plan) string {
	s := p.styles
	var l []string
	add := func(x string) { l = append(l, x) }
	add(s.Section.Render("SET ON THE MACHINE"))
	add(s.kv(" Pin hole", pl.Hole.Label, "") + s.Unit.Render(fmt.Sprintf("  (r %.1f cm, %.0f mL)", pl.Hole.RadiusCm, pl.Hole.EffectiveSweptML)))
	add(s.kv(" Motor speed", f1(pl.Timing.RPM), "rpm"))
	add(s.kv(" Dwell", f1(pl.Timing.DwellS), "s"))
	add(s.kv(" PEEP valve", f0(pl.PEEPCmH2O), "cmH2O"))
	if pl.O2FlowLPerMin > 0 {
		add(s.kv(" O2 bleed", f1(pl.O2FlowLPerMin), "L/min") + s.Unit.Render(fmt.Sprintf(" FiO2 %.2f estimated", pl.Figures.FiO2)))
	} else {
		add(s.kv(" O2 bleed", "none", "") + s.Unit.Render(fmt.Sprintf(" (room air, FiO2 %.2f)", pl.Figures.FiO2)))
	}
	add(s.Section.Render("THE PATIENT GETS"))
	add(s.kv(" Tidal volume", f0(pl.Hole.DeliveredML), "mL") + " " + s.Value.Render(f1(pl.Hole.MLPerKg)) + s.Unit.Render(fmt.Sprintf(" mL/kg (aim %.0f)", pl.TargetVtML)))
	var nb []string
	if pl.Below != nil {
		nb = append(nb, fmt.Sprintf("%s: %.1f", pl.Below.Label, pl.Below.MLPerKg))
	}
	if pl.Above != nil {
		nb = append(nb, fmt.Sprintf("%s: %.1f", pl.Above.Label, pl.Above.MLPerKg))
	}
	add(s.kv(" Next holes", strings.Join(nb, "  "), "mL/kg"))
	add(s.kv(" Rate", f1(pl.Timing.RateBPM), "/min") + s.Unit.Render(fmt.Sprintf(" Ti %.2f s 1:%.1f", pl.Timing.TiS, pl.Timing.IE)))
	add(s.kv(" Minute vent.", f1(pl.MinuteVentLPerMin), "L/min") + s.Unit.Render(fmt.Sprintf(" peak %.0f L/min", pl.PeakFlowLPerMin)))
	add(s.kv(" Peak", f1(pl.PeakCmH2O), "cmH2O") + s.Unit.Render(fmt.Sprintf(" end-insp %.1f", pl.EndInspCmH2O)))
	add(s.kv(" Plateau", f1(pl.PlateauCmH2O), "cmH2O") + s.Unit.Render(fmt.Sprintf(" driving %.1f", pl.DrivingCmH2O)))
	add(s.kv(" Trapped gas", f0(pl.TrappedML), "mL") + s.Unit.Render(fmt.Sprintf(" PEEPi %.1f cmH2O", pl.IntrinsicPEEPCmH2O)))
	add(s.kv(" Torque", f2(pl.PeakTorqueNm), "N m") + s.Unit.Render(fmt.Sprintf(" %.0f%% of rating", 100*pl.TorqueShareOfRating)))
	if len(pl.Changes) > 0 {
		line := s.Label.Render(fmt.Sprintf("%-14s", " Rounding"))
		width := 14
		for i, c := range pl.Changes {
			part := fmt.Sprintf("%s %s->%s", shortWhat(c.What), trimFloat(c.Wanted), trimFloat(c.Got))
			if i < len(pl.Changes)-1 {
				part += ";"
			}
			if width+len(part)+1 > detailWidth && width > 14 {
				add(line)
				line, width = strings.Repeat(" ", 14), 14
			}
			line += s.Unit.Render(part + " ")
			width += len(part) + 1
		}
		add(line)
	}
	for _, c := range pl.Cautions {
		add(s.levelWord(c.Level) + " " + s.Caution.Render(c.Message))
	}
	return strings.Join(l, "\n")
}

func shortWhat(w string) string {
	switch w {
	case "motor speed":
		return "rpm"
	case "I:E (E of 1:E)":
		return "I:E"
	}
	return w
}

func (p *settingPanel) ShortHelp() []key.Binding  { return []key.Binding{p.keys.Advance} }
func (p *settingPanel) FullHelp() [][]key.Binding { return [][]key.Binding{{p.keys.Advance}} }
