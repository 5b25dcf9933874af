package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// rawControls are bytes that act on a terminal: ESC, BEL, the C1 CSI
// (U+009B as UTF-8) and the right-to-left override (U+202E). None may be
// written raw by any text path (common practice: ECMA-48 control
// functions; Unicode UAX #9 for bidi controls).
var rawControls = []string{"\x1b", "\x07", "\u009b", "\u202e", "\u200b"}

func requireNoRawControls(t *testing.T, what, out string) {
	t.Helper()
	for _, c := range rawControls {
		require.NotContains(t, out, c, "%s wrote a raw %q", what, c)
	}
}

// An attacker with write access to the ward's log folder puts escape
// sequences (clear screen, retitle, clipboard write) into every text field
// of a record; log show and log beds print them escaped.
func TestLogTextFromFilesIsNeverRaw(t *testing.T) {
	dir := t.TempDir()
	logPath := filepath.Join(dir, "h.jsonl")
	r := crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--bed", "B4", "--initials", "ab", "--log", logPath, "--propose-hole", "7")
	require.Equal(t, 0, r.status, r.stderr)
	data, err := os.ReadFile(logPath)
	require.NoError(t, err)
	evil := `\u001b[2J\u001b]0;pwned\u0007\u001b]52;c;ZXZpbA==\u0007\u009b31m\u202e\u200b`
	// Free text fields: the record is read and shown, escaped.
	shown := string(data)
	for _, field := range []string{`"profile_id":"demo-a"`, `"hole":"8"`} {
		key := strings.SplitN(field, ":", 2)[0]
		shown = strings.Replace(shown, field, key+`:"X`+evil+`"`, 1)
	}
	// Fields the writer holds to a set of letters: the line is damaged,
	// and its summary on stderr shows the label escaped.
	damaged := string(data)
	for _, field := range []string{`"initials":"AB"`, `"bed":"B4"`, `"sex":"male"`} {
		key := strings.SplitN(field, ":", 2)[0]
		damaged = strings.Replace(damaged, field, key+`:"X`+evil+`"`, 1)
	}
	require.NotEqual(t, string(data), shown)
	require.NotEqual(t, string(data), damaged)
	require.NoError(t, os.WriteFile(logPath, []byte(shown+damaged), 0o600))
	for _, args := range [][]string{{"log", "show", "--log", logPath}, {"log", "beds", "--log", logPath}} {
		r := crankside(t, args...)
		requireNoRawControls(t, strings.Join(args[:2], " ")+" stdout", r.stdout)
		requireNoRawControls(t, strings.Join(args[:2], " ")+" stderr", r.stderr)
		require.Contains(t, r.stdout, `\x1b]0;pwned`, "%v shows the text escaped", args)
		require.Contains(t, r.stderr, `bed label "X\x1b[2J\x1b]0;pwned`, "%v names the damaged line's label escaped", args)
	}
}

// A profile file whose name holds an escape sequence is listed escaped.
func TestProfileFileNamesAreListedEscaped(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "evil\x1b]0;x\x07\u202e.json"), []byte("{"), 0o600))
	r := crankside(t, "profiles", "list", "--profiles", dir)
	requireNoRawControls(t, "profiles list stdout", r.stdout)
	requireNoRawControls(t, "profiles list stderr", r.stderr)
	require.Contains(t, r.stdout, `evil\x1b]0;x\x07`)
}
