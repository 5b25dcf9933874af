package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/report"
	"crankside/setup"
)

// settingPanel is what to set on the machine and what the patient gets,
// with one breath drawn beside it when there is room. A setting with a
// stop is never shown under a heading that says to set it, and its stop
// lines are on this panel itself.
type settingPanel struct {
	panelBase
	keys scrollKeys
	bed  bedsideKeys
	// chart is the breath drawn for the current trace at chartW x chartH:
	// drawn once per plan and size, never per keystroke.
	chart          string
	chartFor       *setup.Trace
	chartW, chartH int
}

func newSettingPanel(s *Styles) *settingPanel {
	p := &settingPanel{keys: newScrollKeys(), bed: newBedsideKeys()}
	p.styles = s
	return p
}

func (p *settingPanel) Title() string { return "Setting" }

func (p *settingPanel) SetOutcome(o *outcome) {
	p.out = o
	p.redraw()
}

func (p *settingPanel) SetSize(w, h int) {
	p.w, p.h = w, h
	p.redraw()
}

// redraw draws the chart when the plan or the size changed.
func (p *settingPanel) redraw() {
	var tr *setup.Trace
	if p.out != nil && p.out.plan != nil {
		tr = p.out.trace
	}
	w, h := p.w-detailWidth-2, p.h
	if tr == p.chartFor && w == p.chartW && h == p.chartH {
		return
	}
	p.chartFor, p.chartW, p.chartH, p.chart = tr, w, h, ""
	if tr != nil && w >= 30 && h >= 12 {
		p.chart = breathChart(tr, w, h, p.styles)
	}
}

func (p *settingPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	if km, ok := msg.(tea.KeyMsg); ok && key.Matches(km, p.keys.Advance) {
		return p, ask(advanceRequested{})
	} else if ok {
		return p, p.bed.request(km, false)
	}
	return p, nil
}

// detailWidth is the width of the figures column beside the chart.
const detailWidth = 44

func (p *settingPanel) View() string {
	s := p.styles
	if p.out == nil || p.out.plan == nil {
		return s.waitingView(p.waiting())
	}
	details := p.details(p.out.plan)
	if p.chart != "" {
		return besideEachOther(wrapBlock(details, detailWidth), detailWidth, strings.Split(p.chart, "\n"))
	}
	return details
}

func (p *settingPanel) details(pl *setup.Plan) string {
	s := p.styles
	var l []string
	add := func(x string) { l = append(l, x) }
	for _, c := range pl.Cautions {
		if c.Level == setup.Stop {
			add(s.levelWord(c.Level) + " " + s.Error.Render(c.Message))
		}
	}
	heading := report.SettingHeading(pl.Cautions, "SET ON THE MACHINE")
	if setup.FirstStop(pl.Cautions) != nil {
		add(s.Error.Render(heading))
	} else {
		add(s.Section.Render(heading))
	}
	add(s.kv(" Pin hole", pl.Hole.Label, "") + s.Unit.Render(fmt.Sprintf("  (r %.1f cm, %.0f mL)", pl.Hole.RadiusCm, pl.Hole.EffectiveSweptML)))
	add(s.kv(" Motor speed", f1(pl.Timing.RPM), "rpm"))
	add(s.kv(" Dwell", f1(pl.Timing.DwellS), "s") + s.Unit.Render(" motor stop each turn"))
	add(s.kv(" PEEP valve", f0(pl.PEEPCmH2O), "cmH2O"))
	if pl.O2FlowLPerMin > 0 {
		add(s.kv(" O2 bleed", f1(pl.O2FlowLPerMin), "L/min"))
	} else {
		add(s.kv(" O2 bleed", "none", "") + s.Unit.Render(" (room air)"))
	}
	add(s.Section.Render("THE PATIENT GETS (predicted)"))
	var nb []string
	if pl.Below != nil {
		nb = append(nb, fmt.Sprintf("%s: %.1f", pl.Below.Label, pl.Below.MLPerKg))
	}
	if pl.Above != nil {
		nb = append(nb, fmt.Sprintf("%s: %.1f", pl.Above.Label, pl.Above.MLPerKg))
	}
	add(s.kv(" Aim", f0(pl.TargetVtML), "mL") + s.Unit.Render(fmt.Sprintf(" (%+.0f%% off it)", pl.OffTargetPct)))
	add(s.kv(" Next holes", strings.Join(nb, ", "), "mL/kg"))
	for _, r := range report.PlanFigureRows(*pl) {
		add(s.kv(" "+strings.TrimSpace(r.Label), r.Text, r.Unit))
	}
	add(s.Hint.Render(report.DrivingNote))
	for _, c := range pl.Changes {
		add(s.Label.Render(" Rounded ") + s.Unit.Render(c.What+": wanted "+trimFloat(c.Wanted)+", set "+trimFloat(c.Got)+" "+c.Unit))
	}
	for _, c := range pl.Cautions {
		if c.Level != setup.Stop {
			add(s.levelWord(c.Level) + " " + s.Caution.Render(c.Message))
		}
	}
	for _, wl := range report.PlanWatchLines(*pl) {
		if wl.Heading {
			add(s.Section.Render(wl.Text))
		} else {
			add(" " + s.Unit.Render(wl.Text))
		}
	}
	return strings.Join(l, "\n")
}

func (p *settingPanel) ShortHelp() []key.Binding {
	return []key.Binding{p.keys.Advance, p.bed.Sheet, p.bed.Pace}
}
func (p *settingPanel) FullHelp() [][]key.Binding {
	return [][]key.Binding{{p.keys.Advance}, {p.bed.Sheet, p.bed.Pace}}
}
