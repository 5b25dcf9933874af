//go:build unix

package logbook_test

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"syscall"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
)

// TestHelperLimitedAppender is not a test on its own: the file-size test
// starts the test binary again with CRANKSIDE_FSIZE set, so that the limit
// applies to that process alone.
func TestHelperLimitedAppender(t *testing.T) {
	limit, err := strconv.ParseUint(os.Getenv("CRANKSIDE_FSIZE"), 10, 64)
	if err != nil {
		t.Skip("helper process for the file-size test; runs only when it starts it")
	}
	rec := sampleRecord(t, "B1", 50)
	// The Go runtime ignores SIGXFSZ: a write past the limit returns EFBIG
	// after writing what fits.
	if err := syscall.Setrlimit(syscall.RLIMIT_FSIZE, &syscall.Rlimit{Cur: limit, Max: limit}); err != nil {
		fmt.Fprintln(os.Stderr, "setrlimit:", err)
		os.Exit(4)
	}
	if err := logbook.AppendRecord(os.Getenv("CRANKSIDE_LOG"), rec); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(3)
	}
	os.Exit(0)
}

// An append refused by a file-size limit in the middle of its line is cut
// back to the log's length before it: the file stays byte for byte as it
// was, and the message says nothing was written.
func TestAFailedAppendLeavesTheFileByteIdentical(t *testing.T) {
	for _, torn := range []bool{false, true} {
		path := filepath.Join(t.TempDir(), "handover.jsonl")
		for i := 0; i < 3; i++ {
			require.NoError(t, logbook.AppendRecord(path, sampleRecord(t, "B1", i)))
		}
		if torn { // the record would start with a newline after a torn line
			f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND, 0)
			require.NoError(t, err)
			_, err = f.WriteString(`{"format":"crankside-check/1","bed":"B`)
			require.NoError(t, err)
			require.NoError(t, f.Close())
		}
		before, err := os.ReadFile(path)
		require.NoError(t, err)
		// Room for 100 more bytes: a record is some kilobytes, so part of
		// it is written before the limit refuses the rest.
		cmd := exec.Command(os.Args[0], "-test.run=^TestHelperLimitedAppender$")
		cmd.Env = append(os.Environ(), "CRANKSIDE_LOG="+path, "CRANKSIDE_FSIZE="+strconv.Itoa(len(before)+100))
		out, err := cmd.CombinedOutput()
		var exit *exec.ExitError
		require.ErrorAs(t, err, &exit, "%s", out)
		require.Equal(t, 3, exit.ExitCode(), "%s", out)
		require.Contains(t, string(out), "record NOT written: nothing was written, the log is as it was ("+strconv.Itoa(len(before))+" bytes)")
		require.Contains(t, string(out), "file too large")
		after, err := os.ReadFile(path)
		require.NoError(t, err)
		require.Equal(t, before, after, "the log is byte-identical after the failed append")
	}
}
