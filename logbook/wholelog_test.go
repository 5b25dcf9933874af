package logbook

import (
	"fmt"
	"io"
	"sort"

	"crankside/setup"
)

// The whole-file reader: every record of one log decoded into memory. The
// program reads logs as a stream (ReadHistories, ReadBedHistory,
// WardRows); this is the reference those are held to in the tests.

// ReadLog reads every record it can from one log, in file order. A torn
// last line (a crash while writing), junk, or an over-long line is
// skipped; no earlier record is lost because of it. At most
// MaxProblemsKept problems are returned with their line numbers, then, if
// there were more, one with Line 0 saying how many ("and N more damaged
// lines"). The log must be the user's own regular file (see
// CheckLogPath): a link, a pipe or a device such as /dev/zero is refused
// at once.
func ReadLog(path string) ([]setup.Record, []LogProblem, error) {
	f, err := openLogForRead(path)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	recs, problems, err := readRecords(f)
	if err != nil {
		err = fmt.Errorf("log %s: %w", path, unwrapPathError(err))
	}
	return recs, problems, err
}

func readRecords(r io.Reader) ([]setup.Record, []LogProblem, error) {
	var recs []setup.Record
	var sum LogSummary
	err := scanLog(r, "", &sum, func(n int, text []byte) {
		rec, problem := decodeRecord(text)
		if problem != "" {
			sum.damaged("", n, problem)
			return
		}
		recs = append(recs, rec)
	})
	problems := sum.Problems
	if more := sum.Damaged - len(sum.Problems); more > 0 {
		problems = append(problems, LogProblem{Reason: moreDamaged(more)})
	}
	return recs, problems, err
}

// History groups records by bed (only bed, when it is not empty), oldest
// first.
func History(recs []setup.Record, bed string) []BedHistory {
	byBed := map[string][]setup.Record{}
	for _, r := range recs {
		// Beds are one whatever the case of their letters (b4 is B4).
		if key := setup.BedKey(r.Bed); bed == "" || key == setup.BedKey(bed) {
			byBed[key] = append(byBed[key], r)
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
		h := BedHistory{Bed: b, Total: len(rs)}
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
