package ui

import (
	"fmt"
	"io"
	"strings"
	"time"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"crankside/setup"
)

// pacingView beats a setting's rhythm for a person turning the wheel or
// squeezing a bag: the phase in large letters, the time left in it, the
// breath under way, and a terminal bell at each turn when asked for. The
// phase comes from setup.Pacer.At on the model's clock, read at each tick:
// a slow terminal shows a later moment, never a drifted one.
type pacingView struct {
	pacer setup.Pacer
	start time.Time
	state setup.PaceState
	bell  bool
	gen   int // the tick chain that belongs to this view
}

// pacingTick asks the pacing view to read the clock again.
type pacingTick struct{ gen int }

// pacingEvery is how often the clock is read: ten times a second shows
// the time left to a tenth.
const pacingEvery = 100 * time.Millisecond

func tickPacing(gen int) tea.Cmd {
	return tea.Tick(pacingEvery, func(time.Time) tea.Msg { return pacingTick{gen: gen} })
}

// pacingKeys act in the pacing view; none of them is a character.
type pacingKeys struct {
	Close, Bell, Restart key.Binding
}

func newPacingKeys() pacingKeys {
	return pacingKeys{
		Close:   key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "close")),
		Bell:    key.NewBinding(key.WithKeys("ctrl+g"), key.WithHelp("ctrl+g", "bell on/off")),
		Restart: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "restart at breath 1")),
	}
}

// openPacing starts the pacing view of the plan or the check at the
// clock's now; a setting with a stop gets none and says why.
func (m *Model) openPacing(check bool) tea.Cmd {
	var p setup.Pacer
	var err error
	switch {
	case check && m.out.check != nil:
		p, err = m.out.check.Pacer()
	case check:
		m.handoverNote(m.styles.Error.Render("! no pacing: the check is not complete"))
		return nil
	case m.out.plan != nil:
		p, err = m.out.plan.Pacer()
	default:
		m.note = "no pacing: the plan is not complete"
		return nil
	}
	if err != nil {
		m.note = "no pacing: " + strings.TrimPrefix(err.Error(), "setup: ")
		return nil
	}
	gen := 1
	if m.pacing != nil {
		gen = m.pacing.gen + 1
	}
	now := m.now()
	m.pacing = &pacingView{pacer: p, start: now, state: p.At(now, now), gen: gen}
	return tickPacing(gen)
}

// pacingTicked reads the clock; a new breath rings the bell when it is on.
func (m *Model) pacingTicked(msg pacingTick) tea.Cmd {
	v := m.pacing
	if v == nil || msg.gen != v.gen {
		return nil // a tick of a view that was closed or restarted
	}
	was := v.state.Breath
	v.state = v.pacer.At(v.start, m.now())
	next := tickPacing(v.gen)
	if v.bell && v.state.Breath != was {
		return tea.Batch(next, ringBell(m.bellOut))
	}
	return next
}

// ringBell writes the terminal bell (BEL) to out.
func ringBell(out io.Writer) tea.Cmd {
	return func() tea.Msg {
		if out != nil {
			io.WriteString(out, "\a")
		}
		return nil
	}
}

// pacingKey handles the pacing view's keys; any other key is refused with
// a note, so nothing acts unseen behind it.
func (m *Model) pacingKey(msg tea.KeyMsg) tea.Cmd {
	k, v := m.pacingKeys, m.pacing
	switch {
	case key.Matches(msg, m.keys.Quit):
		return m.quit()
	case key.Matches(msg, k.Close):
		m.pacing = nil
	case key.Matches(msg, k.Bell):
		v.bell = !v.bell
	case key.Matches(msg, k.Restart):
		v.start = m.now()
		v.state = v.pacer.At(v.start, v.start)
	default:
		m.note = "the pacing view takes Esc, Enter and Ctrl+G only"
	}
	return nil
}

// view draws the rhythm in width columns.
func (v *pacingView) view(s *Styles, width int) string {
	p, st := v.pacer, v.state
	var l []string
	add := func(x string) { l = append(l, x) }
	add(s.Section.Render("KEEP THIS RHYTHM BY HAND") + s.Unit.Render(" ("+p.Setting+")"))
	add(s.Unit.Render(fmt.Sprintf("one turn %.2f s, then a pause %.2f s: %.1f breaths/min", p.TurnS, p.PauseS, p.PerMinute())))
	add("")
	word := s.Value
	if st.Phase == setup.PhasePause {
		word = s.Label
	}
	for _, row := range bigWord(st.Phase) {
		add("  " + word.Render(row))
	}
	add("")
	add(s.Value.Render(fmt.Sprintf("  %s: %.1f s left", st.Phase, st.LeftS)) + s.Label.Render(fmt.Sprintf("      breath %d", st.Breath)))
	add("")
	add(s.Hint.Render(fmt.Sprintf("By hand: one whole turn of the wheel during TURN, still during PAUSE. With a bag: squeeze for the first %.2f s of TURN (the delivery), then let it refill.", p.TiS)))
	bell := "off"
	if v.bell {
		bell = "on"
	}
	add(s.Hint.Render("Bell at each turn: " + bell + ". Timed from the clock, not the screen."))
	return strings.Join(wrapLines(l, width), "\n")
}

// wrapLines wraps each line to width at spaces.
func wrapLines(lines []string, width int) []string {
	var out []string
	for _, l := range lines {
		if l == "" {
			out = append(out, "")
			continue
		}
		out = append(out, wrapBlock(l, width)...)
	}
	return out
}

// bigFont draws the letters of TURN and PAUSE five rows high.
var bigFont = map[rune][5]string{
	'T': {"█████", "  █  ", "  █  ", "  █  ", "  █  "},
	'U': {"█   █", "█   █", "█   █", "█   █", " ███ "},
	'R': {"████ ", "█   █", "████ ", "█  █ ", "█   █"},
	'N': {"█   █", "██  █", "█ █ █", "█  ██", "█   █"},
	'P': {"████ ", "█   █", "████ ", "█    ", "█    "},
	'A': {" ███ ", "█   █", "█████", "█   █", "█   █"},
	'S': {" ████", "█    ", " ███ ", "    █", "████ "},
	'E': {"█████", "█    ", "████ ", "█    ", "█████"},
}

// bigWord is word in the large letters, five rows.
func bigWord(word string) []string {
	rows := make([]string, 5)
	for _, r := range word {
		g, ok := bigFont[r]
		if !ok {
			continue
		}
		for i := range rows {
			rows[i] += g[i] + "  "
		}
	}
	return rows
}
