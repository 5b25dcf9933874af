package ui

import (
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
	ChartTrace, ChartRef     lipgloss.Style
	ChartAxis                lipgloss.Style
}

// NewStyles builds the styles once for the whole program.
func NewStyles() Styles {
	p := newPalette()
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
