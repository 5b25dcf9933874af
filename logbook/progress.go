package logbook

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"crankside/physiology"
	"crankside/setup"
)

// DefaultMaxFiles is how many log files a read takes by default (the
// files named and those found in folders): a ward's folder holds a log
// per terminal, or per terminal and month (10 terminals for 10 years is
// 1 200), and past this a folder is more likely the wrong one than a
// ward's. Reading this many small logs takes a few seconds (README).
// MaxFiles raises it.
const DefaultMaxFiles = 10_000

// NoteAfter is how long a read of many files goes on before a note of
// its progress: a person waiting longer than a second with no word takes
// the program for stuck (common practice).
const NoteAfter = time.Second

// ReadOption changes how logs and folders of logs are read.
type ReadOption func(*readConfig)

type readConfig struct {
	maxFiles int
	progress *Progress
}

// MaxFiles lets a read take up to n files (n <= 0: DefaultMaxFiles).
func MaxFiles(n int) ReadOption { return func(c *readConfig) { c.maxFiles = n } }

// WithProgress has the read tell p how far it has got.
func WithProgress(p *Progress) ReadOption { return func(c *readConfig) { c.progress = p } }

func configOf(opts []ReadOption) readConfig {
	var c readConfig
	for _, o := range opts {
		o(&c)
	}
	if c.maxFiles <= 0 {
		c.maxFiles = DefaultMaxFiles
	}
	return c
}

// TooManyFilesError is a read refused before it starts: more files than
// its limit. Nothing was read.
type TooManyFilesError struct {
	Files, Limit int
}

func (e *TooManyFilesError) Error() string {
	return fmt.Sprintf("%s log files found, more than the limit of %s: nothing was read", thousands(e.Files), thousands(e.Limit))
}

// Progress writes a note of a long read's progress ("reading 12 000 of
// 100 000 files..."): the first once the read has taken after (NoteAfter
// when 0), then each time the time taken doubles, so a read of minutes
// says so in a few lines. Its methods do nothing on a nil *Progress. It
// is used by one goroutine at a time.
type Progress struct {
	note        func(string)
	now         func() time.Time
	start       time.Time
	due         time.Duration // the time taken at which the next note is due
	verb        string
	done, total int
}

// NewProgress starts the clock of a read that notes its progress with
// note. now is the clock (nil: time.Now); tests give their own.
func NewProgress(note func(string), after time.Duration, now func() time.Time) *Progress {
	if now == nil {
		now = time.Now
	}
	if after <= 0 {
		after = NoteAfter
	}
	return &Progress{note: note, now: now, start: now(), due: after}
}

// begin starts a pass over total files ("checking", "reading").
func (p *Progress) begin(verb string, total int) {
	if p != nil {
		p.verb, p.done, p.total = verb, 0, total
	}
}

// step counts one file of the pass, and notes the progress when due.
func (p *Progress) step() {
	if p == nil {
		return
	}
	p.done++
	taken := p.now().Sub(p.start)
	if taken < p.due || p.done >= p.total {
		return
	}
	for p.due <= taken {
		p.due *= 2
	}
	p.note(fmt.Sprintf("%s %s of %s files...", p.verb, thousands(p.done), thousands(p.total)))
}

// thousands is n >= 0 with its thousands apart: 100 000.
func thousands(n int) string {
	s := strconv.Itoa(n)
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + " " + s[i:]
	}
	return s
}

// MaxFilesCeiling bounds MaxFilesEntry: derived: the names of ten million
// files in a folder are about a gigabyte in memory, beyond a bedside
// computer's means.
const MaxFilesCeiling = 10_000_000

// MaxFilesEntry reads how many log files a read may take, as a person
// types it (a whole number, 1 to MaxFilesCeiling), or DefaultMaxFiles
// when blank.
func MaxFilesEntry(text string) (int, *setup.InputError) {
	if strings.TrimSpace(text) == "" {
		return DefaultMaxFiles, nil
	}
	n, err := physiology.ParseNumber(text)
	if err != nil {
		return 0, &setup.InputError{Field: "max-files", Reason: err.Error() + " (a number of files)"}
	}
	if err := physiology.CheckRange("number of log files", n, 1, MaxFilesCeiling, "files"); err != nil {
		return 0, &setup.InputError{Field: "max-files", Reason: err.Error()}
	}
	if n != math.Trunc(n) {
		return 0, &setup.InputError{Field: "max-files", Reason: fmt.Sprintf("%s is not a whole number of files", physiology.PlainNumber(n))}
	}
	return int(n), nil
}
