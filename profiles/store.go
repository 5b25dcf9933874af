package profiles

import (
	"embed"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"crankside/profiles/safetext"
)

//go:embed demo/*.json
var demoFiles embed.FS

// DefaultID is the profile the tool opens with when none is named.
const DefaultID = "demo-a"

// Source says where a profile came from.
type Source struct {
	Embedded bool
	Path     string // the file, when not embedded
	// Stamp identifies the bytes that were parsed, for SaveIfUnchanged and
	// SaveWithBackupIfUnchanged; zero for an embedded demo.
	Stamp Stamp
}

// String is the source for a message or a list: the path made safe to
// print with safetext.Escape. Use Path itself to open the file.
func (s Source) String() string {
	if s.Embedded {
		return "embedded demo"
	}
	return safetext.Escape(s.Path)
}

// Entry is one profile found while listing, or one file that failed.
type Entry struct {
	ID       string // the profile's id; for a file that failed, its name without .json, escaped with safetext.Escape
	Label    string
	FileName string // the file's base name, raw as on disk; "" for a built-in demo
	Source   Source
	Profile  Profile
	Err      error // set when the file could not be read or is invalid; its text is escaped
}

// DisplayName is the entry's id made safe to print on one line. A valid id
// holds only a-z, 0-9, - and _; a file that failed is listed under its file
// name, which may hold anything and is already escaped in ID, so escaping
// again changes nothing.
func (e Entry) DisplayName() string { return safetext.Escape(e.ID) }

// Embedded returns the demo profiles built into the binary, sorted by id.
// They are checked by the package's tests, so an error here is a build
// mistake; it is still returned rather than panicking.
func Embedded() ([]Entry, error) {
	names, err := demoFiles.ReadDir("demo")
	if err != nil {
		return nil, err
	}
	var out []Entry
	for _, n := range names {
		data, err := demoFiles.ReadFile("demo/" + n.Name())
		if err != nil {
			return nil, err
		}
		p, err := Parse(data, "embedded "+n.Name())
		if err != nil {
			return nil, err
		}
		out = append(out, Entry{ID: p.ID, Label: p.Label, Source: Source{Embedded: true}, Profile: p})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].ID < out[j].ID })
	return out, nil
}

// DefaultDir is os.UserConfigDir()/crankside/profiles, or "" when the
// system has no configuration directory.
func DefaultDir() string {
	d, err := os.UserConfigDir()
	if err != nil {
		return ""
	}
	return filepath.Join(d, "crankside", "profiles")
}

// ReadFile reads and parses one profile file, refusing files over
// MaxFileBytes before reading them whole.
func ReadFile(path string) (Profile, error) {
	data, err := readLimited(path)
	if err != nil {
		return Profile{}, fmt.Errorf("profile %s: %w", safetext.Escape(path), err)
	}
	return Parse(data, path)
}

// readLimited reads at most MaxFileBytes+1 bytes, so an oversized file is
// refused by Parse without being read whole.
// It refuses anything that is not a regular file (a FIFO, a device such as
// /dev/zero, a folder) before reading, without blocking on it.
func readLimited(path string) ([]byte, error) {
	data, _, err := readLimitedStat(path)
	return data, err
}

func readLimitedStat(path string) ([]byte, os.FileInfo, error) {
	f, err := os.OpenFile(path, os.O_RDONLY|openReadFlags, 0)
	if err != nil {
		return nil, nil, unwrapPath(err)
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, nil, unwrapPath(err)
	}
	if !info.Mode().IsRegular() {
		return nil, nil, fmt.Errorf("is not a regular file (%s); a profile is a plain .json file", info.Mode().Type())
	}
	data, err := io.ReadAll(io.LimitReader(f, MaxFileBytes+1))
	if err != nil {
		return nil, nil, unwrapPath(err)
	}
	return data, info, nil
}

func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// List returns the embedded profiles and every *.json file in dir (which
// may be "" or missing), each file read and parsed once. A bad file (broken
// JSON, invalid, not a regular file, too large) is listed with its error,
// costs no more than reading at most MaxFileBytes of it, and does not hide
// the others. Two files with the same id both carry an error; a file that
// uses a built-in demo's id carries one too (the id opens the built-in).
func List(dir string) ([]Entry, error) {
	out, err := Embedded()
	if err != nil {
		return nil, err
	}
	files, err := dirFiles(dir)
	if err != nil {
		return nil, err
	}
	builtin := map[string]bool{}
	for _, e := range out {
		builtin[e.ID] = true
	}
	for _, f := range files {
		e := readEntry(f)
		if e.Err == nil && builtin[e.ID] {
			e.Err = fmt.Errorf("profile %s: id %q is a built-in demo's, and that id opens the built-in one; give this file another id, or open it by its path",
				safetext.Escape(f), e.ID)
		}
		out = append(out, e)
	}
	markDuplicates(out)
	return out, nil
}

// dirFiles lists dir's *.json files, sorted by name; none when dir is ""
// or missing.
func dirFiles(dir string) ([]string, error) {
	if dir == "" {
		return nil, nil
	}
	names, err := os.ReadDir(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, fmt.Errorf("profiles folder %s: %w", safetext.Escape(dir), unwrapPath(err))
	}
	var files []string
	for _, n := range names {
		if strings.HasSuffix(n.Name(), ".json") {
			files = append(files, filepath.Join(dir, n.Name()))
		}
	}
	return files, nil
}

// readEntry reads one file into an Entry; a failure names the entry by its
// file name.
func readEntry(f string) Entry {
	p, st, err := ReadFileStamped(f)
	e := Entry{ID: p.ID, Label: p.Label, FileName: filepath.Base(f), Source: Source{Path: f, Stamp: st}, Profile: p, Err: err}
	if err != nil {
		// Escaped: the name may hold anything, and callers print the ID.
		e.ID = safetext.Escape(strings.TrimSuffix(filepath.Base(f), ".json"))
	}
	return e
}

// markDuplicates gives an error to every file entry whose id another good
// entry also has.
func markDuplicates(out []Entry) {
	seen := map[string]int{}
	for i := range out {
		if out[i].Err != nil {
			continue
		}
		if j, dup := seen[out[i].ID]; dup {
			out[i].Err = fmt.Errorf("profile %s: id %q is also used by %s", out[i].Source, out[i].ID, out[j].Source)
			if out[j].Err == nil {
				out[j].Err = fmt.Errorf("profile %s: id %q is also used by %s", out[j].Source, out[j].ID, out[i].Source)
			}
			continue
		}
		seen[out[i].ID] = i
	}
}

// ErrNotFound is returned (wrapped) when no profile has the id asked for.
var ErrNotFound = errors.New("profile not found")

// Open finds a profile by path (anything with a path separator or ending
// in .json), or by id: a built-in demo's id opens the built-in one without
// reading dir at all; any other id is looked for first as dir/ID.json and
// only then by reading every *.json file in dir. Two files in dir with the
// id (neither named ID.json) are refused: open one by its path.
func Open(ref, dir string) (Profile, Source, error) {
	if strings.ContainsRune(ref, os.PathSeparator) || strings.ContainsRune(ref, '/') || strings.HasSuffix(ref, ".json") {
		p, st, err := ReadFileStamped(ref)
		return p, Source{Path: ref, Stamp: st}, err
	}
	if p, ok, err := openEmbedded(ref); ok || err != nil {
		return p, Source{Embedded: true}, err
	}
	var named error // the error of dir/ID.json, when it exists but fails
	if dir != "" {
		f := filepath.Join(dir, ref+".json")
		p, st, err := ReadFileStamped(f)
		if err == nil && p.ID == ref {
			return p, Source{Path: f, Stamp: st}, nil
		}
		if err != nil && !errors.Is(err, fs.ErrNotExist) {
			named = err
		}
	}
	return scanFor(ref, dir, named)
}

// openEmbedded parses only the built-in demo named id, if there is one.
func openEmbedded(id string) (Profile, bool, error) {
	if !fs.ValidPath(id) || strings.ContainsAny(id, "/\\") {
		return Profile{}, false, nil
	}
	data, err := demoFiles.ReadFile("demo/" + id + ".json")
	if err != nil {
		return Profile{}, false, nil
	}
	p, err := Parse(data, "embedded "+id+".json")
	if err == nil && p.ID != id {
		err = fmt.Errorf("embedded %s.json has id %q: a build mistake", id, p.ID)
	}
	return p, true, err
}

// scanFor reads every file in dir for the id; named is the error of
// dir/ID.json, returned when no other file has the id.
func scanFor(ref, dir string, named error) (Profile, Source, error) {
	files, err := dirFiles(dir)
	if err != nil {
		return Profile{}, Source{}, err
	}
	var found []Entry
	var ids []string
	if emb, err := Embedded(); err == nil {
		for _, e := range emb {
			ids = append(ids, e.ID)
		}
	}
	for _, f := range files {
		e := readEntry(f)
		switch {
		case e.Err == nil && e.ID == ref:
			found = append(found, e)
		case e.Err == nil:
			ids = append(ids, e.ID)
		}
	}
	switch {
	case len(found) == 1:
		return found[0].Profile, found[0].Source, nil
	case len(found) > 1:
		return Profile{}, found[0].Source, fmt.Errorf("profile id %q is used by both %s and %s; open one by its path", ref, found[0].Source, found[1].Source)
	case named != nil:
		return Profile{}, Source{}, named
	}
	return Profile{}, Source{}, fmt.Errorf("%w: %s (known: %s; or give a path to a .json file)", ErrNotFound, quote(ref), strings.Join(ids, ", "))
}
