package logbook

import (
	"time"

	"crankside/setup"
)

// BedSchedule reads the bed's last record from the log and gives the
// schedule at the interval every (0: setup.DefaultCheckEvery).
func BedSchedule(logPath, bed string, every time.Duration) (*setup.Schedule, error) {
	if err := setup.CheckBedLabel(bed); err != nil {
		return nil, err
	}
	h, _, err := ReadBedHistory([]string{logPath}, bed, 1)
	if err != nil {
		return nil, err
	}
	sc := setup.ScheduleAt(logPath, every)
	if len(h.Entries) > 0 {
		t := h.Entries[0].Record.Time
		sc.Last = &t
	}
	return sc, nil
}
