package ui

import (
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"
	"time"

	"github.com/charmbracelet/bubbles/help"
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"

	"crankside/logbook"
	"crankside/profiles"
	"crankside/profiles/safetext"
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
	// Preferences are the choices kept between runs (the gas unit), read
	// from PreferencesPath, where a changed choice is written; PreferencesPath
	// "" keeps nothing. PreferencesNote says why the file was not used.
	Preferences     setup.Preferences
	PreferencesPath string
	PreferencesNote string
	// NoColor leaves every colour out (NO_COLOR); bold, underline and the
	// inverse (reversed) colours of the cursor stay.
	NoColor bool
	// Every is the ward's interval between checks, for the next check due
	// on the status line; 0 means setup.DefaultCheckEvery.
	Every time.Duration
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
	picker   *picker
	out      outcome
	dir      string
	logPath  string
	now      func() time.Time
	w, h     int
	// overlay is a text view over the panels (the card, the history).
	overlay *textOverlay
	// scroll is each panel's first line shown, moved by the page keys.
	scroll [6]int
	// unsaved is true while the handover panel holds entries or a check
	// that have not been recorded.
	unsaved     bool
	confirmQuit bool
	// recordedAt is when the current check was recorded; recording it
	// again asks first (confirmRecord).
	recordedAt   string
	recordedTime time.Time // the record's own time, which its card carries
	// prefsPath is where the gas unit chosen is kept between runs, and
	// keptGasUnit the unit that file holds (as far as this run knows).
	prefsPath, keptGasUnit string
	confirmRecord          bool
	// ward is every bed's last check, shown over the panels (F7).
	ward *wardView
	// fromRecord is the record the handover check was started from.
	fromRecord *recordStart
	// applied asks, once, whether the record's proposal was applied.
	applied *appliedQuestion
	// pacing beats the setting's rhythm over the panels (Ctrl+K); bellOut
	// is where its bell is written (the terminal).
	pacing     *pacingView
	pacingKeys pacingKeys
	bellOut    io.Writer
	// due is the handover bed's last record; every the ward's interval
	// between checks (0: setup.DefaultCheckEvery).
	due   bedDue
	every time.Duration
	// note is a passing remark on the status strip, such as a typing key
	// refused where nothing can be typed.
	note string
}

// textOverlay is a titled block of text shown in place of the panels.
type textOverlay struct {
	title, text string
	offset      int
}

// savedMsg is the outcome of recording a check.
type savedMsg struct {
	bed, path string
	at        time.Time
	err       error
}

// historyMsg is a bed's earlier checks read from the log.
type historyMsg struct {
	bed     string
	history logbook.BedHistory
	summary logbook.LogSummary
	err     error
}

// New builds the root model; Run starts it.
func New(opts Options) *Model {
	styles := NewStyles(opts.NoColor)
	m := &Model{styles: &styles, keys: newGlobalKeys(), help: help.New(), dir: opts.ProfilesDir, now: opts.Now, logPath: opts.LogPath}
	if m.now == nil {
		m.now = time.Now
	}
	m.pacingKeys, m.bellOut, m.every = newPacingKeys(), os.Stdout, opts.Every
	m.help.Ellipsis = ""
	m.help.Styles.ShortKey = styles.Value
	m.help.Styles.ShortDesc = styles.Help
	m.help.Styles.FullKey = styles.Value
	m.help.Styles.FullDesc = styles.Help
	// The separators too: from the palette, so that NO_COLOR leaves none.
	m.help.Styles.ShortSeparator = styles.Help
	m.help.Styles.FullSeparator = styles.Help
	m.help.Styles.Ellipsis = styles.Help
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
	m.out.logNote = logNote(m.logPath)
	m.startUnits(opts)
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

// Update routes a message: sizes to every child, keys to the focused one,
// and each panel's wish to the method that carries it out.
func (m *Model) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		m.resize(msg.Width, msg.Height)
		m.clampWard()
	case tea.KeyMsg:
		return m, m.handleKey(msg)
	case entryChanged:
		// The gas entries' labels say the unit before problems name them.
		m.handover.showGasUnit()
		m.entryChanged()
		return m, tea.Batch(m.rememberGasUnit(), m.lookupBed())
	case bedLastMsg:
		m.bedLastRead(msg)
	case prefsSavedMsg:
		m.prefsSaved(msg)
	case advanceRequested:
		return m, m.focusPanel(min(m.focus+1, len(m.panels)-1))
	case pickRequested:
		m.picker = newPicker(m.dir, m.out.profile.ID, m.styles)
	case recordRequested:
		// Entries typed just before the key are in the fields already:
		// record what they give, never an earlier computation.
		m.recompute()
		return m, m.recordAsked()
	case cardRequested:
		m.recompute()
		m.card()
	case sheetRequested:
		m.recompute()
		m.sheet(msg.check)
	case pacingRequested:
		m.recompute()
		return m, m.openPacing(msg.check)
	case pacingTick:
		return m, m.pacingTicked(msg)
	case historyRequested:
		return m, m.history()
	case stepTakeRequested:
		m.takeStep()
	case benchChosen:
		return m, m.readBench(msg.path)
	case refitWriteRequest:
		return m, m.writeRefit()
	case savedMsg:
		m.saved(msg)
	case historyMsg:
		m.showHistory(msg)
	case wardMsg:
		if m.ward != nil {
			m.ward.rows, m.ward.summary, m.ward.err, m.ward.loading = msg.rows, msg.summary, msg.err, false
			m.ward.cursor = min(m.ward.cursor, max(len(msg.rows)-1, 0))
			m.clampWard()
		}
	case benchMsg:
		m.machine.setPreview(msg.res, msg.err)
	case writtenMsg:
		m.written(msg)
	}
	return m, nil
}

func (m *Model) entryChanged() {
	m.recompute()
	// An entry typed on the handover panel is part of a check to record,
	// complete or not; elsewhere an entry matters once there is a check.
	if m.out.check != nil || m.focus == panelHandover {
		m.unsaved = true
		m.recordedAt = ""
		m.out.saveNote = ""
	}
}

func (m *Model) handleKey(msg tea.KeyMsg) tea.Cmd {
	m.note = ""
	if !key.Matches(msg, m.panels[panelHandover].(*handoverPanel).keys.Save) {
		m.confirmRecord = false
	}
	switch {
	case msg.Paste:
		return m.paste(msg)
	case msg.Alt && !m.boundAlt(msg):
		return m.escThenKey(msg)
	}
	if m.w < MinWidth || m.h < MinHeight {
		// Nothing on the screen can be seen: no key acts unseen but the
		// quit, and its question is in the small view.
		switch {
		case m.confirmQuit:
			return m.confirmingQuit(msg)
		case key.Matches(msg, m.keys.Quit):
			return m.quit()
		}
		return nil
	}
	switch {
	case m.confirmQuit:
		return m.confirmingQuit(msg)
	case m.pacing != nil:
		return m.pacingKey(msg)
	case m.overlay != nil:
		return m.overlayKey(msg)
	case m.picker != nil:
		return m.handlePicker(msg)
	case m.ward != nil:
		return m.wardKey(msg)
	case m.applied != nil:
		return m.appliedKey(msg)
	}
	if cmd, done := m.globalKey(msg); done {
		return cmd
	}
	if isTyping(msg) && !m.panels[m.focus].Editing() {
		m.note = "nothing to type into here (" + m.panels[m.focus].Title() + "): F1, F2 and F6 have entries"
		return nil
	}
	if where := m.keyElsewhere(msg); where != "" {
		m.note = where
		return nil
	}
	_, cmd := m.panels[m.focus].Update(msg)
	return cmd
}

// keyElsewhere says where an action key of another panel acts when the
// focused panel has no such key ("ctrl+s record: on F6 Handover"), so
// that it is never dropped without a word; "" otherwise. Only the keys
// that act (record, card, history, the step; load a profile, refit, save
// the refit) are looked for: editing keys stay the focused field's.
func (m *Model) keyElsewhere(msg tea.KeyMsg) string {
	hk, mk, bk := m.handover.keys, m.machine.keys, m.handover.bed
	if m.bedsideHere() && (key.Matches(msg, bk.Sheet) || key.Matches(msg, bk.Pace)) {
		return ""
	}
	for _, a := range []struct {
		panel    int
		bindings []key.Binding
	}{{panelHandover, []key.Binding{hk.Save, hk.Card, hk.History, hk.Take}}, {panelMachine, []key.Binding{mk.Pick, mk.Bench, mk.Write}}, {panelSetting, []key.Binding{bk.Sheet, bk.Pace}}} {
		if a.panel == m.focus {
			continue
		}
		for _, b := range a.bindings {
			if slices.Contains(b.Keys(), msg.String()) {
				return fmt.Sprintf("%s %s: on F%d %s", b.Help().Key, b.Help().Desc, a.panel+1, m.panels[a.panel].Title())
			}
		}
	}
	return ""
}

// isTyping reports whether a key types: a printable character or a space.
// Only the focused field takes these.
func isTyping(msg tea.KeyMsg) bool {
	return (msg.Type == tea.KeyRunes && !msg.Alt) || msg.Type == tea.KeySpace
}

// globalKey handles the keys that act on every panel.
func (m *Model) globalKey(msg tea.KeyMsg) (tea.Cmd, bool) {
	switch {
	case key.Matches(msg, m.keys.Quit):
		return m.quit(), true
	case key.Matches(msg, m.keys.Suspend):
		// Ctrl+Z: the terminal is given back to the shell, and taken
		// again on fg.
		return suspendSelf, true
	case key.Matches(msg, m.keys.Next):
		return m.focusPanel((m.focus + 1) % len(m.panels)), true
	case key.Matches(msg, m.keys.Prev):
		return m.focusPanel((m.focus + len(m.panels) - 1) % len(m.panels)), true
	case key.Matches(msg, m.keys.Help):
		// The keys are an overlay like the card: it scrolls, Esc closes.
		m.overlay = &textOverlay{title: "Keys", text: m.fullHelp()}
		return nil, true
	case key.Matches(msg, m.keys.Ward):
		return m.readWard(), true
	case key.Matches(msg, m.keys.PageDn):
		m.scroll[m.focus] = min(m.scroll[m.focus]+max(m.h/2, 1), m.maxScroll(m.focus))
		return nil, true
	case key.Matches(msg, m.keys.PageUp):
		m.scroll[m.focus] = max(m.scroll[m.focus]-max(m.h/2, 1), 0)
		return nil, true
	}
	for i, b := range m.keys.Panel {
		if key.Matches(msg, b) && i < len(m.panels) {
			return m.focusPanel(i), true
		}
	}
	return nil, false
}

func (m *Model) confirmingQuit(msg tea.KeyMsg) tea.Cmd {
	switch {
	case key.Matches(msg, m.keys.Confirm):
		return tea.Quit
	case key.Matches(msg, m.keys.Stay):
		m.confirmQuit = false
	default:
		m.note = "the screen is asking: Ctrl+C again quits without recording, Esc stays"
	}
	return nil
}

func (m *Model) overlayKey(msg tea.KeyMsg) tea.Cmd {
	o := m.overlay
	switch {
	case key.Matches(msg, m.keys.Quit):
		return m.quit()
	case msg.Type == tea.KeyEsc || msg.Type == tea.KeyEnter:
		m.overlay = nil
	case msg.Type == tea.KeyDown:
		o.offset++
	case msg.Type == tea.KeyUp:
		o.offset = max(o.offset-1, 0)
	case key.Matches(msg, m.keys.PageDn):
		o.offset += max(m.h/2, 1)
	case key.Matches(msg, m.keys.PageUp):
		o.offset = max(o.offset-max(m.h/2, 1), 0)
	case msg.Type == tea.KeyHome:
		o.offset = 0
	case isTyping(msg):
		m.note = "nothing to type into here: Esc closes this view"
	}
	o.offset = min(o.offset, m.overlayMax())
	return nil
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
	m.scroll[i] = 0
	return m.panels[i].Focus()
}

// recompute hands the entries, as typed, to setup's entry builder and
// marks every problem beside its field; only when there is none does it ask
// setup for the plan. Until then the figures wait: they are never left
// showing an earlier entry's numbers.
func (m *Model) recompute() {
	m.patient.form.clearErrors()
	m.targets.form.clearErrors()
	m.out.plan, m.out.trace, m.out.waiting = nil, nil, nil
	e := m.planEntries()
	req, problems := setup.BuildRequest(e, m.now())
	m.patient.setHints(req.Targets.Lung)
	for _, p := range problems {
		m.fail(p)
	}
	if len(problems) == 0 && m.out.summary != nil {
		pl, err := setup.MakePlan(req, m.out.profile)
		var ie *setup.InputError
		switch {
		case errors.As(err, &ie):
			m.fail(ie)
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
	m.recomputeCheck(e, problems)
	for _, p := range m.panels {
		p.SetOutcome(&m.out)
	}
}

// planEntries are the patient's and the targets' fields as typed.
func (m *Model) planEntries() setup.Entries {
	e := setup.Entries{}
	for _, f := range append(append([]*field(nil), m.patient.form.fields...), m.targets.form.fields...) {
		e[f.name] = f.Value()
	}
	return e
}

// fail puts a problem beside its field (a missing entry waits rather than
// errs), and in the waiting list.
func (m *Model) fail(p *setup.InputError) {
	f := m.field(p.Field)
	label := p.Field
	if f != nil {
		label = f.label
		if !p.Missing {
			f.err = p.Reason
		}
	}
	m.out.waiting = append(m.out.waiting, label+": "+p.Reason)
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
		if m.confirmQuit {
			msg = "NOT RECORDED or not saved. Ctrl+C again: quit anyway; Esc: stay. " + msg
		}
		return fit(strings.Join(wrapWords(max(m.w, 1), strings.Fields(msg)...), "\n"), max(m.w, 1), max(m.h, 1))
	}
	var body string
	bodyH := m.h - fixedRows
	switch {
	case m.pacing != nil:
		body = m.box(m.withUnit("Pacing"), m.pacing.view(m.styles, m.w-4), bodyH, true, 0)
	case m.picker != nil:
		body = m.box(m.withUnit("Profiles"), m.picker.view(m.w-4, bodyH-3), bodyH, true, 0)
	case m.overlay != nil:
		body = m.box(m.withUnit(m.overlay.title), m.overlay.text, bodyH, true, m.overlay.offset)
	case m.ward != nil:
		w, _ := m.wardSize()
		lines, _, _ := m.ward.lines(w)
		body = m.box(m.withUnit("Ward: every bed's last check"), strings.Join(lines, "\n"), bodyH, true, m.ward.offset)
	default:
		top, bottom := m.split(bodyH)
		p := m.panels[m.focus]
		body = m.box(m.withUnit(p.Title()), p.View(), top, true, m.scroll[m.focus])
		if bottom > 0 {
			q := m.panels[m.secondPanel()]
			body += "\n" + m.box(q.Title(), q.View(), bottom, false, 0)
		}
	}
	lines := []string{m.titleBar(), body, m.summary(), m.helpLine(), m.clinicalLine()}
	return strings.Join(lines, "\n")
}

// withUnit names the unit being used after a frame's title, at every
// size: the id always, its label when the whole of it fits (a label cut
// short could read as another unit's).
func (m *Model) withUnit(title string) string {
	p := m.out.profile
	fw, _ := m.panelFrame()
	short := title + "  ·  unit " + safetext.Escape(p.ID)
	long := short + ": " + safetext.Escape(p.Label)
	if p.Label != "" && lipgloss.Width(long) <= m.w-fw {
		return long
	}
	return short
}

func (m *Model) clinicalLine() string {
	text := setup.ClinicalCaution
	if lipgloss.Width(text) > m.w {
		text = setup.ClinicalCautionShort
	}
	return m.styles.Hint.Render(truncate(text, m.w))
}

// box draws a panel's content in its frame: long lines wrap, and content
// taller than the box scrolls from the panel's offset, with markers.
func (m *Model) box(title, content string, h int, focused bool, offset int) string {
	st := m.styles.Panel
	if focused {
		st = m.styles.PanelFocused
	}
	fw, fh := st.GetHorizontalFrameSize(), st.GetVerticalFrameSize()
	w := m.w - fw
	lines := append([]string{ansi.Truncate(m.styles.PanelTitle.Render(title), w, "")}, window(wrapBlock(content, w), h-fh-1, offset)...)
	// Pad to the full height so the strip below never moves, and every
	// line to the full width, so the frame needs no wrapping of its own.
	for len(lines) < h-fh {
		lines = append(lines, "")
	}
	for i, l := range lines {
		if n := ansi.StringWidth(l); n < w {
			lines[i] = l + strings.Repeat(" ", w-n)
		}
	}
	return st.Render(strings.Join(lines, "\n"))
}

// maxScroll is how far panel i's content can scroll at the current size.
func (m *Model) maxScroll(i int) int {
	fw, fh := m.panelFrame()
	top, _ := m.split(m.h - fixedRows)
	n := len(wrapBlock(m.panels[i].View(), m.w-fw))
	return max(n-(top-fh-1), 0)
}

func (m *Model) overlayMax() int {
	if m.overlay == nil {
		return 0
	}
	fw, fh := m.panelFrame()
	n := len(wrapBlock(m.overlay.text, m.w-fw))
	return max(n-(m.h-fixedRows-fh-1), 0)
}

func (m *Model) titleBar() string {
	s := m.styles
	bar := m.tabs(true)
	if m.w < 100 {
		// Narrow: the tabs first, the Cautions count in its short form when
		// the long one does not fit; the profile after them when it fits
		// (every panel's frame names it too).
		if lipgloss.Width(bar) > m.w {
			bar = m.tabs(false)
		}
		if id := " | " + m.out.profile.ID; lipgloss.Width(bar)+len(id) <= m.w {
			bar += s.Label.Render(id)
		}
		return truncate(bar, m.w)
	}
	lead := s.Title.Render("crankside") + s.Label.Render(" · "+m.out.profile.ID+" ")
	return truncate(lead+" "+bar, m.w)
}

// tabs are the panels' names by their keys; the Cautions tab carries its
// count in the colour of the highest level counted.
func (m *Model) tabs(long bool) string {
	s := m.styles
	var tabs []string
	for i, p := range m.panels {
		name := fmt.Sprintf("F%d %s", i+1, p.Title())
		count := ""
		if i == panelCautions {
			count = m.cautionCount(long)
		}
		switch {
		case i == m.focus && m.ward == nil: // over the ward, no panel is shown
			tabs = append(tabs, s.TabActive.Render("["+name)+m.countStyle().Render(count)+s.TabActive.Render("]"))
		case m.w < 100:
			tabs = append(tabs, s.Tab.Render(" "+name)+m.countStyle().Render(count))
		default:
			tabs = append(tabs, s.Tab.Render(" "+name)+m.countStyle().Render(count)+s.Tab.Render(" "))
		}
	}
	return strings.Join(tabs, "")
}

// countStyle is the Cautions count's colour: that of the highest level
// of every caution it counts.
func (m *Model) countStyle() lipgloss.Style {
	top := setup.Level(0)
	for _, a := range m.alerts() {
		top = max(top, a.level)
	}
	if st, ok := m.styles.LevelText[top]; ok {
		return st
	}
	return m.styles.Tab
}

// cautionCount is the Cautions tab's count, saying what it counts: the
// plan's and the handover check's (now and proposed together), or in the
// short form their total.
func (m *Model) cautionCount(long bool) string {
	plan, check := -1, -1
	if m.out.plan != nil {
		plan = len(m.out.plan.Cautions)
	}
	if ck := m.out.check; ck != nil {
		check = len(ck.Current.Cautions)
		if ck.Proposed != nil {
			check += len(ck.Proposed.Cautions)
		}
	}
	var parts []string
	if plan >= 0 {
		parts = append(parts, fmt.Sprintf("plan %d", plan))
	}
	if check >= 0 {
		parts = append(parts, fmt.Sprintf("F6 %d", check))
	}
	switch {
	case len(parts) == 0:
		return ""
	case long:
		return "(" + strings.Join(parts, ", ") + ")"
	}
	return fmt.Sprintf("(%d in all)", max(plan, 0)+max(check, 0))
}

// summary is the strip that stays on every panel.
func (m *Model) summary() string {
	s := m.styles
	if m.confirmQuit {
		return truncate(s.levelWord(setup.Warn)+s.Error.Render(" Not recorded or not saved. Ctrl+C again: quit anyway; Esc: stay"), m.w)
	}
	if m.note != "" {
		return truncate(s.Error.Render("! "+m.note), m.w)
	}
	if m.applied != nil {
		return truncate(s.Error.Render(m.applied.short()), m.w)
	}
	// Every panel's strip starts with the highest level of everything on
	// the screen and where it is, then what to dial when a proposal can be
	// made; then, on the handover panel, what the machine is set to now,
	// and elsewhere the plan.
	if m.focus == panelHandover {
		ck := m.out.check
		switch {
		case ck == nil && len(m.out.readingStops) > 0:
			c := m.out.readingStops[0]
			return m.withLead(s.Error.Render(c.Message))
		case ck == nil:
			// Never the plan's figures here: they would read as the bed's.
			reason := "the machine's setting"
			if len(m.out.checkWaiting) > 0 {
				reason = strings.Join(m.out.checkWaiting, "; ")
			}
			return m.waitingLine(s.Waiting.Render("CHECK WAITING for "+reason), s.Waiting.Render("CHECK WAITING for entries: F6 says which"))
		case m.out.checkJSON.LungFiguresJSON == nil:
			// The lung's figures are withheld: none to put on the line.
			return m.withLead(s.Error.Render("Set now: readings unexplained, patient gets NOT KNOWN"))
		}
		lead := "Set now: "
		if len(m.out.toConfirm) > 0 {
			lead = "Recorded, not yet confirmed: "
		}
		parts := m.strip(lead, m.out.checkJSON.FiguresJSON, ck.Current.Cautions, ck.VolumeBoundNote() != "")
		if due := m.dueText(); due != "" {
			// The bed's next check is safety-relevant: right after the level.
			parts = append([]string{parts[0], due}, parts[1:]...)
		}
		return m.withLead(parts...)
	}
	pl := m.out.plan
	if pl == nil {
		reason := "an entry"
		if len(m.out.waiting) > 0 {
			reason = strings.Join(m.out.waiting, "; ")
		}
		return m.waitingLine(s.Waiting.Render("SETTING WAITING for "+reason), s.Waiting.Render("SETTING WAITING for entries: see beside them"))
	}
	return m.withLead(m.strip("Plan: ", pl.FiguresJSON(), pl.Cautions, false)...)
}

// strip is one line: the highest caution first, so a narrow window never
// cuts it off, then the hole, speed, dwell, volume and the caution count.
// upperBound marks a volume that is at most what the patient gets (setup's
// Check.VolumeBoundNote). The volume is read from the lung's figures,
// which the caller has found present.
func (m *Model) strip(lead string, f setup.FiguresJSON, cs []setup.Caution, upperBound bool) []string {
	vol := ""
	if upperBound {
		vol = m.styles.Caution.Render("at most ")
	}
	s := m.styles
	level := s.Label.Render("no cautions")
	if len(cs) > 0 {
		level = s.levelWord(setup.Highest(cs))
	}
	parts := []string{
		s.Label.Render(lead) + level,
		s.Label.Render("Hole ") + s.Big.Render(f.Hole),
		s.Big.Render(f1(f.MotorRPM)) + s.Unit.Render(" rpm"),
		s.Label.Render("dwell ") + s.Big.Render(f1(f.DwellS)) + s.Unit.Render(" s"),
	}
	if l := f.LungFiguresJSON; l != nil {
		parts = append(parts, vol+s.Value.Render(f0(l.DeliveredVtML))+s.Unit.Render(" mL ")+s.Value.Render(f1(l.MLPerKg))+s.Unit.Render(" mL/kg"))
	}
	if n := len(cs); n > 0 {
		parts = append(parts, s.Label.Render(fmt.Sprintf("%d caution%s", n, plural(n))))
	}
	return parts
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
		b = []key.Binding{m.keys.Confirm, m.keys.Stay}
	case m.pacing != nil:
		b = []key.Binding{m.pacingKeys.Close, m.pacingKeys.Bell, m.pacingKeys.Restart}
	case m.applied != nil:
		b = []key.Binding{appliedYes, appliedNo, m.keys.Quit}
	case m.overlay != nil:
		b = []key.Binding{key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "close")),
			key.NewBinding(key.WithKeys("pgdown"), key.WithHelp("↑/↓ pgup/pgdn", "scroll"))}
	case m.ward != nil:
		b = []key.Binding{key.NewBinding(key.WithKeys("down"), key.WithHelp("↑/↓ pgup/pgdn", "choose a bed")),
			key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "start its check")),
			key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "close")),
			key.NewBinding(key.WithKeys("f1"), key.WithHelp("F1-F6", "panel")), m.keys.Quit}
	default:
		// How to find every key first, then the panel's own keys (record,
		// card, history on the handover panel), then the general ones: a
		// narrow window drops the keys that are the same everywhere.
		b = append([]key.Binding{m.keys.Help}, m.panels[m.focus].ShortHelp()...)
		b = append(b, key.NewBinding(key.WithKeys("f1"), key.WithHelp("F1-F6", "panel")), m.keys.Ward, m.keys.Next, m.keys.Quit)
	}
	// The help line drops the keys that do not fit; F1 ... ? come first.
	return ansi.Truncate(m.help.ShortHelpView(b), m.w, "")
}

func (m *Model) fullHelp() string {
	s := m.styles
	p := m.panels[m.focus]
	groups := append(p.FullHelp(), []key.Binding{m.keys.Next, m.keys.Prev, m.keys.PageDn, m.keys.Ward, m.keys.Help, m.keys.Quit}, m.keys.Panel[:])
	var l []string
	l = append(l, m.help.FullHelpView(groups), "")
	for _, t := range []string{
		"Keys that type (digits, letters, the decimal point or comma) only ever go into the field with the cursor; where there is none they are refused with a note.",
		"Keys that act are never characters: F1-F6 or Alt+1-6 choose a panel, Tab and Shift+Tab the next or previous one, arrows and Enter move between fields, Ctrl keys record, show the card and the history, Esc closes, Ctrl+C quits (it asks first when a check is not recorded).",
		"A field that holds a value shows it selected when the cursor arrives: the first character typed replaces it; an arrow, Home or End edits it instead.",
		"0,9 means 0.9 in every number field; what was read is shown beside the field.",
		"Choices take their letter (m or f; n, a or o) or Space for the next one; arrows never change a value.",
		"Backspace, Delete and Ctrl+U edit the field with the cursor.",
		"A paste goes as text into the field with the cursor, or is refused whole.",
		"A record's values: Enter confirms each; Ctrl+Y/N: was its proposal applied?",
		"Blank optional entries use the default shown beside them, with its source.",
		"Every figure comes from the computation the command line uses (crankside plan).",
		"Levels: STOP do not use this setting; WARN needs a clinician's decision; NOTE.",
	} {
		l = append(l, s.Label.Render(t))
	}
	return strings.Join(l, "\n")
}

// Run starts the full-screen UI and blocks until it ends.
func Run(opts Options) error {
	p := tea.NewProgram(New(opts), tea.WithAltScreen())
	stop := keepTerminal(p)
	defer stop()
	_, err := p.Run()
	return err
}

var _ tea.Model = (*Model)(nil)
