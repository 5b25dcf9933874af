package tests

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

// `log show` holds each bed's newest checks in full and counts the rest,
// so its memory does not grow with a year of records (issue 22): it says
// how many are not shown and how to see them; --limit N and --all change
// how many are shown. The log is one real check re-stamped at 103 times
// (invented data).
func TestLogShowShowsTheNewestChecksAndCountsTheRest(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "handover.jsonl")
	r := crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--bed", "B7", "--initials", "ab", "--log", logPath)
	require.Equal(t, 0, r.status, r.stderr)
	line := strings.TrimSpace(mustRead(t, logPath))
	stamp := regexp.MustCompile(`"time":"[^"]*"`)
	start := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	var lines []string
	for i := range 103 {
		at := start.Add(time.Duration(i) * 4 * time.Hour).Format(time.RFC3339)
		lines = append(lines, stamp.ReplaceAllString(line, `"time":"`+at+`"`))
	}
	require.NoError(t, os.WriteFile(logPath, []byte(strings.Join(lines, "\n")+"\n"), 0o600))

	count := func(out string) int { return strings.Count(out, "  AB    hole 8") }
	r = crankside(t, "log", "show", "--log", logPath, "--bed", "B7")
	require.Equal(t, 0, r.status, r.stderr)
	// derived: 103 checks, the default 100 shown, 3 counted.
	require.Contains(t, r.stdout, "Bed B7: 103 checks, the newest 100 first")
	require.Equal(t, 100, count(r.stdout))
	require.Contains(t, r.stdout, "and 3 earlier checks not shown (--limit N or --all to see them)")
	require.Contains(t, r.stdout, "2026-01-18 00:00 UTC", "derived: the newest, check 103, at 102 x 4 h = 17 days after 1 January")
	require.NotContains(t, r.stdout, "2026-01-01 04:00 UTC", "the second oldest is not shown")

	r = crankside(t, "log", "show", "--log", logPath, "--bed", "B7", "--limit", "102")
	require.Equal(t, 0, r.status, r.stderr)
	require.Equal(t, 102, count(r.stdout))
	require.Contains(t, r.stdout, "and 1 earlier check not shown")

	r = crankside(t, "log", "show", "--log", logPath, "--bed", "B7", "--all")
	require.Equal(t, 0, r.status, r.stderr)
	require.Equal(t, 103, count(r.stdout))
	require.Contains(t, r.stdout, "Bed B7: 103 check(s), newest first")
	require.NotContains(t, r.stdout, "not shown")

	r = crankside(t, "log", "show", "--log", logPath, "--bed", "B7", "--limit", "2", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var obj struct {
		Format string `json:"format"`
		Beds   []struct {
			Checks   []json.RawMessage `json:"checks"`
			Total    int               `json:"checks_total"`
			NotShown int               `json:"checks_not_shown"`
		} `json:"beds"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	require.Equal(t, "crankside-history/3", obj.Format)
	require.Len(t, obj.Beds, 1)
	require.Len(t, obj.Beds[0].Checks, 2)
	require.Equal(t, 103, obj.Beds[0].Total)
	require.Equal(t, 101, obj.Beds[0].NotShown)

	for _, bad := range [][]string{{"--limit", "0"}, {"--limit", "-3"}, {"--limit", "ten"}, {"--limit", "2.5"}, {"--limit", "5", "--all"}} {
		r = crankside(t, append([]string{"log", "show", "--log", logPath, "--bed", "B7"}, bad...)...)
		require.Equal(t, 2, r.status, "%v", bad)
		require.Equal(t, 1, strings.Count(strings.TrimSpace(r.stderr), "\n")+1, "%v: one line: %s", bad, r.stderr)
		require.Contains(t, r.stderr, "--limit", fmt.Sprint(bad))
		require.Empty(t, r.stdout)
	}
}
