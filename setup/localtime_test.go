package setup_test

import (
	"os"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

// TestMain reads every local time in UTC, so that the golden cards and
// lines do not depend on the TZ of the computer running the tests; the
// command-line tests (tests/localtime_cli_test.go) set TZ to real zones.
func TestMain(m *testing.M) {
	time.Local = time.UTC
	os.Exit(m.Run())
}

// The clock a person reads, in two zones: 12:34 UTC is 18:04 in India
// (UTC+5:30, no daylight saving) and 07:34 in New York in December
// (EST, UTC-5) (from memory: the zones' offsets; the tz database names
// the abbreviations IST and EST).
func TestLocalTimesCarryTheZone(t *testing.T) {
	at := time.Date(2026, 12, 1, 12, 34, 56, 0, time.UTC)
	saved := time.Local
	defer func() { time.Local = saved }()
	for _, c := range []struct {
		zone, full, short, clock string
	}{
		{"Asia/Kolkata", "2026-12-01 18:04 IST", "12-01 18:04 IST", "18:04 IST"},
		{"America/New_York", "2026-12-01 07:34 EST", "12-01 07:34 EST", "07:34 EST"},
		{"UTC", "2026-12-01 12:34 UTC", "12-01 12:34 UTC", "12:34 UTC"},
	} {
		loc, err := time.LoadLocation(c.zone)
		if err != nil {
			t.Skipf("no zone database for %s: %v", c.zone, err)
		}
		time.Local = loc
		require.Equal(t, c.full, setup.LocalDateTime(at), c.zone)
		require.Equal(t, c.short, setup.LocalShort(at), c.zone)
		require.Equal(t, c.clock, setup.LocalClock(at), c.zone)
	}
}
