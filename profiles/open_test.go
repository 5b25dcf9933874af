package profiles

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

func saveAs(t testing.TB, dir, file, id string) {
	t.Helper()
	p, _, err := Open("demo-a", "")
	require.NoError(t, err)
	p.ID, p.Label = id, "unit "+id
	require.NoError(t, Save(filepath.Join(dir, file), p))
}

func TestOpenBuiltinReadsNoFolder(t *testing.T) {
	// A "folder" that is a plain file cannot be read as a folder: opening a
	// built-in id through it still works, because the folder is not looked at.
	notADir := filepath.Join(t.TempDir(), "plain")
	require.NoError(t, os.WriteFile(notADir, []byte("x"), 0o600))
	p, src, err := Open("demo-b", notADir)
	require.NoError(t, err)
	require.True(t, src.Embedded)
	require.Equal(t, "demo-b", p.ID)
	_, _, err = Open("ward-1", notADir)
	require.Error(t, err, "another id must read the folder, and says it cannot")
	// A folder file carrying a built-in id does not shadow the built-in.
	dir := t.TempDir()
	saveAs(t, dir, "demo-a.json", "demo-a")
	p, src, err = Open("demo-a", dir)
	require.NoError(t, err)
	require.True(t, src.Embedded)
	require.Equal(t, "Demonstration unit A (invented)", p.Label)
}

func TestOpenByIDLooksAtTheFileNameFirst(t *testing.T) {
	dir := t.TempDir()
	saveAs(t, dir, "ward-3.json", "ward-3")
	saveAs(t, dir, "bed-seven.json", "ward-7") // id not in the file name
	saveAs(t, dir, "ward-9.json", "ward-10")   // file name names another id
	saveAs(t, dir, "a.json", "ward-9")
	saveAs(t, dir, "dup-1.json", "dup")
	saveAs(t, dir, "dup-2.json", "dup")
	require.NoError(t, os.WriteFile(filepath.Join(dir, "ward-5.json"), []byte(`{"format":`), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "broken.json"), []byte("\x00\xff"), 0o644))

	cases := []struct{ ref, file string }{
		{"ward-3", "ward-3.json"},
		{"ward-7", "bed-seven.json"},
		{"ward-9", "a.json"},
		{"ward-10", "ward-9.json"},
	}
	for _, c := range cases {
		p, src, err := Open(c.ref, dir)
		require.NoError(t, err, c.ref)
		require.Equal(t, c.ref, p.ID)
		require.Equal(t, filepath.Join(dir, c.file), src.Path)
	}
	// ward-5.json is broken and no other file has the id: its own error.
	_, _, err := Open("ward-5", dir)
	require.ErrorIs(t, err, ErrProfile)
	require.ErrorContains(t, err, "ward-5.json")
	// Two files with one id, neither named for it: refused, naming both.
	_, _, err = Open("dup", dir)
	require.ErrorContains(t, err, "used by both")
	require.ErrorContains(t, err, "dup-1.json")
	_, _, err = Open("nope", dir)
	require.ErrorIs(t, err, ErrNotFound)
	require.ErrorContains(t, err, "ward-7")
}

func TestListEntriesShowNamesEscaped(t *testing.T) {
	dir := t.TempDir()
	name := "evil\x1b]0;pwned\x07\u202e.json"
	require.NoError(t, os.WriteFile(filepath.Join(dir, name), []byte("{"), 0o644))
	saveAs(t, dir, "ok.json", "ok-unit")
	entries, err := List(dir)
	require.NoError(t, err)
	var seen bool
	for _, e := range entries {
		if e.FileName != name {
			continue
		}
		seen = true
		require.Error(t, e.Err)
		requireNoRawControls(t, e.DisplayName())
		requireNoRawControls(t, e.Err.Error())
		requireNoRawControls(t, e.Source.String())
		require.Equal(t, `evil\x1b]0;pwned\x07\u202e`, e.DisplayName())
		require.Contains(t, e.Err.Error(), `evil\x1b]0;pwned\x07\u202e.json`)
	}
	require.True(t, seen)
}
