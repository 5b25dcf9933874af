package main

import (
	"encoding/json"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestPlanJSONHasTheVersion2Keys(t *testing.T) {
	r := crankside(t, "plan", "--height-cm", "170", "--sex", "female", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	// DESIGN version 2: the keys the version 2 breath adds.
	for _, k := range []string{"btps_factor", "delivered_vt_room_ml", "compression_loss_ml", "relief_vented_ml",
		"leaked_ml", "pressure_limited", "room", "clearance_cm", "clearance_defaulted", "leak_l_min_at_20_cmh2o", "relief_cmh2o"} {
		require.Contains(t, obj, k)
	}
	// 22 C, 50 %, 760 mmHg -> 1.105 (REFERENCES, derived).
	require.InDelta(t, 1.105, obj["btps_factor"], 0.0005)
	// Property: delivered_vt_ml is F x delivered_vt_room_ml (to the JSON's rounding).
	require.InDelta(t, obj["delivered_vt_ml"].(float64), obj["btps_factor"].(float64)*obj["delivered_vt_room_ml"].(float64), 0.1)
	require.Greater(t, obj["compression_loss_ml"], 0.0)
	room := obj["room"].(map[string]any)
	require.Contains(t, room["temperature_c"].(map[string]any)["source"], "common practice")

	r = crankside(t, "plan", "--height-cm", "170", "--sex", "female", "--room-c", "37", "--room-rh", "100", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	// 37 C saturated -> 1.000 (REFERENCES, derived).
	require.InDelta(t, 1.000, obj["btps_factor"], 0.0005)
	require.Equal(t, "entered", obj["room"].(map[string]any)["temperature_c"].(map[string]any)["source"])

	r = crankside(t, "plan", "--height-cm", "170", "--sex", "female", "--room-c", "70")
	require.NotEqual(t, 0, r.status)
	require.Contains(t, r.stderr, "room-c")
}

func TestCheckJSONHasTheFitRanges(t *testing.T) {
	r := crankside(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4",
		"--peak", "17", "--end-pressure", "14", "--manometer-step", "0.5", "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj))
	// DESIGN version 2: each range is [low, high] around the fitted value.
	for _, k := range []string{"fitted_compliance_range", "fitted_resistance_range", "delivered_vt_range_ml"} {
		v, ok := obj[k].([]any)
		require.True(t, ok, "%s: %v", k, obj[k])
		require.Len(t, v, 2)
		require.LessOrEqual(t, v[0].(float64), v[1].(float64), k)
	}
	c := obj["fitted_compliance_ml_per_cmh2o"].(float64)
	cr := obj["fitted_compliance_range"].([]any)
	require.Less(t, cr[0].(float64), c)
	require.Greater(t, cr[1].(float64), c)
	require.InDelta(t, 0.5, obj["manometer_step_cmh2o"], 0)
	require.Contains(t, obj["patient_effort_note"], "passive")
}
