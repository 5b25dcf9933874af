package tests

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// A few hostile number values through the built binary: what a shell sees
// is exit status 2 and one line on stderr naming the flag (common practice:
// only plain finite decimals are numbers at a bedside). The whole table, every
// number flag of plan and check with every hostile value, runs in-process
// through the same entry in ../main_test.go.
func TestEveryNumberFlagRefusesHostileValues(t *testing.T) {
	plan := []string{"plan", "--height-cm", "175", "--sex", "male"}
	check := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4"}
	cases := []struct {
		base        []string
		flag, value string
	}{
		{plan, "--height-cm", "NaN"}, {plan, "--fio2", "1e999"}, {plan, "--rate", "١٧٥"},
		{check, "--dwell-s", "\x7f"}, {check, "--peak", "-Inf"}, {check, "--propose-peep", ""},
	}
	for _, c := range cases {
		args := append(append([]string(nil), c.base...), c.flag, c.value)
		r := crankside(t, args...)
		require.Equal(t, 2, r.status, "%s %q: %s", c.flag, c.value, r.stderr)
		require.Contains(t, r.stderr, c.flag, "%s %q: the message names the flag", c.flag, c.value)
		require.Equal(t, 1, strings.Count(strings.TrimRight(r.stderr, "\n"), "\n")+1, "%s %q: one line: %q", c.flag, c.value, r.stderr)
		require.NotContains(t, r.stderr, "goroutine")
		require.Empty(t, r.stdout)
	}
}

// A decimal comma is a decimal mark, as written in much of the world
// (common practice): "0,9" is 0.9 on every number flag, as on the screen.
func TestDecimalCommaIsADecimalMark(t *testing.T) {
	r := crankside(t, "plan", "--height-cm", "175,5", "--sex", "male", "--peep", "7,5", "--fio2", "0,4", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, `"peep_cmh2o": 7.5`)
	require.Contains(t, r.stdout, `"fio2": 0.4`)
	require.Contains(t, r.stdout, `"height_cm": 175.5`)
	r = crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1,4", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, `"dwell_s": 1.4`)
}

func TestHostileTextFlags(t *testing.T) {
	base := []string{"plan", "--height-cm", "175"}
	for _, v := range []string{"", "m\nf", strings.Repeat("m", 100000), "\x1b[31mmale"} {
		r := crankside(t, append(base, "--sex", v)...)
		require.Equal(t, 2, r.status, "%q", v)
		require.Less(t, len(r.stderr), 2000, "the message does not echo a huge value whole")
	}
	for _, v := range []string{"1:", "1:2:3", "0:0", "-1:2", "1:1e999", strings.Repeat("1", 5000)} {
		r := crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--ie", v)
		require.Equal(t, 2, r.status, "--ie %q", v)
		require.Contains(t, r.stderr, "--ie")
	}
}

func TestHostileProfileFiles(t *testing.T) {
	dir := t.TempDir()
	good := crankside(t, "profiles", "show", "demo-a", "--json").stdout
	files := map[string][]byte{
		"huge.json":    []byte(`{"label":"` + strings.Repeat("x", 2<<20) + `"}`),
		"binary.json":  {0xff, 0xfe, 0, 1, 2, 3, '{'},
		"deep.json":    []byte(strings.Repeat(`{"crank":`, 5000) + "1" + strings.Repeat("}", 5000)),
		"dupkey.json":  []byte(strings.Replace(good, `"id": "demo-a",`, `"id": "demo-a", "id": "other",`, 1)),
		"big-num.json": []byte(strings.Replace(good, `"rod_cm": 22`, `"rod_cm": 1e308`, 1)),
		"nan.json":     []byte(strings.Replace(good, `"rod_cm": 22`, `"rod_cm": "NaN"`, 1)),
		"holes.json":   []byte(strings.Replace(good, `"holes": [`, `"holes": [`+strings.Repeat(`{"label":"x","radius_cm":2},`, 3000), 1)),
		"empty.json":   {},
	}
	for name, data := range files {
		path := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(path, data, 0o644))
		r := crankside(t, "profiles", "validate", path)
		require.Equal(t, 2, r.status, "%s: %s", name, r.stdout)
		require.NotEmpty(t, r.stderr)
		require.NotContains(t, r.stderr, "goroutine")
		r = crankside(t, "plan", "--height-cm", "175", "--sex", "male", "--profile", path)
		require.Equal(t, 2, r.status, name)
		require.Equal(t, 1, strings.Count(strings.TrimRight(r.stderr, "\n"), "\n")+1, "%s: one line", name)
		require.Less(t, len(r.stderr), 4000, "%s: a short message", name)
	}
	// The bad files in the directory do not hide the good demos.
	r := crankside(t, "profiles", "list", "--profiles", dir)
	require.Contains(t, r.stdout, "demo-a ")
	require.Contains(t, r.stdout, "BAD")
}

func TestHostileBenchAndLogFiles(t *testing.T) {
	dir := t.TempDir()
	unit := filepath.Join(dir, "unit.json")
	require.NoError(t, os.WriteFile(unit, []byte(crankside(t, "profiles", "new", "--from", "demo-a", "--id", "unit-1").stdout), 0o644))
	before := mustRead(t, unit)
	for name, data := range map[string]string{
		"binary.csv":   "\x00\xff\xfe\x01",
		"huge.csv":     "hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n" + strings.Repeat("5,50,5,20,318\n", 200000),
		"quote.csv":    "hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n\"5,50,5,20,318\n",
		"nan.csv":      "hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n5,NaN,5,20,Inf\n",
		"headonly.csv": "hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml\n",
	} {
		path := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(path, []byte(data), 0o644))
		r := crankside(t, "calibrate", "--profile", unit, "--bench", path, "--write")
		require.Equal(t, 2, r.status, "%s: %s", name, r.stdout)
		require.NotContains(t, r.stderr, "goroutine")
		require.Equal(t, before, mustRead(t, unit), "%s: nothing written", name)
	}
	logPath := filepath.Join(dir, "junk.jsonl")
	require.NoError(t, os.WriteFile(logPath, []byte("\x00\x01junk\n"+strings.Repeat("y", 3<<20)+"\n{}\n"), 0o600))
	r := crankside(t, "log", "show", "--log", logPath)
	require.Equal(t, 1, r.status)
	require.Contains(t, r.stderr, "line 1")
	require.Contains(t, r.stderr, "line 2: longer than")
	require.Contains(t, r.stdout, "No checks recorded")
}
