package ui

import (
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/report"
	"crankside/setup"
)

// bedsideKeys open the bedside sheet and the pacing view, on the Setting
// panel (for the plan) and on the Handover panel (for the check).
type bedsideKeys struct {
	Sheet, Pace key.Binding
}

func newBedsideKeys() bedsideKeys {
	return bedsideKeys{
		Sheet: key.NewBinding(key.WithKeys("ctrl+e"), key.WithHelp("ctrl+e", "bedside sheet")),
		Pace:  key.NewBinding(key.WithKeys("ctrl+k"), key.WithHelp("ctrl+k", "pace by hand")),
	}
}

// request turns a bedside key into the root's request, or nil.
func (k bedsideKeys) request(msg tea.KeyMsg, check bool) tea.Cmd {
	switch {
	case key.Matches(msg, k.Sheet):
		return ask(sheetRequested{check: check})
	case key.Matches(msg, k.Pace):
		return ask(pacingRequested{check: check})
	}
	return nil
}

// bedsideHere reports whether the focused panel takes the bedside keys.
func (m *Model) bedsideHere() bool { return m.focus == panelSetting || m.focus == panelHandover }

// sheet shows the bedside sheet of the plan (from the Setting panel) or of
// the handover check (from the Handover panel); a check recorded in this
// session carries its record's time and the next check due.
func (m *Model) sheet(check bool) {
	var sh report.Sheet
	switch {
	case check && m.out.check != nil:
		sh = report.CheckSheet(*m.out.check, m.out.profile.Label, setup.BedKey(m.checkField("bed").Value()), m.now())
		if m.recordedAt != "" && m.logPath != "" {
			rec := setup.Record{Time: m.recordedTime}
			sh.Schedule = setup.RecordedSchedule(m.logPath, rec, 0)
		}
	case check:
		m.handoverNote(m.styles.Error.Render("! no sheet: the check is not complete"))
		return
	case m.out.plan != nil:
		sh = report.PlanSheet(*m.out.plan, m.now())
	default:
		m.note = "no sheet: the plan is not complete"
		return
	}
	var b strings.Builder
	if err := sh.Write(&b); err != nil {
		m.note = "no sheet: " + err.Error()
		return
	}
	title := "Bedside sheet of the plan (also: crankside plan ... --sheet)"
	if check {
		title = "Bedside sheet of the check (also: crankside check ... --sheet)"
	}
	m.overlay = &textOverlay{title: title, text: b.String()}
}
