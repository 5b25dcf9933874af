package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
)

// machinePanel shows the loaded profile: what it is, its geometry, motor
// and controller limits, circuit, and the calibration's age.
type machinePanel struct {
	keys    machineKeys
	styles  *Styles
	out     *outcome
	sig     signals
	focused bool
	w, h    int
}

func newMachinePanel(s *Styles) *machinePanel {
	return &machinePanel{keys: newMachineKeys(), styles: s}
}

func (p *machinePanel) Init() tea.Cmd         { return nil }
func (p *machinePanel) Title() string         { return "Machine" }
func (p *machinePanel) Editing() bool         { return false }
func (p *machinePanel) Focus() tea.Cmd        { p.focused = true; return nil }
func (p *machinePanel) Blur()                 { p.focused = false }
func (p *machinePanel) SetOutcome(o *outcome) { p.out = o }
func (p *machinePanel) SetSize(w, h int)      { p.w, p.h = w, h }

func (p *machinePanel) Signals() signals {
	s := p.sig
	p.sig = signals{}
	return s
}

func (p *machinePanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	if km, ok := msg.(tea.KeyMsg); ok {
		switch {
		case key.Matches(km, p.keys.Pick):
			p.sig.pick = true
		case key.Matches(km, p.keys.Advance):
			p.sig.advance = true
		}
	}
	return p, nil
}

func (p *machinePanel) View() string {
	s := p.styles
	if p.out == nil || p.out.summary == nil {
		return s.Waiting.Render("no profile loaded")
	}
	sum := p.out.summary
	pr := sum.Profile
	var lines []string
	add := func(l string) { lines = append(lines, l) }
	add(s.Value.Render(pr.Label) + s.Label.Render("  id "+pr.ID+", "+p.out.source.String()))
	if p.out.loadErr != "" {
		add(s.Error.Render("! not loaded: " + p.out.loadErr))
	}
	add("")
	crank := "in-line"
	if !sum.InLine {
		crank = fmt.Sprintf("offset %.2f cm", pr.Crank.OffsetCm)
	}
	first, last := sum.Holes[0], sum.Holes[len(sum.Holes)-1]
	add(s.kv("Cylinder", "bore "+f1(pr.Cylinder.BoreCm), "cm") + s.Unit.Render(fmt.Sprintf(", ring friction %.0f N", pr.Cylinder.RingFrictionN)))
	add(s.kv("Crank", fmt.Sprintf("rod %.1f", pr.Crank.RodCm), "cm") + s.Unit.Render(", "+crank))
	add(s.kv("Holes", fmt.Sprintf("%d", len(sum.Holes)), "") + s.Unit.Render(fmt.Sprintf(": %s (r %.1f cm, %.0f mL) to %s (r %.1f cm, %.0f mL)",
		first.Label, first.RadiusCm, first.EffectiveSweptML, last.Label, last.RadiusCm, last.EffectiveSweptML)))
	if pr.Motor.Fixed() {
		add(s.kv("Motor", "fixed "+f1(pr.Motor.RPM), "rpm") + s.Unit.Render(fmt.Sprintf(", rated %.1f N m", pr.Motor.RatedTorqueNm)))
	} else {
		add(s.kv("Motor", fmt.Sprintf("%.1f-%.1f", pr.Motor.MinRPM, pr.Motor.MaxRPM), "rpm") +
			s.Unit.Render(fmt.Sprintf(" in %.2g rpm steps, rated %.1f N m", pr.Motor.RPMStep, pr.Motor.RatedTorqueNm)))
	}
	add(s.kv("Dwell timer", fmt.Sprintf("%.2g s steps", pr.Controller.DwellStepS), "") + s.Unit.Render(fmt.Sprintf(", up to %.1f s", pr.Controller.MaxDwellS)))
	add(s.kv("Circuit", f2(pr.Circuit.ComplianceMLPerCmH2O), "mL/cmH2O") +
		s.Unit.Render(fmt.Sprintf(", exp. valve %.1f cmH2O/(L/s), relief %.0f cmH2O", pr.Circuit.ExpiratoryResistanceCmH2OPerLS, pr.Circuit.ReliefCmH2O)))
	c := sum.Calibration
	if c.Fit == nil {
		add(s.kv("Calibration", "none", "") + s.Unit.Render(" (k 1, b 0 mL: geometric volumes)"))
	} else {
		add(s.kv("Calibration", c.Date, "") + s.Unit.Render(fmt.Sprintf(" (%d days old): k %.3f, b %.1f mL, %d points on %d holes", c.AgeDays, c.K, c.BML, c.Points, c.Holes)))
	}
	for _, cn := range sum.Cautions {
		add("  " + s.levelWord(cn.Level) + " " + cn.Message)
	}
	add("")
	add(s.Hint.Render("Press p to load another profile (embedded demos and the profiles directory)."))
	return fit(strings.Join(lines, "\n"), p.w, p.h)
}

func (p *machinePanel) ShortHelp() []key.Binding { return []key.Binding{p.keys.Pick, p.keys.Advance} }
func (p *machinePanel) FullHelp() [][]key.Binding {
	return [][]key.Binding{{p.keys.Pick, p.keys.Advance}}
}
