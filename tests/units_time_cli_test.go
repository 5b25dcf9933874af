package tests

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
)

// cranksideTZ runs the command with TZ set, as a ward's computer would be.
func cranksideTZ(t *testing.T, tz string, args ...string) result {
	t.Helper()
	crankside(t, "--version") // reads the sources once, as crankside does
	cmd := exec.Command(binary, args...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	cmd.Env = append(os.Environ(), "XDG_CONFIG_HOME="+t.TempDir(), "HOME="+t.TempDir(), "TZ="+tz)
	err := cmd.Run()
	status := 0
	var ee *exec.ExitError
	if errors.As(err, &ee) {
		status = ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return result{out.String(), errb.String(), status}
}

// A check recorded once is read back in two zones: the log keeps UTC (RFC
// 3339), `log show`, `log beds` and the card print the local clock with
// its zone. The expected clock is the record's UTC time put in the zone by
// the standard library's tz database (not by the code under test).
func TestLocalTimeUnderTwoZones(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "handover.jsonl")
	r := cranksideTZ(t, "Asia/Kolkata", "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21",
		"--dwell-s", "1.4", "--bed", "B4", "--initials", "ab", "--log", logPath, "--card")
	require.Equal(t, 0, r.status, r.stderr)
	raw, err := os.ReadFile(logPath)
	require.NoError(t, err)
	var rec struct {
		Time string `json:"time"`
	}
	line, _ := bufio.NewReader(bytes.NewReader(raw)).ReadString('\n')
	require.NoError(t, json.Unmarshal([]byte(line), &rec))
	require.True(t, strings.HasSuffix(rec.Time, "Z"), "the log keeps UTC: %s", rec.Time)
	at, err := time.Parse(time.RFC3339, rec.Time)
	require.NoError(t, err)

	for _, c := range []struct{ tz, abbrev string }{
		{"Asia/Kolkata", "IST"},   // UTC+5:30 all year (from memory; tz database)
		{"America/New_York", "E"}, // EST in winter, EDT in summer (tz database)
	} {
		loc, err := time.LoadLocation(c.tz)
		if err != nil {
			t.Skipf("no zone database for %s: %v", c.tz, err)
		}
		want := at.In(loc).Format("2006-01-02 15:04 MST")
		require.True(t, strings.HasPrefix(want[17:], c.abbrev), "%s: the zone's abbreviation: %s", c.tz, want)

		show := cranksideTZ(t, c.tz, "log", "show", "--log", logPath, "--bed", "B4")
		require.Equal(t, 0, show.status, show.stderr)
		require.Contains(t, show.stdout, want+"  AB", "%s: log show", c.tz)
		require.NotContains(t, show.stdout, " UTC", c.tz)

		beds := cranksideTZ(t, c.tz, "log", "beds", "--log", logPath)
		require.Equal(t, 0, beds.status, beds.stderr)
		require.Contains(t, beds.stdout, at.In(loc).Format("01-02 15:04 MST"), "%s: log beds", c.tz)

		js := cranksideTZ(t, c.tz, "log", "beds", "--log", logPath, "--json")
		require.Contains(t, js.stdout, `"`+rec.Time+`"`, "%s: JSON keeps UTC", c.tz)
	}
	// The card printed when the check was recorded (TZ=Asia/Kolkata).
	kolkata, err := time.LoadLocation("Asia/Kolkata")
	require.NoError(t, err)
	require.Contains(t, r.stdout, "HANDOVER CARD  bed B4  "+at.In(kolkata).Format("2006-01-02 15:04")+" IST")
}

// Done-when of the units: a PaO2 of 25 kPa is read as 187.5 mmHg (NIST SP
// 811: 25 x 7.50062) and echoed; a PaCO2 of 10.5 "mmHg" is refused as the
// kPa value it is (10.5 x 7.50062 = 78.8 mmHg), exit status 2.
func TestGasUnitsOnTheCommandLine(t *testing.T) {
	base := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4"}
	r := crankside(t, append(base, "--gas-unit", "kpa", "--pao2", "25")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "ENTERED  PaO2 25 kPa = 187.5 mmHg")

	r = crankside(t, append(base, "--paco2", "10.5", "--ph", "7.2")...)
	require.Equal(t, 2, r.status)
	require.Contains(t, r.stderr, "--paco2: 10.5 looks like kPa (= 78.8 mmHg): say the unit")
	require.Equal(t, 1, strings.Count(r.stderr, "\n"), "one line: %q", r.stderr)

	r = crankside(t, append(base, "--gas-unit", "kpa", "--paco2", "10.5", "--ph", "7.2", "--json")...)
	require.Equal(t, 0, r.status, r.stderr)
	var obj struct {
		EntriesConverted []struct {
			Entry, EnteredUnit, Unit, Text string
			Entered, Value                 float64
		} `json:"entries_converted"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	require.Len(t, obj.EntriesConverted, 1)
	require.Equal(t, "PaCO2 10.5 kPa = 78.8 mmHg", obj.EntriesConverted[0].Text)
	require.InDelta(t, 78.8, obj.EntriesConverted[0].Value, 0.05, "NIST SP 811: 10.5 x 7.50062")

	// Height in inches and the manometer in hPa, echoed on the plan and the check.
	r = crankside(t, "plan", "--height-in", "70", "--sex", "male")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "height 70 in = 177.8 cm") // 70 x 2.54 exactly
	r = crankside(t, append(base, "--pressure-unit", "hpa", "--peak", "17", "--end-pressure", "14")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "peak reading 17 hPa = 17.34 cmH2O") // REFERENCES: 17 hPa -> 17.34 cmH2O
}

// A record of a check typed in the ward's units keeps what was converted,
// and the log's reader takes it back as the writer wrote it.
func TestARecordWithConvertedEntriesReadsBack(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "handover.jsonl")
	r := crankside(t, "check", "--height-cm", `5'10"`, "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--pressure-unit", "mbar", "--peak", "17", "--end-pressure", "14", "--gas-unit", "kpa", "--paco2", "6", "--ph", "7.35",
		"--bed", "B7", "--log", logPath)
	require.Equal(t, 0, r.status, r.stderr)
	raw, err := os.ReadFile(logPath)
	require.NoError(t, err)
	require.Contains(t, string(raw), `"text":"height 70 in = 177.8 cm"`)
	require.Contains(t, string(raw), `"text":"PaCO2 6 kPa = 45.0 mmHg"`) // NIST SP 811: 6 x 7.50062 = 45.004
	show := crankside(t, "log", "show", "--log", logPath, "--bed", "B7")
	require.Equal(t, 0, show.status, show.stderr)
	require.Contains(t, show.stdout, "Bed B7: 1 check(s)")
	require.Empty(t, show.stderr)
}
