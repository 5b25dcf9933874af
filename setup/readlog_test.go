package setup_test

import (
	"sort"

	"crankside/logbook"
	"crankside/setup"
)

// readLog reads every record of one log through the log store, oldest
// first, with the damaged lines it reported: a record's round trip through
// the writer and the reader.
func readLog(path string) ([]setup.Record, []logbook.LogProblem, error) {
	hs, sum, err := logbook.ReadHistories([]string{path}, "", 0)
	var recs []setup.Record
	for _, h := range hs {
		for _, e := range h.Entries {
			recs = append(recs, e.Record)
		}
	}
	sort.SliceStable(recs, func(i, j int) bool { return recs[i].Time.Before(recs[j].Time) })
	return recs, sum.Problems, err
}
