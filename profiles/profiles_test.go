package profiles

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func demo(t *testing.T, id string) Profile {
	t.Helper()
	p, src, err := Open(id, "")
	require.NoError(t, err)
	require.True(t, src.Embedded)
	return p
}

func TestDemoAGeometry(t *testing.T) {
	// The invented demo unit A as specified for this program (no published
	// source: demo data are invented): bore 10.0 cm, rod 22 cm, in-line, 25 holes "1".."25"
	// at 1.4 to 6.2 cm in 0.2 cm steps; variable 8-40 rpm in 0.5 steps rated
	// 12 N m; dwell 0.1 s up to 10 s; circuit 1.5, valve 3, relief 40; ring 12 N;
	// no calibration points.
	p := demo(t, "demo-a")
	require.Equal(t, 10.0, p.Cylinder.BoreCm)
	require.Equal(t, 12.0, p.Cylinder.RingFrictionN)
	require.Equal(t, 22.0, p.Crank.RodCm)
	require.Equal(t, 0.0, p.Crank.OffsetCm)
	require.Len(t, p.Crank.Holes, 25)
	for i, h := range p.Crank.Holes {
		require.Equal(t, fmt.Sprint(i+1), h.Label)
		require.InDelta(t, 1.4+0.2*float64(i), h.RadiusCm, 1e-12)
	}
	require.Equal(t, Motor{Kind: MotorVariable, MinRPM: 8, MaxRPM: 40, RPMStep: 0.5, RatedTorqueNm: 12}, p.Motor)
	require.Equal(t, Controller{DwellStepS: 0.1, MaxDwellS: 10}, p.Controller)
	require.Equal(t, Circuit{ComplianceMLPerCmH2O: 1.5, ExpiratoryResistanceCmH2OPerLS: 3, ReliefCmH2O: 40, LeakLMinAt20CmH2O: 0}, p.Circuit)
	require.True(t, p.Calibration == nil || len(p.Calibration.Points) == 0)
	// Version 2 fields (DESIGN.md demo data): clearance 1.0 cm, leak 0.
	require.Equal(t, 1.0, p.Cylinder.ClearanceCm)
	require.Equal(t, FormatV3, p.Format)
	require.Equal(t, 15.0, p.Oxygen.MaxFlowLMin, "the demo's flowmeter (invented; 15 L/min is common practice)")
	require.Empty(t, p.Defaults)
}

func TestDemoBGeometry(t *testing.T) {
	// The invented demo unit B (no published source): bore 9.0, rod 25, in-line, 10 holes "A".."H", "J",
	// "K" (no "I") at 2.0 to 6.5 cm in 0.5 steps; fixed 20 rpm rated 8 N m;
	// dwell 0.1 up to 10 s; circuit 2.0, valve 4, relief 45; ring 15 N; four
	// bench points; version 2: clearance 1.5 cm, leak 0.
	p := demo(t, "demo-b")
	require.Equal(t, 9.0, p.Cylinder.BoreCm)
	require.Equal(t, 15.0, p.Cylinder.RingFrictionN)
	require.Equal(t, 25.0, p.Crank.RodCm)
	require.Equal(t, 0.0, p.Crank.OffsetCm)
	require.Len(t, p.Crank.Holes, 10)
	labels := []string{"A", "B", "C", "D", "E", "F", "G", "H", "J", "K"}
	for i, h := range p.Crank.Holes {
		require.Equal(t, labels[i], h.Label)
		require.InDelta(t, 2.0+0.5*float64(i), h.RadiusCm, 1e-12)
	}
	require.Equal(t, 1.5, p.Cylinder.ClearanceCm)
	require.Equal(t, FormatV3, p.Format)
	require.Equal(t, 15.0, p.Oxygen.MaxFlowLMin, "the demo's flowmeter (invented; 15 L/min is common practice)")
	require.Empty(t, p.Defaults, "the demo writes every field out")
	require.Equal(t, Motor{Kind: MotorFixed, RPM: 20, RatedTorqueNm: 8}, p.Motor)
	require.Equal(t, Controller{DwellStepS: 0.1, MaxDwellS: 10}, p.Controller)
	require.Equal(t, Circuit{ComplianceMLPerCmH2O: 2.0, ExpiratoryResistanceCmH2OPerLS: 4, ReliefCmH2O: 45, LeakLMinAt20CmH2O: 0}, p.Circuit)
	require.NotNil(t, p.Calibration)
	require.Len(t, p.Calibration.Points, 4)
}

func demoJSON(t *testing.T) map[string]any {
	t.Helper()
	data, err := Marshal(demo(t, "demo-b"))
	require.NoError(t, err)
	var m map[string]any
	require.NoError(t, json.Unmarshal(data, &m))
	return m
}

func mustJSON(t *testing.T, m map[string]any) []byte {
	data, err := json.Marshal(m)
	require.NoError(t, err)
	return data
}

func obj(m map[string]any, k string) map[string]any { return m[k].(map[string]any) }

func TestRefusals(t *testing.T) {
	// One case per refusal class of the v1 format (profiles/doc.go); each
	// message names the field.
	cases := []struct {
		name  string
		edit  func(m map[string]any)
		field string
	}{
		{"unknown top field", func(m map[string]any) { m["colour"] = "red" }, "colour"},
		{"unknown nested field", func(m map[string]any) { obj(m, "cylinder")["stroke_cm"] = 3 }, "cylinder.stroke_cm"},
		{"missing required", func(m map[string]any) { delete(obj(m, "circuit"), "relief_cmh2o") }, "circuit.relief_cmh2o"},
		{"missing hole radius", func(m map[string]any) {
			delete(obj(m, "crank")["holes"].([]any)[2].(map[string]any), "radius_cm")
		}, "crank.holes[2].radius_cm"},
		{"non-positive bore", func(m map[string]any) { obj(m, "cylinder")["bore_cm"] = 0 }, "cylinder.bore_cm"},
		{"negative radius", func(m map[string]any) {
			obj(m, "crank")["holes"].([]any)[1].(map[string]any)["radius_cm"] = -1
		}, "crank.holes[1].radius_cm"},
		{"duplicate hole label", func(m map[string]any) {
			obj(m, "crank")["holes"].([]any)[3].(map[string]any)["label"] = "A"
		}, "crank.holes[3].label"},
		{"rod not longer than radius plus offset", func(m map[string]any) { obj(m, "crank")["rod_cm"] = 6.5 }, "crank.rod_cm"},
		{"rod short with offset", func(m map[string]any) { obj(m, "crank")["rod_cm"] = 7.0; obj(m, "crank")["offset_cm"] = 0.6 }, "crank.rod_cm"},
		{"min above max", func(m map[string]any) {
			m["motor"] = map[string]any{"kind": "variable", "min_rpm": 30, "max_rpm": 20, "rpm_step": 0.5, "rated_torque_nm": 8}
		}, "motor.min_rpm"},
		{"field of the other motor kind", func(m map[string]any) { obj(m, "motor")["min_rpm"] = 10 }, "motor.min_rpm"},
		{"unknown motor kind", func(m map[string]any) { obj(m, "motor")["kind"] = "stepper" }, "motor.kind"},
		{"wrong type", func(m map[string]any) { obj(m, "controller")["dwell_step_s"] = "0.1" }, "controller.dwell_step_s"},
		{"bad format", func(m map[string]any) { m["format"] = "crankside-profile/9" }, "format"},
		{"bad calibration date", func(m map[string]any) { obj(m, "calibration")["date"] = "24/11/2026" }, "calibration.date"},
		{"calibration names no hole", func(m map[string]any) {
			obj(m, "calibration")["points"].([]any)[0].(map[string]any)["hole"] = "Z"
		}, "calibration.points[0].hole"},
		{"bad id", func(m map[string]any) { m["id"] = "Demo B!" }, "id"},
		{"bench speed the motor cannot run", func(m map[string]any) {
			obj(m, "calibration")["points"].([]any)[1].(map[string]any)["rpm"] = 30
		}, "calibration.points[1].rpm"},
		{"too many holes", func(m map[string]any) {
			var hs []any
			for i := 0; i < MaxHoles+1; i++ {
				hs = append(hs, map[string]any{"label": fmt.Sprint(i), "radius_cm": 2})
			}
			obj(m, "crank")["holes"] = hs
			delete(m, "calibration")
		}, "crank.holes"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := demoJSON(t)
			c.edit(m)
			_, err := Parse(mustJSON(t, m), "test.json")
			require.Error(t, err)
			require.ErrorIs(t, err, ErrProfile)
			require.Contains(t, err.Error(), c.field, "message must name the field")
		})
	}
}

func TestRefusalsOfTheRawText(t *testing.T) {
	good, err := Marshal(demo(t, "demo-a"))
	require.NoError(t, err)
	s := string(good)
	cases := []struct {
		name, text, want string
	}{
		{"duplicate key", strings.Replace(s, `"id": "demo-a",`, `"id": "demo-a", "id": "demo-c",`, 1), "id: appears twice"},
		{"syntax error with line and column", strings.Replace(s, `"label": "1"`, `"label": "1",,`, 1), "line 15, column 22"}, // derived: the first hole label is line 15 of the marshalled file (3 cylinder fields, then crank),
		{"ends early", s[:len(s)/2], "ends early"},
		{"trailing data", s + "{}", "extra data"},
		{"deep nesting", strings.Repeat("[", 100) + strings.Repeat("]", 100), "nested deeper"},
		{"NaN as text", strings.Replace(s, `"bore_cm": 10`, `"bore_cm": NaN`, 1), "syntax error"},
		{"huge number", strings.Replace(s, `"bore_cm": 10`, `"bore_cm": 1e308`, 1), "cylinder.bore_cm"},
		{"too large", `{"id":"` + strings.Repeat("x", MaxFileBytes) + `"}`, "at most"},
		{"not an object", `[1,2]`, "profile"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse([]byte(c.text), "t.json")
			require.Error(t, err)
			require.Contains(t, err.Error(), c.want)
		})
	}
}

func TestMinusZeroOffsetIsInLine(t *testing.T) {
	good, err := Marshal(demo(t, "demo-a"))
	require.NoError(t, err)
	p, err := Parse([]byte(strings.Replace(string(good), `"offset_cm": 0`, `"offset_cm": -0`, 1)), "t.json")
	require.NoError(t, err)
	require.Equal(t, 0.0, math.Abs(p.Crank.OffsetCm))
}

func TestSaveThenLoadIsIdentical(t *testing.T) {
	dir := t.TempDir()
	for _, id := range []string{"demo-a", "demo-b"} {
		p := demo(t, id)
		path := filepath.Join(dir, id+".json")
		require.NoError(t, Save(path, p))
		got, err := ReadFile(path)
		require.NoError(t, err)
		require.Equal(t, p, got)
	}
	// An invalid profile is not saved and the old file is kept.
	p := demo(t, "demo-a")
	p.Cylinder.BoreCm = -1
	path := filepath.Join(dir, "demo-a.json")
	before, _ := os.ReadFile(path)
	require.Error(t, Save(path, p))
	after, _ := os.ReadFile(path)
	require.Equal(t, before, after)
}

func TestListShowsBadFilesAndDuplicates(t *testing.T) {
	dir := t.TempDir()
	good := demo(t, "demo-a")
	good.ID, good.Label = "ward-3", "Ward 3 unit"
	require.NoError(t, Save(filepath.Join(dir, "ward-3.json"), good))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "broken.json"), []byte(`{"format":`), 0o644))
	dup := demo(t, "demo-a") // same id as the embedded demo
	require.NoError(t, Save(filepath.Join(dir, "copy.json"), dup))
	entries, err := List(dir)
	require.NoError(t, err)
	byID := map[string][]Entry{}
	for _, e := range entries {
		byID[e.ID] = append(byID[e.ID], e)
	}
	require.Len(t, byID["ward-3"], 1)
	require.NoError(t, byID["ward-3"][0].Err, "a bad file must not hide a good one")
	require.Len(t, byID["broken"], 1)
	require.Error(t, byID["broken"][0].Err)
	require.Len(t, byID["demo-a"], 2)
	for _, e := range byID["demo-a"] {
		if e.Source.Embedded {
			require.NoError(t, e.Err, "the built-in keeps its id")
			continue
		}
		require.ErrorContains(t, e.Err, "built-in demo's")
	}
	// Two files with one id both carry an error.
	require.NoError(t, Save(filepath.Join(dir, "ward-3-copy.json"), good))
	entries, err = List(dir)
	require.NoError(t, err)
	n := 0
	for _, e := range entries {
		if e.ID == "ward-3" {
			n++
			require.ErrorContains(t, e.Err, "also used by")
		}
	}
	require.Equal(t, 2, n)
	require.NoError(t, os.Remove(filepath.Join(dir, "ward-3-copy.json")))
	require.NoError(t, byID["demo-b"][0].Err)
	// Open by id finds the directory's profile; by path the file itself.
	p, src, err := Open("ward-3", dir)
	require.NoError(t, err)
	require.Equal(t, "Ward 3 unit", p.Label)
	require.False(t, src.Embedded)
	_, _, err = Open(filepath.Join(dir, "broken.json"), "")
	require.ErrorIs(t, err, ErrProfile)
	_, _, err = Open("nope", dir)
	require.ErrorIs(t, err, ErrNotFound)
	require.ErrorContains(t, err, "demo-b")
}

func TestCrashBeforeRenameLeavesTheOldProfile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "unit.json")
	old := demo(t, "demo-a")
	old.ID = "unit-x"
	require.NoError(t, Save(path, old))
	before, err := os.ReadFile(path)
	require.NoError(t, err)
	changed := old
	changed.Label = "changed"
	data, err := Marshal(changed)
	require.NoError(t, err)
	// Stop where a crash would: the temporary file is written and synced,
	// the rename has not happened.
	crash := fmt.Errorf("simulated crash")
	err = writeAtomic(path, data, 0o644, func(tmp string) error {
		got, err := os.ReadFile(tmp)
		require.NoError(t, err)
		require.Equal(t, data, got, "the new contents are complete on disk before the rename")
		return crash
	})
	require.ErrorIs(t, err, crash)
	after, err := os.ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, before, after)
	p, err := ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, old, p)
	// The leftover temporary file is not mistaken for a profile.
	entries, err := List(dir)
	require.NoError(t, err)
	require.Len(t, entries, 3, "two embedded demos and unit.json")
	for _, e := range entries {
		require.NoError(t, e.Err, "%s", e.Source)
	}
}

func TestSaveWithBackupKeepsTheOldFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "unit.json")
	old := demo(t, "demo-b")
	require.NoError(t, Save(path, old))
	next := old
	next.Calibration = &Calibration{Date: "2026-12-01", Points: old.Calibration.Points[:2]}
	require.NoError(t, SaveWithBackup(path, next))
	bak, err := ReadFile(path + ".bak")
	require.NoError(t, err)
	require.Equal(t, old, bak)
	got, err := ReadFile(path)
	require.NoError(t, err)
	require.Equal(t, next, got)
}

func TestReadBenchReportsEveryBadLine(t *testing.T) {
	p := demo(t, "demo-a")
	text := BenchHeader() + "\n" +
		"5,50,5,20,318\n" +
		"99,50,5,20,408\n" + // unknown hole
		"12,50,abc,20,528\n" + // text for a number
		"16,50,5,20,0\n" + // zero volume
		"\n" +
		"7,50,5\n" + // missing columns
		"8,50,5,20,-4\n" + // negative volume
		"9,50,5,55,400\n" // a speed the motor cannot run
	_, err := ReadBench(strings.NewReader(text), "bench.csv", p)
	var be *BenchError
	require.ErrorAs(t, err, &be)
	var lines []int
	for _, pr := range be.Problems {
		lines = append(lines, pr.Line)
	}
	require.Equal(t, []int{3, 4, 5, 7, 8, 9}, lines)
	require.Contains(t, be.Problems[5].Reason, "outside this motor's 8-40 rpm")
	require.Contains(t, be.Problems[0].Reason, `"99"`)
	require.Contains(t, be.Problems[1].Reason, "not a number")
	require.Contains(t, be.Problems[3].Reason, "columns")
	// A missing column in the header.
	_, err = ReadBench(strings.NewReader("hole,rpm,measured_ml\n5,20,300\n"), "b.csv", p)
	require.ErrorContains(t, err, "line 1")
	// A good file.
	pts, err := ReadBench(strings.NewReader(BenchHeader()+"\n5,50,5,20,318\n8, 50, 5, 20, 408\n"), "b.csv", p)
	require.NoError(t, err)
	require.Len(t, pts, 2)
	require.Equal(t, "8", pts[1].Hole)
}

// Issue rule: a header separated by semicolons (a spreadsheet's CSV where
// the comma is the decimal mark) is read with semicolons, line numbers and
// all; a comma-separated file is still read with commas.
func TestReadBenchSemicolonSeparated(t *testing.T) {
	p := demo(t, "demo-a")
	semi := strings.ReplaceAll(BenchHeader(), ",", ";")
	pts, err := ReadBench(strings.NewReader("\ufeff"+semi+"\r\n5;50;5;20;318\r\n8; 50; 5; 20; 408.5\r\n"), "b.csv", p)
	require.NoError(t, err)
	require.Equal(t, []float64{318, 408.5}, []float64{pts[0].MeasuredML, pts[1].MeasuredML})
	// A bad row of a semicolon file is named by its line.
	_, err = ReadBench(strings.NewReader(semi+"\n5;50;5;20;318\n8;50;x;20;408\n"), "b.csv", p)
	require.ErrorContains(t, err, "line 3")
	// The parser given reads each number cell.
	comma := func(s string) (float64, error) { return strconv.ParseFloat(strings.Replace(s, ",", ".", 1), 64) }
	pts, err = ReadBenchNumbers(strings.NewReader(semi+"\n5;50;5;20;318,5\n"), "b.csv", p, comma)
	require.NoError(t, err)
	require.Equal(t, 318.5, pts[0].MeasuredML)
}
