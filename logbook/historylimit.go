package logbook

import (
	"fmt"
	"strconv"
	"strings"

	"crankside/physiology"
	"crankside/setup"
)

// HistoryShown is how many of a bed's newest checks a history shows in
// full unless told otherwise (log show, the screen's Ctrl+R): about two
// and a half weeks of checks every 4 hours. The older ones are counted,
// not held, so a history's memory does not grow with the log (a year of
// 30 beds checked every 4 hours is about 65 000 records).
const HistoryShown = 100

// HistoryLimit reads how many of each bed's newest checks to show, as a
// person types it: a whole number, 1 or more; blank is HistoryShown.
func HistoryLimit(text string) (int, *setup.InputError) {
	text = strings.TrimSpace(text)
	if text == "" {
		return HistoryShown, nil
	}
	n, err := strconv.Atoi(text)
	if err != nil || n < 1 {
		return 0, &setup.InputError{Field: "limit", Reason: fmt.Sprintf("%s is not a whole number of checks: give 1 or more (or --all for every check)", physiology.Quote(text))}
	}
	return n, nil
}

// NotShown is the line that ends a bed's history when older checks were
// counted but not shown, or "": "and 3 234 earlier checks not shown
// (--limit N or --all to see them)".
func (h BedHistory) NotShown(how string) string {
	n := h.Total - len(h.Entries)
	if n <= 0 {
		return ""
	}
	word := "checks"
	if n == 1 {
		word = "check"
	}
	return fmt.Sprintf("and %d earlier %s not shown (%s)", n, word, how)
}
