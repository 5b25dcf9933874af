package setup_test

import (
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

// The entry builder itself refuses manometer readings outside the
// plausible range (setup.ManometerMinCmH2O-ManometerMaxCmH2O, common
// practice), so that the screen refuses them as the command line does.
func TestTheEntryBuilderRefusesImplausibleReadings(t *testing.T) {
	base := setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21", "dwell-s": "1.4"}
	for _, c := range []struct{ peak, end, field string }{{"-17", "14", "peak"}, {"1e9", "14", "peak"}, {"17", "200", "end-pressure"}} {
		e := setup.Entries{"peak": c.peak, "end-pressure": c.end}
		for k, v := range base {
			e[k] = v
		}
		_, problems := setup.BuildCheckRequest(e, today)
		require.NotNil(t, problems.Field(c.field), "peak %s end %s", c.peak, c.end)
	}
	e := setup.Entries{"peak": "150", "end-pressure": "0"}
	for k, v := range base {
		e[k] = v
	}
	_, problems := setup.BuildCheckRequest(e, today)
	require.Nil(t, problems.Field("peak"))
	require.Nil(t, problems.Field("end-pressure"), "the range's own ends are readings")
}
