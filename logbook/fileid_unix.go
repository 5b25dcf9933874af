//go:build unix

package logbook

import (
	"os"
	"syscall"
)

// fileID is what makes a file itself (its device and inode), so that a
// file named twice, or by its folder and by name, is read once; ok is
// false when the system does not say.
func fileID(st os.FileInfo) (id [2]uint64, ok bool) {
	s, ok := st.Sys().(*syscall.Stat_t)
	if !ok {
		return id, false
	}
	return [2]uint64{uint64(s.Dev), s.Ino}, true
}
