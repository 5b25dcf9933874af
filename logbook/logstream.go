package logbook

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"sort"

	"crankside/setup"
)

// MaxProblemsKept is how many damaged lines a read keeps with their line
// numbers; the rest are only counted, so junk cannot fill memory or a
// screen.
const MaxProblemsKept = 5

// LogSummary is what a read of one or more logs found besides the
// records: every damaged line is counted, the first MaxProblemsKept are
// kept with where they are.
type LogSummary struct {
	Logs       []string     // the files read, in order
	Records    int          // records counted (of the bed asked for, if one was), duplicates once
	Duplicates int          // records found again, in another log or the same one, counted once
	Damaged    int          // lines skipped: torn, junk, over-long, not a whole check record
	Problems   []LogProblem // the first MaxProblemsKept damaged lines
}

func (s *LogSummary) damaged(log string, line int, reason string) {
	s.Damaged++
	if len(s.Problems) < MaxProblemsKept {
		s.Problems = append(s.Problems, LogProblem{Log: log, Line: line, Reason: reason})
	}
}

// Lines is the summary for a person: one line per kept problem, naming
// its log when there is one, then "and N more damaged lines" when more
// were counted. It is empty when nothing was damaged.
func (s LogSummary) Lines() []string {
	var out []string
	for _, p := range s.Problems {
		if p.Log != "" {
			out = append(out, fmt.Sprintf("%s %s", p.Log, p))
		} else {
			out = append(out, p.String())
		}
	}
	if more := s.Damaged - len(s.Problems); more > 0 {
		out = append(out, moreDamaged(more))
	}
	return out
}

func moreDamaged(n int) string {
	if n == 1 {
		return "and 1 more damaged line"
	}
	return fmt.Sprintf("and %d more damaged lines", n)
}

// utf8BOM is the byte order mark an editor may put at a file's start.
const utf8BOM = "\ufeff"

const (
	reasonTooLong = "longer than %d bytes; skipped"
	reasonTorn    = "torn last line (the program stopped while writing it); skipped"
	reasonJunk    = "not a whole check record; skipped"
	reasonRules   = "not a record this program writes: %s; skipped"
)

// scanLog reads r line by line in bounded memory and hands visit each
// complete line shaped like one JSON object (the slice is only valid
// during the call). Blank lines are passed over; over-long, torn and
// shapeless lines are counted in sum as damaged. A line longer than
// MaxRecordBytes is consumed without being held.
func scanLog(r io.Reader, log string, sum *LogSummary, visit func(line int, text []byte)) error {
	br := bufio.NewReaderSize(r, 64<<10)
	var buf []byte
	for n := 1; ; n++ {
		text, tooLong, complete, err := nextLine(br, &buf)
		if err != nil && !errors.Is(err, io.EOF) {
			if log != "" {
				return fmt.Errorf("log %s line %d: %w", log, n, unwrapPathError(err))
			}
			return err
		}
		if len(text) == 0 && !tooLong && err != nil {
			return nil
		}
		if n == 1 {
			// A UTF-8 byte order mark, as some editors save, is not part of
			// the first record.
			text = bytes.TrimPrefix(text, []byte(utf8BOM))
		}
		trimmed := bytes.TrimSpace(text)
		switch {
		case tooLong:
			sum.damaged(log, n, fmt.Sprintf(reasonTooLong, MaxRecordBytes))
		case len(trimmed) == 0:
		case !complete:
			sum.damaged(log, n, reasonTorn)
		case trimmed[0] != '{' || trimmed[len(trimmed)-1] != '}':
			sum.damaged(log, n, reasonJunk)
		default:
			visit(n, trimmed)
		}
		if err != nil {
			return nil
		}
	}
}

// nextLine returns one line without its newline; complete is false when
// the input ended before a newline. A line that fits the reader's buffer
// is returned in place; a longer one is gathered in *buf, and one over
// MaxRecordBytes is dropped as it is read.
func nextLine(br *bufio.Reader, buf *[]byte) (text []byte, tooLong, complete bool, err error) {
	chunk, err := br.ReadSlice('\n')
	if err == nil {
		return chunk[:len(chunk)-1], false, true, nil
	}
	line := append((*buf)[:0], chunk...)
	for errors.Is(err, bufio.ErrBufferFull) {
		chunk, err = br.ReadSlice('\n')
		if !tooLong {
			line = append(line, chunk...)
			if len(line) > MaxRecordBytes+1 {
				tooLong, line = true, line[:0]
			}
		}
	}
	if cap(line) <= 2*MaxRecordBytes {
		*buf = line
	}
	if err == nil {
		if !tooLong {
			line = line[:len(line)-1]
		}
		if len(line) > MaxRecordBytes {
			tooLong, line = true, line[:0]
		}
		return line, tooLong, true, nil
	}
	return line, tooLong, false, err
}

// decodeRecord decodes one complete line; problem is "" for a whole
// check record of this format that keeps the writer's rules (recordProblem,
// keysProblem), else the reason the line is damaged, for the summary.
func decodeRecord(text []byte) (rec setup.Record, problem string) {
	if err := json.Unmarshal(text, &rec); err != nil {
		return setup.Record{}, reasonJunk
	}
	if p := expandCompact(&rec); p != "" {
		return setup.Record{}, fmt.Sprintf(reasonRules, p)
	}
	rec.WithholdLung()
	if p := recordProblem(&rec); p != "" {
		return setup.Record{}, fmt.Sprintf(reasonRules, p)
	}
	if p := keysProblem(text); p != "" {
		return setup.Record{}, fmt.Sprintf(reasonRules, p)
	}
	version, _ := writerOf(&rec)
	withRecomputed(&rec, version)
	return rec, ""
}

// missingFromRecord names what a decoded record lacks of a check as this
// program writes one, or is "". A line of the right format that holds
// only a bed and a time (half written, or written by hand) must not
// become a bed's last check: it would stand in the ward in place of the
// real one, and of its STOP.
func missingFromRecord(r setup.Record) string {
	switch {
	case r.Time.IsZero():
		return "time"
	case r.Bed == "":
		return "bed"
	case r.ProfileID == "":
		return "profile_id"
	case !(r.HeightCm > 0) || r.Sex == "" || !(r.PBWKg > 0):
		return "patient"
	case r.Setting.Hole == "" || !(r.Setting.RPM > 0) || r.Setting.DwellS < 0:
		return "setting"
	case r.ClinicalCaution == "":
		return "clinical_caution"
	case !r.Unexplained() && (r.LungFiguresJSON == nil || !(r.DeliveredVtML > 0) || !(r.RateBPM > 0)):
		// Without readings no lung explains, a check has its figures.
		return "figures"
	}
	return ""
}

// recordKey identifies a record by its canonical JSON: the decoded record
// encoded again. A record copied into two logs, byte for byte, re-spaced,
// with its keys in another order, escaped otherwise or carrying fields
// this program does not read, is then counted once, as what is shown of
// it is the same. Record.MarshalJSON is called itself: its output is
// already compact, and json.Marshal would only compact it again. text is
// the line, the key should the record not encode (it then stands for
// itself).
func recordKey(rec *setup.Record, text []byte) [sha256.Size]byte {
	b, err := rec.MarshalJSON()
	if err != nil {
		return sha256.Sum256(text)
	}
	return sha256.Sum256(b)
}

// sortByBed orders bed labels as a ward reads them: B2 before B10.
func sortByBed(beds []string) {
	sort.Slice(beds, func(i, j int) bool { return bedLess(beds[i], beds[j]) })
}

// bedLess compares labels with runs of digits taken as numbers; labels
// equal that way ("B01", "B1") fall back to byte order.
func bedLess(a, b string) bool {
	if c := bedCompare(a, b); c != 0 {
		return c < 0
	}
	return a < b
}

func bedCompare(a, b string) int {
	for a != "" && b != "" {
		da, db := digitRun(a), digitRun(b)
		if da > 0 && db > 0 {
			na, nb := trimZeros(a[:da]), trimZeros(b[:db])
			if len(na) != len(nb) {
				return lessSign(len(na) < len(nb))
			}
			if na != nb {
				return lessSign(na < nb)
			}
			a, b = a[da:], b[db:]
			continue
		}
		if a[0] != b[0] {
			return lessSign(a[0] < b[0])
		}
		a, b = a[1:], b[1:]
	}
	switch {
	case len(a) < len(b):
		return -1
	case len(a) > len(b):
		return 1
	}
	return 0
}

func digitRun(s string) int {
	n := 0
	for n < len(s) && s[n] >= '0' && s[n] <= '9' {
		n++
	}
	return n
}

func trimZeros(s string) string {
	for len(s) > 1 && s[0] == '0' {
		s = s[1:]
	}
	return s
}

func lessSign(less bool) int {
	if less {
		return -1
	}
	return 1
}
