package profiles

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"time"

	"crankside/profiles/safetext"
)

// Stamp identifies the bytes of a profile file as they were read, so that a
// later save can tell whether someone else wrote the file in between.
type Stamp struct {
	Exists    bool // false: the file did not exist (a save then expects none)
	SizeBytes int64
	ModTime   time.Time
	SHA256    [sha256.Size]byte
}

// ErrChanged is wrapped by the error of a save refused because the file is
// not the one that was read.
var ErrChanged = errors.New("profiles: the file changed since it was read")

// newFileMode is the mode of a profile file created new; an existing file
// keeps its own mode.
const newFileMode fs.FileMode = 0o644

// staleTempAge is how old one of our temporary files must be before a save
// removes it: a save holds the lock while its temporary file exists, so one
// found under the lock is a crashed save's; the age also spares a save by a
// tool that did not lock.
const staleTempAge = 10 * time.Minute

// ReadFileStamped is ReadFile that also returns the Stamp of the bytes it
// parsed, for SaveIfUnchanged or SaveWithBackupIfUnchanged.
func ReadFileStamped(path string) (Profile, Stamp, error) {
	data, info, err := readLimitedStat(path)
	if err != nil {
		return Profile{}, Stamp{}, fmt.Errorf("profile %s: %w", safetext.Escape(path), err)
	}
	st := Stamp{Exists: true, SizeBytes: info.Size(), ModTime: info.ModTime(), SHA256: sha256.Sum256(data)}
	p, err := Parse(data, path)
	return p, st, err
}

// SaveWithBackupIfUnchanged is SaveWithBackup with SaveIfUnchanged's check.
func SaveWithBackupIfUnchanged(path string, p Profile, read Stamp) error {
	return guardedSave(path, p, true, &read)
}

// guardedSave is every profile save: validate, refuse a link or a
// non-regular file, lock, remove stale temporary files, check the stamp,
// keep the old file as .bak when asked, and write atomically with the old
// file's mode.
func guardedSave(path string, p Profile, backup bool, expect *Stamp) error {
	data, err := encodeValid(path, p)
	if err != nil {
		return err
	}
	shown := safetext.Escape(path)
	if err := refuseLink(path); err != nil {
		return fmt.Errorf("not saved: %w", err)
	}
	unlock, err := lockBeside(path)
	if err != nil {
		return fmt.Errorf("not saved (%s unchanged): cannot take the lock %s.lock: %w", shown, shown, unwrapPath(err))
	}
	defer unlock()
	removeStaleTemps(path, time.Now())
	// Look again under the lock: the file may have been replaced meanwhile.
	if err := refuseLink(path); err != nil {
		return fmt.Errorf("not saved: %w", err)
	}
	old, info, err := readLimitedStat(path)
	exists := err == nil
	if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return fmt.Errorf("not saved (%s unchanged): cannot read it: %w", shown, err)
	}
	if expect != nil {
		if why := changedSince(*expect, exists, old, info); why != "" {
			return fmt.Errorf("not saved: %s %s; nothing was written: open it again and redo the change: %w", shown, why, ErrChanged)
		}
	}
	mode := newFileMode
	if exists {
		mode = info.Mode().Perm()
	}
	if backup && exists {
		if err := WriteAtomic(path+".bak", old, mode); err != nil {
			return fmt.Errorf("not saved: the backup %s.bak could not be written: %w", shown, err)
		}
	}
	return WriteAtomic(path, data, mode)
}

// changedSince says how the file now differs from the stamp, or "".
func changedSince(st Stamp, exists bool, data []byte, info os.FileInfo) string {
	switch {
	case !st.Exists && exists:
		return "was created by someone else since this profile was started"
	case st.Exists && !exists:
		return "was removed since it was read"
	case !exists:
		return ""
	case info.Size() != st.SizeBytes || !info.ModTime().Equal(st.ModTime) || !bytes.Equal(sumOf(data), st.SHA256[:]):
		return "changed since it was read (another save, or an edit)"
	}
	return ""
}

func sumOf(data []byte) []byte { s := sha256.Sum256(data); return s[:] }

// refuseLink refuses to save through a symbolic link, which would replace
// the link with a file and leave the real profile as it was, and refuses
// anything that is not a regular file. A missing file is fine.
func refuseLink(path string) error {
	info, err := os.Lstat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return fmt.Errorf("%s: %w", safetext.Escape(path), unwrapPath(err))
	case info.Mode()&fs.ModeSymlink != 0:
		real, err := filepath.EvalSymlinks(path)
		if err != nil {
			target, _ := os.Readlink(path)
			return fmt.Errorf("%s is a symbolic link to %s, which does not exist; name the real file to save to", safetext.Escape(path), safetext.Escape(target))
		}
		return fmt.Errorf("%s is a symbolic link; name the real file %s instead", safetext.Escape(path), safetext.Escape(real))
	case !info.Mode().IsRegular():
		return fmt.Errorf("%s is not a regular file (%s)", safetext.Escape(path), info.Mode().Type())
	}
	return nil
}

// tempPrefixes are the name starts of writeAtomic's temporary files for path
// and for its backup.
func tempPrefixes(path string) []string {
	base := filepath.Base(path)
	return []string{"." + base + ".tmp-", "." + base + ".bak.tmp-"}
}

// removeStaleTemps removes our own temporary files for path (and its
// backup) older than staleTempAge: what a save killed before its rename left.
// Only regular files of exactly our naming are touched.
func removeStaleTemps(path string, now time.Time) {
	dir := filepath.Dir(path)
	entries, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	prefixes := tempPrefixes(path)
	for _, e := range entries {
		name := e.Name()
		ours := false
		for _, pre := range prefixes {
			if rest, ok := strings.CutPrefix(name, pre); ok && rest != "" && !strings.ContainsAny(rest, ".") {
				ours = true
			}
		}
		if !ours || !e.Type().IsRegular() {
			continue
		}
		if info, err := e.Info(); err == nil && now.Sub(info.ModTime()) > staleTempAge {
			os.Remove(filepath.Join(dir, name))
		}
	}
}
