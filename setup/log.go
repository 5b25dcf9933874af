package setup

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
)

// MaxRecordBytes bounds one log line; a record is a few kB. Longer lines
// are skipped by the reader and reported.
const MaxRecordBytes = 256 << 10

// AppendRecord adds one record to the log as one JSON line: the file is
// created with mode 0600 if needed, locked against other writers, the line
// is written with a single write and synced before the lock is released.
// If the file's last line was torn by an earlier crash, the record starts
// on a fresh line so the torn one stays alone. On error nothing earlier in
// the file is touched.
func AppendRecord(path string, rec Record) error {
	line, err := json.Marshal(rec)
	if err != nil {
		return err
	}
	if len(line) >= MaxRecordBytes {
		return fmt.Errorf("record is %d bytes, more than a log line may hold", len(line))
	}
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND|os.O_CREATE, 0o600)
	if err != nil {
		return fmt.Errorf("log %s: %w", path, unwrapPathError(err))
	}
	defer f.Close()
	if err := lockFile(f); err != nil {
		return fmt.Errorf("log %s: cannot lock: %w", path, err)
	}
	defer unlockFile(f)
	if torn, err := endsTorn(path); err != nil {
		return fmt.Errorf("log %s: %w", path, err)
	} else if torn {
		line = append([]byte{'\n'}, line...)
	}
	line = append(line, '\n')
	if _, err := f.Write(line); err != nil {
		return fmt.Errorf("log %s: record not saved: %w", path, unwrapPathError(err))
	}
	if err := f.Sync(); err != nil {
		return fmt.Errorf("log %s: record may not be on disk: %w", path, unwrapPathError(err))
	}
	return nil
}

func unwrapPathError(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// endsTorn reports whether a non-empty file does not end in a newline.
func endsTorn(path string) (bool, error) {
	r, err := os.Open(path)
	if err != nil {
		return false, err
	}
	defer r.Close()
	st, err := r.Stat()
	if err != nil || st.Size() == 0 {
		return false, err
	}
	b := make([]byte, 1)
	if _, err := r.ReadAt(b, st.Size()-1); err != nil {
		return false, err
	}
	return b[0] != '\n', nil
}

// LogProblem is a line of the log that could not be read.
type LogProblem struct {
	Line   int
	Reason string
}

func (p LogProblem) String() string { return fmt.Sprintf("line %d: %s", p.Line, p.Reason) }

// ReadLog reads every record it can. A torn last line (a crash while
// writing), junk, or an over-long line is skipped and reported; no earlier
// record is lost because of it.
func ReadLog(path string) ([]Record, []LogProblem, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, fmt.Errorf("log %s: %w", path, unwrapPathError(err))
	}
	defer f.Close()
	return readRecords(f)
}

func readRecords(r io.Reader) ([]Record, []LogProblem, error) {
	br := bufio.NewReaderSize(r, 64<<10)
	var recs []Record
	var problems []LogProblem
	for n := 1; ; n++ {
		line, tooLong, complete, err := readLine(br)
		if err != nil && !errors.Is(err, io.EOF) {
			return recs, problems, err
		}
		if len(line) == 0 && !tooLong && errors.Is(err, io.EOF) {
			break
		}
		switch {
		case tooLong:
			problems = append(problems, LogProblem{n, fmt.Sprintf("longer than %d bytes; skipped", MaxRecordBytes)})
		case len(bytes.TrimSpace(line)) == 0:
		case !complete:
			problems = append(problems, LogProblem{n, "torn last line (the program stopped while writing it); skipped"})
		default:
			var rec Record
			dec := json.NewDecoder(bytes.NewReader(line))
			if err := dec.Decode(&rec); err != nil || rec.Format != RecordFormat {
				problems = append(problems, LogProblem{n, "not a check record; skipped"})
				break
			}
			recs = append(recs, rec)
		}
		if errors.Is(err, io.EOF) {
			break
		}
	}
	return recs, problems, nil
}

// readLine returns one line without its newline; complete is false when the
// input ended before a newline. A line over MaxRecordBytes is consumed and
// reported as too long without being held in memory.
func readLine(br *bufio.Reader) (line []byte, tooLong, complete bool, err error) {
	for {
		chunk, err := br.ReadSlice('\n')
		if !tooLong {
			line = append(line, chunk...)
			if len(line) > MaxRecordBytes {
				tooLong, line = true, nil
			}
		}
		switch {
		case err == nil:
			return bytes.TrimSuffix(line, []byte("\n")), tooLong, true, nil
		case errors.Is(err, bufio.ErrBufferFull):
			continue
		default:
			return line, tooLong, false, err
		}
	}
}

// BedHistory is one bed's checks in time order, each with what changed
// since the one before.
type BedHistory struct {
	Bed     string
	Entries []HistoryEntry
}

// HistoryEntry is a record and its changes from the bed's previous record.
type HistoryEntry struct {
	Record  Record   `json:"record"`
	Changes []string `json:"changes"`
}

// History groups records by bed (only bed, when it is not empty), oldest
// first.
func History(recs []Record, bed string) []BedHistory {
	byBed := map[string][]Record{}
	for _, r := range recs {
		if bed == "" || r.Bed == bed {
			byBed[r.Bed] = append(byBed[r.Bed], r)
		}
	}
	var beds []string
	for b := range byBed {
		beds = append(beds, b)
	}
	sort.Strings(beds)
	var out []BedHistory
	for _, b := range beds {
		rs := byBed[b]
		sort.SliceStable(rs, func(i, j int) bool { return rs[i].Time.Before(rs[j].Time) })
		h := BedHistory{Bed: b}
		for i, r := range rs {
			e := HistoryEntry{Record: r}
			if i > 0 {
				e.Changes = recordChanges(rs[i-1], r)
			}
			h.Entries = append(h.Entries, e)
		}
		out = append(out, h)
	}
	return out
}

func recordChanges(a, b Record) []string {
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
	if a.Unexplained() || b.Unexplained() {
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

func explainedWord(r Record) string {
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
