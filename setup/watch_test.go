package setup_test

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

// TestWatchBandContainsThePrediction: over patients, lungs and both demo
// machines, the band holds the model's own peak and end pressures, and the
// alarm limits obey the relief valve and 40 cmH2O (RMVS001 2020) and stay
// above PEEP (common practice). A property of the band, not a value.
func TestWatchBandContainsThePrediction(t *testing.T) {
	for _, id := range []string{"demo-a", "demo-b"} {
		p := profile(t, id)
		for _, h := range []float64{155, 175, 195} {
			for _, lung := range []physiology.Lung{physiology.Normal, physiology.ARDS, physiology.Obstructive} {
				pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: h, Sex: physiology.Male}, Targets: setup.Targets{Lung: lung}, Now: today}, p)
				require.NoError(t, err)
				w := pl.Watch
				require.LessOrEqual(t, w.PeakBand[0], pl.PeakCmH2O, "%s %v %v", id, h, lung)
				require.GreaterOrEqual(t, w.PeakBand[1], pl.PeakCmH2O, "%s %v %v", id, h, lung)
				require.LessOrEqual(t, w.EndBand[0], pl.EndInspCmH2O, "%s %v %v", id, h, lung)
				require.GreaterOrEqual(t, w.EndBand[1], pl.EndInspCmH2O, "%s %v %v", id, h, lung)
				require.LessOrEqual(t, w.AlarmHighCmH2O, 40.0, "RMVS001 2020")
				require.LessOrEqual(t, w.AlarmHighCmH2O, p.Circuit.ReliefCmH2O, "never above the relief valve")
				require.Greater(t, w.AlarmLowCmH2O, pl.PEEPCmH2O, "above PEEP")
				require.Less(t, w.AlarmLowCmH2O, w.AlarmHighCmH2O)
			}
		}
	}
}

// TestWatchOnACheck: with readings a lung explains, the band holds the
// readings (the fit reproduces them) within one manometer step; with
// readings no lung explains there is no band at all.
func TestWatchOnACheck(t *testing.T) {
	req := checkReq("8", 21, 1.4)
	req.Readings = &physiology.Readings{PeakCmH2O: 20, EndCmH2O: 15}
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.NotNil(t, ck.Fitted)
	require.NotNil(t, ck.Watch)
	// derived: the readings +/- 1 cmH2O (default step 1): [19, 21] and [14, 16].
	require.InDeltaSlice(t, []float64{19, 21}, ck.Watch.PeakBand[:], 1e-9)
	require.InDeltaSlice(t, []float64{14, 16}, ck.Watch.EndBand[:], 1e-9)
	// derived: 20 + 10 = 30 (common practice); low min(20 - 5, 19 - 1) = 15.
	require.Equal(t, 30.0, ck.Watch.AlarmHighCmH2O)
	require.Equal(t, 15.0, ck.Watch.AlarmLowCmH2O)

	req.Readings = &physiology.Readings{PeakCmH2O: 15, EndCmH2O: 5}
	ck, err = setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.True(t, ck.Unexplained())
	require.Nil(t, ck.Watch, "no band on readings no lung explains")
	var b bytes.Buffer
	require.NoError(t, report.CheckText(&b, ck))
	require.Contains(t, b.String(), "no band and no alarm limits are given")
	require.NotContains(t, b.String(), "Alarm HIGH")
	require.Contains(t, b.String(), "TO CONFIRM BY STOPWATCH  one turn 2.86 s, then a pause of 1.40 s")
}

// TestWatchJSONKeys: the plan's and the check's JSON carry the watch and
// timing_check objects with the keys issue 23 names.
func TestWatchJSONKeys(t *testing.T) {
	pl := plan(t, "demo-a", setup.Patient{HeightCm: 175, Sex: physiology.Male}, setup.Targets{})
	b, err := json.Marshal(pl.JSON())
	require.NoError(t, err)
	var obj map[string]any
	require.NoError(t, json.Unmarshal(b, &obj))
	w := obj["watch"].(map[string]any)
	for _, k := range []string{"expected_peak_cmh2o", "expected_end_cmh2o", "alarm_high_cmh2o", "alarm_low_cmh2o", "hand_turn", "bag_rate_bpm"} {
		require.Contains(t, w, k)
	}
	require.Contains(t, w["hand_turn"], "turn_s")
	require.Contains(t, w["hand_turn"], "pause_s")
	require.Contains(t, w["hand_turn"], "breaths_per_min")
	tc := obj["timing_check"].(map[string]any)
	// derived: 21 rpm -> 60/21 = 2.8571 s; 1.4 s; 60/4.2571 = 14.094 /min; 42.571 s.
	require.InDelta(t, 2.8571, tc["turn_s"], 1e-4)
	require.InDelta(t, 1.4, tc["pause_s"], 1e-9)
	require.InDelta(t, 14.094, tc["breaths_in_60_s"], 1e-3)
	require.InDelta(t, 42.571, tc["seconds_for_10_breaths"], 1e-3)
	require.Len(t, obj["checklist"], 5)

	ck, err := setup.RunCheck(checkReq("8", 21, 1.4), profile(t, "demo-a"))
	require.NoError(t, err)
	b, err = json.Marshal(ck.JSON())
	require.NoError(t, err)
	require.Contains(t, string(b), `"timing_check":{"turn_s":2.8571,"pause_s":1.4`)
	require.Contains(t, string(b), `"watch":{"expected_peak_cmh2o":[`)
}

// TestStopPlanGivesNoAlarmLimits: a plan with a stop shows no band and no
// alarm limits in its text, and its checklist says none are given.
func TestStopPlanGivesNoAlarmLimits(t *testing.T) {
	pl := plan(t, "demo-a", setup.Patient{HeightCm: 175, Sex: physiology.Male}, setup.Targets{ComplianceMLPerCmH2O: 12})
	// derived: about 420 mL into 12 mL/cmH2O is a plateau near 5 + 35 = 40: a stop (RMVS001 2020, 35).
	require.NotNil(t, setup.FirstStop(pl.Cautions), "a plateau far above 35 is a stop")
	var b bytes.Buffer
	require.NoError(t, report.PlanText(&b, pl))
	out := b.String()
	require.NotContains(t, out, "Alarm HIGH")
	require.Contains(t, out, "no band and no alarm limits are given")
	require.Contains(t, out, "limits to be set once a usable setting is found")
	j := pl.JSON()
	require.True(t, strings.Contains(j.Checklist[0].Text, "none given"))
}

// TestChecklistSources: each item has its id and source; the alarm item
// carries the limits (RMVS001 2020 for the alarms).
func TestChecklistSources(t *testing.T) {
	w := &setup.WatchJSON{AlarmHighCmH2O: 24, AlarmLowCmH2O: 10}
	items := setup.Checklist(w)
	ids := []string{}
	for _, it := range items {
		require.NotEmpty(t, it.Source, it.ID)
		ids = append(ids, it.ID)
	}
	require.Equal(t, []string{"external-alarm", "bag-at-bed", "humidification", "oxygen-away-from-motor", "passive-patient"}, ids)
	require.Contains(t, items[0].Text, "HIGH 24 cmH2O, LOW/disconnection 10 cmH2O")
	require.Contains(t, items[0].Source, "RMVS001 2020")
}
