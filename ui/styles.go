package ui

import (
	"strings"

	"github.com/charmbracelet/lipgloss"

	"crankside/setup"
)

// palette holds every colour the UI uses; panels never name a colour.
type palette struct {
	text, muted, accent, frame, focus lipgloss.AdaptiveColor
	stop, warn, note, okay            lipgloss.AdaptiveColor
	onLevel                           lipgloss.AdaptiveColor
}

func newPalette() palette {
	return palette{
		text:    lipgloss.AdaptiveColor{Light: "#1d2021", Dark: "#e6e1d6"},
		muted:   lipgloss.AdaptiveColor{Light: "#6b6b6b", Dark: "#9a958a"},
		accent:  lipgloss.AdaptiveColor{Light: "#005f73", Dark: "#7fc8c0"},
		frame:   lipgloss.AdaptiveColor{Light: "#a8a8a8", Dark: "#5b5852"},
		focus:   lipgloss.AdaptiveColor{Light: "#005f73", Dark: "#7fc8c0"},
		stop:    lipgloss.AdaptiveColor{Light: "#b00020", Dark: "#ff6b6b"},
		warn:    lipgloss.AdaptiveColor{Light: "#8a5a00", Dark: "#f2c14e"},
		note:    lipgloss.AdaptiveColor{Light: "#3b5998", Dark: "#9db4ff"},
		okay:    lipgloss.AdaptiveColor{Light: "#2e7d32", Dark: "#9ccc65"},
		onLevel: lipgloss.AdaptiveColor{Light: "#ffffff", Dark: "#1d2021"},
	}
}

// Styles is every style of the UI, grouped by where it is used.
type Styles struct {
	Title, Tab, TabActive    lipgloss.Style
	Panel, PanelFocused      lipgloss.Style
	PanelTitle               lipgloss.Style
	Label, Value, Unit, Hint lipgloss.Style
	Big                      lipgloss.Style
	Error, Waiting           lipgloss.Style
	Section                  lipgloss.Style
	FieldFocused             lipgloss.Style
	Selected                 lipgloss.Style // a value the first typed character replaces
	Summary, Caution         lipgloss.Style
	Help                     lipgloss.Style
	Level                    map[setup.Level]lipgloss.Style
	LevelText                map[setup.Level]lipgloss.Style // a count or mark in a level's colour
	ChartTrace, ChartRef     lipgloss.Style
	ChartAxis                lipgloss.Style
}

// noColorPalette is every colour left out (NO_COLOR): the styles keep
// their bold, underline and inverse (reversed) colours, so that the text cursor, the
// selected value and the level words still show.
func noColorPalette() palette {
	none := lipgloss.AdaptiveColor{}
	return palette{text: none, muted: none, accent: none, frame: none, focus: none, stop: none, warn: none, note: none, okay: none, onLevel: none}
}

// NewStyles builds the styles once for the whole program; noColor leaves
// every colour out and keeps the rest.
func NewStyles(noColor bool) Styles {
	p := newPalette()
	if noColor {
		p = noColorPalette()
	}
	level := func(c lipgloss.AdaptiveColor) lipgloss.Style {
		return lipgloss.NewStyle().Bold(true).Foreground(p.onLevel).Background(c)
	}
	return Styles{
		Title:        lipgloss.NewStyle().Bold(true).Foreground(p.accent),
		Tab:          lipgloss.NewStyle().Foreground(p.muted),
		TabActive:    lipgloss.NewStyle().Bold(true).Foreground(p.focus).Underline(true),
		Panel:        lipgloss.NewStyle().Border(lipgloss.NormalBorder()).BorderForeground(p.frame).Padding(0, 1),
		PanelFocused: lipgloss.NewStyle().Border(lipgloss.ThickBorder()).BorderForeground(p.focus).Padding(0, 1),
		PanelTitle:   lipgloss.NewStyle().Bold(true).Foreground(p.accent),
		Label:        lipgloss.NewStyle().Foreground(p.muted),
		Value:        lipgloss.NewStyle().Foreground(p.text).Bold(true),
		Unit:         lipgloss.NewStyle().Foreground(p.muted),
		Hint:         lipgloss.NewStyle().Foreground(p.muted).Italic(true),
		Big:          lipgloss.NewStyle().Bold(true).Foreground(p.accent),
		Error:        lipgloss.NewStyle().Foreground(p.stop),
		Waiting:      lipgloss.NewStyle().Foreground(p.muted).Italic(true),
		Section:      lipgloss.NewStyle().Bold(true).Foreground(p.text),
		FieldFocused: lipgloss.NewStyle().Foreground(p.focus).Bold(true),
		Selected:     lipgloss.NewStyle().Reverse(true),
		Summary:      lipgloss.NewStyle().Foreground(p.text),
		Caution:      lipgloss.NewStyle().Foreground(p.muted),
		Help:         lipgloss.NewStyle().Foreground(p.muted),
		Level: map[setup.Level]lipgloss.Style{
			setup.Stop: level(p.stop),
			setup.Warn: level(p.warn),
			setup.Note: level(p.note),
		},
		LevelText: map[setup.Level]lipgloss.Style{
			setup.Stop: lipgloss.NewStyle().Bold(true).Foreground(p.stop),
			setup.Warn: lipgloss.NewStyle().Bold(true).Foreground(p.warn),
			setup.Note: lipgloss.NewStyle().Foreground(p.note),
		},
		ChartTrace: lipgloss.NewStyle().Foreground(p.accent),
		ChartRef:   lipgloss.NewStyle().Foreground(p.muted),
		ChartAxis:  lipgloss.NewStyle().Foreground(p.frame),
	}
}

// levelWord is a caution level as a word in its colours: the word carries
// the meaning, the colour repeats it.
func (s Styles) levelWord(l setup.Level) string {
	st, ok := s.Level[l]
	if !ok {
		return setup.LevelWord(l)
	}
	return st.Render(setup.LevelWord(l))
}

// withLevels draws a line of plain text in st, with every level word in it
// (STOP, WARN, NOTE standing alone) in its own colours, as levelWord draws
// it everywhere else: the ward's and the history's lines colour their
// levels as the panels do.
func (s Styles) withLevels(text string, st lipgloss.Style) string {
	var b strings.Builder
	start := 0
	for i := 0; i+4 <= len(text); i++ {
		l, ok := levelAt(text, i)
		if !ok {
			continue
		}
		if i > start {
			b.WriteString(st.Render(text[start:i]))
		}
		b.WriteString(s.levelWord(l))
		start = i + 4
		i += 3
	}
	if start < len(text) {
		b.WriteString(st.Render(text[start:]))
	}
	return b.String()
}

// levelAt reports whether a level word stands alone at text[i:].
func levelAt(text string, i int) (setup.Level, bool) {
	for _, l := range []setup.Level{setup.Stop, setup.Warn, setup.Note} {
		w := setup.LevelWord(l)
		if !strings.HasPrefix(text[i:], w) {
			continue
		}
		if (i == 0 || !wordByte(text[i-1])) && (i+len(w) == len(text) || !wordByte(text[i+len(w)])) {
			return l, true
		}
	}
	return 0, false
}

func wordByte(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || strings.IndexByte("-_./", c) >= 0
}
