package profiles

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestSaveOnAFullDiskKeepsTheOldProfile(t *testing.T) {
	if os.Geteuid() != 0 {
		t.Skip("a full disk is simulated with a small tmpfs, which needs root")
	}
	dir := t.TempDir()
	if out, err := exec.Command("mount", "-t", "tmpfs", "-o", "size=64k", "tmpfs", dir).CombinedOutput(); err != nil {
		t.Skipf("cannot mount a small tmpfs here: %v %s", err, out)
	}
	t.Cleanup(func() { exec.Command("umount", dir).Run() })
	path := filepath.Join(dir, "unit.json")
	p := demo(t, "demo-b")
	p.ID = "unit-b"
	require.NoError(t, Save(path, p))
	before, err := os.ReadFile(path)
	require.NoError(t, err)
	f, err := os.Create(filepath.Join(dir, "ballast"))
	require.NoError(t, err)
	for {
		if _, err := f.Write(bytes.Repeat([]byte{'x'}, 1024)); err != nil {
			break
		}
	}
	f.Close()
	p.Label = "a new label that must not half-replace the old file"
	_, stamp, err := ReadFileStamped(path)
	require.NoError(t, err)
	err = SaveWithBackupIfUnchanged(path, p, stamp)
	require.Error(t, err)
	require.Contains(t, err.Error(), "not saved")
	after, err := os.ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, before, after)
	got, err := ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, "unit-b", got.ID)
	// No temporary file is left to be mistaken for a profile.
	names, _ := filepath.Glob(filepath.Join(dir, ".unit.json.tmp-*"))
	require.Empty(t, names)
}
