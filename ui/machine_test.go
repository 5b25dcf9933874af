package ui

import (
	"os"
	"path/filepath"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/stretchr/testify/require"

	"crankside/profiles"
)

func TestRefitFromABenchFileWithPreview(t *testing.T) {
	dir := t.TempDir()
	unit := filepath.Join(dir, "unit.json")
	p, _ := demoProfile(t, "demo-a")
	p.ID, p.Label = "unit-1", "Unit 1"
	data, err := profiles.Marshal(p)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(unit, data, 0o600))
	bench := filepath.Join(dir, "bench.csv")
	require.NoError(t, os.WriteFile(bench, []byte(profiles.BenchHeader()+"\n5,50,5,20,318\n8,50,5,20,408\n12,50,5,20,528\n"), 0o644))

	p, stamp, readErr := profiles.ReadFileStamped(unit)
	require.NoError(t, readErr)
	m := New(Options{Profile: p, Source: profiles.Source{Path: unit, Stamp: stamp}, ProfilesDir: dir, Now: testNow,
		Prefill: map[string]string{"height-cm": "175", "sex": "male"}})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	before := m.out.plan.Hole.EffectiveSweptML
	press(m, fkey(3), ctrlB)
	require.True(t, m.panels[m.focus].Editing(), "the path entry takes letters")
	press(m, runes("q")) // typed into the path, never a quit
	press(m, tea.KeyMsg{Type: tea.KeyBackspace})
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(bench), Paste: true})
	runCmd(m, press(m, enter))
	require.Equal(t, machinePreview, m.machine.mode, m.machine.note)
	require.Contains(t, screen(m), "nothing is saved until you press Ctrl+W")
	unchanged, err := os.ReadFile(unit)
	require.NoError(t, err)
	// Discard: nothing written.
	press(m, esc)
	after, _ := os.ReadFile(unit)
	require.Equal(t, unchanged, after)
	require.NoFileExists(t, unit+".bak")
	// Again, and save: the profile on disk and the plan both change.
	press(m, ctrlB, ctrlU)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(bench), Paste: true})
	runCmd(m, press(m, enter))
	runCmd(m, press(m, ctrlW))
	require.Contains(t, screen(m), "Saved to")
	require.FileExists(t, unit+".bak")
	saved, err := profiles.ReadFile(unit)
	require.NoError(t, err)
	require.NotNil(t, saved.Calibration)
	require.Len(t, saved.Calibration.Points, 3)
	require.NotEqual(t, before, m.out.plan.Hole.EffectiveSweptML)
}

func TestRefitOfABadBenchFileSaysWhy(t *testing.T) {
	dir := t.TempDir()
	bench := filepath.Join(dir, "bad.csv")
	require.NoError(t, os.WriteFile(bench, []byte(profiles.BenchHeader()+"\n99,50,5,20,318\n"), 0o644))
	m := newTestModel(t, nil)
	press(m, enter, fkey(3), ctrlB)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(bench), Paste: true})
	runCmd(m, press(m, enter))
	require.Equal(t, machineView, m.machine.mode)
	require.Contains(t, m.machine.note, "line 2")
	require.Contains(t, m.machine.note, `"99"`)
	require.Contains(t, screen(m), "! bench file")
}

// Design rule (cautions): a calibration whose k is implausible, or that
// makes a hole's effective volume exceed its geometric one, is flagged;
// the screen, like calibrate --write, never saves such a fit. (The bench
// is invented: it says the piston delivers more than it sweeps.)
func TestAnImplausibleRefitIsNotSaved(t *testing.T) {
	dir := t.TempDir()
	unit := filepath.Join(dir, "unit.json")
	p, _ := demoProfile(t, "demo-a")
	p.ID, p.Label = "unit-1", "Unit 1"
	data, err := profiles.Marshal(p)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(unit, data, 0o600))
	bench := filepath.Join(dir, "bench.csv")
	require.NoError(t, os.WriteFile(bench, []byte(profiles.BenchHeader()+"\n4,20,5,20,330\n9,50,5,20,520\n14,20,5,20,640\n20,50,5,20,900\n"), 0o600))
	p, stamp, err := profiles.ReadFileStamped(unit)
	require.NoError(t, err)
	m := New(Options{Profile: p, Source: profiles.Source{Path: unit, Stamp: stamp}, ProfilesDir: dir, Now: testNow,
		Prefill: map[string]string{"height-cm": "175", "sex": "male"}})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(3), ctrlB)
	press(m, tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(bench), Paste: true})
	runCmd(m, press(m, enter))
	require.Equal(t, machinePreview, m.machine.mode, m.machine.note)
	require.NotEmpty(t, m.machine.preview.Unwritable())
	runCmd(m, press(m, ctrlW))
	require.Contains(t, m.machine.note, "nothing written: the fit is implausible")
	after, err := os.ReadFile(unit)
	require.NoError(t, err)
	require.Equal(t, data, after)
	require.NoFileExists(t, unit+".bak")
}

// The hole table scrolled down says how many holes are above, as it says
// how many are below: demo-a's 25 holes at 80x24 do not fit.
func TestTheHoleTableSaysWhatIsAbove(t *testing.T) {
	m := newTestModel(t, map[string]string{"height-cm": "175", "sex": "male"})
	press(m, fkey(3))
	require.Contains(t, screen(m), "more holes (down arrow)")
	require.NotContains(t, screen(m), "above (up arrow)")
	press(m, down, down, down)
	v := screen(m)
	require.Contains(t, v, "^ 3 more holes above (up arrow)")
	require.Contains(t, v, "more holes (down arrow)")
}
