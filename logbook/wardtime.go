package logbook

import (
	"crypto/sha256"
	"fmt"
	"strings"
	"time"

	"crankside/setup"
)

// FutureSkew is how far ahead of this terminal's clock a record may be
// dated and still be taken as a check of now: terminals' clocks drift by
// minutes (common practice: allow for it). A record dated later is from
// the future: it is shown with its year beside the bed's newest real
// check, and never stands in its place.
const FutureSkew = 5 * time.Minute

// ConflictWindow is how close in time two checks of one bed from
// different logs (terminals) are taken as made at once: both are shown,
// with a conflict note (common practice: a handover check takes minutes).
const ConflictWindow = 5 * time.Minute

// wardItem is one decoded record of a bed, with its log.
type wardItem struct {
	rec  setup.Record
	log  string
	line int
	key  [sha256.Size]byte
}

// wardRowOf makes a bed's row from its good records, newest first, none
// from the future (at most a few), and the newest record from the future
// if there is one. Of the newest record and those from other logs within
// ConflictWindow of it (a copy of the same record is no conflict), the row
// shows the one with the highest caution level, then the newest, then the
// one whose log path sorts first: the order the logs were named in never
// matters, and a conflict shows the louder check.
func wardRowOf(items []wardItem, future *wardItem, now time.Time, every time.Duration) WardRow {
	if len(items) == 0 {
		row := NewWardRow(future.rec, future.log, now, every)
		row.FutureAt, row.FutureLog = future.rec.Time.UTC(), future.log
		return row
	}
	group := []wardItem{items[0]}
	for _, it := range items[1:] {
		if items[0].rec.Time.Sub(it.rec.Time) > ConflictWindow {
			break
		}
		if it.log != items[0].log && it.key != items[0].key && !sameLog(group, it.log) {
			group = append(group, it)
		}
	}
	shown := group[0]
	for _, it := range group[1:] {
		if louder(it, shown) {
			shown = it
		}
	}
	row := NewWardRow(shown.rec, shown.log, now, every)
	if len(group) > 1 {
		row.Conflict = conflictNote(group)
	}
	if future != nil {
		row.FutureAt, row.FutureLog = future.rec.Time.UTC(), future.log
	}
	return row
}

func sameLog(group []wardItem, log string) bool {
	for _, g := range group {
		if g.log == log {
			return true
		}
	}
	return false
}

// louder reports whether a is shown rather than b in a conflict.
func louder(a, b wardItem) bool {
	la, lb := setup.Highest(a.rec.Cautions), setup.Highest(b.rec.Cautions)
	if la != lb {
		return la > lb
	}
	if !a.rec.Time.Equal(b.rec.Time) {
		return a.rec.Time.After(b.rec.Time)
	}
	return a.log < b.log
}

// conflictNote is "conflict: two checks at 14:05 from a.jsonl and
// b.jsonl", or with each time when they differ, oldest last; the logs in
// path order.
func conflictNote(group []wardItem) string {
	g := append([]wardItem(nil), group...)
	sortItemsByLog(g)
	same := true
	for _, it := range g[1:] {
		same = same && setup.LocalClock(it.rec.Time) == setup.LocalClock(g[0].rec.Time)
	}
	var parts []string
	for _, it := range g {
		if same {
			parts = append(parts, it.log)
		} else {
			parts = append(parts, setup.LocalClock(it.rec.Time)+" from "+it.log)
		}
	}
	count := map[int]string{2: "two", 3: "three"}[len(g)]
	if count == "" {
		count = fmt.Sprint(len(g))
	}
	list := strings.Join(parts[:len(parts)-1], ", ") + " and " + parts[len(parts)-1]
	if same {
		return fmt.Sprintf("conflict: %s checks at %s from %s", count, setup.LocalClock(g[0].rec.Time), list)
	}
	return fmt.Sprintf("conflict: %s checks within %.0f min: %s", count, ConflictWindow.Minutes(), list)
}

func sortItemsByLog(g []wardItem) {
	for i := 1; i < len(g); i++ {
		for j := i; j > 0 && g[j].log < g[j-1].log; j-- {
			g[j], g[j-1] = g[j-1], g[j]
		}
	}
}

// historyConflicts notes, on each entry of a bed's history (newest first),
// the checks of other logs within ConflictWindow of it.
func historyConflicts(entries []HistoryEntry, keys [][sha256.Size]byte) {
	within := func(i, j int) bool {
		d := entries[i].Record.Time.Sub(entries[j].Record.Time)
		return d <= ConflictWindow && d >= -ConflictWindow
	}
	for i := range entries {
		group := []wardItem{{rec: entries[i].Record, log: entries[i].Log, key: keys[i]}}
		add := func(j int) {
			if entries[j].Log != entries[i].Log && keys[j] != keys[i] && !sameLog(group, entries[j].Log) {
				group = append(group, wardItem{rec: entries[j].Record, log: entries[j].Log, key: keys[j]})
			}
		}
		for j := i - 1; j >= 0 && within(i, j); j-- {
			add(j)
		}
		for j := i + 1; j < len(entries) && within(i, j); j++ {
			add(j)
		}
		if len(group) > 1 {
			entries[i].Conflict = conflictNote(group)
		}
	}
}
