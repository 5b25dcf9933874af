package setup

import "time"

// Times a person reads are the local clock with its zone ("2026-12-01
// 18:04 IST"), as the process's TZ says (Go's time.Local); JSON and the log
// keep UTC in RFC 3339, so that records from computers in different zones
// merge by the instant, not by what a clock showed.

// LocalDateTime is t on the local clock with date and zone:
// "2026-12-01 18:04 IST".
func LocalDateTime(t time.Time) string { return t.Local().Format("2006-01-02 15:04 MST") }

// LocalShort is t on the local clock, month-day and zone: "12-01 18:04 IST".
func LocalShort(t time.Time) string { return t.Local().Format("01-02 15:04 MST") }

// LocalClock is t on the local clock with its zone: "18:04 IST".
func LocalClock(t time.Time) string { return t.Local().Format("15:04 MST") }
