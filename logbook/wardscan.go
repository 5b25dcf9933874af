package logbook

import (
	"bytes"
	"slices"
	"sort"
	"time"

	"crankside/setup"
)

// The ward's read of a long log. Decoding and validating a record costs
// some fifty times more than finding its line; the ward needs only each
// bed's newest check. So each line's bed and time are read off its first
// keys (lineHeader), where the writer puts them, and only the lines that
// can decide a bed's row are decoded and validated in full: the bed's
// newest lines, every line within ConflictWindow of its newest, and its
// newest line from the future.
//
// Why a line left undecoded cannot change a row. A line is a bed's record
// only when it decodes with no problem (decodeRecord), and then its keys
// are the writer's, each once in its object (keysProblem): its top-level
// "bed" and "time" are the ones lineHeader read. A line that breaks a rule
// is damaged and never a bed's check, whatever bed a later duplicate key
// would name: it belongs to the bed its first "bed" key names (the writer
// writes that key once, before the check's own keys). Every line newer
// than the row's record is decoded (and counted when damaged), and so is
// every line within ConflictWindow of it; when that cannot be known from
// the lines held (every held line damaged with older ones let go, a line
// let go within the window of the newest good one, a damaged newest
// future record with older ones seen), or when a decoded line does not say
// what its header said, the read is done again decoding every line.

// wardHoldMax bounds the lines held for one bed within ConflictWindow of
// its newest; beyond it the oldest is let go (and the read is redone
// exactly should it matter).
const wardHoldMax = 64

// headerKeysMax is how many of a line's first keys lineHeader reads.
const headerKeysMax = 8

// bedLines are the lines held for one bed.
type bedLines struct {
	held    []wardCandidate // newest first
	dropped time.Time       // the newest line let go (zero: none)
	future  []wardCandidate // the lines dated at the newest instant after ahead
	futures int             // lines dated after ahead
}

// holdFuture holds a line dated after ahead when none is newer: the lines
// of the newest such instant are all held, since which of them a read of
// every line shows depends on which are copies (see canonical).
func (b *bedLines) holdFuture(c wardCandidate, text []byte) {
	b.futures++
	switch {
	case len(b.future) > 0 && c.at.Before(b.future[0].at):
		return
	case len(b.future) > 0 && c.at.After(b.future[0].at):
		spare := b.future[0].text
		b.future = b.future[:0]
		c.text = append(spare[:0], text...)
	default:
		c.text = append([]byte(nil), text...)
	}
	b.future = append(b.future, c)
}

// insert holds the line of a record dated c.at when it can decide the
// row: among the wardKeep newest, or within ConflictWindow of the newest.
// spare is a buffer to reuse; what is returned is the buffer to reuse
// next (spare when the line was not held, else a line's let go, or nil).
func (b *bedLines) insert(c wardCandidate, text []byte, spare []byte) []byte {
	i := 0
	for i < len(b.held) && c.before(b.held[i]) {
		i++
	}
	if i == len(b.held) && len(b.held) >= wardKeep && b.held[0].at.Sub(c.at) > ConflictWindow {
		b.letGo(c.at)
		return spare
	}
	c.text = append(spare[:0], text...)
	b.held = append(b.held, wardCandidate{})
	copy(b.held[i+1:], b.held[i:])
	b.held[i] = c
	var freed []byte
	for n := len(b.held); n > wardKeep && (b.held[0].at.Sub(b.held[n-1].at) > ConflictWindow || n > wardHoldMax); n-- {
		last := b.held[n-1]
		b.letGo(last.at)
		freed = last.text
		b.held = b.held[:n-1]
	}
	return freed
}

func (b *bedLines) letGo(at time.Time) {
	if at.After(b.dropped) {
		b.dropped = at
	}
}

// wardRowsScan is the ward read of files (see WardRows): the rows and
// exact as wardScan.rows gives them.
func wardRowsScan(files []string, now time.Time, every time.Duration, p *Progress) ([]WardRow, LogSummary, bool, error) {
	var sum LogSummary
	w := newWardScan(now.Add(FutureSkew), &sum)
	p.begin("reading", len(files))
	for i, path := range files {
		if err := readOneLog(path, &sum, w.visit(path, i)); err != nil {
			return nil, sum, true, err
		}
		p.step()
	}
	rows, exact := w.rows(now, every)
	return rows, sum, exact, nil
}

// newWardScan reads records dated up to ahead as checks of now.
func newWardScan(ahead time.Time, sum *LogSummary) *wardScan {
	return &wardScan{beds: map[string]*bedLines{}, ahead: ahead, sum: sum}
}

type wardScan struct {
	beds  map[string]*bedLines
	ahead time.Time // now + FutureSkew
	sum   *LogSummary
	spare []byte // a held line's buffer let go, for the next
}

func (w *wardScan) visit(log string, logIdx int) func(int, []byte) {
	return func(n int, text []byte) {
		raw, at, ok := lineHeader(text)
		var b *bedLines
		if ok {
			b = w.beds[string(raw)] // no allocation for a bed already met
			if b == nil {
				b = w.bed(setup.BedKey(string(raw)))
			}
		} else {
			var label string
			if label, at, ok = decodedHeader(text); !ok {
				w.sum.damaged(log, n, reasonJunk)
				return
			}
			b = w.bed(setup.BedKey(label))
		}
		w.sum.Records++
		c := wardCandidate{at: at, log: log, logIdx: logIdx, line: n}
		if at.After(w.ahead) {
			b.holdFuture(c, text)
			return
		}
		w.spare = b.insert(c, text, w.spare)
	}
}

// bed is the lines held for a bed (its BedKey), made when first met.
func (w *wardScan) bed(key string) *bedLines {
	b := w.beds[key]
	if b == nil {
		b = &bedLines{}
		w.beds[key] = b
	}
	return b
}

// lineHeader reads the format, time and bed of a record line from its
// first keys, as the writer writes them: an object whose first keys have
// plain values (strings without escapes, numbers, true, false or null),
// among which "format" is this record format, "time" an RFC 3339 time and
// "bed" the label, each once. It reads nothing past the bed's key, so a
// line costs the same whatever its length, and allocates nothing for a
// time written as the writer writes it (UTC, to the second). ok is false
// for any other line: decodedHeader then decodes it.
func lineHeader(text []byte) (bed []byte, at time.Time, ok bool) {
	if len(text) == 0 || text[0] != '{' {
		return nil, time.Time{}, false
	}
	var format, stamp []byte
	found := 0
	i := 1
	for range headerKeysMax {
		key, j, ok := plainString(text, i)
		if !ok || j >= len(text) || text[j] != ':' {
			return nil, time.Time{}, false
		}
		var val []byte
		isString := j+1 < len(text) && text[j+1] == '"'
		if isString {
			val, j, ok = plainString(text, j+1)
		} else {
			j, ok = plainScalarEnd(text, j+1)
		}
		if !ok || j >= len(text) {
			return nil, time.Time{}, false
		}
		var slot *[]byte
		switch string(key) {
		case "format":
			slot = &format
		case "time":
			slot = &stamp
		case "bed":
			slot = &bed
		}
		if slot != nil {
			if *slot != nil || !isString {
				return nil, time.Time{}, false // twice, or not a string
			}
			*slot = val
			if found++; found == 3 {
				break
			}
		}
		if text[j] != ',' {
			return nil, time.Time{}, false
		}
		i = j + 1
	}
	if found != 3 || string(format) != setup.RecordFormat {
		return nil, time.Time{}, false
	}
	at, ok = headerTime(stamp)
	if !ok {
		return nil, time.Time{}, false
	}
	return bed, at, true
}

// plainString reads the JSON string that opens at text[i]: its content
// and the index after its closing quote. ok is false when there is no
// string there or it holds an escape (only decoding can tell what an
// escaped string says) or a control character.
func plainString(text []byte, i int) (content []byte, next int, ok bool) {
	if i >= len(text) || text[i] != '"' {
		return nil, 0, false
	}
	end := bytes.IndexByte(text[i+1:], '"')
	if end < 0 {
		return nil, 0, false
	}
	content = text[i+1 : i+1+end]
	for _, c := range content {
		if c == '\\' || c < 0x20 {
			return nil, 0, false
		}
	}
	return content, i + 2 + end, true
}

// plainScalarEnd is the index after a number, true, false or null that
// starts at text[i]; ok is false for anything else (an object or array).
func plainScalarEnd(text []byte, i int) (int, bool) {
	j := i
	for j < len(text) {
		c := text[j]
		if c >= '0' && c <= '9' || c == '-' || c == '+' || c == '.' || c >= 'a' && c <= 'z' || c == 'E' {
			j++
			continue
		}
		break
	}
	return j, j > i
}

// headerTime reads a record's time: YYYY-MM-DDTHH:MM:SSZ, as the writer
// writes it, without allocating; any other RFC 3339 form through the
// standard parser. The decoded record's time is compared with it before a
// row is made (wardReader.decode), so a form the two read differently
// only costs an exact read.
func headerTime(s []byte) (time.Time, bool) {
	if len(s) == 20 && s[4] == '-' && s[7] == '-' && s[10] == 'T' && s[13] == ':' && s[16] == ':' && s[19] == 'Z' {
		num := func(a, b int) int {
			n := 0
			for _, c := range s[a:b] {
				if c < '0' || c > '9' {
					return -1
				}
				n = n*10 + int(c-'0')
			}
			return n
		}
		y, mo, d, h, mi, sec := num(0, 4), num(5, 7), num(8, 10), num(11, 13), num(14, 16), num(17, 19)
		if y >= 0 && mo >= 1 && mo <= 12 && d >= 1 && h >= 0 && h < 24 && mi >= 0 && mi < 60 && sec >= 0 && sec < 60 {
			t := time.Date(y, time.Month(mo), d, h, mi, sec, 0, time.UTC)
			if t.Day() == d {
				return t, true
			}
		}
		return time.Time{}, false
	}
	t, err := time.Parse(time.RFC3339Nano, string(s))
	return t, err == nil
}

// rows decodes, for each bed, its held lines newest first until the
// newest good record and every held line within ConflictWindow of it are
// decoded, and its newest line from the future; exact is false when the
// lines held cannot tell the row (see the comment at the top of the file).
func (w *wardScan) rows(now time.Time, every time.Duration) (rows []WardRow, exact bool) {
	// The damaged lines decoded here are counted apart and merged in file
	// order, so that the problems kept do not depend on the order of a
	// map's beds.
	scanSum := w.sum
	var decodeSum LogSummary
	w.sum = &decodeSum
	defer func() { w.sum = scanSum; scanSum.merge(decodeSum) }()
	for bed, b := range w.beds {
		var good []wardItem
		for _, c := range b.held {
			if len(good) > 0 && good[0].rec.Time.Sub(c.at) > ConflictWindow {
				break
			}
			it, ok, same := w.decode(bed, c)
			if !same {
				return nil, false
			}
			if ok {
				good = append(good, it)
			}
		}
		good = canonical(good)
		if !b.dropped.IsZero() && (len(good) == 0 || good[0].rec.Time.Sub(b.dropped) <= ConflictWindow) {
			return nil, false // an older good line, or one within the window, was let go
		}
		var futures []wardItem
		for _, c := range b.future {
			it, ok, same := w.decode(bed, c)
			if !same {
				return nil, false
			}
			if ok {
				futures = append(futures, it)
			}
		}
		futures = canonical(futures)
		if len(futures) == 0 && b.futures > len(b.future) {
			return nil, false // an older good record from the future may lie further back
		}
		var fut *wardItem
		if len(futures) > 0 {
			fut = &futures[0]
		}
		if len(good) == 0 && fut == nil {
			continue // every line of the bed is damaged: no row
		}
		rows = append(rows, wardRowOf(good, fut, now, every))
	}
	return rows, true
}

// newestWithin sorts items by time and returns (a copy of) the newest
// keep and every other one within window of the newest, at most
// wardHoldMax: those that can be in a conflict with the newest.
func newestWithin(items []histItem, keep int, window time.Duration) []histItem {
	sort.SliceStable(items, func(i, j int) bool { return itemBefore(items[i], items[j]) })
	if keep <= 0 || len(items) <= keep {
		return items
	}
	from := len(items) - keep
	newest := items[len(items)-1].rec.Time
	for from > 0 && len(items)-from < wardHoldMax && newest.Sub(items[from-1].rec.Time) <= window {
		from--
	}
	return append([]histItem(nil), items[from:]...)
}

// canonical gives decoded records the order a read of every line gives
// them, newest first: a record found more than once (copied within a log
// or across logs) counts once, at its first line in the log whose path
// sorts first (historyReader.take and moveCopy), since at equal times that
// place decides which is newest.
func canonical(items []wardItem) []wardItem {
	var out []wardItem
	for _, it := range items {
		j := slices.IndexFunc(out, func(o wardItem) bool { return o.key == it.key })
		switch {
		case j < 0:
			out = append(out, it)
		case it.log < out[j].log || it.log == out[j].log && it.line < out[j].line:
			out[j].log, out[j].line = it.log, it.line
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		return orderBefore(out[j].rec.Time, out[j].log, out[j].line, out[i].rec.Time, out[i].log, out[i].line)
	})
	return out
}

// decode decodes a held line: ok when it is a good record (a damaged one
// is counted), same when it says what its header said.
func (w *wardScan) decode(bed string, c wardCandidate) (it wardItem, ok, same bool) {
	rec, problem := decodeRecord(c.text)
	if problem != "" {
		w.sum.damaged(c.log, c.line, problem)
		return wardItem{}, false, true
	}
	if setup.BedKey(rec.Bed) != bed || !rec.Time.Equal(c.at) {
		return wardItem{}, false, false
	}
	return wardItem{rec: rec, log: c.log, line: c.line, key: recordKey(&rec, c.text)}, true, true
}
