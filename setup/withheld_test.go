package setup_test

import (
	"encoding/json"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

// When no lung explains a check's readings, nothing that depends on the
// lung may be given as what the patient gets. The figures that do live in
// one struct, setup.LungFiguresJSON, nil as a whole then. Every other key
// of a check's output must have been placed, by a person, in one of the
// two lists below; a key added to CheckJSON (or to a struct it embeds)
// without that decision fails TestEveryCheckKeyIsDecidedForTheLung.

// lungFreeKeys are the check's keys that do not depend on the lung: the
// patient's entries, the setting and what the machine sets whatever the
// lung, the readings as read, the assumed lung as such (labelled by
// mechanics_source), the cautions (which leave out those that judge the
// assumed lung's figures: TestUnexplainedReadingsAreStops), the proposal
// (on the assumed lung, labelled so, with its differences' current values
// null), the blood gas and what it alone gives, the room and the gas path,
// what to time, and the reason the lung's figures are withheld.
var lungFreeKeys = []string{
	"profile_id", "calibration_date", "height_cm", "sex", "pbw_kg", "setting", "readings",
	"fit_problem", "mechanics_source", "figures_withheld", "cautions", "proposed",
	"hole", "swept_ml", "effective_swept_ml", "rate_bpm", "motor_rpm", "dwell_s", "ti_s", "te_s", "ie_ratio",
	"peep_cmh2o", "o2_flow_l_min", "cylinder_minutes", "cylinder_entered", "cylinder_minutes_to_empty",
	"cylinder_reserve_bar", "compliance_ml_per_cmh2o", "resistance_cmh2o_per_l_s", "btps_factor",
	"gas_readings", "protocol_step", "protocol_rule_status", "protocol_changes", "protocol_notes",
	"protocol_problem", "proposal_from", "pf_ratio", "sf_ratio", "ards_severity", "ards_severity_basis",
	"ards_severity_note", "ratio_fio2", "clinical_caution", "manometer_step_cmh2o", "fit_range_note",
	"gas", "timing_check", "inferred_from_stopwatch", "entries_converted",
}

// fitKeys depend on a lung that explains the readings (the fitted lung,
// its range, the volume bound, the watch band round its predictions) and
// stand outside the lung's struct because they are the fit's own: each is
// null or absent when no lung explains the readings.
var fitKeys = []string{
	"fitted_compliance_ml_per_cmh2o", "fitted_resistance_cmh2o_per_l_s", "fit_end_only",
	"fitted_resistance_at_least_cmh2o_per_l_s", "delivered_vt_is_upper_bound", "volume_note",
	"fitted_compliance_range", "fitted_resistance_range", "delivered_vt_range_ml",
	"patient_effort_note", "watch",
}

// recordKeys are a log record's own keys, before its check's.
var recordOwnKeys = []string{"format", "time", "bed", "initials", "second_initials"}

// jsonKey is one top-level key of a struct as encoding/json writes it,
// and whether it is reached through an embedded setup.LungFiguresJSON.
type jsonKey struct {
	name string
	lung bool
}

// topLevelKeys walks a struct type as encoding/json does: the fields of
// an embedded struct (or pointer to one) without a name of their own are
// the outer struct's keys.
func topLevelKeys(t reflect.Type, inLung bool) []jsonKey {
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	lungType := reflect.TypeOf(setup.LungFiguresJSON{})
	var out []jsonKey
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if name == "-" || (!f.IsExported() && !f.Anonymous) {
			continue
		}
		ft := f.Type
		for ft.Kind() == reflect.Pointer {
			ft = ft.Elem()
		}
		if f.Anonymous && name == "" && ft.Kind() == reflect.Struct {
			out = append(out, topLevelKeys(ft, inLung || ft == lungType)...)
			continue
		}
		if name == "" {
			name = f.Name
		}
		out = append(out, jsonKey{name, inLung})
	}
	return out
}

func setOf(keys ...[]string) map[string]bool {
	m := map[string]bool{}
	for _, ks := range keys {
		for _, k := range ks {
			m[k] = true
		}
	}
	return m
}

func TestEveryCheckKeyIsDecidedForTheLung(t *testing.T) {
	free, fit := setOf(lungFreeKeys), setOf(fitKeys)
	seen := map[string]bool{}
	lungKeys := 0
	for _, k := range topLevelKeys(reflect.TypeOf(setup.CheckJSON{}), false) {
		require.False(t, seen[k.name], "key %s is written twice", k.name)
		seen[k.name] = true
		if k.lung {
			lungKeys++
			require.False(t, free[k.name] || fit[k.name], "%s is in LungFiguresJSON and in a list outside it", k.name)
			continue
		}
		require.True(t, free[k.name] || fit[k.name],
			"CheckJSON key %q is new: if the lung decides it, put it in setup.LungFiguresJSON; "+
				"if it is the fit's, add it to fitKeys and make it null without a fit; if not, add it to lungFreeKeys", k.name)
		require.False(t, free[k.name] && fit[k.name], "%s is in both lists", k.name)
	}
	for k := range setOf(lungFreeKeys, fitKeys) {
		require.True(t, seen[k], "%s is listed but CheckJSON has no such key", k)
	}
	// The 19 figures issue 10 withheld by a list of keys, now a struct:
	// the volume, mL/kg, FiO2, minute ventilation, peak flow, the five
	// pressures, trapped volume, tau, torque and its share, and the gas
	// path's room volume, compression, leak, relief and pressure limit.
	require.Equal(t, 19, lungKeys, "the lung's figures (counted from DESIGN.md's key list and issue 10's withheld keys)")
}

// lungKeyNames are the JSON keys of setup.LungFiguresJSON, from its type.
func lungKeyNames() []string {
	var out []string
	for _, k := range topLevelKeys(reflect.TypeOf(setup.LungFiguresJSON{}), true) {
		out = append(out, k.name)
	}
	return out
}

// checkWalk asserts, of one encoded check object with no lung explaining
// its readings, that every key is decided, every lung figure and every
// fit key is null (or absent), and that the lung figures are all there,
// as null, where a script looks for them.
func checkWalk(t *testing.T, obj map[string]any, extra []string) {
	t.Helper()
	free, fit, lung, own := setOf(lungFreeKeys), setOf(fitKeys), setOf(lungKeyNames()), setOf(extra)
	keys := make([]string, 0, len(obj))
	for k := range obj {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		v := obj[k]
		switch {
		case lung[k]:
			require.Nil(t, v, "lung figure %s must be null when no lung explains the readings", k)
		case fit[k]:
			require.Nil(t, v, "%s is the fit's: null without a fit", k)
		case free[k], own[k]:
		default:
			t.Fatalf("key %q of the output is in no list (see TestEveryCheckKeyIsDecidedForTheLung)", k)
		}
	}
	for k := range lung {
		_, ok := obj[k]
		require.True(t, ok, "lung figure %s must stay present, as null", k)
	}
	require.Equal(t, setup.WithheldReason, obj["figures_withheld"])
}

func TestNoLungFigureEscapesTheWithheldStruct(t *testing.T) {
	ck := unexplainedCheck(t, true)
	j := ck.JSON()

	// The Go value: the lung's struct is nil as a whole, the reason beside
	// it, and every fit field at its zero value.
	require.Nil(t, j.LungFiguresJSON, "no lung explains the readings: the lung's figures are withheld")
	require.Equal(t, setup.WithheldReason, j.FiguresWithheld)
	v := reflect.ValueOf(j)
	fit := setOf(fitKeys)
	for i := 0; i < v.NumField(); i++ {
		f := v.Type().Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if fit[name] {
			require.True(t, v.Field(i).IsZero(), "Go field %s (%s) must be zero without a fit", f.Name, name)
		}
	}
	// The proposal keeps its lung (the assumed one, labelled so).
	require.NotNil(t, j.Proposed)
	require.NotNil(t, j.Proposed.LungFiguresJSON)

	// The check's JSON, as `check --json` prints it.
	b, err := setup.VersionedJSON(setup.FormatCheckJSON, j)
	require.NoError(t, err)
	var obj map[string]any
	require.NoError(t, json.Unmarshal(b, &obj))
	checkWalk(t, obj, []string{"format", "model_version", "program_version"})
	// A difference gives its current value only for what the machine sets
	// whatever the lung; a new difference is withheld until listed here.
	machineOnly := setOf([]string{"rate", "Ti", "Te", "I:E (E of 1:E)", "PEEP"})
	diffs := obj["proposed"].(map[string]any)["differences"].([]any)
	require.NotEmpty(t, diffs)
	for _, d := range diffs {
		d := d.(map[string]any)
		what := d["what"].(string)
		if machineOnly[what] {
			require.NotNil(t, d["current"], "difference %s does not depend on the lung", what)
			continue
		}
		require.Nil(t, d["current"], "difference %s: nothing is known of the current %s", what, what)
		require.Nil(t, d["change"], "difference %s: no change from an unknown", what)
	}

	// The same check kept as a log record, and read back.
	rec, err := setup.NewRecord(ck, "B4", "jk", today)
	require.NoError(t, err)
	b, err = json.Marshal(rec)
	require.NoError(t, err)
	obj = nil
	require.NoError(t, json.Unmarshal(b, &obj))
	checkWalk(t, obj, recordOwnKeys)

	path := filepath.Join(t.TempDir(), "log.jsonl")
	require.NoError(t, logbook.AppendRecord(path, rec))
	recs, problems, err := readLog(path)
	require.NoError(t, err)
	require.Empty(t, problems)
	require.Len(t, recs, 1)
	require.Nil(t, recs[0].LungFiguresJSON, "a record read back has no lung figures (its nulls are not zeros)")
	row := logbook.NewWardRow(recs[0], path, today.Add(time.Hour), 4*time.Hour)
	require.Nil(t, row.MLPerKg, "the ward gives no mL/kg for a bed whose readings no lung explains")
	require.Contains(t, report.WardLine(row), "readings unexplained")
	wb, err := json.Marshal(row)
	require.NoError(t, err)
	require.Contains(t, string(wb), `"ml_per_kg":null`)
}

func TestExplainedCheckGivesTheLungFigures(t *testing.T) {
	// Readings 17/14 fit a lung (the card golden's case): the lung's
	// figures are there, nothing is withheld.
	req := checkReq("8", 21, 1.4)
	req.Readings = &physiology.Readings{PeakCmH2O: 17, EndCmH2O: 14}
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	j := ck.JSON()
	require.NotNil(t, j.LungFiguresJSON)
	require.Empty(t, j.FiguresWithheld)
	b, err := json.Marshal(j)
	require.NoError(t, err)
	var obj map[string]any
	require.NoError(t, json.Unmarshal(b, &obj))
	for _, k := range lungKeyNames() {
		require.NotNil(t, obj[k], "lung figure %s is given when a lung explains the readings", k)
	}
	_, ok := obj["figures_withheld"]
	require.False(t, ok, "nothing withheld, no reason")
}
