package logbook_test

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/setup"
)

func sampleRecord(t testing.TB, bed string, n int) setup.Record {
	t.Helper()
	req := checkReq("8", 21, 1.4)
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, bed, "ab", today.Add(time.Duration(n)*time.Minute))
	require.NoError(t, err)
	return rec
}

// TestHelperAppender is not a test on its own: the durability tests start
// the test binary again with CRANKSIDE_HELPER set, as a separate process.
func TestHelperAppender(t *testing.T) {
	mode := os.Getenv("CRANKSIDE_HELPER")
	if mode == "" {
		t.Skip("helper process for the durability tests; runs only when they start it")
	}
	path := os.Getenv("CRANKSIDE_LOG")
	count, _ := strconv.Atoi(os.Getenv("CRANKSIDE_COUNT"))
	rec := sampleRecord(t, os.Getenv("CRANKSIDE_BED"), 0)
	for i := 0; count == 0 || i < count; i++ {
		rec.Time = today.Add(time.Duration(i) * time.Second)
		if err := logbook.AppendRecord(path, rec); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(3)
		}
		if mode == "tear" && i == 9 {
			// A crash mid-write on a device that does not write a line at
			// once: half a record, then nothing more, until killed.
			f, _ := os.OpenFile(path, os.O_WRONLY|os.O_APPEND, 0)
			f.WriteString(`{"format":"crankside-check/1","bed":"B`)
			f.Sync()
			f.Close()
			fmt.Println("torn")
			time.Sleep(time.Hour)
		}
	}
	os.Exit(0)
}

func helper(t *testing.T, mode, path, bed string, count int) *exec.Cmd {
	cmd := exec.Command(os.Args[0], "-test.run=^TestHelperAppender$")
	cmd.Env = append(os.Environ(), "CRANKSIDE_HELPER="+mode, "CRANKSIDE_LOG="+path, "CRANKSIDE_BED="+bed, "CRANKSIDE_COUNT="+strconv.Itoa(count))
	return cmd
}

func lines(t *testing.T, path string) int {
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	return bytes.Count(data, []byte("\n"))
}

func TestKilledWhileAppendingLosesNoEarlierRecord(t *testing.T) {
	path := filepath.Join(t.TempDir(), "handover.jsonl")
	// Killed at an arbitrary moment while appending as fast as it can.
	cmd := helper(t, "forever", path, "B1", 0)
	require.NoError(t, cmd.Start())
	deadline := time.Now().Add(20 * time.Second)
	for {
		if _, err := os.Stat(path); err == nil && lines(t, path) >= 30 {
			break
		}
		require.True(t, time.Now().Before(deadline), "helper wrote too little")
		time.Sleep(5 * time.Millisecond)
	}
	require.NoError(t, cmd.Process.Signal(syscall.SIGKILL))
	cmd.Wait()
	recs, problems, err := logbook.ReadLog(path)
	require.NoError(t, err)
	require.GreaterOrEqual(t, len(recs), 30)
	require.LessOrEqual(t, len(problems), 1, "at most the line being written when killed: %v", problems)

	// Killed after tearing its last line: the ten before it all read back.
	path2 := filepath.Join(t.TempDir(), "torn.jsonl")
	cmd = helper(t, "tear", path2, "B2", 0)
	out, err := cmd.StdoutPipe()
	require.NoError(t, err)
	require.NoError(t, cmd.Start())
	buf := make([]byte, 64)
	n, _ := out.Read(buf) // "torn" once the half line is on disk
	require.Contains(t, string(buf[:n]), "torn")
	require.NoError(t, cmd.Process.Signal(syscall.SIGKILL))
	cmd.Wait()
	recs, problems, err = logbook.ReadLog(path2)
	require.NoError(t, err)
	require.Len(t, recs, 10)
	require.Len(t, problems, 1)
	require.Contains(t, problems[0].Reason, "torn")
	// The next append starts on its own line; the torn one stays alone.
	require.NoError(t, logbook.AppendRecord(path2, sampleRecord(t, "B2", 99)))
	recs, problems, err = logbook.ReadLog(path2)
	require.NoError(t, err)
	require.Len(t, recs, 11)
	require.Len(t, problems, 1)
}

func TestConcurrentAppendersLoseNothing(t *testing.T) {
	path := filepath.Join(t.TempDir(), "handover.jsonl")
	var wg sync.WaitGroup
	errs := make(chan error, 8)
	for i := 0; i < 8; i++ {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			out, err := helper(t, "count", path, fmt.Sprintf("B%d", i), 50).CombinedOutput()
			if err != nil {
				errs <- fmt.Errorf("appender %d: %v: %s", i, err, out)
			}
		}(i)
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Fatal(err)
	}
	recs, problems, err := logbook.ReadLog(path)
	require.NoError(t, err)
	require.Empty(t, problems)
	require.Len(t, recs, 400)
	perBed := map[string]int{}
	for _, r := range recs {
		perBed[r.Bed]++
	}
	for i := 0; i < 8; i++ {
		require.Equal(t, 50, perBed[fmt.Sprintf("B%d", i)])
	}
	st, err := os.Stat(path)
	require.NoError(t, err)
	require.Equal(t, os.FileMode(0o600), st.Mode().Perm(), "the log holds clinical data: owner only")
}

func TestAppendToAMissingOrReadOnlyDirectory(t *testing.T) {
	rec := sampleRecord(t, "B3", 0)
	err := logbook.AppendRecord(filepath.Join(t.TempDir(), "no-such-dir", "h.jsonl"), rec)
	require.ErrorContains(t, err, "no such file or directory")

	dir := t.TempDir()
	path := filepath.Join(dir, "h.jsonl")
	require.NoError(t, logbook.AppendRecord(path, rec))
	before, _ := os.ReadFile(path)
	if os.Geteuid() == 0 {
		// Root ignores permission bits: make the directory a read-only bind mount.
		if out, err := exec.Command("mount", "--bind", dir, dir).CombinedOutput(); err != nil {
			t.Skipf("cannot make a read-only directory as root here (mount: %v %s); the missing-directory case above still ran", err, out)
		}
		defer exec.Command("umount", dir).Run()
		if out, err := exec.Command("mount", "-o", "remount,ro,bind", dir).CombinedOutput(); err != nil {
			t.Skipf("cannot remount read-only (%v %s); the missing-directory case above still ran", err, out)
		}
	} else {
		require.NoError(t, os.Chmod(path, 0o400))
		defer os.Chmod(path, 0o600)
	}
	err = logbook.AppendRecord(path, rec)
	require.Error(t, err, "appending to a read-only log must fail loudly")
	require.True(t, strings.Contains(err.Error(), "read-only") || strings.Contains(err.Error(), "permission denied"), err.Error())
	after, _ := os.ReadFile(path)
	require.Equal(t, before, after, "the earlier record is untouched")
}

func TestReadLogSkipsJunkAndOverlongLines(t *testing.T) {
	path := filepath.Join(t.TempDir(), "h.jsonl")
	require.NoError(t, logbook.AppendRecord(path, sampleRecord(t, "B5", 0)))
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND, 0)
	require.NoError(t, err)
	f.WriteString("\x00\x01 binary junk\n")
	f.WriteString(strings.Repeat("x", logbook.MaxRecordBytes+10) + "\n")
	f.WriteString("{\"format\":\"something-else\"}\n")
	f.Close()
	require.NoError(t, logbook.AppendRecord(path, sampleRecord(t, "B5", 1)))
	recs, problems, err := logbook.ReadLog(path)
	require.NoError(t, err)
	require.Len(t, recs, 2)
	require.Len(t, problems, 3)
	require.Equal(t, 2, problems[0].Line)
	require.Contains(t, problems[1].Reason, "longer than")
	h := logbook.History(recs, "B5")
	require.Len(t, h, 1)
	require.Len(t, h[0].Entries, 2)
	require.Equal(t, []string{"no change"}, h[0].Entries[1].Changes)
}

func TestBedLabelAndInitials(t *testing.T) {
	for _, ok := range []string{"B4", "ward3-12", "ICU.7", "2"} {
		require.NoError(t, setup.CheckBedLabel(ok), ok)
	}
	for _, bad := range []string{"", "John", "Mary Smith", "B4\n", strings.Repeat("1", 17), "Bé4"} {
		require.Error(t, setup.CheckBedLabel(bad), bad)
	}
	require.NoError(t, setup.CheckInitials("ab"))
	require.NoError(t, setup.CheckInitials(""), "initials are optional; the card says when they are missing")
	for _, bad := range []string{"abcde", "a1", "é"} {
		require.Error(t, setup.CheckInitials(bad), bad)
	}
}
