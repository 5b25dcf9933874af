package setup_test

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

// A round trip (named as such): what is written is read back.
func TestPreferencesRoundTrip(t *testing.T) {
	path := filepath.Join(t.TempDir(), "crankside", "preferences.json")
	p, err := setup.ReadPreferences(path)
	require.NoError(t, err, "no file: the defaults, no error")
	require.Equal(t, setup.GasUnitMmHg, p.GasUnit)
	require.NoError(t, setup.WritePreferences(path, setup.Preferences{GasUnit: setup.GasUnitKPa}))
	p, err = setup.ReadPreferences(path)
	require.NoError(t, err)
	require.Equal(t, setup.GasUnitKPa, p.GasUnit)
	fi, err := os.Stat(path)
	require.NoError(t, err)
	require.Equal(t, os.FileMode(0o600), fi.Mode().Perm(), "owner-only")
	entries, err := os.ReadDir(filepath.Dir(path))
	require.NoError(t, err)
	require.Len(t, entries, 1, "no temporary file left beside it")
}

// The reader takes only what the writer writes; anything else is refused,
// said in one line naming the file, and the defaults are used.
func TestPreferencesAreReadStrictly(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct{ name, text, why string }{
		{"unknown key", `{"format":"crankside-preferences/1","gas_unit":"kpa","colour":"red"}`, "unknown field"},
		{"repeated key", `{"format":"crankside-preferences/1","gas_unit":"kpa","GAS_UNIT":"mmhg"}`, "given twice"},
		{"bad unit", `{"format":"crankside-preferences/1","gas_unit":"torr"}`, `"torr" is not mmhg or kpa`},
		{"no unit", `{"format":"crankside-preferences/1"}`, `"" is not mmhg or kpa`},
		{"other format", `{"format":"crankside-preferences/9","gas_unit":"kpa"}`, "format"},
		{"two objects", `{"format":"crankside-preferences/1","gas_unit":"kpa"} {}`, "text after"},
		{"not JSON", `gas_unit=kpa`, "not the preferences' JSON"},
		{"empty", ``, "not the preferences' JSON"},
	} {
		path := filepath.Join(dir, "p.json")
		require.NoError(t, os.WriteFile(path, []byte(c.text), 0o600))
		p, err := setup.ReadPreferences(path)
		require.Error(t, err, c.name)
		require.Contains(t, err.Error(), c.why, c.name)
		require.Contains(t, err.Error(), path, c.name)
		require.NotContains(t, err.Error(), "\n", c.name)
		require.Equal(t, setup.GasUnitMmHg, p.GasUnit, "%s: the default is used", c.name)
	}
	// Too long: more than 4096 bytes is not a preferences file.
	path := filepath.Join(dir, "big.json")
	require.NoError(t, os.WriteFile(path, make([]byte, 4097), 0o600))
	_, err := setup.ReadPreferences(path)
	require.ErrorContains(t, err, "4097 bytes")
	// A folder is not a file.
	_, err = setup.ReadPreferences(dir)
	require.ErrorContains(t, err, "not a regular file")
}
