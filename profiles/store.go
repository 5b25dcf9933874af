package profiles

import (
	"embed"
	"errors"
	"fmt"
	"io"
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
}

func (s Source) String() string {
	if s.Embedded {
		return "embedded demo"
	}
	return s.Path
}

// Entry is one profile found while listing, or one file that failed.
type Entry struct {
	ID      string
	Label   string
	Source  Source
	Profile Profile
	Err     error // set when the file could not be read or is invalid
}

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
// may be "" or missing). A bad file is listed with its error and does not
// hide the others; two profiles with the same id both carry an error.
func List(dir string) ([]Entry, error) {
	out, err := Embedded()
	if err != nil {
		return nil, err
	}
	if dir != "" {
		files, err := filepath.Glob(filepath.Join(dir, "*.json"))
		if err != nil {
			return nil, err
		}
		sort.Strings(files)
		for _, f := range files {
			p, err := ReadFile(f)
			e := Entry{ID: p.ID, Label: p.Label, Source: Source{Path: f}, Profile: p, Err: err}
			if err != nil {
				e.ID = strings.TrimSuffix(filepath.Base(f), ".json")
			}
			out = append(out, e)
		}
	}
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
	return out, nil
}

// ErrNotFound is returned (wrapped) when no profile has the id asked for.
var ErrNotFound = errors.New("profile not found")

// Open finds a profile by path (anything with a path separator or ending
// in .json) or by id: embedded first, then dir.
func Open(ref, dir string) (Profile, Source, error) {
	if strings.ContainsRune(ref, os.PathSeparator) || strings.ContainsRune(ref, '/') || strings.HasSuffix(ref, ".json") {
		p, err := ReadFile(ref)
		return p, Source{Path: ref}, err
	}
	entries, err := List(dir)
	if err != nil {
		return Profile{}, Source{}, err
	}
	var ids []string
	for _, e := range entries {
		if e.ID == ref {
			if e.Err != nil {
				return Profile{}, e.Source, e.Err
			}
			return e.Profile, e.Source, nil
		}
		if e.Err == nil {
			ids = append(ids, e.ID)
		}
	}
	return Profile{}, Source{}, fmt.Errorf("%w: %s (known: %s; or give a path to a .json file)", ErrNotFound, quote(ref), strings.Join(ids, ", "))
}
