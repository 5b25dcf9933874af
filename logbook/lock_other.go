//go:build !unix

package logbook

import (
	"fmt"
	"os"
)

// Without flock, O_APPEND's single write keeps each line whole on local
// file systems.
func lockFile(*os.File) error   { return nil }
func unlockFile(*os.File) error { return nil }

// openOwnedLog refuses a link or anything but a regular file. Without
// O_NOFOLLOW the name is checked before and the open file after, which
// leaves a moment in between; ownership and mode bits are not checked
// here (they mean something else off unix).
func openOwnedLog(path string, flag int) (*os.File, error) {
	if st, err := os.Lstat(path); err == nil && st.Mode()&os.ModeSymlink != 0 {
		return nil, fmt.Errorf("log %s is a symbolic link; a log is never followed through a link: give the real file's path", path)
	}
	f, err := os.OpenFile(path, flag, 0o600)
	if err != nil {
		return nil, fmt.Errorf("log %s: %w", path, unwrapPathError(err))
	}
	st, err := f.Stat()
	if err == nil && !st.Mode().IsRegular() {
		err = fmt.Errorf("log %s is not a regular file (%s); give a plain file", path, fileKind(st.Mode()))
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	return f, nil
}

func dirWritable(string) error { return nil }
