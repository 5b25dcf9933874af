//go:build unix

package logbook

import (
	"errors"
	"fmt"
	"os"
	"syscall"
)

// lockFile takes an exclusive advisory lock, so appenders in several
// processes write one whole line at a time.
func lockFile(f *os.File) error {
	for {
		err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX)
		if err != syscall.EINTR {
			return err
		}
	}
}

func unlockFile(f *os.File) error { return syscall.Flock(int(f.Fd()), syscall.LOCK_UN) }

// openOwnedLog opens path with flag, never through a symbolic link and
// never waiting on a pipe or device: O_NOFOLLOW refuses a link (a dangling
// one too, so O_CREATE makes no target), O_NONBLOCK keeps the open of a
// FIFO from blocking, and fstat on the open file (not the name, which
// could change in between) refuses anything but a regular file that this
// user owns and nobody else can read or write.
func openOwnedLog(path string, flag int) (*os.File, error) {
	f, err := os.OpenFile(path, flag|syscall.O_NOFOLLOW|syscall.O_NONBLOCK, 0o600)
	if err != nil {
		return nil, explainOpenError(path, err)
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("log %s: %w", path, unwrapPathError(err))
	}
	if err := ownedRegular(path, st); err != nil {
		f.Close()
		return nil, err
	}
	return f, nil
}

func explainOpenError(path string, err error) error {
	switch {
	case errors.Is(err, syscall.ELOOP):
		return fmt.Errorf("log %s is a symbolic link; a log is never followed through a link: give the real file's path", path)
	case errors.Is(err, syscall.ENXIO):
		// O_WRONLY|O_NONBLOCK on a FIFO with no reader.
		return fmt.Errorf("log %s is not a regular file (a named pipe or device); give a plain file", path)
	case errors.Is(err, syscall.EISDIR):
		return fmt.Errorf("log %s is not a regular file (a folder); give a file in it", path)
	}
	return fmt.Errorf("log %s: %w", path, unwrapPathError(err))
}

// ownedRegular refuses what a log must not be, saying how to fix it.
func ownedRegular(path string, st os.FileInfo) error {
	if !st.Mode().IsRegular() {
		return fmt.Errorf("log %s is not a regular file (%s); give a plain file", path, fileKind(st.Mode()))
	}
	if sys, ok := st.Sys().(*syscall.Stat_t); ok && int(sys.Uid) != os.Geteuid() {
		return fmt.Errorf("log %s belongs to uid %d; use your own log file", path, sys.Uid)
	}
	if perm := st.Mode().Perm(); perm&0o077 != 0 {
		return fmt.Errorf("log %s has mode %04o, so others may read or change clinical records; run: chmod 600 %s", path, perm, path)
	}
	return nil
}

// dirWritable says whether this user may create a file in dir.
func dirWritable(dir string) error {
	const wOK, xOK = 0x2, 0x1
	return syscall.Access(dir, wOK|xOK)
}
