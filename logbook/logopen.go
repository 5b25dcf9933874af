package logbook

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
)

// fileKind names what a path is, for a message.
func fileKind(m fs.FileMode) string {
	switch {
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0:
		return "a device"
	case m.IsRegular():
		return "a regular file"
	}
	return "not a plain file"
}

// openLogForAppend opens (creating 0600 if missing) a log this user owns;
// read and write, so that the last byte can be read on the same file.
func openLogForAppend(path string) (*os.File, error) {
	return openOwnedLog(path, os.O_RDWR|os.O_APPEND|os.O_CREATE)
}

// openLogForRead opens an existing log this user owns, read only.
func openLogForRead(path string) (*os.File, error) {
	return openOwnedLog(path, os.O_RDONLY)
}

// CheckLogPath says whether a record can be appended to path, without
// writing anything: nil when the file is a regular file of this user's
// that nobody else may read or write, or when it does not exist yet but
// its folder does and is writable (the first record creates it, 0600).
// Otherwise the error says what is wrong and how to fix it (a link, a
// pipe or device, mode bits for others: "chmod 600 FILE", another user's
// file, a missing folder). The screen calls it at start to say where it
// records and whether it can.
func CheckLogPath(path string) error {
	if path == "" {
		return errors.New("no log file is set: checks cannot be recorded (give --log FILE)")
	}
	if _, err := os.Lstat(path); errors.Is(err, fs.ErrNotExist) {
		dir := filepath.Dir(path)
		st, err := os.Stat(dir)
		switch {
		case err != nil:
			return fmt.Errorf("log %s: its folder %s cannot be used: %w", path, dir, unwrapPathError(err))
		case !st.IsDir():
			return fmt.Errorf("log %s: %s is not a folder", path, dir)
		}
		if err := dirWritable(dir); err != nil {
			return fmt.Errorf("log %s: cannot create it in %s: %w", path, dir, err)
		}
		return nil
	}
	f, err := openOwnedLog(path, os.O_WRONLY|os.O_APPEND)
	if err != nil {
		return err
	}
	return f.Close()
}

// SkippedLog is a log found by expanding a folder that fails the log checks
// (a link, not a regular file, another user's, readable by others, or
// unreadable): it is left out, and Err says why.
type SkippedLog struct {
	Path string
	Err  error
}

// String is the line for a person: "log DIR/x.jsonl skipped: has mode
// 0644, ...; its beds are not shown".
func (s SkippedLog) String() string {
	why := s.Err.Error()
	for _, prefix := range []string{"log " + s.Path + ": ", "log " + s.Path + " "} {
		if rest, ok := strings.CutPrefix(why, prefix); ok {
			why = rest
			break
		}
	}
	return fmt.Sprintf("log %s skipped: %s; its beds are not shown", s.Path, why)
}

// ExpandLogFolders turns a list of logs and folders of logs into the
// files to read: a folder stands for the *.jsonl files directly inside it
// (not in sub-folders), in name order. A path named twice (or a file and
// its folder) is read once. A symbolic link named directly is refused
// later when opened; a folder with no log is an error, as is an empty
// list. A file found inside a folder is opened once here and, when it fails the log checks, left out
// and returned in skipped, so that one group-readable file does not hide
// every other bed of the ward. A file named directly is not checked here:
// opening it refuses it, as the readers do. The caller must say
// loudly what was skipped (its beds are missing from what it shows).
//
// More files than the limit (DefaultMaxFiles, or MaxFiles) is a
// *TooManyFilesError, found before any file is opened. With a Progress,
// the check of the files found in folders notes how far it has got.
func ExpandLogFolders(paths []string, opts ...ReadOption) (files []string, skipped []SkippedLog, err error) {
	return expandLogPaths(paths, true, configOf(opts))
}

// logPath is a path to read: named (a file or what is not a folder) or
// found in a folder.
type logPath struct {
	path     string
	inFolder bool
}

// expandLogPaths lists what paths stand for (see ExpandLogFolders), refuses more files than
// c.maxFiles (0: no limit) before opening any, then keeps each file once
// and, with skipBad, checks each found in a folder.
func expandLogPaths(paths []string, skipBad bool, c readConfig) ([]string, []SkippedLog, error) {
	if len(paths) == 0 {
		return nil, nil, errors.New("no log file given")
	}
	var found []logPath
	for _, p := range paths {
		st, err := os.Lstat(p)
		if err != nil || !st.IsDir() {
			found = append(found, logPath{path: p}) // opening it gives the precise refusal
			continue
		}
		entries, err := os.ReadDir(p)
		if err != nil {
			return nil, nil, fmt.Errorf("log folder %s: %w", p, unwrapPathError(err))
		}
		n := 0
		for _, e := range entries { // ReadDir sorts by name
			if filepath.Ext(e.Name()) == ".jsonl" {
				found = append(found, logPath{path: filepath.Join(p, e.Name()), inFolder: true})
				n++
			}
		}
		if n == 0 {
			return nil, nil, fmt.Errorf("log folder %s holds no *.jsonl log", p)
		}
	}
	if c.maxFiles > 0 && len(found) > c.maxFiles {
		return nil, nil, &TooManyFilesError{Files: len(found), Limit: c.maxFiles}
	}
	return keepOnce(found, skipBad, c.progress)
}

// keepOnce keeps each file once (the first time it is named) and, with
// skipBad, leaves out those found in a folder that fail the log checks.
func keepOnce(found []logPath, skipBad bool, p *Progress) ([]string, []SkippedLog, error) {
	out := make([]string, 0, len(found))
	var skipped []SkippedLog
	ids := map[[2]uint64]bool{}
	var seen []os.FileInfo // files the system gives no id for
	p.begin("checking", len(found))
	for _, f := range found {
		p.step()
		if st, err := os.Lstat(f.path); err == nil {
			if id, ok := fileID(st); ok {
				if ids[id] {
					continue
				}
				ids[id] = true
			} else if slices.ContainsFunc(seen, func(s os.FileInfo) bool { return os.SameFile(s, st) }) {
				continue
			} else {
				seen = append(seen, st)
			}
		}
		if f.inFolder && skipBad {
			lf, err := openLogForRead(f.path)
			if err != nil {
				skipped = append(skipped, SkippedLog{Path: f.path, Err: err})
				continue
			}
			lf.Close()
		}
		out = append(out, f.path)
	}
	return out, skipped, nil
}
