//go:build unix

package profiles

import (
	"errors"
	"os"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

func TestReadingAFIFODoesNotBlock(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.json")
	require.NoError(t, syscall.Mkfifo(fifo, 0o600))
	done := make(chan error, 1)
	go func() { _, err := ReadFile(fifo); done <- err }()
	select {
	case err := <-done:
		require.ErrorContains(t, err, "not a regular file")
	case <-time.After(10 * time.Second): // a guard against hanging, not a timing assertion
		t.Fatal("reading a FIFO blocked")
	}
	entries, err := List(dir)
	require.NoError(t, err)
	var found bool
	for _, e := range entries {
		if e.Source.Path == fifo {
			found = true
			require.Error(t, e.Err)
		}
	}
	require.True(t, found)
	_, err = ReadFile("/dev/zero")
	require.True(t, err != nil && !errors.Is(err, os.ErrNotExist))
}
