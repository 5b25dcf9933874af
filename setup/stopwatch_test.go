package setup_test

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/setup"
)

func entries(kv ...string) setup.Entries {
	e := setup.Entries{"height-cm": "175", "sex": "male", "hole": "7"}
	for i := 0; i+1 < len(kv); i += 2 {
		e[kv[i]] = kv[i+1]
	}
	return e
}

// nextCheckEntries are the entries the next check of bed B4 starts from
// once ck is recorded.
func nextCheckEntries(t *testing.T, ck setup.Check) setup.Entries {
	t.Helper()
	rec, err := setup.NewRecord(ck, "B4", "", today)
	require.NoError(t, err)
	return setup.RecordEntries(rec)
}

// runEntries builds and runs a check on a demo machine.
func runEntries(t *testing.T, id string, e setup.Entries) (setup.Check, error) {
	t.Helper()
	req, problems := setup.BuildCheckRequest(e, today)
	require.Empty(t, problems)
	return setup.RunCheck(req, profile(t, id))
}

// TestStopwatchRoundTrip: a check entered by stopwatch equals the check at
// the speed and dwell it implies (a round trip). derived: one turn 3 s is
// 60 / 3 = 20 rpm; 12 breaths a minute is a 5 s breath, less the 3 s turn
// = 2 s of dwell.
func TestStopwatchRoundTrip(t *testing.T) {
	cases := []struct {
		name              string
		timed, dialled    []string
		wantRPM, wantDwel float64
	}{
		{"turn and pause", []string{"turn-s", "3", "pause-s", "1.5"}, []string{"rpm", "20", "dwell-s", "1.5"}, 20, 1.5},
		{"turn and count", []string{"turn-s", "3", "breaths-per-min", "12"}, []string{"rpm", "20", "dwell-s", "2"}, 20, 2},
		{"dial and count", []string{"rpm", "20", "breaths-per-min", "12"}, []string{"rpm", "20", "dwell-s", "2"}, 20, 2},
		{"turn and dial", []string{"turn-s", "2", "dwell-s", "1"}, []string{"rpm", "30", "dwell-s", "1"}, 30, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			timed, err := runEntries(t, "demo-a", entries(c.timed...))
			require.NoError(t, err)
			dialled, err := runEntries(t, "demo-a", entries(c.dialled...))
			require.NoError(t, err)
			require.InDelta(t, c.wantRPM, timed.Current.Setting.RPM, 1e-9)
			require.InDelta(t, c.wantDwel, timed.Current.Setting.DwellS, 1e-9)
			tj, dj := timed.JSON(), dialled.JSON()
			require.Equal(t, dj.FiguresJSON, tj.FiguresJSON, "same figures")
			require.Equal(t, dj.Cautions, tj.Cautions, "same cautions")
			require.Equal(t, dj.Watch, tj.Watch, "same watch band")
			require.NotEmpty(t, tj.InferredFromStopwatch)
			require.Empty(t, dj.InferredFromStopwatch)
		})
	}
}

// TestStopwatchNothingRounded: a timed turn off the motor's step is run as
// timed and said. derived: 60 / 2.86 = 20.979 rpm, nearest step 21 (0.5
// steps on demo-a); the record's next entries are what was timed.
func TestStopwatchNothingRounded(t *testing.T) {
	ck, err := runEntries(t, "demo-a", entries("turn-s", "2.86", "pause-s", "1.43"))
	require.NoError(t, err)
	require.InDelta(t, 20.979, ck.Current.Setting.RPM, 0.001)
	require.InDelta(t, 1.43, ck.Current.Setting.DwellS, 1e-12, "1.43 s is off the 0.1 s step and kept")
	require.Contains(t, ck.Inferred, "motor speed 20.979 rpm from one turn timed at 2.86 s (nearest motor step 21 rpm)")
	require.Contains(t, ck.Inferred, "dwell 1.43 s, the pause as timed (nearest controller step 1.4 s)")
	next := nextCheckEntries(t, ck)
	require.Equal(t, "2.86", next["turn-s"])
	require.Equal(t, "1.43", next["pause-s"])
	require.NotContains(t, next, "rpm")
	require.NotContains(t, next, "dwell-s")
	// A proposal of PEEP alone keeps the timed speed; one of a speed is dialled.
	req, problems := setup.BuildCheckRequest(entries("turn-s", "2.86", "pause-s", "1.43", "propose-peep", "8"), today)
	require.Empty(t, problems)
	_, err = setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	req, problems = setup.BuildCheckRequest(entries("turn-s", "2.86", "pause-s", "1.43", "propose-rpm", "20.9"), today)
	require.Empty(t, problems)
	_, err = setup.RunCheck(req, profile(t, "demo-a"))
	require.ErrorContains(t, err, "20.9 rpm is not a speed of this motor")
}

// TestStopwatchLimits: each limit just inside and just outside. demo-a
// runs 8-40 rpm, dwell to 10 s; a stopwatch may be off by 10 % (common
// practice): derived: 40 x 1.1 = 44 rpm is a turn of 1.3636 s; 8 / 1.1 =
// 7.2727 rpm is a turn of 8.25 s; 10 x 1.1 = 11 s of pause. demo-b runs
// only at 20 rpm: 20 / 1.1 = 18.18 rpm is a turn of 3.3 s.
func TestStopwatchLimits(t *testing.T) {
	cases := []struct {
		id    string
		kv    []string
		field string // "" : accepted
		words string
	}{
		{"demo-a", []string{"turn-s", "1.37", "pause-s", "1"}, "", ""},
		{"demo-a", []string{"turn-s", "1.36", "pause-s", "1"}, "turn-s", "one turn in 1.36 s is 44.12 rpm, outside this motor's 8-40 rpm by more than a stopwatch's 10 %"},
		{"demo-a", []string{"turn-s", "8.24", "pause-s", "1"}, "", ""},
		{"demo-a", []string{"turn-s", "8.26", "pause-s", "1"}, "turn-s", "is 7.26 rpm, outside this motor's 8-40 rpm"},
		{"demo-a", []string{"turn-s", "3", "pause-s", "10.9"}, "", ""},
		{"demo-a", []string{"turn-s", "3", "pause-s", "11.1"}, "pause-s", "a pause of 11.10 s is longer than this controller's 10 s"},
		{"demo-b", []string{"turn-s", "3.29", "pause-s", "1"}, "", ""},
		{"demo-b", []string{"turn-s", "3.31", "pause-s", "1"}, "turn-s", "outside this motor's 20-20 rpm"},
	}
	for _, c := range cases {
		e := entries(c.kv...)
		if c.id == "demo-b" {
			e["hole"] = "C"
		}
		_, err := runEntries(t, c.id, e)
		if c.field == "" {
			require.NoError(t, err, "%s %v", c.id, c.kv)
			continue
		}
		var ie *setup.InputError
		require.ErrorAs(t, err, &ie, "%s %v", c.id, c.kv)
		require.Equal(t, c.field, ie.Field)
		require.Contains(t, ie.Reason, c.words)
	}
}

// TestStopwatchEntryProblems: one way each, and a count that cannot hold
// the turn. derived: 21 breaths a minute is 60 / 21 = 2.857 s a breath,
// less than a 3 s turn; 20 a minute is exactly 3 s: dwell 0.
func TestStopwatchEntryProblems(t *testing.T) {
	cases := []struct {
		kv           []string
		field, words string
	}{
		{[]string{"rpm", "20", "turn-s", "3", "dwell-s", "1"}, "turn-s", "not both"},
		{[]string{"rpm", "20", "dwell-s", "1", "pause-s", "1"}, "pause-s", "not two"},
		{[]string{"turn-s", "3", "breaths-per-min", "21"}, "breaths-per-min", "one breath every 2.86 s, shorter than the turn of 3.00 s"},
		{[]string{"turn-s", "0.4", "pause-s", "1"}, "turn-s", "0.5-30"},
		{[]string{"turn-s", "3", "pause-s", "31"}, "pause-s", "0-30"},
		{[]string{"turn-s", "3", "breaths-per-min", "3.9"}, "breaths-per-min", "4-60"},
		{[]string{"turn-s", "3"}, "dwell-s", "pause-s"},
		{[]string{"pause-s", "1"}, "rpm", "turn-s"},
	}
	for _, c := range cases {
		_, problems := setup.BuildCheckRequest(entries(c.kv...), today)
		p := problems.Field(c.field)
		require.NotNil(t, p, "%v: want a problem on %s, got %v", c.kv, c.field, problems)
		require.Contains(t, p.Reason, c.words, "%v", c.kv)
	}
	req, problems := setup.BuildCheckRequest(entries("turn-s", "3", "breaths-per-min", "20"), today)
	require.Empty(t, problems)
	require.InDelta(t, 0, req.Setting.DwellS, 1e-12)
}

// A setting timed by its breaths counted in a minute starts the next check
// from that count, on the dial's speed: no dwell that no one read (demo-a
// at 20 rpm, 12 breaths a minute: 5 s a breath, 3 s a turn, 2 s of dwell,
// derived as in TestStopwatchRoundTrip).
func TestRecordEntriesKeepACountedRate(t *testing.T) {
	ck, err := runEntries(t, "demo-a", entries("rpm", "20", "breaths-per-min", "12"))
	require.NoError(t, err)
	next := nextCheckEntries(t, ck)
	require.Equal(t, "12", next["breaths-per-min"])
	require.Equal(t, "20", next["rpm"])
	require.NotContains(t, next, "dwell-s")
}

// A number that is not one says the field's unit, and only a field with a
// unit says one.
func TestEntryErrorsNameTheUnit(t *testing.T) {
	_, problems := setup.BuildCheckRequest(entries("rpm", "twenty", "dwell-s", "1", "fio2", "x"), today)
	var rpm, fio2 string
	for _, p := range problems {
		switch p.Field {
		case "rpm":
			rpm = p.Reason
		case "fio2":
			fio2 = p.Reason
		}
	}
	require.True(t, strings.HasSuffix(rpm, " (rpm)"), "%q", rpm)
	require.NotContains(t, fio2, "()")
}
