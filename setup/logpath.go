package setup

import (
	"errors"
	"fmt"
	"os"
)

// CheckLogWritable says whether the log at path can be appended to, without
// writing anything: its folder exists or can be made, and the file, if it
// exists, is a regular file.
func CheckLogWritable(path string) error {
	fi, err := os.Lstat(path)
	switch {
	case errors.Is(err, os.ErrNotExist):
		return nil
	case err != nil:
		return unwrapPathError(err)
	case !fi.Mode().IsRegular():
		return fmt.Errorf("%s is not a regular file", path)
	}
	return nil
}
