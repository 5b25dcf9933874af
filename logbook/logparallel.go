package logbook

import (
	"crypto/sha256"
	"runtime"
	"slices"
	"sync"

	"crankside/setup"
)

// The history reader decodes on every core: decoding the JSON of each
// record is most of a read, and the lines are independent. This goroutine
// scans the logs and hands the lines that may hold the bed, in batches, to
// decoding workers; one collector takes the decoded batches back in file
// order and keeps, counts and reports them exactly as a read on one core
// does (historyReader.take), so the result does not depend on the number
// of cores. Memory stays bounded: at most a few batches are in flight.

// batchLines is how many lines a worker decodes at a time.
const batchLines = 128

type rawLine struct {
	n    int
	text []byte
}

type decodedLine struct {
	n       int
	rec     setup.Record
	ok      bool
	problem string            // why the line is damaged, when it is not ok
	key     [sha256.Size]byte // set when the record is of the bed asked for
}

type lineBatch struct {
	log    string
	logIdx int
	lines  []rawLine
	out    chan []decodedLine // buffered: a worker never waits
}

// decodeLine decodes one line, and keys the record when its bed is kept.
func decodeLine(n int, text []byte, bed string) decodedLine {
	rec, problem := decodeRecord(text)
	ok := problem == ""
	d := decodedLine{n: n, rec: rec, ok: ok, problem: problem}
	if ok && (bed == "" || setup.BedKey(rec.Bed) == bed) {
		d.key = recordKey(&rec, text)
	}
	return d
}

// readFiles reads every file into h, as readOneLog with h.visit would,
// with the decoding spread over the cores.
func (h *historyReader) readFiles(files []string) error {
	workers := runtime.GOMAXPROCS(0)
	h.progress.begin("reading", len(files))
	if workers < 2 {
		for i, path := range files {
			if err := readOneLog(path, h.sum, h.visit(path, i)); err != nil {
				return err
			}
			h.progress.step()
		}
		return nil
	}
	scanSum := h.sum // the scan's own counts: torn, over-long and shapeless lines
	var decodeSum LogSummary
	h.sum = &decodeSum
	defer func() { h.sum = scanSum }()

	jobs := make(chan *lineBatch, workers)
	pending := make(chan *lineBatch, 2*workers)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for b := range jobs {
				out := make([]decodedLine, len(b.lines))
				for i, l := range b.lines {
					out[i] = decodeLine(l.n, l.text, h.bed)
				}
				b.out <- out
			}
		}()
	}
	collected := make(chan struct{})
	go func() {
		defer close(collected)
		for b := range pending {
			for _, d := range <-b.out {
				h.take(b.log, b.logIdx, d)
			}
		}
	}()

	var err error
	for i, path := range files {
		b := &lineBatch{log: path, logIdx: i}
		send := func() {
			if len(b.lines) == 0 {
				return
			}
			b.out = make(chan []decodedLine, 1)
			pending <- b // first in line for the collector, then to a worker
			jobs <- b
			b = &lineBatch{log: path, logIdx: i}
		}
		err = readOneLog(path, scanSum, func(n int, text []byte) {
			if h.needle != nil && !mayHoldLabel(text, h.needle) {
				return
			}
			b.lines = append(b.lines, rawLine{n: n, text: append([]byte(nil), text...)})
			if len(b.lines) == batchLines {
				send()
			}
		})
		send()
		if err != nil {
			break
		}
		h.progress.step()
	}
	close(jobs)
	close(pending)
	<-collected
	wg.Wait()
	scanSum.merge(decodeSum)
	return err
}

// merge adds the counts of a read of the same logs (in the same order,
// s.Logs) that looked at other lines, keeping the first MaxProblemsKept
// problems of both in file order, as one read of every line would.
func (s *LogSummary) merge(o LogSummary) {
	s.Records += o.Records
	s.Duplicates += o.Duplicates
	s.Damaged += o.Damaged
	if len(o.Problems) == 0 {
		return
	}
	all := append(s.Problems, o.Problems...)
	slices.SortStableFunc(all, func(a, b LogProblem) int {
		if ia, ib := slices.Index(s.Logs, a.Log), slices.Index(s.Logs, b.Log); ia != ib {
			return ia - ib
		}
		return a.Line - b.Line
	})
	s.Problems = all[:min(len(all), MaxProblemsKept)]
}
