package ui

import (
	"fmt"
	"math/rand"
	"os"
	"path/filepath"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"
)

// golden compares a screen with testdata/NAME.golden; -update rewrites it.
func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name+".golden")
	if updating() {
		require.NoError(t, os.MkdirAll("testdata", 0o755))
		require.NoError(t, os.WriteFile(path, []byte(got), 0o644))
	}
	want, err := os.ReadFile(path)
	require.NoError(t, err, "run go test ./ui -update to create %s", path)
	require.Equal(t, string(want), got, "screen %s differs; run go test ./ui -update if the change is intended", name)
}

func TestGoldenScreens(t *testing.T) {
	cases := []struct {
		name    string
		w, h    int
		prefill map[string]string
		keys    []tea.KeyMsg
	}{
		{"start-80x24", 80, 24, nil, nil},
		{"setting-80x24", 80, 24, nil, []tea.KeyMsg{runes("175"), enter, runes("m"), fkey(4)}},
		{"targets-80x24", 80, 24, map[string]string{"height-cm": "162", "sex": "female", "lung": "ards", "fio2": "0.6"}, []tea.KeyMsg{fkey(2)}},
		{"machine-80x24", 80, 24, map[string]string{"height-cm": "175", "sex": "male"}, []tea.KeyMsg{fkey(3)}},
		{"cautions-80x24", 80, 24, map[string]string{"height-cm": "175", "sex": "male", "ml-per-kg": "9.5", "compliance": "12"}, []tea.KeyMsg{fkey(5)}},
		{"invalid-80x24", 80, 24, nil, []tea.KeyMsg{runes("300")}},
		{"help-80x24", 80, 24, nil, []tea.KeyMsg{runes("?")}},
		{"patient-120x40", 120, 40, nil, []tea.KeyMsg{runes("175"), enter, runes("m")}},
		{"setting-120x40", 120, 40, map[string]string{"height-cm": "175", "sex": "male"}, nil},
		{"too-small-60x20", 60, 20, nil, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := newTestModel(t, c.prefill)
			m.Update(tea.WindowSizeMsg{Width: c.w, Height: c.h})
			press(m, c.keys...)
			golden(t, c.name, screen(m))
		})
	}
}

// TestRandomKeysAndSizes feeds random keys and window sizes, tiny ones
// included: no panic, and always something on screen.
func TestRandomKeysAndSizes(t *testing.T) {
	keys := []tea.KeyMsg{enter, tab, shiftTab, esc, down, ctrlU,
		{Type: tea.KeyUp}, {Type: tea.KeyLeft}, {Type: tea.KeyRight}, {Type: tea.KeyBackspace}, {Type: tea.KeySpace},
		runes("1"), runes("2"), runes("3"), runes("4"), runes("5"), runes("7"), runes("0"), runes("."), runes(":"),
		runes("m"), runes("f"), runes("a"), runes("o"), runes("n"), runes("p"), runes("?"), runes("é"), runes("١"),
		{Type: tea.KeyRunes, Runes: []rune(strings.Repeat("9", 500)), Paste: true},
		{Type: tea.KeyRunes, Runes: []rune("1\x00\x1b[2J;rm -rf"), Paste: true},
		fkey(1), fkey(2), fkey(3), fkey(4), fkey(5), fkey(6), pgDn, ctrlP, ctrlB, ctrlW, ctrlS, ctrlO, ctrlR,
	}
	rng := rand.New(rand.NewSource(1))
	for run := 0; run < 20; run++ {
		m := newTestModel(t, nil)
		for i := 0; i < 300; i++ {
			if rng.Intn(15) == 0 {
				m.Update(tea.WindowSizeMsg{Width: rng.Intn(200), Height: rng.Intn(70)})
			}
			k := keys[rng.Intn(len(keys))]
			press(m, k)
			if v := m.View(); v == "" && m.w > 0 && m.h > 0 {
				t.Fatalf("empty view after %d keys at %dx%d", i, m.w, m.h)
			}
		}
		m.Update(tea.WindowSizeMsg{Width: 1, Height: 1})
		require.NotEmpty(t, m.View())
		m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
		require.Contains(t, screen(m), "responsible clinician")
	}
}

// The handover panel with a proposal, a stop plan on the Setting panel and
// a reading no lung explains, at the smallest window and a common one.
func TestHandoverAndStopGoldens(t *testing.T) {
	check := func(t *testing.T, entries map[string]string) *Model {
		m, _ := handoverModel(t)
		// A log path that is the same on every run, for the golden.
		m.logPath = "handover.jsonl"
		m.out.logNote = logNote(m.logPath)
		for name, v := range entries {
			m.checkField(name).SetValue(v)
		}
		m.recompute()
		return m
	}
	proposal := map[string]string{"bed": "B4", "initials": "ab", "hole": "8", "rpm": "21", "dwell-s": "1.4",
		"peak": "17", "end-pressure": "14", "propose-hole": "7", "propose-peep": "8"}
	unexplained := map[string]string{"bed": "B4", "initials": "ab", "hole": "8", "rpm": "21", "dwell-s": "1.4",
		"peak": "120", "end-pressure": "100"}
	for _, size := range [][2]int{{80, 24}, {120, 40}} {
		name := func(what string) string { return fmt.Sprintf("%s-%dx%d", what, size[0], size[1]) }
		t.Run(name("handover-proposal"), func(t *testing.T) {
			m := check(t, proposal)
			m.Update(tea.WindowSizeMsg{Width: size[0], Height: size[1]})
			golden(t, name("handover-proposal"), screen(m))
		})
		t.Run(name("handover-unexplained"), func(t *testing.T) {
			m := check(t, unexplained)
			m.Update(tea.WindowSizeMsg{Width: size[0], Height: size[1]})
			v := screen(m)
			require.Contains(t, v, "STOP")
			require.Contains(t, v, "CANNOT BE EXPLAINED")
			require.Contains(t, v, "NOT KNOWN")
			require.NotContains(t, v, "429 mL", "no predicted volume anywhere on the screen")
			golden(t, name("handover-unexplained"), v)
		})
	}
	t.Run("setting-stop-80x24", func(t *testing.T) {
		m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male", "ml-per-kg": "9.5", "compliance": "12"})
		press(m, fkey(4))
		v := screen(m)
		require.Contains(t, v, "STOP: DO NOT USE THIS SETTING")
		require.NotContains(t, v, "SET ON THE MACHINE")
		golden(t, "setting-stop-80x24", v)
	})
}
