package setup

import "time"

// Schedule is when a bed was last checked and when the next check is due.
type Schedule struct {
	Log    string
	Last   *time.Time // nil: no check of this bed in the log
	Every  time.Duration
	Source string // where the interval comes from
}

// Due is when the next check is due: the last record plus the interval;
// ok is false when there is no record.
func (s Schedule) Due() (time.Time, bool) {
	if s.Last == nil {
		return time.Time{}, false
	}
	return s.Last.Add(s.Every), true
}

// RecordedSchedule is the schedule after a record was just written.
func RecordedSchedule(logPath string, rec Record, every time.Duration) *Schedule {
	sc := ScheduleAt(logPath, every)
	t := rec.Time
	sc.Last = &t
	return sc
}

// ScheduleAt is the schedule of a log at the interval every (0:
// DefaultCheckEvery), with no last check.
func ScheduleAt(logPath string, every time.Duration) *Schedule {
	sc := &Schedule{Log: logPath, Every: every, Source: "entered"}
	if every <= 0 {
		sc.Every, sc.Source = DefaultCheckEvery, CheckEverySource
	}
	return sc
}
