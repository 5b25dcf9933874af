//go:build unix

package logbook_test

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
)

// within runs f and fails the test if it has not returned after a
// generous while: a refusal that blocks (a FIFO opened for writing waits
// for a reader forever) shows as a failure, not a hung run. This is a
// guard against blocking, not a timing assertion.
func within(t *testing.T, what string, f func() error) error {
	t.Helper()
	done := make(chan error, 1)
	go func() { done <- f() }()
	select {
	case err := <-done:
		return err
	case <-time.After(20 * time.Second):
		t.Fatalf("%s blocked: it should refuse at once", what)
		return nil
	}
}

// logReaders are every way the log is read; each must refuse what
// append refuses.
func logReaders(path string) map[string]func() error {
	return map[string]func() error{
		"ReadLog": func() error { _, _, err := logbook.ReadLog(path); return err },
		"ReadBedHistory": func() error {
			_, _, err := logbook.ReadBedHistory([]string{path}, "B1", 0)
			return err
		},
		"ReadHistories": func() error { _, _, err := logbook.ReadHistories([]string{path}, "", 0); return err },
		"WardRows": func() error {
			_, _, err := logbook.WardRows([]string{path}, today, 0)
			return err
		},
		"CheckLogPath": func() error { return logbook.CheckLogPath(path) },
	}
}

// refusedEverywhere checks that appending to and reading path are both
// refused with a message holding want, leaving path's target as it was.
func refusedEverywhere(t *testing.T, path, want string) {
	t.Helper()
	err := within(t, "AppendRecord", func() error { return logbook.AppendRecord(path, sampleRecord(t, "B1", 5)) })
	require.Error(t, err, "append to %s", path)
	require.Contains(t, err.Error(), want, "append")
	for name, read := range logReaders(path) {
		err := within(t, name, read)
		require.Error(t, err, "%s of %s", name, path)
		require.Contains(t, err.Error(), want, name)
	}
}

func ownLog(t *testing.T, dir string) (string, []byte) {
	t.Helper()
	path := filepath.Join(dir, "real.jsonl")
	require.NoError(t, logbook.AppendRecord(path, sampleRecord(t, "B1", 0)))
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	return path, data
}

func TestTheLogRefusesASymlink(t *testing.T) {
	dir := t.TempDir()
	real, before := ownLog(t, dir)
	link := filepath.Join(dir, "link.jsonl")
	require.NoError(t, os.Symlink(real, link))
	refusedEverywhere(t, link, "symbolic link")
	after, err := os.ReadFile(real)
	require.NoError(t, err)
	require.Equal(t, before, after, "nothing was appended through the link")
}

func TestTheLogRefusesADanglingSymlinkAndCreatesNoTarget(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "elsewhere.jsonl")
	link := filepath.Join(dir, "link.jsonl")
	require.NoError(t, os.Symlink(target, link))
	refusedEverywhere(t, link, "symbolic link")
	_, err := os.Lstat(target)
	require.ErrorIs(t, err, os.ErrNotExist, "the link's target must not be created")
}

func TestTheLogRefusesAFIFOWithoutBlocking(t *testing.T) {
	fifo := filepath.Join(t.TempDir(), "pipe.jsonl")
	require.NoError(t, syscall.Mkfifo(fifo, 0o600))
	refusedEverywhere(t, fifo, "not a regular file")
}

func TestTheLogRefusesADevice(t *testing.T) {
	// /dev/zero never ends: a reader that followed it would never return.
	for name, read := range logReaders("/dev/zero") {
		err := within(t, name, read)
		require.Error(t, err, name)
		require.Contains(t, err.Error(), "not a regular file (a device)", name)
	}
	err := within(t, "AppendRecord", func() error { return logbook.AppendRecord("/dev/null", sampleRecord(t, "B1", 0)) })
	require.ErrorContains(t, err, "not a regular file")
}

func TestTheLogRefusesModesOthersCanUse(t *testing.T) {
	for _, mode := range []os.FileMode{0o644, 0o640, 0o604, 0o620, 0o602} {
		dir := t.TempDir()
		path, before := ownLog(t, dir)
		require.NoError(t, os.Chmod(path, mode))
		refusedEverywhere(t, path, "chmod 600 "+path)
		after, err := os.ReadFile(path)
		require.NoError(t, err)
		require.Equal(t, before, after, "mode %04o: nothing appended", mode)
	}
}

func TestTheLogRefusesAnotherUsersFile(t *testing.T) {
	if os.Geteuid() != 0 {
		t.Skip("giving a file to another user needs root (as CI runs); the mode and link refusals still ran")
	}
	path, before := ownLog(t, t.TempDir())
	require.NoError(t, os.Chown(path, 65534, 65534))
	refusedEverywhere(t, path, "belongs to uid 65534; use your own log file")
	after, err := os.ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, before, after)
}

func TestCheckLogPathSaysWhetherARecordCanBeMade(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, logbook.CheckLogPath(filepath.Join(dir, "new.jsonl")), "a new log in an existing folder can be created")
	_, err := os.Lstat(filepath.Join(dir, "new.jsonl"))
	require.ErrorIs(t, err, os.ErrNotExist, "checking creates nothing")
	path, _ := ownLog(t, dir)
	require.NoError(t, logbook.CheckLogPath(path))
	require.ErrorContains(t, logbook.CheckLogPath(filepath.Join(dir, "missing", "h.jsonl")), "no such file")
	require.ErrorContains(t, logbook.CheckLogPath(dir), "not a regular file (a folder)")
	require.ErrorContains(t, logbook.CheckLogPath(""), "no log file")
	// A new log is created owner-only (the log holds clinical data).
	fresh := filepath.Join(dir, "fresh.jsonl")
	require.NoError(t, logbook.AppendRecord(fresh, sampleRecord(t, "B2", 0)))
	st, err := os.Stat(fresh)
	require.NoError(t, err)
	require.Equal(t, os.FileMode(0o600), st.Mode().Perm())
}

func TestAFolderOfLogsRefusesALinkInside(t *testing.T) {
	dir := t.TempDir()
	real, _ := ownLog(t, t.TempDir())
	require.NoError(t, os.Symlink(real, filepath.Join(dir, "other.jsonl")))
	_, _, err := logbook.WardRows([]string{dir}, today, 0)
	require.ErrorContains(t, err, "symbolic link")
	_, _, err = logbook.ReadBedHistory([]string{dir}, "B1", 0)
	require.ErrorContains(t, err, "symbolic link")
}
