package ui

import (
	"errors"
	"fmt"
	"os"
	"strings"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"crankside/logbook"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

func (m *Model) checkField(name string) *field { return m.handover.form.byName(name) }

// patientEntries are the entries of the Patient panel that a check uses.
var patientEntries = []string{"height-cm", "sex", "lung", "compliance", "resistance"}

// settingBlank reports whether nothing of the setting is entered yet:
// neither the hole nor the speed and dwell, dialled or timed.
func (m *Model) settingBlank() bool {
	for _, name := range []string{"hole", "rpm", "dwell-s", "turn-s", "pause-s", "breaths-per-min"} {
		if m.checkField(name).Value() != "" {
			return false
		}
	}
	return true
}

// recomputeCheck runs the handover check of what the machine is set to,
// for the patient on the Patient panel: the entries as typed go to setup's
// check builder, and every problem is marked beside its field. It waits,
// saying why, until the patient and the setting can both be used.
func (m *Model) recomputeCheck(plan setup.Entries, planProblems setup.Problems) {
	h := &m.handover.form
	h.clearErrors()
	m.out.check, m.out.checkWaiting = nil, nil
	wait := func(r string) { m.out.checkWaiting = append(m.out.checkWaiting, r) }
	if m.settingBlank() {
		wait("enter the hole, motor speed and dwell the machine is set to")
		return
	}
	e := setup.Entries{}
	for _, name := range patientEntries {
		e[name] = plan[name]
	}
	for _, f := range h.fields {
		e[f.name] = f.Value()
	}
	m.out.started, m.out.changedFromRecord = "", nil
	m.out.toConfirm, m.out.fromAt = m.toConfirm(), ""
	if m.fromRecord != nil {
		m.out.started, m.out.fromAt = m.fromRecord.label, m.fromRecord.at
		m.out.changedFromRecord = setup.ChangedEntries(m.fromRecord.entries, e)
	}
	req, problems := setup.BuildCheckRequest(e, m.now())
	m.out.checkLung = req.Lung.String()
	m.out.readingStops = nil
	if req.Readings != nil && problems.Field("peak") == nil && problems.Field("end-pressure") == nil && problems.Field("peep") == nil {
		// The manometer is judged on its own, before and without a fit or a
		// patient: an alarming reading is never only "waiting".
		m.out.readingStops = setup.ReadingCautions(*req.Readings, req.Setting.PEEPCmH2O, m.out.profile.Circuit.ReliefCmH2O)
	}
	if gasUsable(req.Gas, problems) {
		// So is the blood gas (setup.GasCautions, most serious first);
		// without a setting the FiO2 is not known yet.
		m.out.readingStops = append(m.out.readingStops, setup.GasCautions(req.Gas, setup.NewGasContext(0, 0, req.Setting.PEEPCmH2O))...)
	}
	for _, p := range problems {
		if f := m.checkField(p.Field); f != nil {
			if !p.Missing {
				f.err = p.Reason
			}
			wait(f.label + ": " + p.Reason)
			continue
		}
		wait("the patient (F1 Patient): " + p.Field + ": " + p.Reason)
	}
	if len(problems) > 0 || m.out.summary == nil {
		return
	}
	ck, err := setup.RunCheck(req, m.out.profile)
	var ie *setup.InputError
	switch {
	case errors.As(err, &ie):
		if f := m.checkField(ie.Field); f != nil {
			f.err = ie.Reason
		}
		wait(ie.Field + ": " + ie.Reason)
	case err != nil:
		wait(err.Error())
	default:
		m.out.check, m.out.checkJSON = &ck, ck.JSON()
	}
}

// record stamps the current check for the log, or says why it cannot be.
func (m *Model) record() (setup.Record, error) {
	if m.out.check == nil {
		reason := "the check is not complete"
		if len(m.out.checkWaiting) > 0 {
			reason = m.out.checkWaiting[0]
		}
		return setup.Record{}, errors.New("nothing to record yet: " + reason)
	}
	if c := m.out.toConfirm; len(c) > 0 {
		return setup.Record{}, errors.New("confirm at the machine first what the record gave: " + strings.Join(c, ", ") + " (Enter on each, or type what the machine shows)")
	}
	rec, err := setup.NewRecord(*m.out.check, m.checkField("bed").Value(), m.checkField("initials").Value(), m.now())
	if err == nil {
		rec, err = rec.WithSecondInitials(m.checkField("second-initials").Value())
	}
	var ie *setup.InputError
	if errors.As(err, &ie) {
		if f := m.checkField(ie.Field); f != nil {
			f.err = ie.Reason
		}
		return setup.Record{}, errors.New(ie.Reason)
	}
	return rec, err
}

// recordAsked records the check; a check already recorded is recorded a
// second time only when the key is pressed again.
func (m *Model) recordAsked() tea.Cmd {
	if m.recordedAt != "" && !m.confirmRecord {
		m.confirmRecord = true
		m.handoverNote(m.styles.Error.Render("! this check was already recorded at " + m.recordedAt + ": Ctrl+S again records it a second time"))
		return nil
	}
	m.confirmRecord = false
	return m.save()
}

// save records the check with a command: the write runs off the UI's
// goroutine on copies of the record and the path.
func (m *Model) save() tea.Cmd {
	rec, err := m.record()
	if err != nil {
		m.handoverNote(m.styles.Error.Render("! not recorded: " + err.Error()))
		return nil
	}
	if m.logPath == "" {
		m.handoverNote(m.styles.Error.Render("! not recorded: no log file (start with --log FILE)"))
		return nil
	}
	path, at := m.logPath, rec.Time
	return func() tea.Msg {
		err := logbook.EnsureLogDir(path)
		if err == nil {
			err = logbook.AppendRecord(path, rec)
		}
		return savedMsg{bed: rec.Bed, path: path, at: at, err: err}
	}
}

// handoverNote puts what became of a record, a card, a history or a step
// at the top of the handover panel's results, and scrolls the panel back
// to it: pressed while the panel is scrolled down, Ctrl+S must still show
// "Recorded" or why not (and its question before recording twice).
func (m *Model) handoverNote(note string) {
	m.out.saveNote = note
	m.scroll[panelHandover] = 0
}

func (m *Model) saved(msg savedMsg) {
	if msg.err != nil {
		m.handoverNote(m.styles.Error.Render("! NOT recorded: " + msg.err.Error()))
		return
	}
	m.unsaved = false
	m.recordedAt, m.recordedTime = setup.LocalClock(msg.at), msg.at
	at := msg.at
	m.due = bedDue{bed: setup.BedKey(msg.bed), known: true, last: &at}
	m.handoverNote(m.styles.Value.Render(fmt.Sprintf("Recorded for bed %s at %s in %s", msg.bed, m.recordedAt, msg.path)))
}

func (m *Model) card() {
	rec, err := m.record()
	if err != nil {
		m.handoverNote(m.styles.Error.Render("! no card: " + err.Error()))
		return
	}
	title := "Handover card, not recorded yet (also: crankside check ... --card)"
	if m.recordedAt != "" {
		// The card of a recorded check is stamped with the record's time,
		// not the time it is opened.
		rec.Time = m.recordedTime
		title = "Handover card, as recorded at " + m.recordedAt
	}
	var b strings.Builder
	report.WriteCard(&b, rec)
	// The card is the printed text; on the screen its level words are
	// coloured as everywhere else.
	lines := strings.Split(b.String(), "\n")
	for i, l := range lines {
		lines[i] = m.styles.withLevels(l, lipgloss.NewStyle())
	}
	m.overlay = &textOverlay{title: title, text: strings.Join(lines, "\n")}
}

func (m *Model) history() tea.Cmd {
	bed := m.checkField("bed").Value()
	if err := setup.CheckBedLabel(bed); err != nil {
		m.handoverNote(m.styles.Error.Render("! " + err.Error()))
		return nil
	}
	if m.logPath == "" {
		m.handoverNote(m.styles.Error.Render("! no log file (start with --log FILE)"))
		return nil
	}
	path := m.logPath
	return func() tea.Msg {
		h, sum, err := logbook.ReadBedHistory([]string{path}, bed, logbook.HistoryShown)
		return historyMsg{bed: bed, history: h, summary: sum, err: err}
	}
}

// showHistory lists a bed's checks newest first, each with its proposal
// and what changed since the one before; the overlay scrolls. Text from
// the log is shown escaped: a record cannot act on the terminal.
func (m *Model) showHistory(msg historyMsg) {
	s := m.styles
	var l []string
	switch {
	case msg.err != nil:
		l = append(l, s.Error.Render("! "+safetext.Escape(msg.err.Error())))
	case len(msg.history.Entries) == 0:
		l = append(l, "No checks recorded for bed "+msg.bed+".")
	default:
		n := len(msg.history.Entries)
		if n < msg.history.Total {
			l = append(l, s.Label.Render(fmt.Sprintf("%d checks, the newest %d first (up/down, PgUp/PgDn scroll)", msg.history.Total, n)))
		} else {
			l = append(l, s.Label.Render(fmt.Sprintf("%d check%s, newest first (up/down, PgUp/PgDn scroll)", n, plural(n))))
		}
		for _, e := range msg.history.Entries {
			l = append(l, s.withLevels(safetext.Escape(report.HistoryLine(e.Record)), s.Value))
			if p := report.ProposalLine(e.Record); p != "" {
				l = append(l, s.withLevels("    proposed: "+safetext.Escape(p), s.Label))
			}
			if len(e.Changes) > 0 {
				l = append(l, s.Label.Render("    changed since the one before: "+safetext.Escape(strings.Join(e.Changes, "; "))))
			}
		}
		if more := msg.history.NotShown("log show --bed " + msg.bed + " --all lists them"); more != "" {
			l = append(l, s.Label.Render(more))
		}
	}
	for _, p := range msg.summary.Lines() {
		l = append(l, s.Error.Render("! "+safetext.Escape(p)))
	}
	m.overlay = &textOverlay{title: "Bed " + msg.bed + ": earlier checks", text: strings.Join(l, "\n")}
}

// quit asks first when the handover panel holds entries or a check that
// have not been recorded, or a refit is not saved.
func (m *Model) quit() tea.Cmd {
	if m.unsaved || m.machine.mode == machinePreview {
		m.confirmQuit = true
		return nil
	}
	return tea.Quit
}

// logNote says where the screen records checks and whether it can.
func logNote(path string) string {
	if path == "" {
		return "Not recording: start with --log FILE to keep a record of checks."
	}
	where := safetext.Escape(path)
	if err := logbook.CheckLogPath(path); err != nil {
		// A new log is made in a folder the screen creates itself.
		if !errors.Is(err, os.ErrNotExist) {
			return "CANNOT RECORD to " + where + ": " + safetext.Escape(err.Error())
		}
		return "Records go to " + where + " (its folder is made at the first record); bed label only, no name is kept."
	}
	return "Records go to " + where + " (it can write there); bed label only, no name is kept."
}

// gasUsable reports whether the gas entries can be judged: some typed,
// none refused.
func gasUsable(g setup.GasReadings, problems setup.Problems) bool {
	for _, name := range []string{"spo2", "pao2", "ph", "paco2"} {
		if problems.Field(name) != nil {
			return false
		}
	}
	return !g.Empty()
}
