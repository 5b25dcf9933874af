package logbook_test

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
)

// smallDisk mounts a tmpfs of the given size: a disk that fills up. It
// needs root (as CI runs); elsewhere the test says why it cannot run.
func smallDisk(t *testing.T, size string) string {
	t.Helper()
	dir := t.TempDir()
	if os.Geteuid() != 0 {
		t.Skip("a full disk is simulated with a small tmpfs, which needs root")
	}
	if out, err := exec.Command("mount", "-t", "tmpfs", "-o", "size="+size, "tmpfs", dir).CombinedOutput(); err != nil {
		t.Skipf("cannot mount a small tmpfs here: %v %s", err, out)
	}
	t.Cleanup(func() { exec.Command("umount", dir).Run() })
	return dir
}

// fill writes until the disk refuses.
func fill(t *testing.T, dir string) {
	f, err := os.Create(filepath.Join(dir, "ballast"))
	require.NoError(t, err)
	defer f.Close()
	block := bytes.Repeat([]byte{'x'}, 1024)
	for {
		if _, err := f.Write(block); err != nil {
			return
		}
	}
}

func TestAppendOnAFullDiskKeepsEarlierRecords(t *testing.T) {
	dir := smallDisk(t, "64k")
	path := filepath.Join(dir, "handover.jsonl")
	for i := 0; i < 3; i++ {
		require.NoError(t, logbook.AppendRecord(path, sampleRecord(t, "B1", i)))
	}
	before, err := os.ReadFile(path)
	require.NoError(t, err)
	fill(t, dir)
	// The log's last page may still have room for a record or so; keep
	// appending until the disk refuses.
	saved := 3
	var appendErr error
	for i := 0; i < 20 && appendErr == nil; i++ {
		if appendErr = logbook.AppendRecord(path, sampleRecord(t, "B1", 10+i)); appendErr == nil {
			saved++
		}
	}
	require.Error(t, appendErr, "a full disk must refuse a record")
	require.Contains(t, appendErr.Error(), "no space left")
	recs, problems, err := logbook.ReadLog(path)
	require.NoError(t, err)
	require.Len(t, recs, saved, "every record that was reported saved is still readable")
	// A short write is cut back: no part of the failed line stays.
	require.Empty(t, problems)
	require.Contains(t, appendErr.Error(), "nothing was written")
	after, _ := os.ReadFile(path)
	require.True(t, strings.HasPrefix(string(after), string(before)))
	require.Equal(t, saved, bytes.Count(after, []byte("\n")), "whole lines only")
}
