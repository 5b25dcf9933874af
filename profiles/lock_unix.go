//go:build unix

package profiles

import (
	"os"
	"syscall"
)

// lockBeside takes an exclusive flock on path + ".lock" (created 0600, never
// through a symbolic link), so that two savers, in this process or another,
// take turns. The lock file is left in place: removing it would let a third
// saver lock a new file while the second still holds the old one.
func lockBeside(path string) (unlock func(), err error) {
	f, err := os.OpenFile(path+".lock", os.O_RDWR|os.O_CREATE|syscall.O_NOFOLLOW, 0o600)
	if err != nil {
		return nil, err
	}
	for {
		err = syscall.Flock(int(f.Fd()), syscall.LOCK_EX)
		if err != syscall.EINTR {
			break
		}
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	return func() {
		syscall.Flock(int(f.Fd()), syscall.LOCK_UN)
		f.Close()
	}, nil
}

// openReadFlags opens without blocking, so that a FIFO named like a profile
// is found not to be a regular file instead of hanging the reader.
const openReadFlags = syscall.O_NONBLOCK
