package logbook

import (
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
)

// scanDay is the invented day of these logs.
var scanDay = time.Date(2026, 3, 2, 12, 0, 0, 0, time.UTC)

// scanBase is a real check of the demo unit, as a record.
func scanBase(t *testing.T) setup.Record {
	t.Helper()
	p, _, err := profiles.Open("demo-a", "")
	require.NoError(t, err)
	ck, err := setup.RunCheck(setup.CheckRequest{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: "8", RPM: 21, DwellS: 1.4, PEEPCmH2O: 5}, Now: scanDay}, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B1", "ab", scanDay)
	require.NoError(t, err)
	return rec
}

// lineMutations make a good record's line into a line of another kind:
// damaged ones (a rule broken, a key twice or in another case, a key
// escaped, junk) and good ones the header cannot read or reads in
// another way (an escaped bed value, keys reordered, a nested unknown
// "bed", a time with an offset or a fraction, a lower-case label).
var lineMutations = []struct {
	name    string
	damaged bool
	apply   func(line string) string
}{
	{"ml_per_kg tampered", true, func(l string) string { return strings.Replace(l, `"ml_per_kg":`, `"ml_per_kg":1`, 1) }},
	{"bed twice", true, func(l string) string { return l[:len(l)-1] + `,"bed":"B2"}` }},
	{"BED in another case", true, func(l string) string { return l[:len(l)-1] + `,"BED":"B2"}` }},
	{"time twice", true, func(l string) string { return l[:len(l)-1] + `,"time":"2026-03-02T23:00:00Z"}` }},
	{"bed key escaped", true, func(l string) string { return strings.Replace(l, `"bed":`, `"b\u0065d":`, 1) }},
	{"junk", true, func(l string) string { return `{"format":"crankside-check/1","time":` }},
	{"volume out of range", true, func(l string) string { return strings.Replace(l, `"delivered_vt_ml":`, `"delivered_vt_ml":9`, 1) }},
	{"bed value escaped", false, func(l string) string {
		i := strings.Index(l, `"bed":"`) + len(`"bed":"`)
		return l[:i] + `\u00` + fmt.Sprintf("%x", l[i]) + l[i+1:]
	}},
	{"keys reordered", false, func(l string) string {
		i := strings.Index(l, `,"bed":"`)
		j := strings.Index(l[i+1:], `,`) + i + 1
		bed := l[i+1 : j]
		l = l[:i] + l[j:]
		return strings.Replace(l, `{"format"`, `{`+bed+`,"format"`, 1)
	}},
	{"nested bed", false, func(l string) string { return l[:len(l)-1] + `,"extra":{"bed":"B3","time":"x"}}` }},
	{"time with offset", false, func(l string) string {
		i := strings.Index(l, `"time":"`) + len(`"time":"`)
		t, _ := time.Parse(time.RFC3339, l[i:i+20])
		return l[:i] + t.In(time.FixedZone("", 3600)).Format(time.RFC3339) + l[i+20:]
	}},
	{"time with a fraction", false, func(l string) string {
		i := strings.Index(l, `"time":"`) + len(`"time":"`) + 19
		return l[:i] + ".000" + l[i:]
	}},
	{"lower-case label", false, func(l string) string { return strings.Replace(l, `"bed":"B`, `"bed":"b`, 1) }},
}

// genScanLogs writes logs of random lines of four beds: checks an hour or
// minutes apart (conflicts across logs), copies across logs, records from
// the future, and every kind of line in lineMutations.
func genScanLogs(t *testing.T, rng *rand.Rand, dir string, base setup.Record) []string {
	var paths []string
	var made []string
	for li := range 1 + rng.IntN(3) {
		var lines []string
		for range 3 + rng.IntN(25) {
			if len(made) > 0 && rng.IntN(8) == 0 {
				lines = append(lines, made[rng.IntN(len(made))]) // a copy
				continue
			}
			rec := base
			rec.Bed = fmt.Sprintf("B%d", 1+rng.IntN(4))
			rec.Time = scanDay.Add(-time.Duration(rng.IntN(8*60)) * time.Minute)
			if rng.IntN(4) == 0 { // one of three instants: ties, copies and conflicts
				rec.Time = scanDay.Add(-time.Duration(rng.IntN(3)*4) * time.Minute)
			}
			if rng.IntN(10) == 0 {
				rec.Time = time.Date(2099, 1, 1+rng.IntN(3), 0, 0, 0, 0, time.UTC)
			}
			rec.Setting.RPM = float64(15 + rng.IntN(10))
			switch rng.IntN(3) {
			case 0:
				rec.Cautions = nil
			case 1:
				rec.Cautions = []setup.Caution{{ID: "test-stop", Level: setup.Stop, Message: "invented"}}
			}
			b, err := json.Marshal(rec)
			require.NoError(t, err)
			line := string(b)
			if rng.IntN(3) == 0 {
				line = lineMutations[rng.IntN(len(lineMutations))].apply(line)
			}
			made = append(made, line)
			lines = append(lines, line)
		}
		path := filepath.Join(dir, fmt.Sprintf("t%d.jsonl", li))
		require.NoError(t, os.WriteFile(path, []byte(strings.Join(lines, "\n")+"\n"), 0o600))
		paths = append(paths, path)
	}
	return paths
}

// rowText is what a person and a script see of a row.
func rowText(rows []WardRow) []string {
	var out []string
	for _, r := range rows {
		out = append(out, fmt.Sprintf("%s at %s from %s: %s %g rpm level %v proposed %v overdue %v; %s; future %s %s",
			r.Bed, r.CheckedAt, r.Source, r.Hole, r.MotorRPM, r.HighestLevel, r.Proposed, r.Overdue, r.Conflict, r.FutureAt, r.FutureLog))
	}
	sort.Strings(out)
	return out
}

// wardOracle is the ward as its rules say, with nothing held back: every
// line decoded and held to the writer's rules, a record found twice counted
// once at its first line in the log whose path sorts first, each bed's
// good records newest first and its newest record from the future.
func wardOracle(t *testing.T, paths []string, now time.Time) []WardRow {
	type place struct {
		item wardItem
	}
	var all []*place
	byKey := map[[32]byte]*place{}
	for _, path := range paths {
		data, err := os.ReadFile(path)
		require.NoError(t, err)
		for i, line := range strings.Split(strings.TrimSuffix(string(data), "\n"), "\n") {
			rec, problem := decodeRecord([]byte(line))
			if problem != "" {
				continue
			}
			key := recordKey(&rec, []byte(line))
			if p, ok := byKey[key]; ok {
				if path < p.item.log || path == p.item.log && i+1 < p.item.line {
					p.item.log, p.item.line = path, i+1
				}
				continue
			}
			p := &place{wardItem{rec: rec, log: path, line: i + 1, key: key}}
			byKey[key] = p
			all = append(all, p)
		}
	}
	beds := map[string][]wardItem{}
	for _, p := range all {
		b := setup.BedKey(p.item.rec.Bed)
		beds[b] = append(beds[b], p.item)
	}
	var rows []WardRow
	for _, items := range beds {
		sort.Slice(items, func(i, j int) bool {
			a, b := items[j], items[i]
			return orderBefore(a.rec.Time, a.log, a.line, b.rec.Time, b.log, b.line)
		})
		var good []wardItem
		var fut *wardItem
		for i, it := range items {
			if it.rec.Time.After(now.Add(FutureSkew)) {
				if fut == nil {
					fut = &items[i]
				}
				continue
			}
			good = append(good, it)
		}
		rows = append(rows, wardRowOf(good, fut, now, setup.DefaultCheckEvery))
	}
	return rows
}

// The ward's quick read gives, whenever it answers (exact), the rows that
// decoding and validating every line gives: on random logs with damaged
// lines of every kind, copies, conflicts and records from the future.
// Both are compared with wardOracle, which holds every line to the
// writer's rules and keeps every record.
func TestWardScanAgreesWithDecodingEveryLine(t *testing.T) {
	base := scanBase(t)
	for _, m := range lineMutations {
		b, err := json.Marshal(base)
		require.NoError(t, err)
		_, problem := decodeRecord([]byte(m.apply(string(b))))
		require.Equal(t, m.damaged, problem != "", "%s: %s", m.name, problem)
	}
	rng := rand.New(rand.NewPCG(22, 3))
	exactRuns := 0
	const runs = 150
	for run := range runs {
		dir := t.TempDir()
		paths := genScanLogs(t, rng, dir, base)
		now := scanDay
		fast, fastSum, exact, err := wardRowsScan(paths, now, setup.DefaultCheckEvery, nil)
		require.NoError(t, err)
		slow, slowSum, err := wardRowsDecodingAll(paths, now, setup.DefaultCheckEvery, nil)
		require.NoError(t, err)
		want := rowText(wardOracle(t, paths, now))
		require.Equal(t, want, rowText(slow), "run %d: every line decoded", run)
		if !exact {
			continue
		}
		exactRuns++
		require.Equal(t, want, rowText(fast), "run %d", run)
		require.LessOrEqual(t, fastSum.Damaged, slowSum.Damaged, "run %d: the quick read counts the damaged lines it decodes, no more", run)
	}
	// The quick read answers most reads itself (derived: a few hundred
	// lines of four beds, a third mutated: most beds' newest lines are
	// good): at least half of them, or this test would test little.
	require.Greater(t, exactRuns, runs/2, "exact quick reads")
}
