package ui

import (
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"crankside/logbook"
	"crankside/report"
	"crankside/setup"
)

// bedDue is the handover bed's last record, for the status line's time
// since it and the next check due (report.DueLine).
type bedDue struct {
	bed   string     // the bed looked up (BedKey), "" for none
	known bool       // the log has been read for it
	last  *time.Time // nil: no record of this bed
}

// bedLastMsg is the outcome of reading a bed's last record.
type bedLastMsg struct {
	bed  string
	last *time.Time
}

// lookupBed reads the handover bed's last record from the log when the
// bed label changed to one the log could hold; nil otherwise.
func (m *Model) lookupBed() tea.Cmd {
	bed := m.checkField("bed").Value()
	if m.logPath == "" || setup.CheckBedLabel(bed) != nil {
		m.due = bedDue{}
		return nil
	}
	key := setup.BedKey(bed)
	if key == m.due.bed {
		return nil
	}
	m.due = bedDue{bed: key}
	path := m.logPath
	return func() tea.Msg {
		h, _, err := logbook.ReadBedHistory([]string{path}, key, 1)
		if err != nil || len(h.Entries) == 0 {
			return bedLastMsg{bed: key}
		}
		t := h.Entries[0].Record.Time
		return bedLastMsg{bed: key, last: &t}
	}
}

// bedLastRead keeps a lookup's outcome when it is still the bed asked for.
func (m *Model) bedLastRead(msg bedLastMsg) {
	if msg.bed == m.due.bed {
		m.due.known, m.due.last = true, msg.last
	}
}

// dueText is the status line's part for the handover bed, or "".
func (m *Model) dueText() string {
	if !m.due.known {
		return ""
	}
	line := report.DueLine(m.due.bed, m.due.last, m.every, m.now())
	if m.due.last != nil && !m.now().Before(m.due.last.Add(m.everyOrDefault())) {
		return m.styles.Error.Render(line)
	}
	return m.styles.Label.Render(line)
}

func (m *Model) everyOrDefault() time.Duration {
	if m.every <= 0 {
		return setup.DefaultCheckEvery
	}
	return m.every
}
