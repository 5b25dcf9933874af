package ui

import (
	"errors"
	"fmt"
	"strings"

	tea "github.com/charmbracelet/bubbletea"

	"crankside/physiology"
	"crankside/setup"
)

// checkFieldNames maps setup's field names to the handover form's where
// they differ: the plan's PEEP target and the machine's PEEP valve are
// different entries.
var checkFieldNames = map[string]string{"peep": "peep-valve"}

func (m *Model) checkField(name string) *field {
	if n, ok := checkFieldNames[name]; ok {
		name = n
	}
	return m.handover.form.byName(name)
}

// recomputeCheck runs the handover check of what the machine is set to,
// for the patient on the patient panel. It waits, saying why, until the
// patient and the setting can both be used.
func (m *Model) recomputeCheck(planReq setup.Request, patientOK bool) {
	h := &m.handover.form
	h.clearErrors()
	m.out.check, m.out.checkWaiting = nil, nil
	wait := func(r string) { m.out.checkWaiting = append(m.out.checkWaiting, r) }
	if m.checkField("hole").Value() == "" && m.checkField("rpm").Value() == "" && m.checkField("dwell-s").Value() == "" {
		wait("enter the hole, motor speed and dwell the machine is set to")
		return
	}
	ok := true
	fail := func(name, reason string) {
		ok = false
		if f := m.checkField(name); f != nil {
			f.err = reason
			wait(f.label + ": " + reason)
			return
		}
		wait(name + ": " + reason)
	}
	number := func(name string, required bool) (float64, bool) {
		f := m.checkField(name)
		text := f.Value()
		if text == "" {
			if required {
				ok = false
				wait(f.label + ": required")
			}
			return 0, false
		}
		v, err := physiology.ParseNumber(text)
		if err != nil {
			fail(name, fmt.Sprintf("%q is not a number", text))
			return 0, false
		}
		return v, true
	}
	req := setup.CheckRequest{Patient: planReq.Patient, Lung: planReq.Targets.Lung,
		ComplianceMLPerCmH2O: planReq.Targets.ComplianceMLPerCmH2O, ResistanceCmH2OPerLS: planReq.Targets.ResistanceCmH2OPerLS, Now: m.now()}
	req.Setting.Hole = m.checkField("hole").Value()
	if req.Setting.Hole == "" {
		ok = false
		wait("Hole: required")
	}
	req.Setting.RPM, _ = number("rpm", true)
	req.Setting.DwellS, _ = number("dwell-s", true)
	req.Setting.PEEPCmH2O = 5
	if v, given := number("peep-valve", false); given {
		req.Setting.PEEPCmH2O = v
	}
	req.Setting.O2LPerMin, _ = number("o2-lpm", false)
	peak, hasPeak := number("peak", false)
	end, hasEnd := number("end-pressure", false)
	switch {
	case hasPeak && hasEnd:
		req.Readings = setup.ReadingsOf(peak, end)
	case hasPeak != hasEnd:
		wait("enter both manometer readings to fit the lung (peak and end of inspiration)")
	}
	cl, hasL := number("cylinder-l", false)
	cb, hasB := number("cylinder-bar", false)
	if hasL && hasB {
		req.CylinderWaterL, req.CylinderBar = cl, cb
	}
	if v := m.checkField("propose-hole").Value(); v != "" {
		req.Proposal.Hole = &v
	}
	for _, pr := range []struct {
		name string
		dst  **float64
	}{{"propose-rpm", &req.Proposal.RPM}, {"propose-dwell-s", &req.Proposal.DwellS}, {"propose-peep", &req.Proposal.PEEPCmH2O}} {
		if v, given := number(pr.name, false); given {
			*pr.dst = &v
		}
	}
	if !patientOK {
		ok = false
		wait("the patient's height and sex (panel 1)")
	}
	if !ok || m.out.summary == nil {
		return
	}
	ck, err := setup.RunCheck(req, m.out.profile)
	var ie *setup.InputError
	switch {
	case errors.As(err, &ie):
		fail(ie.Field, ie.Reason)
	case err != nil:
		wait(err.Error())
	default:
		m.out.check = &ck
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
	rec, err := setup.NewRecord(*m.out.check, m.checkField("bed").Value(), m.checkField("initials").Value(), m.now())
	var ie *setup.InputError
	if errors.As(err, &ie) {
		if f := m.checkField(ie.Field); f != nil {
			f.err = ie.Reason
		}
		return setup.Record{}, errors.New(ie.Reason)
	}
	return rec, err
}

// save records the check with a command: the write runs off the UI's
// goroutine on copies of the record and the path.
func (m *Model) save() tea.Cmd {
	rec, err := m.record()
	if err != nil {
		m.out.saveNote = m.styles.Error.Render("! not recorded: " + err.Error())
		return nil
	}
	if m.logPath == "" {
		m.out.saveNote = m.styles.Error.Render("! not recorded: no log file (start with --log FILE)")
		return nil
	}
	path, at := m.logPath, rec.Time
	return func() tea.Msg {
		err := setup.EnsureLogDir(path)
		if err == nil {
			err = setup.AppendRecord(path, rec)
		}
		return savedMsg{bed: rec.Bed, path: path, at: at, err: err}
	}
}

func (m *Model) saved(msg savedMsg) {
	if msg.err != nil {
		m.out.saveNote = m.styles.Error.Render("! NOT recorded: " + msg.err.Error())
		return
	}
	m.unsaved = false
	m.out.saveNote = m.styles.Value.Render(fmt.Sprintf("Recorded for bed %s at %s UTC in %s", msg.bed, msg.at.UTC().Format("15:04"), msg.path))
}

func (m *Model) card() {
	rec, err := m.record()
	if err != nil {
		m.out.saveNote = m.styles.Error.Render("! no card: " + err.Error())
		return
	}
	var b strings.Builder
	setup.WriteCard(&b, rec)
	m.overlay = &textOverlay{title: "Handover card (also: crankside check ... --card)", text: b.String()}
}

func (m *Model) history() tea.Cmd {
	bed := m.checkField("bed").Value()
	if err := setup.CheckBedLabel(bed); err != nil {
		m.out.saveNote = m.styles.Error.Render("! " + err.Error())
		return nil
	}
	if m.logPath == "" {
		m.out.saveNote = m.styles.Error.Render("! no log file (start with --log FILE)")
		return nil
	}
	path := m.logPath
	return func() tea.Msg {
		recs, problems, err := setup.ReadLog(path)
		return historyMsg{bed: bed, history: setup.History(recs, bed), problems: problems, err: err}
	}
}

func (m *Model) showHistory(msg historyMsg) {
	s := m.styles
	var l []string
	switch {
	case msg.err != nil:
		l = append(l, s.Error.Render("! "+msg.err.Error()))
	case len(msg.history) == 0:
		l = append(l, "No checks recorded for bed "+msg.bed+".")
	default:
		for _, e := range msg.history[0].Entries {
			r := e.Record
			l = append(l, s.Value.Render(fmt.Sprintf("%s UTC  %s", r.Time.UTC().Format("2006-01-02 15:04"), r.Initials))+
				fmt.Sprintf("  hole %s, %.1f rpm, dwell %.1f s, PEEP %.0f: %.0f mL %.1f mL/kg", r.Setting.Hole, r.Setting.RPM, r.Setting.DwellS, r.Setting.PEEPCmH2O, r.DeliveredVtML, r.MLPerKg))
			if len(e.Changes) > 0 {
				l = append(l, s.Label.Render("    changed: "+strings.Join(e.Changes, "; ")))
			}
		}
	}
	for _, p := range msg.problems {
		l = append(l, s.Error.Render("! "+p.String()))
	}
	m.overlay = &textOverlay{title: "Bed " + msg.bed + ": earlier checks", text: strings.Join(l, "\n")}
}

// quit asks first when a computed check has not been recorded.
func (m *Model) quit() tea.Cmd {
	if m.unsaved && m.out.check != nil {
		m.confirmQuit = true
		return nil
	}
	return tea.Quit
}
