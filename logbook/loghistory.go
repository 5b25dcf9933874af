package logbook

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"sort"
	"time"

	"crankside/setup"
)

// histItem is a record with where it was found.
type histItem struct {
	rec    setup.Record
	log    string
	logIdx int
	line   int
	key    [sha256.Size]byte
}

// itemBefore orders records by time; at equal times by log path (see
// orderBefore), then by line.
func itemBefore(a, b histItem) bool {
	return orderBefore(a.rec.Time, a.log, a.line, b.rec.Time, b.log, b.line)
}

// orderBefore orders records by time; at equal times a record from a log
// whose path sorts first counts as the later one, whatever the order the
// logs were named in (so that the order of --log flags never changes
// what a bed shows), then by line.
func orderBefore(atA time.Time, logA string, lineA int, atB time.Time, logB string, lineB int) bool {
	if !atA.Equal(atB) {
		return atA.Before(atB)
	}
	if logA != logB {
		return logA > logB
	}
	return lineA < lineB
}

type historyReader struct {
	bed    string
	needle []byte                       // the bed label, for a pre-check before decoding
	keep   int                          // records kept per bed (0: all)
	window time.Duration                // and with keep, those within window of the newest (at most wardHoldMax)
	keys   map[[sha256.Size]byte]string // a record's key: the log its kept copy came from
	// ahead, when not zero, is the time after which a record is from the
	// future (see FutureSkew): such records are kept apart, in future
	// (the newest of each bed), and never stand as a bed's newest.
	ahead  time.Time
	future map[string]histItem
	byBed  map[string][]histItem
	total  map[string]int
	sum    *LogSummary
	// progress, when not nil, is told of each file read (WithProgress).
	progress *Progress
}

func (h *historyReader) visit(log string, logIdx int) func(int, []byte) {
	return func(n int, text []byte) {
		if h.needle != nil && !mayHoldLabel(text, h.needle) {
			return
		}
		h.take(log, logIdx, decodeLine(n, text, h.bed))
	}
}

// take keeps one decoded line: a damaged line is counted, a record of
// another bed than the one asked for is passed over, a copy is counted
// once.
func (h *historyReader) take(log string, logIdx int, d decodedLine) {
	if !d.ok {
		h.sum.damaged(log, d.n, d.problem)
		return
	}
	rec := d.rec
	bed := setup.BedKey(rec.Bed)
	if h.bed != "" && bed != h.bed {
		return
	}
	if kept, dup := h.keys[d.key]; dup {
		h.sum.Duplicates++
		if log < kept {
			h.keys[d.key] = log
			h.moveCopy(bed, d.key, log, logIdx, d.n)
		}
		return
	}
	h.keys[d.key] = log
	h.sum.Records++
	h.total[bed]++
	it := histItem{rec: rec, log: log, logIdx: logIdx, line: d.n, key: d.key}
	if !h.ahead.IsZero() && rec.Time.After(h.ahead) {
		if old, ok := h.future[bed]; !ok || itemBefore(old, it) {
			h.future[bed] = it
		}
		return
	}
	items := append(h.byBed[bed], it)
	if h.keep > 0 && len(items) > 2*h.keep+16 {
		items = newestWithin(items, h.keep, h.window)
	}
	h.byBed[bed] = items
}

// moveCopy says that a record found again is kept as from log: a record
// copied into several logs is shown as from the one whose path sorts
// first, whatever the order they were read in.
func (h *historyReader) moveCopy(bed string, key [sha256.Size]byte, log string, logIdx, line int) {
	items := h.byBed[bed]
	for i := range items {
		if items[i].key == key {
			items[i].log, items[i].logIdx, items[i].line = log, logIdx, line
		}
	}
	if f, ok := h.future[bed]; ok && f.key == key {
		f.log, f.logIdx, f.line = log, logIdx, line
		h.future[bed] = f
	}
}

// newest sorts items by time and returns (a copy of) the newest keep.
func newest(items []histItem, keep int) []histItem {
	sort.SliceStable(items, func(i, j int) bool { return itemBefore(items[i], items[j]) })
	if keep > 0 && len(items) > keep {
		items = append([]histItem(nil), items[len(items)-keep:]...)
	}
	return items
}

// mayHoldLabel is the cheap test made before a line is decoded: the label
// (upper case, see setup.BedKey) appears in it as a whole string ("B2", never
// the start of "B20") in any case of its letters, or the line escapes a character a label may hold (JSON allows
// "\u0042" for "B"), in which case only decoding can tell. A label with a
// character outside the label set is looked for in every line with an
// escape. It allocates nothing.
func mayHoldLabel(text, label []byte) bool {
	if containsFoldASCII(text, label) && quotedFoldASCII(text, label) {
		return true
	}
	if bytes.IndexByte(text, '\\') < 0 {
		return false // no escape at all: the label is not there
	}
	if bytes.Contains(text, []byte(`\/`)) {
		return true
	}
	for _, c := range label {
		if !labelByte(int(c)) {
			return true
		}
	}
	for rest := text; ; {
		i := bytes.Index(rest, []byte(`\u00`))
		if i < 0 || i+6 > len(rest) {
			return false
		}
		if labelByte(hexByte(rest[i+4], rest[i+5])) {
			return true
		}
		rest = rest[i+4:]
	}
}

// labelByte reports whether c is a character a bed label may hold.
func labelByte(c int) bool {
	return c >= '0' && c <= '9' || c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c == '-' || c == '_' || c == '.' || c == '/'
}

// containsFoldASCII reports whether text holds label with ASCII letters
// matched in either case, without allocating. Each place where the
// label's first character (in either case) occurs is found with
// bytes.IndexByte and compared there, so a line without the label costs
// little more than bytes.Contains.
func containsFoldASCII(text, label []byte) bool {
	n := len(label)
	if n == 0 || bytes.Contains(text, label) {
		return true // as written: the common case, and the fast search
	}
	letters := false
	for _, c := range label {
		letters = letters || upperASCII(c) != lowerASCII(c)
	}
	if !letters {
		return false
	}
	up, lo := upperASCII(label[0]), lowerASCII(label[0])
	for _, first := range [2]byte{up, lo} {
		for rest := text; ; {
			i := bytes.IndexByte(rest, first)
			if i < 0 || len(rest)-i < n {
				break
			}
			if equalFoldASCII(rest[i:i+n], label) {
				return true
			}
			rest = rest[i+1:]
		}
		if up == lo {
			break
		}
	}
	return false
}

// quotedFoldASCII reports whether text holds label as a whole JSON string
// ("B2", not "B20"), its ASCII letters in either case: --bed B2 decodes
// no line of B20-B29.
func quotedFoldASCII(text, label []byte) bool {
	n := len(label)
	for rest := text; ; {
		i := bytes.IndexByte(rest, '"')
		if i < 0 || len(rest)-i < n+2 {
			return false
		}
		if rest[i+n+1] == '"' && equalFoldASCII(rest[i+1:i+1+n], label) {
			return true
		}
		rest = rest[i+1:]
	}
}

func equalFoldASCII(a, b []byte) bool {
	for i := range a {
		if upperASCII(a[i]) != upperASCII(b[i]) {
			return false
		}
	}
	return true
}

func lowerASCII(c byte) byte {
	if c >= 'A' && c <= 'Z' {
		return c - 'A' + 'a'
	}
	return c
}

func upperASCII(c byte) byte {
	if c >= 'a' && c <= 'z' {
		return c - 'a' + 'A'
	}
	return c
}

func hexByte(hi, lo byte) int {
	v := func(c byte) int {
		switch {
		case c >= '0' && c <= '9':
			return int(c - '0')
		case c >= 'a' && c <= 'f':
			return int(c-'a') + 10
		case c >= 'A' && c <= 'F':
			return int(c-'A') + 10
		}
		return -256
	}
	return v(hi)*16 + v(lo)
}

// ReadHistories reads check records from logs, as a stream, and groups
// them by bed (beds in ward order, B2 before B10), each bed's entries
// NEWEST FIRST, at most limit of them (limit <= 0: all), each with what
// changed since the bed's check before it and the log it came from. With
// a bed label only that bed is kept, and a line is decoded only when the
// label could be in it. Bed labels are matched and grouped whatever the
// case of their letters (setup.BedKey): an older record of b4 is one of B4's.
// paths are files or folders of *.jsonl logs (see ExpandLogFolders);
// records from several logs are merged by time, and a record found twice
// (the same canonical JSON) is counted once.
//
// A log that cannot be opened as the user's own regular file (see
// CheckLogPath) stops the read with an error; damaged lines do not, and
// are counted in the summary. Memory grows with the entries kept, not
// with the size of the logs. The lines are decoded on every core, with
// the same result as on one (see readFiles). More files than the limit
// (DefaultMaxFiles, or MaxFiles) is a *TooManyFilesError before any is
// read; WithProgress notes how far the read has got.
func ReadHistories(paths []string, bed string, limit int, opts ...ReadOption) ([]BedHistory, LogSummary, error) {
	var sum LogSummary
	c := configOf(opts)
	files, _, err := expandLogPaths(paths, false, c)
	if err != nil {
		return nil, sum, err
	}
	h := newHistoryReader(bed, limit, &sum)
	h.progress = c.progress
	if err := h.readFiles(files); err != nil {
		return nil, sum, err
	}
	return h.histories(limit), sum, nil
}

func newHistoryReader(bed string, limit int, sum *LogSummary) *historyReader {
	bed = setup.BedKey(bed)
	h := &historyReader{bed: bed, keys: map[[sha256.Size]byte]string{}, byBed: map[string][]histItem{}, total: map[string]int{}, sum: sum, future: map[string]histItem{}}
	if bed != "" {
		h.needle = []byte(bed)
	}
	if limit > 0 {
		h.keep = limit + 1 // one more, for what changed before the oldest shown
	}
	return h
}

// histories is what was read, beds in ward order.
func (h *historyReader) histories(limit int) []BedHistory {
	var beds []string
	for b := range h.byBed {
		beds = append(beds, b)
	}
	sortByBed(beds)
	out := make([]BedHistory, 0, len(beds))
	for _, b := range beds {
		out = append(out, bedHistory(b, newest(h.byBed[b], h.keep), limit, h.total[b]))
	}
	return out
}

// bedHistory turns one bed's items, oldest first, into entries newest
// first, dropping the one kept only for its changes.
func bedHistory(bed string, items []histItem, limit, total int) BedHistory {
	hist := BedHistory{Bed: bed, Total: total}
	var keys [][sha256.Size]byte
	for i := len(items) - 1; i >= 0; i-- {
		if limit > 0 && len(hist.Entries) == limit {
			break
		}
		e := HistoryEntry{Record: items[i].rec, Log: items[i].log}
		if i > 0 {
			e.Changes = recordChanges(items[i-1].rec, items[i].rec)
		}
		hist.Entries = append(hist.Entries, e)
		keys = append(keys, items[i].key)
	}
	historyConflicts(hist.Entries, keys)
	return hist
}

// ReadBedHistory is ReadHistories for one bed: its checks newest first
// (at most limit; limit <= 0: all), Total the number of its checks in
// all the logs. A bed with no check gives an empty history, not an error.
func ReadBedHistory(paths []string, bed string, limit int) (BedHistory, LogSummary, error) {
	if bed == "" {
		return BedHistory{}, LogSummary{}, errors.New("a bed label is needed to read its history")
	}
	hs, sum, err := ReadHistories(paths, bed, limit)
	if err != nil || len(hs) == 0 {
		return BedHistory{Bed: setup.BedKey(bed)}, sum, err
	}
	return hs[0], sum, nil
}

// readOneLog opens a log as the user's own regular file and streams it.
func readOneLog(path string, sum *LogSummary, visit func(int, []byte)) error {
	f, err := openLogForRead(path)
	if err != nil {
		return err
	}
	defer f.Close()
	sum.Logs = append(sum.Logs, path)
	return scanLog(f, path, sum, visit)
}
