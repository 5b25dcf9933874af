package ui

import (
	"fmt"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/logbook"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

// wardMsg is every bed's last check, read off the UI's goroutine.
type wardMsg struct {
	rows    []logbook.WardRow
	summary logbook.LogSummary
	err     error
}

// wardView lists every bed's last check, most urgent first (stop, then
// overdue, then warn); Enter starts the next check of the chosen bed from
// its record.
type wardView struct {
	rows    []logbook.WardRow
	summary logbook.LogSummary
	err     error
	loading bool
	cursor  int
	// offset is the first line shown; Update keeps the cursor's bed in
	// view (clampWard), View only draws.
	offset int
	// confirmStart is true while Enter has asked whether to drop an
	// unrecorded check for the chosen bed's.
	confirmStart bool
	styles       *Styles
}

// readWard reads the ward from the log with a command, on copies.
func (m *Model) readWard() tea.Cmd {
	if m.logPath == "" {
		m.note = "no log file: start with --log FILE to see the ward"
		return nil
	}
	m.ward = &wardView{loading: true, styles: m.styles}
	path, now := m.logPath, m.now()
	return func() tea.Msg {
		rows, sum, err := logbook.WardRows([]string{path}, now, 0)
		return wardMsg{rows: rows, summary: sum, err: err}
	}
}

func (m *Model) wardKey(msg tea.KeyMsg) tea.Cmd {
	w := m.ward
	defer m.clampWard()
	last := max(len(w.rows)-1, 0)
	asked := w.confirmStart
	w.confirmStart = false // a question is answered by the very next key
	switch {
	case key.Matches(msg, m.keys.Quit):
		return m.quit()
	case msg.Type == tea.KeyEsc && asked:
		m.note = "kept: the check on F6 is as it was"
	case msg.Type == tea.KeyEsc:
		m.ward = nil
	case msg.Type == tea.KeyDown:
		w.cursor = min(w.cursor+1, last)
	case msg.Type == tea.KeyUp:
		w.cursor = max(w.cursor-1, 0)
	case key.Matches(msg, m.keys.PageDn):
		w.cursor = min(w.cursor+m.wardPage(), last)
	case key.Matches(msg, m.keys.PageUp):
		w.cursor = max(w.cursor-m.wardPage(), 0)
	case msg.Type == tea.KeyHome:
		w.cursor = 0
	case msg.Type == tea.KeyEnd:
		w.cursor = last
	case msg.Type == tea.KeyEnter && len(w.rows) > 0:
		r := w.rows[w.cursor]
		if m.unsaved && !asked {
			// The entries on the handover panel are not recorded: starting
			// another bed's check replaces them, so it asks first.
			w.confirmStart = true
			m.note = "the check on F6 is not recorded: Enter again drops it and starts " + safetext.Escape(r.Bed) + "; Esc keeps it"
			return nil
		}
		m.ward = nil
		return m.startFromRecord(r.Record)
	case isTyping(msg):
		m.note = "nothing to type into here: arrows choose a bed, Enter opens it, Esc closes"
	case key.Matches(msg, m.keys.Next), key.Matches(msg, m.keys.Prev), m.isPanelKey(msg):
		// A panel key leaves the ward for that panel, as it says.
		m.ward = nil
		cmd, _ := m.globalKey(msg)
		return cmd
	case key.Matches(msg, m.keys.Help), key.Matches(msg, m.keys.Ward), key.Matches(msg, m.keys.Suspend):
		cmd, _ := m.globalKey(msg) // the keys over the ward, F7 reads it again
		return cmd
	default:
		m.note = "in the ward: arrows choose a bed, Enter opens it, Esc closes"
	}
	return nil
}

// isPanelKey reports whether msg is one of the keys that choose a panel.
func (m *Model) isPanelKey(msg tea.KeyMsg) bool {
	for _, b := range m.keys.Panel {
		if key.Matches(msg, b) {
			return true
		}
	}
	return false
}

// wardSize is the width of the ward's text and how many lines of it show.
func (m *Model) wardSize() (w, h int) {
	fw, fh := m.panelFrame()
	return m.w - fw, m.h - fixedRows - fh - 1
}

// wardPage is how many beds PgUp and PgDn move: about half a screen.
func (m *Model) wardPage() int {
	w, h := m.wardSize()
	_, top, bottom := m.ward.lines(w)
	return max(h/2/max(bottom-top+1, 1), 1)
}

// clampWard scrolls the ward so that the chosen bed's lines are in view,
// below the "more above" marker and above the "more below" one.
func (m *Model) clampWard() {
	if m.ward == nil {
		return
	}
	w, h := m.wardSize()
	lines, top, bottom := m.ward.lines(w)
	m.ward.offset = keepInView(m.ward.offset, top, bottom, len(lines), h)
}

// keepInView is the first line to show of n, h at a time, so that lines
// top to bottom are in view and not under a marker of window (which
// takes the first line when some are above, the last when some are below).
func keepInView(off, top, bottom, n, h int) int {
	if n <= h || h < 3 || bottom <= h-2 {
		return 0 // all fits, or the lines are in the first screen
	}
	if bottom > off+h-2 {
		off = bottom - h + 2
	}
	if top < off+1 {
		off = top - 1
	}
	return min(max(off, 0), n-h)
}

// startFromRecord fills the patient and the handover entries from a
// bed's last record and opens the handover panel, marking what came from
// the record, so that a machine found otherwise shows the difference.
//
// Everything else on the handover panel belonged to the check before,
// another bed and perhaps another patient: it is cleared (readings, blood
// gas, dead space, cylinder, proposal), and so are the Patient panel's
// lung condition and mechanics, which the record does not hold; the
// cursor goes to the first field and the last record's note goes.
func (m *Model) startFromRecord(r setup.Record) tea.Cmd {
	e := setup.RecordEntries(r)
	for _, f := range m.handover.form.fields {
		f.SetValue("")
		f.from = ""
	}
	for name, v := range map[string]string{"lung": "normal", "compliance": "", "resistance": ""} { // the panel's defaults
		if f := m.field(name); f != nil {
			f.SetValue(v)
			f.from = ""
		}
	}
	at := "from the record at " + setup.LocalClock(r.Time)
	for name, v := range e {
		if f := m.checkField(name); f != nil {
			f.SetValue(v)
			f.from = at
		}
	}
	for _, name := range []string{"height-cm", "sex"} {
		if f := m.field(name); f != nil {
			f.SetValue(e[name])
			f.from = at
		}
	}
	for _, name := range settingEntries {
		m.checkField(name).unconfirmed = true
	}
	m.fromRecord = &recordStart{entries: e, at: at, label: "Bed " + safetext.Escape(r.Bed) + " started " + at + "; its lung condition is not recorded (F1 says which is assumed)"}
	if r.Proposed != nil {
		m.applied = &appliedQuestion{rec: r}
	}
	m.out.saveNote = ""
	m.unsaved, m.recordedAt = false, ""
	m.handover.form.current().blur()
	m.handover.form.cursor = 0
	m.scroll[panelHandover] = 0
	if m.applied != nil {
		m.applied.ask(m)
	}
	m.recompute()
	return m.focusPanel(panelHandover)
}

// recordStart is what a check was started from.
type recordStart struct {
	entries setup.Entries
	label   string
	at      string // "from the record at 14:05 UTC"
}

// lines is the ward wrapped to width, and the first and last line of the
// chosen bed's row.
func (w *wardView) lines(width int) (lines []string, top, bottom int) {
	s := w.styles
	if w.loading {
		return wrapBlock(s.Hint.Render("reading the log ..."), width), 0, 0
	}
	add := func(text string) { lines = append(lines, wrapBlock(text, width)...) }
	if w.err != nil {
		add(s.Error.Render("! " + safetext.Escape(w.err.Error())))
	}
	if len(w.rows) == 0 && w.err == nil {
		add("No checks recorded yet.")
	}
	add(s.Label.Render(fmt.Sprintf("%d bed%s, most urgent first; OVERDUE after %g h (%s)", len(w.rows), plural(len(w.rows)), setup.DefaultCheckEvery.Hours(), setup.CheckEverySource)))
	for i, r := range w.rows {
		mark := "  "
		st := s.Value
		if i == w.cursor {
			mark, st = "> ", s.FieldFocused
			top = len(lines)
		}
		add(mark + s.withLevels(safetext.Escape(report.WardLine(r)), st))
		if i == w.cursor {
			bottom = len(lines) - 1
		}
	}
	for _, p := range w.summary.Lines() {
		add(s.Error.Render("! " + safetext.Escape(p)))
	}
	return lines, top, bottom
}
