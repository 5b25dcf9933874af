package logbook_test

import (
	"errors"
	"fmt"
	"path/filepath"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
)

// folderOfLogs writes n one-record logs (beds B1..Bn) into a new folder.
func folderOfLogs(t *testing.T, n int) string {
	t.Helper()
	dir := t.TempDir()
	for i := 1; i <= n; i++ {
		bed := fmt.Sprintf("B%d", i)
		writeLog(t, filepath.Join(dir, fmt.Sprintf("t%02d.jsonl", i)), recordLine(t, wardRecord(t, bed, at(9, i), 21, 0))+"\n")
	}
	return dir
}

// tickingClock is a clock that moves on by step each time it is read.
func tickingClock(step time.Duration) func() time.Time {
	now := at(12, 0)
	return func() time.Time {
		t := now
		now = now.Add(step)
		return t
	}
}

// A read of many files notes how far it has got once it has taken a
// second, then each time the time taken doubles; never on its last file.
func TestAFolderReadNotesItsProgress(t *testing.T) {
	dir := folderOfLogs(t, 10)
	var notes []string
	// The clock moves 250 ms per file. derived: the check of the 10 files
	// found reaches 1 s at its 4th file (note, next due at 2 s) and 2 s at
	// its 8th (next due at 4 s); the read goes on from 2.75 s, reaching
	// 4 s at its 6th file (next due at 8 s, never reached by the 10th at
	// 5 s, which is the last and not noted).
	p := logbook.NewProgress(func(s string) { notes = append(notes, s) }, time.Second, tickingClock(250*time.Millisecond))
	rows, sum, err := logbook.WardRows([]string{dir}, at(12, 0), 0, logbook.WithProgress(p))
	require.NoError(t, err)
	require.Zero(t, sum.Damaged)
	require.Len(t, rows, 10, "every bed is read")
	require.Equal(t, []string{"checking 4 of 10 files...", "checking 8 of 10 files...", "reading 6 of 10 files..."}, notes)

	// A read that takes no time says nothing.
	notes = nil
	p = logbook.NewProgress(func(s string) { notes = append(notes, s) }, time.Second, tickingClock(0))
	hs, _, err := logbook.ReadHistories([]string{dir}, "", 0, logbook.WithProgress(p))
	require.NoError(t, err)
	require.Len(t, hs, 10)
	require.Empty(t, notes)

	// The history reader notes as the ward's does: 1 s per file, the 1st
	// checked file is at 1 s (derived: then due at 2, 4, 8, 16 s: the
	// 2nd, 4th, 8th checked; the read starts at 11 s and notes its 6th
	// file at 16 s; 32 s is never reached).
	notes = nil
	p = logbook.NewProgress(func(s string) { notes = append(notes, s) }, time.Second, tickingClock(time.Second))
	_, _, err = logbook.ReadHistories([]string{dir}, "", 0, logbook.WithProgress(p))
	require.NoError(t, err)
	require.Equal(t, []string{"checking 1 of 10 files...", "checking 2 of 10 files...", "checking 4 of 10 files...", "checking 8 of 10 files...", "reading 6 of 10 files..."}, notes)
}

// More files than the limit: nothing is read, and the error says how many
// were found and the limit; at the limit, all are read.
func TestAFolderOverTheFileLimitIsRefusedWhole(t *testing.T) {
	dir := folderOfLogs(t, 3)
	for _, read := range []func(...logbook.ReadOption) error{
		func(o ...logbook.ReadOption) error {
			_, _, err := logbook.ExpandLogFolders([]string{dir}, o...)
			return err
		},
		func(o ...logbook.ReadOption) error {
			_, _, err := logbook.WardRows([]string{dir}, at(12, 0), 0, o...)
			return err
		},
		func(o ...logbook.ReadOption) error {
			_, _, err := logbook.ReadHistories([]string{dir}, "", 0, o...)
			return err
		},
	} {
		err := read(logbook.MaxFiles(2))
		var tooMany *logbook.TooManyFilesError
		require.True(t, errors.As(err, &tooMany), "%v", err)
		require.Equal(t, logbook.TooManyFilesError{Files: 3, Limit: 2}, *tooMany)
		require.EqualError(t, err, "3 log files found, more than the limit of 2: nothing was read")
		require.NoError(t, read(logbook.MaxFiles(3)), "just at the limit")
		require.NoError(t, read(), "the default limit")
	}
	// A file named twice, and by its folder, counts each time it is
	// named (the limit is on what was asked) but is read once.
	files, _, err := logbook.ExpandLogFolders([]string{dir, filepath.Join(dir, "t01.jsonl")}, logbook.MaxFiles(4))
	require.NoError(t, err)
	require.Len(t, files, 3)
	_, _, err = logbook.ExpandLogFolders([]string{dir, filepath.Join(dir, "t01.jsonl")}, logbook.MaxFiles(3))
	require.EqualError(t, err, "4 log files found, more than the limit of 3: nothing was read")
}

func TestMaxFilesEntry(t *testing.T) {
	// The default: 10 000 files (its reason is in DefaultMaxFiles).
	n, ie := logbook.MaxFilesEntry("")
	require.Nil(t, ie)
	require.Equal(t, 10_000, n)
	for text, want := range map[string]int{"1": 1, "250000": 250_000, "10000000": 10_000_000, "2,0": 2} {
		n, ie := logbook.MaxFilesEntry(text)
		require.Nil(t, ie, text)
		require.Equal(t, want, n, text)
	}
	for text, want := range map[string]string{
		"0":        "number of log files 0 files is outside 1-10000000 files",
		"10000001": "outside 1-10000000",
		"2.5":      "2.5 is not a whole number of files",
		"abc":      "(a number of files)",
		"-3":       "outside 1-10000000",
	} {
		_, ie := logbook.MaxFilesEntry(text)
		require.NotNil(t, ie, text)
		require.Equal(t, "max-files", ie.Field)
		require.Contains(t, ie.Reason, want, text)
	}
}
