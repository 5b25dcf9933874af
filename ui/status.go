package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"

	"crankside/setup"
)

// alert is the highest caution level of one thing computed on the screen
// (the plan, the handover's current setting, its proposal, the manometer
// while the check waits) and where it is shown.
type alert struct {
	where string
	level setup.Level
}

// alerts are the levels of everything computed on the screen, in the order
// the status line names them.
func (m *Model) alerts() []alert {
	var a []alert
	add := func(where string, cs []setup.Caution) {
		if len(cs) > 0 {
			a = append(a, alert{where, setup.Highest(cs)})
		}
	}
	if ck := m.out.check; ck != nil {
		add("F6 set now", ck.Current.Cautions)
		if ck.Proposed != nil {
			add("F6 proposal", ck.Proposed.Cautions)
		}
	} else {
		add("F6 manometer", m.out.readingStops)
	}
	if m.out.plan != nil {
		add("plan", m.out.plan.Cautions)
	}
	return a
}

// alertLead is the start of the status line on every panel: the highest
// level of everything on the screen as its word in its colour, and where
// it is ("STOP F6 set now"); "no cautions" when nothing computed has one,
// "" when nothing is computed yet.
func (m *Model) alertLead() string {
	s := m.styles
	a := m.alerts()
	if len(a) == 0 {
		if m.out.plan == nil && m.out.check == nil {
			return ""
		}
		return s.Label.Render("no cautions")
	}
	top := a[0].level
	for _, x := range a {
		top = max(top, x.level)
	}
	if top != setup.Stop {
		// Below a STOP the word is enough: the panel's part says whose.
		return s.levelWord(top)
	}
	var where []string
	for _, x := range a {
		if x.level == top {
			where = append(where, x.where)
		}
	}
	return s.levelWord(top) + s.Label.Render(" "+strings.Join(where, ", "))
}

// dialLine is what to dial when the handover check carries a proposal
// that has no STOP: the proposed hole, speed, dwell, the PEEP when it
// changes, and the O2 flow. "" otherwise: a proposal with a STOP is never
// put under a word that says to set it.
func (m *Model) dialLine() string {
	text := dialText(m.out.check)
	if text == "" {
		return ""
	}
	return m.styles.Label.Render("Dial: ") + m.styles.Big.Render(text)
}

// dialText is the proposed setting to dial, or "" (see dialLine).
func dialText(ck *setup.Check) string {
	if ck == nil || ck.Proposed == nil || ck.Unexplained() || setup.FirstStop(ck.Proposed.Cautions) != nil {
		return ""
	}
	p, now := ck.Proposed.Setting, ck.Current.Setting
	text := fmt.Sprintf("hole %s, %s rpm, dwell %s s", p.Hole, f1(p.RPM), f1(p.DwellS))
	if p.PEEPCmH2O != now.PEEPCmH2O {
		text += fmt.Sprintf(", PEEP %s cmH2O", trimFloat(p.PEEPCmH2O))
	}
	if p.O2LPerMin > 0 {
		text += fmt.Sprintf(", O2 %s L/min", f1(p.O2LPerMin))
	} else {
		text += ", no O2"
	}
	return text
}

// withLead puts the alert lead and the dial line before a panel's own
// parts of the status line, and keeps the parts that fit, whole, in that
// order: a narrow window drops the last parts, never cuts one short.
func (m *Model) withLead(rest ...string) string {
	sep := m.styles.Label.Render(" | ")
	line := ""
	for _, p := range append([]string{m.alertLead(), m.dialLine()}, rest...) {
		switch {
		case p == "":
		case line == "":
			line = p
		case lipgloss.Width(line+sep+p) <= m.w:
			line += sep + p
		default:
			return ansi.Truncate(line, m.w, "")
		}
	}
	return ansi.Truncate(line, m.w, "")
}

// waitingLine is the status line while figures wait: the reasons in full
// when they fit after the lead, else where they are said.
func (m *Model) waitingLine(full, short string) string {
	if line := m.withLead(full); lipgloss.Width(line) < lipgloss.Width(m.withLead())+lipgloss.Width(full) {
		return m.withLead(short)
	}
	return m.withLead(full)
}
