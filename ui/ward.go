package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/profiles/safetext"
	"crankside/setup"
)

// wardMsg is every bed's last check, read off the UI's goroutine.
type wardMsg struct {
	rows    []setup.WardRow
	summary setup.LogSummary
	err     error
}

// wardView lists every bed's last check, most urgent first (stop, then
// overdue, then warn); Enter starts the next check of the chosen bed from
// its record.
type wardView struct {
	rows    []setup.WardRow
	summary setup.LogSummary
	err     error
	loading bool
	cursor  int
	styles  *Styles
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
		rows, sum, err := setup.WardRows([]string{path}, now, 0)
		return wardMsg{rows: rows, summary: sum, err: err}
	}
}

func (m *Model) wardKey(msg tea.KeyMsg) tea.Cmd {
	w := m.ward
	switch {
	case key.Matches(msg, m.keys.Quit):
		return m.quit()
	case msg.Type == tea.KeyEsc:
		m.ward = nil
	case msg.Type == tea.KeyDown:
		w.cursor = min(w.cursor+1, max(len(w.rows)-1, 0))
	case msg.Type == tea.KeyUp:
		w.cursor = max(w.cursor-1, 0)
	case msg.Type == tea.KeyEnter && len(w.rows) > 0:
		r := w.rows[w.cursor]
		m.ward = nil
		return m.startFromRecord(r.Record)
	case isTyping(msg):
		m.note = "nothing to type into here: arrows choose a bed, Enter opens it, Esc closes"
	}
	return nil
}

// startFromRecord fills the patient and the handover entries from a
// bed's last record and opens the handover panel, marking what came from
// the record, so that a machine found otherwise shows the difference.
func (m *Model) startFromRecord(r setup.Record) tea.Cmd {
	e := setup.RecordEntries(r)
	at := "from the record at " + r.Time.UTC().Format("15:04") + " UTC"
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
	for _, name := range []string{"peak", "end-pressure", "propose-hole", "propose-rpm", "propose-dwell-s", "propose-peep"} {
		m.checkField(name).SetValue("")
	}
	m.fromRecord = &recordStart{entries: e, label: "Started " + at + " (bed " + safetext.Escape(r.Bed) + ")"}
	m.recompute()
	return m.focusPanel(panelHandover)
}

// recordStart is what a check was started from.
type recordStart struct {
	entries setup.Entries
	label   string
}

func (w *wardView) view() string {
	s := w.styles
	if w.loading {
		return s.Hint.Render("reading the log ...")
	}
	var l []string
	if w.err != nil {
		l = append(l, s.Error.Render("! "+safetext.Escape(w.err.Error())))
	}
	if len(w.rows) == 0 && w.err == nil {
		l = append(l, "No checks recorded yet.")
	}
	l = append(l, s.Label.Render(fmt.Sprintf("%d bed%s, most urgent first; OVERDUE after %g h (%s)", len(w.rows), plural(len(w.rows)), setup.DefaultCheckEvery.Hours(), setup.CheckEverySource)))
	for i, r := range w.rows {
		mark := "  "
		st := s.Value
		if i == w.cursor {
			mark, st = "> ", s.FieldFocused
		}
		l = append(l, mark+st.Render(safetext.Escape(setup.WardLine(r))))
	}
	for _, p := range w.summary.Lines() {
		l = append(l, s.Error.Render("! "+safetext.Escape(p)))
	}
	return strings.Join(l, "\n")
}
