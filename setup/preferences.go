package setup

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/profiles/safetext"
)

// Preferences are the screen's choices kept between runs: for now the unit
// blood gases are typed in. They live in a small file beside the screen's
// log (DefaultPreferencesPath), written whole through a synced temporary
// file and a rename, and read strictly: a file the writer could not have
// written is refused, said, and not used.
type Preferences struct {
	Format  string `json:"format"`
	GasUnit string `json:"gas_unit"` // GasUnitMmHg or GasUnitKPa
}

// PreferencesFormat is the preferences file's format line.
const PreferencesFormat = "crankside-preferences/1"

// preferencesMaxBytes bounds what is read: the file is one short object.
const preferencesMaxBytes = 4096

// DefaultPreferencesPath is os.UserConfigDir()/crankside/preferences.json,
// beside the screen's default log, or "".
func DefaultPreferencesPath() string {
	d, err := os.UserConfigDir()
	if err != nil {
		return ""
	}
	return filepath.Join(d, "crankside", "preferences.json")
}

// ReadPreferences reads the preferences file. A file that does not exist
// gives the defaults (gas unit mmHg) and no error; any other problem (not
// a regular file, too long, not the writer's JSON, an unknown or repeated
// key, another format, a unit not offered) is an error naming the file,
// and the defaults come with it.
func ReadPreferences(path string) (Preferences, error) {
	def := Preferences{Format: PreferencesFormat, GasUnit: GasUnitMmHg}
	fail := func(why string) (Preferences, error) {
		return def, fmt.Errorf("preferences %s not used: %s", safetext.Escape(path), why)
	}
	fi, err := os.Lstat(path)
	switch {
	case errors.Is(err, os.ErrNotExist):
		return def, nil
	case err != nil:
		return fail(err.Error())
	case !fi.Mode().IsRegular():
		return fail("not a regular file")
	case fi.Size() > preferencesMaxBytes:
		return fail(fmt.Sprintf("%d bytes, more than the %d a preferences file can hold", fi.Size(), preferencesMaxBytes))
	}
	f, err := os.Open(path)
	if err != nil {
		return fail(err.Error())
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, preferencesMaxBytes+1))
	if err != nil {
		return fail(err.Error())
	}
	p, why := parsePreferences(data)
	if why != "" {
		return fail(why)
	}
	return p, nil
}

// parsePreferences holds a file to the writer's rules; why is "" when it
// keeps them.
func parsePreferences(data []byte) (p Preferences, why string) {
	if dup := repeatedKey(data); dup != "" {
		return p, "the key " + physiology.Quote(dup) + " is given twice"
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&p); err != nil {
		return p, "not the preferences' JSON: " + err.Error()
	}
	if dec.More() {
		return p, "text after the preferences' object"
	}
	if p.Format != PreferencesFormat {
		return p, "format " + physiology.Quote(p.Format) + ", not " + PreferencesFormat
	}
	if p.GasUnit != GasUnitMmHg && p.GasUnit != GasUnitKPa {
		return p, "gas_unit " + physiology.Quote(p.GasUnit) + " is not mmhg or kpa"
	}
	return p, ""
}

// repeatedKey is a top-level key given twice in any case, or "".
func repeatedKey(data []byte) string {
	dec := json.NewDecoder(bytes.NewReader(data))
	if t, err := dec.Token(); err != nil || t != json.Delim('{') {
		return ""
	}
	seen := map[string]bool{}
	for dec.More() {
		t, err := dec.Token()
		k, ok := t.(string)
		if err != nil || !ok {
			return ""
		}
		if seen[strings.ToLower(k)] {
			return k
		}
		seen[strings.ToLower(k)] = true
		var skip json.RawMessage
		if dec.Decode(&skip) != nil {
			return ""
		}
	}
	return ""
}

// WritePreferences writes p whole, owner-only, creating the folder when it
// is missing: a crash leaves the old file or the new one, never half.
func WritePreferences(path string, p Preferences) error {
	p.Format = PreferencesFormat
	data, err := json.Marshal(p)
	if err != nil {
		return err
	}
	if _, why := parsePreferences(data); why != "" {
		return fmt.Errorf("preferences not saved: %s", why)
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
		return fmt.Errorf("preferences not saved: %w", err)
	}
	return profiles.WriteAtomic(path, append(data, '\n'), 0o600)
}
