package setup

import (
	"strings"
	"time"

	"crankside/physiology"
)

// DefaultCheckEvery is how often a bed's setting is checked when no
// interval is given: common practice, 4 hours; use your local interval.
const DefaultCheckEvery = 4 * time.Hour

// CheckEverySource says where DefaultCheckEvery comes from.
const CheckEverySource = "common practice: use your local interval"

// CheckInterval reads how often each bed should be checked, in hours as a
// person types it ("4", "2,5"), or the default when blank.
func CheckInterval(text string) (time.Duration, *InputError) {
	if strings.TrimSpace(text) == "" {
		return DefaultCheckEvery, nil
	}
	h, err := physiology.ParseNumber(text)
	if err != nil {
		return 0, &InputError{Field: "every", Reason: err.Error() + " (hours)"}
	}
	if err := physiology.CheckRange("check interval", h, 0.25, 48, "h"); err != nil {
		return 0, &InputError{Field: "every", Reason: err.Error()}
	}
	return time.Duration(h * float64(time.Hour)), nil
}
