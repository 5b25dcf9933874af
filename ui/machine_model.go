package ui

import (
	"errors"
	"os"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"crankside/profiles"
	"crankside/setup"
)

// benchMsg is a refit read from a bench file, not yet saved.
type benchMsg struct {
	res *setup.CalibrationResult
	err error
}

// writtenMsg is the outcome of saving a refit.
type writtenMsg struct {
	path    string
	profile profiles.Profile
	err     error
}

// readBench reads and fits a bench file off the UI's goroutine, on copies.
func (m *Model) readBench(path string) tea.Cmd {
	p, now := m.out.profile, m.now()
	return func() tea.Msg {
		f, err := os.Open(path)
		if err != nil {
			return benchMsg{err: err}
		}
		defer f.Close()
		points, err := setup.ReadBench(f, path, p) // decimal commas and semicolons too
		if err != nil {
			var be *profiles.BenchError
			if errors.As(err, &be) && len(be.Problems) > 1 {
				return benchMsg{err: errors.New(be.Error() + "; run crankside calibrate for every line")}
			}
			return benchMsg{err: err}
		}
		res, err := setup.Calibrate(p, points, now.Format(time.DateOnly), now)
		if err != nil {
			return benchMsg{err: err}
		}
		return benchMsg{res: &res}
	}
}

// writeRefit saves the previewed refit over the profile's file, keeping a
// backup; an embedded demo is refused.
func (m *Model) writeRefit() tea.Cmd {
	prev := m.machine.preview
	if prev == nil {
		return nil
	}
	if m.out.source.Embedded {
		m.machine.note = "! an embedded demo cannot be written; save a copy with 'crankside profiles show " + m.out.profile.ID + " --json'"
		return nil
	}
	if bad := prev.Unwritable(); len(bad) > 0 {
		// As calibrate --write: a fit its own cautions call implausible
		// is never saved.
		m.machine.note = "! nothing written: the fit is implausible (" + setup.LevelWord(bad[0].Level) + " " + string(bad[0].ID) + ": " + bad[0].Message + "); re-measure on the bench"
		return nil
	}
	path, p, stamp := m.out.source.Path, prev.Profile, m.out.source.Stamp
	return func() tea.Msg {
		return writtenMsg{path: path, profile: p, err: profiles.SaveWithBackupIfUnchanged(path, p, stamp)}
	}
}

func (m *Model) written(msg writtenMsg) {
	m.machine.setWritten(msg.path, msg.err)
	if msg.err == nil {
		// Read back what was written, with its new stamp, so that a
		// second refit is checked against this file.
		p, stamp, err := profiles.ReadFileStamped(msg.path)
		if err != nil {
			m.machine.note = "! saved, but could not be read back: " + err.Error()
			return
		}
		m.setProfile(p, profiles.Source{Path: msg.path, Stamp: stamp})
		m.recompute()
	}
}
