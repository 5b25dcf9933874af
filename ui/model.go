package ui

import (
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/charmbracelet/bubbles/help"
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// Options start the UI.
type Options struct {
	Profile     profiles.Profile
	Source      profiles.Source
	ProfilesDir string
	// Prefill holds entries by field name ("height-cm", "sex", "lung",
	// "ml-per-kg", "rate", "ie", "peep", "fio2", "compliance", "resistance").
	Prefill map[string]string
	// Now dates the calibration and the records; nil means time.Now.
	Now func() time.Time
	// LogPath is where handover checks are recorded.
	LogPath string
}

// The smallest window the layout is drawn for.
const (
	MinWidth  = 80
	MinHeight = 24
	// fixedRows are the title bar, summary strip, help line and clinical line.
	fixedRows = 4
	// wideHeight is where the setting is shown under the focused panel.
	wideHeight = 36
)

const (
	panelPatient = iota
	panelTargets
	panelMachine
	panelSetting
	panelCautions
	panelHandover
)

// Model is the root of the UI.
type Model struct {
	styles   *Styles
	keys     globalKeys
	help     help.Model
	panels   []panel
	patient  *patientPanel
	targets  *targetsPanel
	handover *handoverPanel
	machine  *machinePanel
	focus    int
	showHelp bool
	picker   *picker
	out      outcome
	dir      string
	logPath  string
	now      func() time.Time
	w, h     int
	// overlay is a text view over the panels (the card, the history).
	overlay *textOverlay
	// unsaved is true while a computed handover check has not been recorded.
	unsaved     bool
	confirmQuit bool
}

// textOverlay is a titled block of text shown in place of the panels.
type textOverlay struct {
	title, text string
}

// savedMsg is the outcome of recording a check.
type savedMsg struct {
	bed, path string
	at        time.Time
	err       error
}

// historyMsg is a bed's earlier checks read from the log.
type historyMsg struct {
	bed      string
	history  []setup.BedHistory
	problems []setup.LogProblem
	err      error
}

// New builds the root model; Run starts it.
func New(opts Options) *Model {
	styles := NewStyles()
	m := &Model{styles: &styles, keys: newGlobalKeys(), help: help.New(), dir: opts.ProfilesDir, now: opts.Now, logPath: opts.LogPath}
	if m.now == nil {
		m.now = time.Now
	}
	m.help.Styles.ShortKey = styles.Value
	m.help.Styles.ShortDesc = styles.Help
	m.help.Styles.FullKey = styles.Value
	m.help.Styles.FullDesc = styles.Help
	m.patient = newPatientPanel(m.styles)
	m.targets = newTargetsPanel(m.styles)
	m.handover = newHandoverPanel(m.styles)
	m.machine = newMachinePanel(m.styles)
	m.panels = []panel{m.patient, m.targets, m.machine, newSettingPanel(m.styles), newCautionsPanel(m.styles), m.handover}
	m.setProfile(opts.Profile, opts.Source)
	for name, v := range opts.Prefill {
		if f := m.field(name); f != nil {
			f.SetValue(v)
		}
	}
	m.recompute()
	if len(opts.Prefill) > 0 && m.out.plan != nil {
		m.focus = panelSetting
	}
	m.panels[m.focus].Focus()
	return m
}

// Init starts nothing: the cursor does not blink, and nothing runs in the
// background.
func (m *Model) Init() tea.Cmd { return nil }

func (m *Model) field(name string) *field {
	if f := m.patient.form.byName(name); f != nil {
		return f
	}
	return m.targets.form.byName(name)
}

func (m *Model) setProfile(p profiles.Profile, src profiles.Source) {
	m.out.profile, m.out.source = p, src
	sum, err := setup.DescribeProfile(p, m.now())
	if err != nil {
		m.out.loadErr = err.Error()
		return
	}
	m.out.summary = &sum
	m.out.loadErr = ""
}

// Update routes a message: sizes to every child, keys to the focused one.
func (m *Model) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		m.resize(msg.Width, msg.Height)
		return m, nil
	case tea.KeyMsg:
		return m, m.handleKey(msg)
	case savedMsg:
		m.saved(msg)
	case historyMsg:
		m.showHistory(msg)
	case benchMsg:
		m.machine.setPreview(msg.res, msg.err)
	case writtenMsg:
		m.written(msg)
	}
	return m, nil
}

func (m *Model) handleKey(msg tea.KeyMsg) tea.Cmd {
	if m.confirmQuit {
		switch {
		case key.Matches(msg, m.keys.Yes), key.Matches(msg, m.keys.ForceQuit):
			return tea.Quit
		case key.Matches(msg, m.keys.No):
			m.confirmQuit = false
		}
		return nil
	}
	if key.Matches(msg, m.keys.ForceQuit) {
		return m.quit()
	}
	if m.overlay != nil {
		if msg.Type == tea.KeyEsc || key.Matches(msg, m.keys.Quit) || msg.Type == tea.KeyEnter {
			m.overlay = nil
		}
		return nil
	}
	if m.picker != nil {
		return m.handlePicker(msg)
	}
	if m.showHelp {
		if key.Matches(msg, m.keys.Help) || msg.Type == tea.KeyEsc || key.Matches(msg, m.keys.Quit) {
			m.showHelp = false
		}
		return nil
	}
	switch {
	case key.Matches(msg, m.keys.Next):
		return m.focusPanel((m.focus + 1) % len(m.panels))
	case key.Matches(msg, m.keys.Prev):
		return m.focusPanel((m.focus + len(m.panels) - 1) % len(m.panels))
	case key.Matches(msg, m.keys.Help):
		m.showHelp = true
		return nil
	}
	if !m.panels[m.focus].Editing() {
		if key.Matches(msg, m.keys.Quit) {
			return m.quit()
		}
		for i, b := range m.keys.Panel {
			if key.Matches(msg, b) && i < len(m.panels) {
				return m.focusPanel(i)
			}
		}
	}
	return m.toPanel(msg)
}

func (m *Model) toPanel(msg tea.KeyMsg) tea.Cmd {
	p := m.panels[m.focus]
	_, cmd := p.Update(msg)
	sig := p.Signals()
	if sig.changed {
		m.recompute()
		if m.out.check != nil {
			m.unsaved = true
			m.out.saveNote = ""
		}
	}
	if sig.pick {
		m.picker = newPicker(m.dir, m.out.profile.ID, m.styles)
	}
	if sig.save {
		return m.save()
	}
	if sig.card {
		m.card()
	}
	if sig.history {
		return m.history()
	}
	if sig.bench != "" {
		return m.readBench(sig.bench)
	}
	if sig.write {
		return m.writeRefit()
	}
	if sig.advance {
		return tea.Batch(cmd, m.focusPanel(min(m.focus+1, len(m.panels)-1)))
	}
	return cmd
}

func (m *Model) handlePicker(msg tea.KeyMsg) tea.Cmd {
	r := m.picker.update(msg)
	switch {
	case r.cancel:
		m.picker = nil
	case r.chosen != nil:
		m.setProfile(r.chosen.Profile, r.chosen.Source)
		m.picker = nil
		m.recompute()
	}
	return nil
}

func (m *Model) focusPanel(i int) tea.Cmd {
	if i == m.focus {
		return nil
	}
	m.panels[m.focus].Blur()
	m.focus = i
	m.layout()
	return m.panels[i].Focus()
}

// recompute builds the request from the entries and asks setup for the
// plan. Until every entry can be used, the figures wait: they are never
// left showing an earlier entry's numbers.
func (m *Model) recompute() {
	m.patient.form.clearErrors()
	m.targets.form.clearErrors()
	m.out.plan, m.out.trace, m.out.waiting = nil, nil, nil
	req, ok := m.request()
	for _, ie := range setup.CheckEntries(req) {
		if f := m.field(ie.Field); f != nil && f.err == "" && f.Value() != "" {
			m.fail(ie.Field, ie.Reason)
			ok = false
		}
	}
	if ok && m.out.summary != nil {
		req.Now = m.now()
		pl, err := setup.MakePlan(req, m.out.profile)
		var ie *setup.InputError
		switch {
		case errors.As(err, &ie):
			m.fail(ie.Field, ie.Reason)
		case err != nil:
			m.out.waiting = append(m.out.waiting, err.Error())
		default:
			m.out.plan = &pl
			if tr, err := setup.BreathTrace(pl, m.out.profile); err == nil {
				m.out.trace = &tr
			}
		}
	}
	if m.out.summary == nil {
		m.out.waiting = append(m.out.waiting, "the profile could not be used: "+m.out.loadErr)
	}
	m.recomputeCheck(req, ok)
	for _, p := range m.panels {
		p.SetOutcome(&m.out)
	}
}

// fail puts a reason beside its field, or in the waiting list when no
// field has that name.
func (m *Model) fail(name, reason string) {
	if f := m.field(name); f != nil {
		f.err = reason
		m.out.waiting = append(m.out.waiting, f.label+": "+reason)
		return
	}
	m.out.waiting = append(m.out.waiting, name+": "+reason)
}

// request reads the entries. Blank optional entries mean the default; a
// typed 0 is refused rather than taken as "default".
func (m *Model) request() (setup.Request, bool) {
	var req setup.Request
	ok := true
	number := func(name string, required bool) float64 {
		f := m.field(name)
		text := f.Value()
		if text == "" {
			if required {
				ok = false
				m.out.waiting = append(m.out.waiting, f.label+": "+f.hint)
			}
			return 0
		}
		v, err := physiology.ParseNumber(text)
		if err != nil {
			ok = false
			m.fail(name, fmt.Sprintf("%q is not a number", text))
			return 0
		}
		if v == 0 && name != "peep" {
			ok = false
			m.fail(name, "0 is not allowed; leave it blank for the default")
		}
		return v
	}
	req.Patient.HeightCm = number("height-cm", true)
	switch m.field("sex").Value() {
	case "male":
		req.Patient.Sex = physiology.Male
	case "female":
		req.Patient.Sex = physiology.Female
	default:
		ok = false
		m.out.waiting = append(m.out.waiting, "Sex: choose m (male) or f (female)")
	}
	lung, err := physiology.ParseLung(m.field("lung").Value())
	if err != nil {
		lung = physiology.Normal
	}
	t := setup.Targets{Lung: lung}
	t.MLPerKg = number("ml-per-kg", false)
	t.RateBPM = number("rate", false)
	t.FiO2 = number("fio2", false)
	t.ComplianceMLPerCmH2O = number("compliance", false)
	t.ResistanceCmH2OPerLS = number("resistance", false)
	if m.field("peep").Value() != "" {
		v := number("peep", false)
		t.PEEPCmH2O = &v
	}
	if text := m.field("ie").Value(); text != "" {
		e, err := physiology.ParseIE(text)
		if err != nil {
			ok = false
			m.fail("ie", strings.TrimPrefix(err.Error(), "I:E "))
		}
		t.IE = e
	}
	req.Targets = t
	return req, ok
}

func (m *Model) resize(w, h int) {
	m.w, m.h = w, h
	m.help.Width = w
	m.layout()
}

// panelFrame is the border and padding around a panel's body.
func (m *Model) panelFrame() (int, int) {
	st := m.styles.PanelFocused
	return st.GetHorizontalFrameSize(), st.GetVerticalFrameSize()
}

// layout hands each child the size it will be drawn at.
func (m *Model) layout() {
	fw, fh := m.panelFrame()
	bodyH := m.h - fixedRows
	innerW := m.w - fw
	top, bottom := m.split(bodyH)
	for i, p := range m.panels {
		switch {
		case i == m.focus && bottom >= 0:
			p.SetSize(innerW, top-fh)
		case bottom >= 0 && i == m.secondPanel():
			p.SetSize(innerW, bottom-fh)
		default:
			p.SetSize(innerW, bodyH-fh)
		}
	}
}

// secondPanel is shown under the focused one in a tall window.
func (m *Model) secondPanel() int {
	if m.focus == panelSetting {
		return panelCautions
	}
	return panelSetting
}

// split gives the heights of the focused panel and, in a tall window, of
// the panel under it; bottom is -1 when there is only one.
func (m *Model) split(bodyH int) (top, bottom int) {
	if m.h < wideHeight || m.focus == panelCautions || m.focus == panelHandover {
		return bodyH, -1
	}
	switch m.focus {
	case panelPatient:
		top = 13
	case panelTargets:
		top = 16
	case panelMachine:
		top = 15
	case panelSetting:
		top = bodyH - 10
	}
	return top, bodyH - top
}

// View draws the whole screen.
func (m *Model) View() string {
	if m.w < MinWidth || m.h < MinHeight {
		msg := fmt.Sprintf("Make the window larger: crankside needs %dx%d, this is %dx%d.", MinWidth, MinHeight, m.w, m.h)
		return fit(strings.Join(wrapWords(max(m.w, 1), strings.Fields(msg)...), "\n"), max(m.w, 1), max(m.h, 1))
	}
	var body string
	bodyH := m.h - fixedRows
	switch {
	case m.picker != nil:
		body = m.box("Profiles", m.picker.view(m.w-4, bodyH-2), bodyH, true)
	case m.showHelp:
		body = m.box("Keys", m.fullHelp(), bodyH, true)
	case m.overlay != nil:
		body = m.box(m.overlay.title, m.overlay.text, bodyH, true)
	default:
		top, bottom := m.split(bodyH)
		p := m.panels[m.focus]
		body = m.box(p.Title(), p.View(), top, true)
		if bottom > 0 {
			q := m.panels[m.secondPanel()]
			body += "\n" + m.box(q.Title(), q.View(), bottom, false)
		}
	}
	lines := []string{m.titleBar(), body, m.summary(), m.helpLine(), m.clinicalLine()}
	return strings.Join(lines, "\n")
}

func (m *Model) clinicalLine() string {
	text := setup.ClinicalCaution
	if lipgloss.Width(text) > m.w {
		text = setup.ClinicalCautionShort
	}
	return m.styles.Hint.Render(truncate(text, m.w))
}

func (m *Model) box(title, content string, h int, focused bool) string {
	st := m.styles.Panel
	if focused {
		st = m.styles.PanelFocused
	}
	fw, fh := st.GetHorizontalFrameSize(), st.GetVerticalFrameSize()
	inner := fit(m.styles.PanelTitle.Render(title)+"\n"+content, m.w-fw, h-fh)
	// Pad to the full height so the strip below never moves.
	n := strings.Count(inner, "\n") + 1
	if n < h-fh {
		inner += strings.Repeat("\n", h-fh-n)
	}
	return st.Width(m.w - fw + st.GetHorizontalPadding()).Render(inner)
}

func (m *Model) titleBar() string {
	s := m.styles
	var tabs []string
	for i, p := range m.panels {
		name := fmt.Sprintf("%d %s", i+1, p.Title())
		if i == panelCautions && m.out.plan != nil {
			name += fmt.Sprintf("(%d)", len(m.out.plan.Cautions))
		}
		if i == m.focus {
			tabs = append(tabs, s.TabActive.Render("["+name+"]"))
		} else {
			tabs = append(tabs, s.Tab.Render(" "+name+" "))
		}
	}
	lead := s.Title.Render("crankside") + s.Label.Render(" · "+m.out.profile.ID+" ")
	if m.w < 100 {
		lead = s.Label.Render(m.out.profile.ID + " |")
	}
	return truncate(lead+" "+strings.Join(tabs, ""), m.w)
}

// summary is the strip that stays on every panel.
func (m *Model) summary() string {
	s := m.styles
	if m.confirmQuit {
		return truncate(s.levelWord(setup.Warn)+s.Error.Render(" The handover check is not recorded. y: quit without recording, n: stay"), m.w)
	}
	// On the handover panel the strip is what the machine is set to now;
	// elsewhere it is the plan.
	if m.focus == panelHandover && m.out.check != nil {
		ev := m.out.check.Current
		return m.strip("Set now: ", ev.Figures, ev.Cautions)
	}
	pl := m.out.plan
	if pl == nil {
		reason := "an entry"
		if len(m.out.waiting) > 0 {
			reason = strings.Join(m.out.waiting, "; ")
		}
		return truncate(s.Waiting.Render("SETTING WAITING for "+reason), m.w)
	}
	return m.strip("Plan: ", pl.Figures, pl.Cautions)
}

// strip is one line: the highest caution first, so a narrow window never
// cuts it off, then the hole, speed, dwell, volume and the caution count.
func (m *Model) strip(lead string, f setup.Figures, cs []setup.Caution) string {
	s := m.styles
	sep := s.Label.Render(" | ")
	level := s.Label.Render("no cautions")
	if len(cs) > 0 {
		level = s.levelWord(setup.Highest(cs))
	}
	parts := []string{
		s.Label.Render(lead) + level,
		s.Label.Render("Hole ") + s.Big.Render(f.Hole.Label),
		s.Big.Render(f1(f.Timing.RPM)) + s.Unit.Render(" rpm"),
		s.Label.Render("dwell ") + s.Big.Render(f1(f.Timing.DwellS)) + s.Unit.Render(" s"),
		s.Value.Render(f0(f.Hole.DeliveredML)) + s.Unit.Render(" mL ") + s.Value.Render(f1(f.Hole.MLPerKg)) + s.Unit.Render(" mL/kg"),
	}
	if n := len(cs); n > 0 {
		parts = append(parts, s.Label.Render(fmt.Sprintf("%d caution%s", n, plural(n))))
	}
	return truncate(strings.Join(parts, sep), m.w)
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// helpLine is the focused panel's keys and the global ones that work now.
func (m *Model) helpLine() string {
	var b []key.Binding
	switch {
	case m.picker != nil:
		b = m.picker.ShortHelp()
	case m.confirmQuit:
		b = []key.Binding{m.keys.Yes, m.keys.No}
	case m.showHelp:
		b = []key.Binding{key.NewBinding(key.WithKeys("?"), key.WithHelp("? / esc", "close"))}
	case m.overlay != nil:
		b = []key.Binding{key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "close"))}
	default:
		b = m.panels[m.focus].ShortHelp()
		b = append(b, m.keys.Next)
		if !m.panels[m.focus].Editing() {
			b = append(b, key.NewBinding(key.WithKeys("1"), key.WithHelp("1-6", "panel")), m.keys.Quit)
		}
		b = append(b, m.keys.Help)
	}
	return truncate(m.help.ShortHelpView(b), m.w)
}

func (m *Model) fullHelp() string {
	s := m.styles
	p := m.panels[m.focus]
	groups := append(p.FullHelp(), []key.Binding{m.keys.Next, m.keys.Prev, m.keys.Help, m.keys.Quit, m.keys.ForceQuit}, m.keys.Panel[:])
	var l []string
	l = append(l, m.help.FullHelpView(groups), "")
	l = append(l,
		s.Label.Render("In a number field, letters and digits belong to the field: Tab, Enter, arrows and"),
		s.Label.Render("Ctrl+C still work there. Choices take their letter (m or f; n, a or o) or arrows."),
		s.Label.Render("Blank optional entries use the default shown beside them, with its source."),
		s.Label.Render("Every figure comes from the computation the command line uses (crankside plan)."),
		s.Label.Render("Levels: STOP do not use this setting; WARN needs a clinician's decision; NOTE."),
	)
	return strings.Join(l, "\n")
}

// Run starts the full-screen UI and blocks until it ends.
func Run(opts Options) error {
	_, err := tea.NewProgram(New(opts), tea.WithAltScreen()).Run()
	return err
}

var _ tea.Model = (*Model)(nil)
