package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/report"
	"crankside/setup"
)

// machineMode is what the machine panel is doing.
type machineMode int

const (
	machineView    machineMode = iota
	machinePath                // asking for a bench file
	machinePreview             // showing a refit before anything is saved
)

// machinePanel shows the loaded profile: what it is, its geometry, motor
// and controller limits, circuit, the calibration's age and residuals, and
// a table of the holes; it refits the calibration from a bench file with a
// preview before saving.
type machinePanel struct {
	panelBase
	keys    machineKeys
	mode    machineMode
	path    textinput.Model
	offset  int // first hole row shown
	preview *setup.CalibrationResult
	// previewOffset scrolls the preview, which is longer than a small window.
	previewOffset int
	note          string
}

func newMachinePanel(s *Styles) *machinePanel {
	in := textinput.New()
	in.Prompt = ""
	in.CharLimit = 512
	in.Width = 50
	in.Cursor.SetMode(cursor.CursorStatic)
	p := &machinePanel{keys: newMachineKeys(), path: in}
	p.styles = s
	return p
}

func (p *machinePanel) Title() string { return "Machine" }
func (p *machinePanel) Editing() bool { return p.mode == machinePath }

// setPreview shows a refit, or why there is none.
func (p *machinePanel) setPreview(res *setup.CalibrationResult, err error) {
	if err != nil {
		p.mode, p.preview, p.note = machineView, nil, "! "+err.Error()
		return
	}
	p.mode, p.preview, p.note, p.previewOffset = machinePreview, res, "", 0
}

// setWritten leaves the preview once the refit is saved, or says why not.
func (p *machinePanel) setWritten(path string, err error) {
	if err != nil {
		p.note = "! NOT saved: " + err.Error()
		return
	}
	p.mode, p.preview, p.note = machineView, nil, "Saved to "+path+" (the previous file is "+path+".bak)"
}

func (p *machinePanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok {
		return p, nil
	}
	switch p.mode {
	case machinePath:
		switch {
		case km.Type == tea.KeyEsc:
			p.mode = machineView
			p.path.Blur()
		case km.Type == tea.KeyEnter:
			p.path.Blur()
			path := strings.TrimSpace(p.path.Value())
			if path == "" {
				p.mode, p.note = machineView, "no bench file given"
				return p, nil
			}
			return p, ask(benchChosen{path: path})
		default:
			var cmd tea.Cmd
			p.path, cmd = p.path.Update(km)
			return p, cmd
		}
		return p, nil
	case machinePreview:
		switch {
		case key.Matches(km, p.keys.Write):
			return p, ask(refitWriteRequest{})
		case key.Matches(km, p.keys.Down):
			p.previewOffset = min(p.previewOffset+1, 200)
		case key.Matches(km, p.keys.Up):
			p.previewOffset = max(p.previewOffset-1, 0)
		case km.Type == tea.KeyEsc:
			p.mode, p.preview, p.note = machineView, nil, "refit discarded; nothing saved"
		}
		return p, nil
	}
	switch {
	case key.Matches(km, p.keys.Pick):
		return p, ask(pickRequested{})
	case key.Matches(km, p.keys.Bench):
		p.mode, p.note = machinePath, ""
		return p, p.path.Focus()
	case key.Matches(km, p.keys.Down):
		p.offset = min(p.offset+1, len(p.holes()))
	case key.Matches(km, p.keys.Up):
		p.offset = max(p.offset-1, 0)
	case key.Matches(km, p.keys.Advance):
		return p, ask(advanceRequested{})
	}
	return p, nil
}

func (p *machinePanel) View() string {
	s := p.styles
	if p.out == nil || p.out.summary == nil {
		msg := "no profile loaded"
		if p.out != nil && p.out.loadErr != "" {
			msg += ": " + p.out.loadErr
		}
		return s.Error.Render(msg)
	}
	if p.mode == machinePreview && p.preview != nil {
		lines := strings.Split(p.previewView(), "\n")
		// The heading stays; the rest scrolls.
		off := min(p.previewOffset, max(len(lines)-p.h, 0))
		if off > 0 {
			lines = append(lines[:1:1], lines[1+off:]...)
		}
		return strings.Join(lines, "\n")
	}
	sum := p.out.summary
	pr := sum.Profile
	var top []string
	add := func(l string) { top = append(top, l) }
	add(s.Value.Render(pr.Label) + s.Label.Render("  id "+pr.ID+", "+p.out.source.String()))
	if p.out.loadErr != "" {
		add(s.Error.Render("! not loaded: " + p.out.loadErr))
	}
	crank := "in-line"
	if !sum.InLine {
		crank = fmt.Sprintf("offset %.2f cm", pr.Crank.OffsetCm)
	}
	add(s.kv("Cylinder", "bore "+f1(pr.Cylinder.BoreCm), "cm") + s.Unit.Render(fmt.Sprintf(", ring friction %.0f N; rod %.1f cm, %s", pr.Cylinder.RingFrictionN, pr.Crank.RodCm, crank)))
	if pr.Motor.Fixed() {
		add(s.kv("Motor", "fixed "+f1(pr.Motor.RPM), "rpm") + s.Unit.Render(fmt.Sprintf(", rated %.1f N m", pr.Motor.RatedTorqueNm)))
	} else {
		add(s.kv("Motor", fmt.Sprintf("%.1f-%.1f", pr.Motor.MinRPM, pr.Motor.MaxRPM), "rpm") +
			s.Unit.Render(fmt.Sprintf(" in %.2g rpm steps, rated %.1f N m", pr.Motor.RPMStep, pr.Motor.RatedTorqueNm)))
	}
	add(s.kv("Dwell timer", fmt.Sprintf("%.2g", pr.Controller.DwellStepS), "s steps") + s.Unit.Render(fmt.Sprintf(", up to %.1f s", pr.Controller.MaxDwellS)))
	add(s.kv("Circuit", f2(pr.Circuit.ComplianceMLPerCmH2O), "mL/cmH2O") +
		s.Unit.Render(fmt.Sprintf(", exp. valve %.1f cmH2O/(L/s), relief %.0f cmH2O, leak %.2g L/min at 20 cmH2O", pr.Circuit.ExpiratoryResistanceCmH2OPerLS, pr.Circuit.ReliefCmH2O, pr.Circuit.LeakLMinAt20CmH2O)))
	add(s.kv("Oxygen", "up to "+f1(sum.MaxO2FlowLPerMin.Value), "L/min") + s.Unit.Render(" ("+sum.MaxO2FlowLPerMin.Source+")"))
	c := sum.Calibration
	if c.Fit == nil {
		add(s.kv("Calibration", "none", "") + s.Unit.Render(" (k 1, b 0 mL: geometric volumes)"))
	} else {
		add(s.kv("Calibration", c.Date, "") + s.Unit.Render(fmt.Sprintf(" (%d days old): k %.3f, b %.1f mL, %d points on %d holes", c.AgeDays, c.K, c.BML, c.Points, c.Holes)))
	}
	for _, cn := range sum.Cautions {
		add("  " + s.levelWord(cn.Level) + " " + cn.Message)
	}
	switch {
	case p.mode == machinePath:
		add(s.FieldFocused.Render("> Bench file (CSV): ") + "[" + p.path.View() + "]")
		add(s.Hint.Render("  header: " + benchHeaderHint))
	case p.note != "":
		style := s.Value
		if strings.HasPrefix(p.note, "!") {
			style = s.Error
		}
		for _, l := range wrapWords(max(p.w, 20), strings.Fields(p.note)...) {
			add(style.Render(l))
		}
	}
	table := p.holeTable(sum)
	top = wrapBlock(strings.Join(top, "\n"), p.w)
	room := p.h - len(top) - 1
	if room < 3 {
		// The panel scrolls as a whole (PgUp/PgDn) when the top is long.
		return strings.Join(append(top, table...), "\n")
	}
	off := min(p.offset, max(len(table)-room+1, 0))
	rows := table[1:]
	if off < len(rows) {
		rows = rows[off:]
	}
	var above []string
	if off > 0 {
		// Said, as below: a hole scrolled out of view is never silently gone.
		above = []string{s.Hint.Render(fmt.Sprintf("  ^ %d more hole%s above (up arrow)", off, plural(off)))}
	}
	if shown := room - 1 - len(above); len(rows) > shown {
		rows = append(rows[:shown-1], s.Hint.Render(fmt.Sprintf("  v %d more holes (down arrow)", len(rows)-(shown-1))))
	}
	rows = append(above, rows...)
	return strings.Join(top, "\n") + "\n" + table[0] + "\n" + strings.Join(rows, "\n")
}

const benchHeaderHint = "hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml"

// holeTable is a header and one row per hole, with the bench residual of
// any hole that was measured.
func (p *machinePanel) holeTable(sum *setup.ProfileSummary) []string {
	s := p.styles
	resid := map[string]string{}
	if c := sum.Calibration; c.Fit != nil {
		for _, r := range c.Residuals {
			resid[r.Hole] += fmt.Sprintf(" %+.1f mL", r.ResidualML)
		}
	}
	out := []string{s.Section.Render(fmt.Sprintf("  %-6s %9s %9s %11s %s", "hole", "radius", "swept", "calibrated", "bench residual"))}
	for _, h := range sum.Holes {
		out = append(out, fmt.Sprintf("  %-6s %6.2f cm %6.0f mL %8.0f mL %s", h.Label, h.RadiusCm, h.SweptML, h.EffectiveSweptML, s.Label.Render(resid[h.Label])))
	}
	return out
}

func (p *machinePanel) previewView() string {
	s := p.styles
	r := p.preview
	var b strings.Builder
	report.CalibrationText(&b, *r)
	head := s.Section.Render("REFIT PREVIEW: nothing is saved until you press Ctrl+W") + "\n"
	if p.out.source.Embedded {
		head += s.Error.Render("This is an embedded demo: it cannot be written. Save a copy with 'crankside profiles show "+r.Profile.ID+" --json'.") + "\n"
	}
	if p.note != "" {
		head += s.Error.Render(p.note) + "\n"
	}
	return head + b.String()
}

func (p *machinePanel) ShortHelp() []key.Binding {
	switch p.mode {
	case machinePath:
		return []key.Binding{key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "read the bench file")), key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "cancel"))}
	case machinePreview:
		return []key.Binding{p.keys.Write, key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "discard")), key.NewBinding(key.WithKeys("down"), key.WithHelp("↑/↓", "scroll"))}
	}
	return []key.Binding{p.keys.Pick, p.keys.Bench, p.keys.Down, p.keys.Advance}
}

func (p *machinePanel) FullHelp() [][]key.Binding {
	return [][]key.Binding{{p.keys.Pick, p.keys.Bench, p.keys.Write}, {p.keys.Up, p.keys.Down, p.keys.Advance}}
}

// holes are the loaded profile's holes, for clamping the table's scroll.
func (p *machinePanel) holes() []setup.HoleGeometry {
	if p.out == nil || p.out.summary == nil {
		return nil
	}
	return p.out.summary.Holes
}
