package logbook

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"crankside/setup"
)

// MaxRecordBytes bounds one log line; a record is a few kB. Longer lines
// are skipped by the reader and reported.
const MaxRecordBytes = 256 << 10

// AppendRecord adds one record to the log as one JSON line: the file is
// created with mode 0600 if needed (an existing one must be a regular
// file of this user's that nobody else may read or write, never reached
// through a link: see CheckLogPath), locked against other writers, the line
// is written with a single write and synced before the lock is released.
// If the file's last line was torn by an earlier crash, the record starts
// on a fresh line so the torn one stays alone. An append that fails (a
// full disk, a file-size limit) is cut back, under the lock, to the file's
// length before it: no part of the record stays. A record that breaks the
// rules the reader holds records to (recordProblem) is refused before the
// file is opened. The record is written as RecordVersion's writer writes it. On error nothing earlier in the file is touched.
func AppendRecord(path string, rec setup.Record) error {
	rec.WriterVersion = RecordVersion
	if p := recordProblem(&rec); p != "" {
		return fmt.Errorf("log %s: record NOT written (nothing was written): %s", path, p)
	}
	line, err := encodeRecordLine(rec)
	if err != nil {
		return err
	}
	if len(line) >= MaxRecordBytes {
		return fmt.Errorf("record is %d bytes, more than a log line may hold", len(line))
	}
	f, err := openLogForAppend(path)
	if err != nil {
		return err
	}
	defer f.Close()
	if err := lockFile(f); err != nil {
		return fmt.Errorf("log %s: cannot lock: %w", path, err)
	}
	defer unlockFile(f)
	st, err := f.Stat()
	if err != nil {
		return fmt.Errorf("log %s: record NOT written (nothing was written): %w", path, unwrapPathError(err))
	}
	if torn, err := endsTorn(f, st.Size()); err != nil {
		return fmt.Errorf("log %s: record NOT written (nothing was written): %w", path, err)
	} else if torn {
		line = append([]byte{'\n'}, line...)
	}
	line = append(line, '\n')
	if _, err := f.Write(line); err != nil {
		return cutBack(f, path, st.Size(), "record NOT written", err)
	}
	if err := f.Sync(); err != nil {
		// The kernel may have dropped the pages it could not write: the
		// record is taken back so that what is on disk is certain.
		return cutBack(f, path, st.Size(), "record NOT written (it could not be synced to disk)", err)
	}
	return nil
}

// cutBack truncates the log, still locked, to its length before the
// append, so that a failed write (a full disk, a file-size limit) leaves
// no part of the record, and says so; if even that fails, it says the
// log may end in a torn line, which the reader then skips.
func cutBack(f *os.File, path string, size int64, what string, cause error) error {
	cause = unwrapPathError(cause)
	if err := f.Truncate(size); err != nil {
		return fmt.Errorf("log %s: %s, and part of it may remain as a torn last line (cutting it off failed: %v): %w", path, what, unwrapPathError(err), cause)
	}
	if err := f.Sync(); err != nil {
		return fmt.Errorf("log %s: %s; it was cut off, but the log may not be synced (%v): %w", path, what, unwrapPathError(err), cause)
	}
	return fmt.Errorf("log %s: %s: nothing was written, the log is as it was (%d bytes): %w", path, what, size, cause)
}

func unwrapPathError(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// endsTorn reports whether the open file of that size, when not empty,
// does not end in a newline.
func endsTorn(f *os.File, size int64) (bool, error) {
	if size == 0 {
		return false, nil
	}
	b := make([]byte, 1)
	if _, err := f.ReadAt(b, size-1); err != nil {
		return false, err
	}
	return b[0] != '\n', nil
}

// LogProblem is a line of the log that could not be read. Line 0 marks
// the line that says how many more were counted but not kept.
type LogProblem struct {
	Log    string `json:"log,omitempty"` // set when several logs are read
	Line   int    `json:"line"`
	Reason string `json:"reason"`
}

func (p LogProblem) String() string {
	if p.Line == 0 {
		return p.Reason
	}
	return fmt.Sprintf("line %d: %s", p.Line, p.Reason)
}

// BedHistory is one bed's checks in time order, each with what changed
// since the one before: oldest first from History, newest first from
// ReadHistories and ReadBedHistory.
type BedHistory struct {
	Bed     string
	Entries []HistoryEntry
	Total   int // the bed's checks in the logs read, when more may exist than Entries holds
}

// HistoryEntry is a record and its changes from the bed's previous record.
type HistoryEntry struct {
	Record  setup.Record `json:"record"`
	Changes []string     `json:"changes"`
	Log     string       `json:"log,omitempty"` // the log (terminal) it came from, when read by ReadHistories
	// Conflict notes checks of the bed from other logs within
	// ConflictWindow of this one: "conflict: two checks at 14:05 UTC from
	// a.jsonl and b.jsonl".
	Conflict string `json:"conflict,omitempty"`
}

func recordChanges(a, b setup.Record) []string {
	var out []string
	str := func(what, x, y string) {
		if x != y {
			out = append(out, fmt.Sprintf("%s %s -> %s", what, x, y))
		}
	}
	num := func(what string, x, y float64, unit string, tol float64) {
		if d := y - x; d > tol || d < -tol {
			out = append(out, fmt.Sprintf("%s %.4g -> %.4g %s", what, x, y, unit))
		}
	}
	str("profile", a.ProfileID, b.ProfileID)
	str("hole", a.Setting.Hole, b.Setting.Hole)
	num("motor speed", a.Setting.RPM, b.Setting.RPM, "rpm", 1e-9)
	num("dwell", a.Setting.DwellS, b.Setting.DwellS, "s", 1e-9)
	num("PEEP", a.Setting.PEEPCmH2O, b.Setting.PEEPCmH2O, "cmH2O", 1e-9)
	num("O2", a.Setting.O2LPerMin, b.Setting.O2LPerMin, "L/min", 1e-9)
	if a.LungFiguresJSON == nil || b.LungFiguresJSON == nil {
		// No volume is known for a check whose readings no lung explains.
		str("readings", explainedWord(a), explainedWord(b))
	} else {
		num("tidal volume", a.DeliveredVtML, b.DeliveredVtML, "mL", 0.5)
	}
	if a.Readings != nil && b.Readings != nil {
		num("peak reading", a.Readings.PeakCmH2O, b.Readings.PeakCmH2O, "cmH2O", 1e-9)
		num("end reading", a.Readings.EndCmH2O, b.Readings.EndCmH2O, "cmH2O", 1e-9)
	}
	if a.FittedComplianceMLPerCmH2O != nil && b.FittedComplianceMLPerCmH2O != nil {
		num("fitted C", *a.FittedComplianceMLPerCmH2O, *b.FittedComplianceMLPerCmH2O, "mL/cmH2O", 0.5)
	}
	if len(out) == 0 {
		out = append(out, "no change")
	}
	return out
}

func explainedWord(r setup.Record) string {
	if r.Unexplained() {
		return "unexplained"
	}
	return "explained"
}

// EnsureLogDir creates the log's directory, owner-only, if it is missing:
// for the default log location, which a fresh machine does not have.
func EnsureLogDir(path string) error {
	return os.MkdirAll(filepath.Dir(path), 0o700)
}

// DefaultLogPath is os.UserConfigDir()/crankside/handover.jsonl, or "".
func DefaultLogPath() string {
	d, err := os.UserConfigDir()
	if err != nil {
		return ""
	}
	return filepath.Join(d, "crankside", "handover.jsonl")
}
