package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// The readings a manometer can show at a handover that must never look
// calm (issue 10), on demo-a hole 8, 21 rpm, dwell 1.4 s, PEEP 5.
var alarmingReadings = []struct {
	peak, end string
	id        string // the reading's own stop
	source    string
}{
	{"120", "100", "measured-peak-high", "MHRA RMVS001 2020: never more than 40 cmH2O"},
	{"55", "14", "measured-peak-high", "MHRA RMVS001 2020: never more than 40 cmH2O"},
	{"15", "3", "measured-end-at-or-below-peep", "RMVS001 disconnection alarm: end 3 is below PEEP 5"},
	{"12", "14", "measured-peak-below-end", "common practice: the peak is the highest reading"},
}

func readingArgs(peak, end string, more ...string) []string {
	return append([]string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--peak", peak, "--end-pressure", end}, more...)
}

// predicted are the current setting's figures that depend on the lung.
var predicted = []string{"delivered_vt_ml", "ml_per_kg", "minute_ventilation_l_min", "peak_flow_l_min",
	"peak_pressure_cmh2o", "end_inspiratory_pressure_cmh2o", "plateau_pressure_cmh2o", "driving_pressure_cmh2o",
	"intrinsic_peep_cmh2o", "trapped_volume_ml", "peak_torque_nm"}

// checkStopJSON asserts the object has the reading's stop and, when no
// lung explains the readings, null predicted figures.
func checkStopJSON(t *testing.T, obj map[string]any, id, source string) {
	t.Helper()
	found := false
	for _, c := range obj["cautions"].([]any) {
		c := c.(map[string]any)
		if c["id"] == id {
			found = true
			require.Equal(t, "stop", c["level"], "%s (%s)", id, source)
		}
	}
	require.True(t, found, "%s (%s) in %v", id, source, obj["cautions"])
	if obj["fit_problem"] != nil {
		for _, k := range predicted {
			v, ok := obj[k]
			// A log line of the compact writer (record 3) leaves every
			// null out: absent reads as null. The check's JSON keeps it.
			require.True(t, ok || obj["record"] == 3.0, "key %s stays present", k)
			require.Nil(t, v, "%s must be null when no lung explains the readings", k)
		}
	}
}

func TestAlarmingReadingsTextShowsTheStop(t *testing.T) {
	for _, c := range alarmingReadings {
		r := crankside(t, readingArgs(c.peak, c.end)...)
		require.Equal(t, 3, r.status, r.stderr) // a STOP: exit 3 (crankside check --help)
		lines := strings.Split(r.stdout, "\n")
		require.True(t, strings.HasPrefix(lines[1], "STOP"), "%s/%s: line 2 is a STOP: %q", c.peak, c.end, lines[1])
		require.Contains(t, r.stdout, "STOP  "+c.id+": ", c.source)
		require.Contains(t, r.stdout, "STOP: DO NOT USE THIS SETTING (")
		require.NotContains(t, r.stdout, "THE MACHINE IS SET TO", "never read as an instruction")
		if strings.Contains(r.stdout, "THE READINGS CANNOT BE EXPLAINED") {
			require.Contains(t, r.stdout, "THE PATIENT GETS: NOT KNOWN")
			require.NotContains(t, r.stdout, "Tidal vol.", "no volume for the current setting")
			require.NotContains(t, r.stdout, "Tidal volume", "no volume for the current setting")
		}
	}
	// The issue's own case: 120/100 cannot be explained, and its figures
	// (the calm 14.8 cmH2O peak of the assumed lung) are gone.
	r := crankside(t, readingArgs("120", "100")...)
	require.Contains(t, r.stdout, "STOP  THE READINGS CANNOT BE EXPLAINED: ")
	require.NotContains(t, r.stdout, "14.8")
}

func TestAlarmingReadingsJSONHasNullFigures(t *testing.T) {
	for _, c := range alarmingReadings {
		r := crankside(t, readingArgs(c.peak, c.end, "--json")...)
		require.Equal(t, 3, r.status, r.stderr) // a STOP: exit 3 (crankside check --help)
		var obj map[string]any
		require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
		checkStopJSON(t, obj, c.id, c.source)
	}
	r := crankside(t, readingArgs("120", "100", "--json")...)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	require.NotEmpty(t, obj["fit_problem"])
	require.Nil(t, obj["delivered_vt_ml"])
	require.InDelta(t, 21, obj["motor_rpm"], 0, "the setting's own values stay")
}

func TestAlarmingReadingsCardSaysStopAtTheTop(t *testing.T) {
	for _, c := range alarmingReadings {
		r := crankside(t, readingArgs(c.peak, c.end, "--card", "--bed", "B4")...)
		require.Equal(t, 3, r.status, r.stderr) // a STOP: exit 3 (crankside check --help)
		lines := strings.Split(r.stdout, "\n")
		require.True(t, strings.HasPrefix(lines[1], "STOP"), "%s/%s card: %q", c.peak, c.end, lines[1])
		require.Contains(t, r.stdout, "STOP  "+c.id+": ")
		for _, l := range lines {
			require.LessOrEqual(t, len(l), 80, l)
		}
	}
	r := crankside(t, readingArgs("120", "100", "--card", "--bed", "B4")...)
	require.Contains(t, r.stdout, "STOP: READINGS UNEXPLAINED - NOTHING ON THIS CARD IS WHAT THE PATIENT GETS")
	require.Contains(t, r.stdout, "THE READINGS CANNOT BE EXPLAINED: ")
}

func TestAlarmingReadingsRecordKeepsTheStop(t *testing.T) {
	for _, c := range alarmingReadings {
		path := filepath.Join(t.TempDir(), "handover.jsonl")
		r := crankside(t, readingArgs(c.peak, c.end, "--log", path, "--bed", "B4")...)
		require.Equal(t, 3, r.status, r.stderr) // a STOP: exit 3 (crankside check --help)
		b, err := os.ReadFile(path)
		require.NoError(t, err)
		var obj map[string]any
		require.NoError(t, json.Unmarshal(b, &obj))
		require.Equal(t, "B4", obj["bed"])
		require.Equal(t, "crankside-check/1", obj["format"])
		checkStopJSON(t, obj, c.id, c.source)
		// The log read back says the same.
		r = crankside(t, "log", "show", "--log", path, "--bed", "B4")
		require.Equal(t, 0, r.status, r.stderr)
		require.Contains(t, r.stdout, "highest STOP")
		if obj["fit_problem"] != nil {
			require.Contains(t, r.stdout, "readings unexplained")
		}
	}
}

// A 190 cm man on demo-a's smallest hole with a stiff lung (C 10): the
// alveolar ventilation is about 2 mL/kg PBW/min, far below the stop at 20
// (a third of the usual 60; PaCO2 about triples by the alveolar
// ventilation equation; common practice).
func TestBarelyVentilatedIsAStop(t *testing.T) {
	r := crankside(t, "check", "--height-cm", "190", "--sex", "male", "--hole", "1", "--rpm", "21", "--dwell-s", "1.4",
		"--compliance", "10", "--json")
	require.Equal(t, 3, r.status, r.stderr) // a STOP: exit 3 (crankside check --help)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	checkStopJSON(t, obj, "alveolar-ventilation-low", "common practice: below 20 mL/kg PBW/min is a stop")
}
