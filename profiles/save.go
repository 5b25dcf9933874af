package profiles

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"

	"crankside/profiles/safetext"
)

// Marshal writes a profile in the current format (FormatCurrent, version 3),
// indented, ending in a newline; an older profile is written as version
// 3 with its defaults written out.
func Marshal(p Profile) ([]byte, error) {
	p.Format = FormatCurrent
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	if err := enc.Encode(p); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// encodeValid marshals p and parses the result back, so that nothing is
// saved that the tool would refuse to load.
func encodeValid(path string, p Profile) ([]byte, error) {
	data, err := Marshal(p)
	if err != nil {
		return nil, err
	}
	if _, err := Parse(data, path); err != nil {
		return nil, fmt.Errorf("not saved: %w", err)
	}
	return data, nil
}

// WriteAtomic writes data to path through a synced temporary file and a
// rename, so a crash leaves either the old file or the new one.
func WriteAtomic(path string, data []byte, mode os.FileMode) error {
	return writeAtomic(path, data, mode, nil)
}

// writeAtomic is WriteAtomic with a hook run just before the rename, which
// tests use to stop the save where a crash would.
func writeAtomic(path string, data []byte, mode os.FileMode, beforeRename func(tmp string) error) error {
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("not saved (%s unchanged): %w", safetext.Escape(path), err)
	}
	name := tmp.Name()
	fail := func(err error) error {
		tmp.Close()
		os.Remove(name)
		return fmt.Errorf("not saved (%s unchanged): %w", safetext.Escape(path), err)
	}
	if _, err := tmp.Write(data); err != nil {
		return fail(err)
	}
	if err := tmp.Chmod(mode); err != nil {
		return fail(err)
	}
	if err := tmp.Sync(); err != nil {
		return fail(err)
	}
	if err := tmp.Close(); err != nil {
		os.Remove(name)
		return fmt.Errorf("not saved (%s unchanged): %w", safetext.Escape(path), err)
	}
	if beforeRename != nil {
		if err := beforeRename(name); err != nil {
			return err
		}
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("not saved (%s unchanged): %w", safetext.Escape(path), err)
	}
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
	return nil
}
