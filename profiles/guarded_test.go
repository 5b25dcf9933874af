package profiles

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

func unitFile(t *testing.T, mode os.FileMode) (string, Profile) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "unit.json")
	p := demo(t, "demo-b")
	p.ID = "unit-b"
	require.NoError(t, Save(path, p))
	require.NoError(t, os.Chmod(path, mode))
	return path, p
}

func TestSaveRefusesASymbolicLink(t *testing.T) {
	path, p := unitFile(t, 0o600)
	real, err := filepath.EvalSymlinks(path) // the temp dir itself may sit behind a link
	require.NoError(t, err)
	before, err := os.ReadFile(path)
	require.NoError(t, err)
	link := filepath.Join(filepath.Dir(path), "link.json")
	require.NoError(t, os.Symlink(path, link))
	p.Label = "written through the link"
	for name, save := range map[string]func() error{
		"Save":           func() error { return Save(link, p) },
		"SaveWithBackup": func() error { return SaveWithBackup(link, p) },
	} {
		err := save()
		require.Error(t, err, name)
		require.Contains(t, err.Error(), "symbolic link", name)
		require.Contains(t, err.Error(), "name the real file "+real, name)
		info, err := os.Lstat(link)
		require.NoError(t, err)
		require.NotZero(t, info.Mode()&os.ModeSymlink, "%s: the link is still a link", name)
		after, err := os.ReadFile(path)
		require.NoError(t, err)
		require.Equal(t, before, after, "%s: the real file is untouched", name)
	}
	// A dangling link is refused too, and nothing is created at its target.
	dangling := filepath.Join(filepath.Dir(path), "dangling.json")
	target := filepath.Join(filepath.Dir(path), "nowhere.json")
	require.NoError(t, os.Symlink(target, dangling))
	err = Save(dangling, p)
	require.ErrorContains(t, err, "does not exist")
	_, err = os.Stat(target)
	require.ErrorIs(t, err, os.ErrNotExist)
	// A folder is not a file to save over.
	err = Save(filepath.Dir(path), p)
	require.ErrorContains(t, err, "not a regular file")
}

func TestSaveKeepsTheFileMode(t *testing.T) {
	path, p := unitFile(t, 0o600)
	p.Label = "recalibrated"
	require.NoError(t, SaveWithBackup(path, p))
	for _, f := range []string{path, path + ".bak"} {
		info, err := os.Stat(f)
		require.NoError(t, err)
		require.Equal(t, os.FileMode(0o600), info.Mode().Perm(), "%s keeps the profile's 0600", f)
	}
	require.NoError(t, Save(path, p))
	info, err := os.Stat(path)
	require.NoError(t, err)
	require.Equal(t, os.FileMode(0o600), info.Mode().Perm())
	if runtime.GOOS != "windows" {
		lock, err := os.Stat(path + ".lock")
		require.NoError(t, err)
		require.Equal(t, os.FileMode(0o600), lock.Mode().Perm(), "the lock file is the owner's only")
	}
}

func TestConcurrentSavesFromOneReadExactlyOneWins(t *testing.T) {
	path, _ := unitFile(t, 0o644)
	p0, stamp, err := ReadFileStamped(path)
	require.NoError(t, err)
	const writers = 10
	errs := make([]error, writers)
	var wg sync.WaitGroup
	start := make(chan struct{})
	for i := 0; i < writers; i++ {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			p := p0
			p.Label = fmt.Sprintf("writer %d", i)
			<-start
			errs[i] = SaveWithBackupIfUnchanged(path, p, stamp)
		}(i)
	}
	close(start)
	wg.Wait()
	winner := -1
	for i, err := range errs {
		if err == nil {
			require.Equal(t, -1, winner, "writers %d and %d both said written", winner, i)
			winner = i
			continue
		}
		require.ErrorIs(t, err, ErrChanged, "writer %d", i)
		require.Contains(t, err.Error(), "nothing was written")
	}
	require.NotEqual(t, -1, winner, "one writer must succeed")
	got, err := ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, fmt.Sprintf("writer %d", winner), got.Label, "the file holds the one save that was reported")
	bak, err := ReadFile(path + ".bak")
	require.NoError(t, err)
	require.Equal(t, p0, bak, "the backup is the file as read, not a loser's")
	// Saving again from the old stamp is refused; from a fresh one it works.
	require.ErrorIs(t, SaveIfUnchanged(path, p0, stamp), ErrChanged)
	_, fresh, err := ReadFileStamped(path)
	require.NoError(t, err)
	require.NoError(t, SaveIfUnchanged(path, p0, fresh))
}

func TestSaveIfUnchangedSeesAnEditOfTheSameSize(t *testing.T) {
	path, p := unitFile(t, 0o644)
	_, stamp, err := ReadFileStamped(path)
	require.NoError(t, err)
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	edited := []byte(string(data))
	i := len(`{
  "format": "crankside-profile/2",
  "id": "unit-`)
	edited[i] = 'c' // unit-b -> unit-c: same size
	require.NoError(t, os.WriteFile(path, edited, 0o644))
	require.NoError(t, os.Chtimes(path, stamp.ModTime, stamp.ModTime)) // and the same time
	err = SaveIfUnchanged(path, p, stamp)
	require.ErrorIs(t, err, ErrChanged)
	after, err := os.ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, edited, after, "nothing was written")
	// A file that appeared after a "new file" stamp is not overwritten.
	other := filepath.Join(filepath.Dir(path), "new.json")
	require.NoError(t, os.WriteFile(other, data, 0o644))
	require.ErrorIs(t, SaveIfUnchanged(other, p, Stamp{}), ErrChanged)
	require.NoError(t, SaveIfUnchanged(filepath.Join(filepath.Dir(path), "fresh.json"), p, Stamp{}))
}

func TestSaveRemovesStaleTemporaryFiles(t *testing.T) {
	path, p := unitFile(t, 0o644)
	dir := filepath.Dir(path)
	old := time.Now().Add(-time.Hour)
	write := func(name string, when time.Time) string {
		f := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(f, []byte("{"), 0o600))
		require.NoError(t, os.Chtimes(f, when, when))
		return f
	}
	stale := write(".unit.json.tmp-1234567", old)
	staleBak := write(".unit.json.bak.tmp-7654321", old)
	fresh := write(".unit.json.tmp-999", time.Now()) // a save may be writing it
	foreign := write(".other.json.tmp-111", old)     // another profile's
	notOurs := write(".unit.json.tmp-keep.me", old)  // not our naming
	require.NoError(t, Save(path, p))
	for _, f := range []string{stale, staleBak} {
		_, err := os.Stat(f)
		require.ErrorIs(t, err, os.ErrNotExist, "%s is removed", f)
	}
	for _, f := range []string{fresh, foreign, notOurs} {
		_, err := os.Stat(f)
		require.NoError(t, err, "%s is kept", f)
	}
}

func TestOpenGivesTheStampForASafeSave(t *testing.T) {
	// The stamp Open returns lets a read-change-write refuse a file that
	// someone else wrote in between (the calibrate --write case).
	path, _ := unitFile(t, 0o600)
	p, src, err := Open(path, "")
	require.NoError(t, err)
	require.True(t, src.Stamp.Exists)
	q, byID, err := Open("unit-b", filepath.Dir(path))
	require.NoError(t, err)
	require.Equal(t, src.Stamp, byID.Stamp)
	q.Label = "someone else's save"
	require.NoError(t, SaveWithBackupIfUnchanged(byID.Path, q, byID.Stamp))
	p.Label = "my save"
	err = SaveWithBackupIfUnchanged(src.Path, p, src.Stamp)
	require.ErrorIs(t, err, ErrChanged)
	got, err := ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, "someone else's save", got.Label)
}
