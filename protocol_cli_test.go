package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// Three handovers from the command line, each checked against the ARDS
// Network protocol card's numbers and a derivation written out here, not
// against the program's own arithmetic.
//
// Common to all on demo-a (invented; in-line crank, bore 10 cm, 0.5 rpm and
// 0.1 s steps, motor 8-40 rpm), a 175 cm man:
//   - PBW 50 + 0.91 x (175 - 152.4) = 70.57 kg (ARDSNet 2000);
//   - hole 9 (radius 3.0 cm) sweeps pi x 5^2 x 6.0 = 471 mL: at most 6.7
//     mL/kg PBW; the plateau rule leaving Vt alone means Vt >= 5.95 mL/kg,
//     420 mL (derived);
//   - 21 rpm with a 1.4 s dwell: breath 60/21 + 1.4 = 4.257 s, 14.09 /min;
//     the delivery is half a turn, Ti = 30 / rpm (derived);
//   - so the minute ventilation is between 0.420 x 14.09 = 5.92 and 0.471 x
//     14.09 = 6.64 L/min (derived).
//
// The O2 bleed gives FiO2 = 0.21 + 0.79 x Q / MV (REFERENCES), and the step
// sets Q on a flowmeter's 0.1 L/min, rounded up.

// handover is a check of hole 9 at 188 cm: PBW 50 + 0.91 x 35.6 = 82.4 kg
// (ARDS Network 2000), at which hole 9's breath is 6.0 mL/kg PBW, so the
// card's step towards 6 does not fire and each test sees its own rule.
func handover(more ...string) []string {
	return append([]string{"check", "--height-cm", "188", "--sex", "male", "--hole", "9", "--rpm", "21", "--dwell-s", "1.4"}, more...)
}

func checkJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	r := crankside(t, append(args, "--json")...)
	var obj map[string]any
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &obj), r.stdout)
	require.Equal(t, stopStatus(obj), r.status, r.stderr)
	return obj
}

// stopStatus is the exit status a check's JSON calls for: 3 when a caution
// of the setting or of the proposal is a stop, else 0 (crankside check
// --help).
func stopStatus(obj map[string]any) int {
	lists := []any{obj["cautions"]}
	if p, ok := obj["proposed"].(map[string]any); ok {
		lists = append(lists, p["cautions"])
	}
	for _, l := range lists {
		cs, _ := l.([]any)
		for _, c := range cs {
			if m, _ := c.(map[string]any); m["level"] == "stop" {
				return 3
			}
		}
	}
	return 0
}

func ruleStatus(t *testing.T, obj map[string]any) map[string]string {
	t.Helper()
	out := map[string]string{}
	for k, v := range obj["protocol_rule_status"].(map[string]any) {
		out[k] = v.(string)
	}
	return out
}

func stepProposed(obj map[string]any) map[string]any {
	return obj["protocol_step"].(map[string]any)["proposed"].(map[string]any)
}

func ruleByID(t *testing.T, obj map[string]any, id string) map[string]any {
	t.Helper()
	for _, r := range obj["protocol_step"].(map[string]any)["rules"].([]any) {
		if r.(map[string]any)["id"] == id {
			return r.(map[string]any)
		}
	}
	t.Fatalf("no rule %s", id)
	return nil
}

func num(t *testing.T, m map[string]any, k string) float64 {
	t.Helper()
	v, ok := m[k].(float64)
	require.True(t, ok, "%s is a number: %v", k, m[k])
	return v
}

func tenths(v float64) bool { return math.Abs(v*10-math.Round(v*10)) < 1e-6 }

func TestHandoverHypoxaemicOnRoomAir(t *testing.T) {
	// SpO2 85 is below 88-95; from room air at PEEP 5 the step is the
	// lower-PEEP/FiO2 table's first pair, FiO2 0.3 with PEEP 5 (ARDS
	// Network protocol card). No pH: the pH rule cannot fire. Nothing moves
	// the volume or the rate: hole 9, 21 rpm, 1.4 s stay. The O2 flow for
	// 0.30 is 0.09 / 0.79 x MV = 0.114 x 5.92-6.64 = 0.67-0.76 L/min, 0.7 or
	// 0.8 rounded up (derived).
	obj := checkJSON(t, handover("--spo2", "85")...)
	require.Equal(t, map[string]string{"protocol-scope": "in-goal", "oxygenation": "fired", "plateau": "in-goal", "ph": "no-reading"}, ruleStatus(t, obj))
	require.Nil(t, ruleByID(t, obj, "ph")["value"], "a rule without its reading has a null value")
	require.Equal(t, 85.0, ruleByID(t, obj, "oxygenation")["value"])
	p := stepProposed(obj)
	require.Equal(t, "9", p["hole"])
	require.Equal(t, 21.0, num(t, p, "motor_rpm"))
	require.Equal(t, 1.4, num(t, p, "dwell_s"))
	require.Equal(t, 5.0, num(t, p, "peep_cmh2o"))
	o2 := num(t, p, "o2_flow_l_min")
	require.True(t, tenths(o2), "%v L/min is set on a 0.1 L/min flowmeter", o2)
	require.GreaterOrEqual(t, o2, 0.7-1e-9)
	require.LessOrEqual(t, o2, 0.8+1e-9)
	fio2 := num(t, p, "fio2")
	require.GreaterOrEqual(t, fio2, 0.30-1e-4, "rounded up: never below the step's FiO2")
	require.LessOrEqual(t, fio2, 0.30+0.079/5.92+1e-4, "at most 0.79 x 0.1 / MV above (derived)")
	require.InDelta(t, 14.09, num(t, p, "rate_bpm"), 0.01)
	// The step is the proposal, evaluated with its cautions.
	require.Equal(t, "protocol-step", obj["proposal_from"])
	prop := obj["proposed"].(map[string]any)
	set := prop["setting"].(map[string]any)
	require.Equal(t, o2, num(t, set, "o2_flow_l_min"))
	require.Equal(t, fio2, num(t, prop, "fio2"))
	require.NotNil(t, prop["cautions"])

	r := crankside(t, handover("--spo2", "85")...)
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "BLOOD GAS / OXIMETER  SpO2 85 %, PaO2 not taken, pH not taken")
	require.Contains(t, r.stdout, "FIRED      oxygenation: SpO2 % = 85, goal SpO2 88-95 %")
	require.Contains(t, r.stdout, "next pair up the table, FiO2 0.3, PEEP 5 cmH2O")
	require.Contains(t, r.stdout, "NO READING ph:")
	require.Contains(t, r.stdout, "THE STEP ON THIS MACHINE  hole 9, 21.0 rpm, dwell 1.4 s")
	require.Contains(t, r.stdout, "The proposal evaluated here is the protocol's step.")
}

func TestHandoverAcidotic(t *testing.T) {
	// pH 7.22 with PaCO2 58: HCO3 = 0.03 x 58 x 10^(7.22 - 6.1) = 22.94
	// mmol/L; held, pH 7.35 needs 22.94 / (0.03 x 10^1.25) = 43.0 mmHg
	// (Henderson-Hasselbalch, REFERENCES). At the same Vt the rate scales as
	// PaCO2 / PaCO2': 14.09 x 58 / 43.0 = 19.0 /min (alveolar ventilation
	// equation; ARDS Network protocol card: pH 7.15-7.30, raise the rate, at
	// most 35). At the same I:E 1:1.98 a 60/19 = 3.158 s breath has Ti
	// 3.158 / 2.98 = 1.060 s: 28.31 rpm, 28.5 on the 0.5 rpm step (turn
	// 2.105 s); the dwell 3.158 - 2.105 = 1.053 s is 1.1 s on the 0.1 s step:
	// 60 / 3.205 = 18.72 /min (derived). SpO2 92 is in goal: FiO2 stays
	// 0.21, no O2.
	obj := checkJSON(t, handover("--spo2", "92", "--ph", "7.22", "--paco2", "58")...)
	require.Equal(t, map[string]string{"protocol-scope": "in-goal", "oxygenation": "in-goal", "plateau": "in-goal", "ph": "fired"}, ruleStatus(t, obj))
	ph := ruleByID(t, obj, "ph")
	require.Contains(t, ph["action"], "HCO3 22.9 mmol/L held")
	require.Contains(t, ph["action"], "rate 14.1 -> 19.0 /min aiming at pH 7.35 (PaCO2 43.0 mmHg")
	require.Contains(t, ph["source"], "ARDS Network protocol card")
	p := stepProposed(obj)
	require.Equal(t, "9", p["hole"])
	require.Equal(t, 28.5, num(t, p, "motor_rpm"))
	require.InDelta(t, 1.1, num(t, p, "dwell_s"), 1e-9)
	require.InDelta(t, 18.72, num(t, p, "rate_bpm"), 0.01)
	require.Equal(t, 5.0, num(t, p, "peep_cmh2o"))
	require.InDelta(t, 0.21, num(t, p, "fio2"), 1e-9)
	require.Equal(t, 0.0, num(t, p, "o2_flow_l_min"))
	changes := map[string][2]float64{}
	for _, c := range obj["protocol_changes"].([]any) {
		c := c.(map[string]any)
		changes[c["what"].(string)] = [2]float64{c["wanted"].(float64), c["got"].(float64)}
	}
	require.InDelta(t, 19.0, changes["rate"][0], 0.05, "%v", changes)
	require.InDelta(t, 18.72, changes["rate"][1], 0.01)
	require.InDelta(t, 28.31, changes["motor speed"][0], 0.01)
	require.Equal(t, 28.5, changes["motor speed"][1])

	r := crankside(t, handover("--spo2", "92", "--ph", "7.22", "--paco2", "58")...)
	require.Contains(t, r.stdout, "FIRED      ph: pH = 7.22, goal pH 7.30-7.45")
	require.Contains(t, r.stdout, "THE STEP ON THIS MACHINE  hole 9, 28.5 rpm, dwell 1.1 s (18.7 /min)")
	require.Contains(t, r.stdout, "MACHINE    rate: wanted 19 /min, this machine 18.72 /min")
}

func TestHandoverOverOxygenatedOnAHighStep(t *testing.T) {
	// 15 L/min into at most 6.64 L/min of minute ventilation is all
	// oxygen: FiO2 1.0 (the bleed caps at 1), so with PEEP 18 the patient is
	// at the table's 1.0/18. PaO2 110 is above 55-80: the pair below is
	// 0.9/18 (ARDS Network lower-PEEP/FiO2 table). pH 7.40 is in goal. The
	// plateau is at most 18 + 471 / 60 = 25.9 plus a little trapped gas,
	// under 30 (derived; assumed compliance 60). The O2 flow for 0.9 mixes
	// into the piston's intake (version 2): 0.69 / 0.79 x intake, the intake
	// being hole 9's swept 471.24 mL (pi 5^2 x 6) x 14.094 /min = 6.642
	// L/min at most (calibration none): 0.8734 x 5.92-6.642 = 5.17-5.801
	// L/min, 5.2-5.9 rounded up to a tenth (derived).
	obj := checkJSON(t, handover("--peep", "18", "--o2-lpm", "15", "--pao2", "110", "--ph", "7.40", "--paco2", "40")...)
	require.Equal(t, map[string]string{"protocol-scope": "in-goal", "oxygenation": "fired", "plateau": "in-goal", "ph": "in-goal"}, ruleStatus(t, obj))
	require.Contains(t, ruleByID(t, obj, "oxygenation")["action"], "the pair below on the table, FiO2 0.9, PEEP 18 cmH2O (from FiO2 1.00, PEEP 18)")
	p := stepProposed(obj)
	require.Equal(t, "9", p["hole"])
	require.Equal(t, 21.0, num(t, p, "motor_rpm"))
	require.Equal(t, 1.4, num(t, p, "dwell_s"))
	require.Equal(t, 18.0, num(t, p, "peep_cmh2o"))
	o2 := num(t, p, "o2_flow_l_min")
	require.True(t, tenths(o2), "%v", o2)
	require.GreaterOrEqual(t, o2, 5.2-1e-9)
	require.LessOrEqual(t, o2, 5.9+1e-9)
	fio2 := num(t, p, "fio2")
	require.GreaterOrEqual(t, fio2, 0.90-1e-4)
	require.LessOrEqual(t, fio2, 0.90+0.079/5.92+1e-4)

	// One step at a time: at the flow proposed, the same PaO2 takes the
	// next pair below, 0.9/16 (the table), not the same pair again.
	next := checkJSON(t, handover("--peep", "18", "--o2-lpm", fmtFlow(o2), "--pao2", "110")...)
	require.Contains(t, ruleByID(t, next, "oxygenation")["action"], "FiO2 0.9, PEEP 16 cmH2O")
	require.Equal(t, 16.0, num(t, stepProposed(next), "peep_cmh2o"))

	r := crankside(t, handover("--peep", "18", "--o2-lpm", "15", "--pao2", "110", "--ph", "7.40", "--paco2", "40")...)
	require.Contains(t, r.stdout, "FIRED      oxygenation: PaO2 mmHg = 110, goal PaO2 55-80 mmHg (decides over SpO2)")
	require.Contains(t, r.stdout, "IN GOAL    ph: pH = 7.40")
	require.Contains(t, r.stdout, "THE STEP ON THIS MACHINE  hole 9, 21.0 rpm, dwell 1.4 s (14.1 /min), PEEP 18 cmH2O, FiO2 0.9")
}

func fmtFlow(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

func TestHandoverFixedSpeedMotorChangesOnlyTheDwell(t *testing.T) {
	// demo-b (invented) runs only at 20 rpm: a 3 s turn, Ti 1.5 s. With a
	// 1.0 s dwell the rate is 60 / 4 = 15 /min. pH 7.25 with PaCO2 50: 15 x
	// 10^(7.35 - 7.25) = 18.9 /min with the bicarbonate held (Henderson-
	// Hasselbalch; at the same Vt the rate scales as PaCO2 / PaCO2' = 10^0.1).
	// The dwell for it is 60/18.9 - 3 = 0.17 s, 0.2 s on the 0.1 s step:
	// 60 / 3.2 = 18.75 /min, Ti still 1.5 s, I:E (3.2 - 1.5) / 1.5 = 1:1.13
	// (derived).
	// At 190 cm (PBW 84.2 kg) hole E's breath is 6.0 mL/kg: no Vt step.
	args := []string{"check", "--height-cm", "190", "--sex", "male", "--profile", "demo-b", "--hole", "E", "--rpm", "20",
		"--dwell-s", "1", "--ph", "7.25", "--paco2", "50"}
	obj := checkJSON(t, args...)
	require.Equal(t, "fired", ruleStatus(t, obj)["ph"])
	p := stepProposed(obj)
	require.Equal(t, 20.0, num(t, p, "motor_rpm"), "the one speed")
	require.InDelta(t, 0.2, num(t, p, "dwell_s"), 1e-9)
	require.InDelta(t, 18.75, num(t, p, "rate_bpm"), 1e-9)
	prop := obj["proposed"].(map[string]any)
	require.InDelta(t, 1.5, num(t, prop, "ti_s"), 1e-3)
	require.InDelta(t, 1.133, num(t, prop, "ie_ratio"), 1e-3)
	r := crankside(t, args...)
	require.Contains(t, r.stdout, "only through the dwell")
	require.Contains(t, r.stdout, "THE STEP ON THIS MACHINE  hole E, 20.0 rpm, dwell 0.2 s (18.8 /min)")
}

func TestHandoverRateCappedAtTheMotorsMaximum(t *testing.T) {
	// demo-a with its motor limited to 20 rpm: the fastest turn is 3 s, the
	// fastest rate 20 /min with no dwell. At 20 rpm and 1.5 s dwell the rate
	// is 60 / 4.5 = 13.33 /min; pH 7.15 (the lower edge of 7.15-7.30, not
	// the severe band) with PaCO2 60: HCO3 = 0.03 x 60 x 10^1.05 = 20.2,
	// PaCO2 for 7.35 = 20.2 / (0.03 x 10^1.25) = 37.9, rate 13.33 x 60 / 37.9
	// = 21.1 /min (derived), which this motor cannot reach.
	raw, err := os.ReadFile(filepath.Join("profiles", "demo", "demo-a.json"))
	require.NoError(t, err)
	var prof map[string]any
	require.NoError(t, json.Unmarshal(raw, &prof))
	prof["id"] = "demo-a-slow"
	prof["motor"].(map[string]any)["max_rpm"] = 20
	b, _ := json.Marshal(prof)
	path := filepath.Join(t.TempDir(), "demo-a-slow.json")
	require.NoError(t, os.WriteFile(path, b, 0o600))
	args := []string{"check", "--height-cm", "188", "--sex", "male", "--profile", path, "--hole", "9", "--rpm", "20",
		"--dwell-s", "1.5", "--ph", "7.15", "--paco2", "60"}
	obj := checkJSON(t, args...)
	require.Contains(t, ruleByID(t, obj, "ph")["action"], "rate 13.3 -> 21.1 /min")
	p := stepProposed(obj)
	require.Equal(t, 20.0, num(t, p, "motor_rpm"))
	require.Equal(t, 0.0, num(t, p, "dwell_s"))
	require.InDelta(t, 20.0, num(t, p, "rate_bpm"), 1e-9)
	warn := false
	for _, c := range obj["proposed"].(map[string]any)["cautions"].([]any) {
		c := c.(map[string]any)
		require.NotEqual(t, "rate-unreachable", c["id"], "the step is the best this machine reaches, not a stop")
		warn = warn || (c["id"] == "protocol-rate-not-reached" && c["level"] == "warn")
	}
	require.True(t, warn, "the step's setting cannot give its rate: a warn with the next lever")
	r := crankside(t, args...)
	require.Contains(t, r.stdout, "THE STEP ON THIS MACHINE  hole 9, 20.0 rpm, dwell 0.0 s")
	require.Contains(t, r.stdout, "WARN protocol-rate-not-reached: the protocol's rate 21.1 /min cannot be reached on this machine: its fastest, 20.0 /min")
	require.Contains(t, r.stdout, "MACHINE    rate: wanted 21.1 /min, this machine 20 /min")
	require.Contains(t, r.stdout, "this motor cannot reach 21.1 /min")
}

func TestHandoverRateCappedAt35(t *testing.T) {
	// 40 rpm and 0.5 s: 60 / 2.0 = 30 /min. pH 7.15: with HCO3 held the
	// PaCO2 for 7.35 is PaCO2 / 10^0.2 (Henderson-Hasselbalch), so at the
	// same Vt the rate is 30 x 10^0.2 = 47.5 /min, capped at the
	// protocol's 35 (ARDS Network protocol card). At 40
	// rpm the dwell for 35 /min is 60/35 - 1.5 = 0.21 s: 0.2 s gives 35.3,
	// above 35, so one step longer, 0.3 s: 60 / 1.8 = 33.3 /min (derived).
	obj := checkJSON(t, "check", "--height-cm", "175", "--sex", "male", "--hole", "9", "--rpm", "40", "--dwell-s", "0.5",
		"--ph", "7.15", "--paco2", "50")
	require.Contains(t, ruleByID(t, obj, "ph")["action"], "capped at the protocol's 35 /min")
	p := stepProposed(obj)
	require.Equal(t, 40.0, num(t, p, "motor_rpm"))
	require.InDelta(t, 0.3, num(t, p, "dwell_s"), 1e-9)
	require.InDelta(t, 33.33, num(t, p, "rate_bpm"), 0.01)
}

func TestProtocolStepJSONKeysFromTheCommand(t *testing.T) {
	obj := checkJSON(t, handover("--spo2", "85", "--ph", "7.22", "--paco2", "58")...)
	keys := func(v any) []string {
		var out []string
		for k := range v.(map[string]any) {
			out = append(out, k)
		}
		sort.Strings(out)
		return out
	}
	// Issue 15's JSON contract.
	require.Equal(t, []string{"proposed", "rules"}, keys(obj["protocol_step"]))
	require.Equal(t, []string{"dwell_s", "fio2", "hole", "motor_rpm", "o2_flow_l_min", "peep_cmh2o", "rate_bpm", "target_ml_per_kg"},
		keys(obj["protocol_step"].(map[string]any)["proposed"]))
	for _, r := range obj["protocol_step"].(map[string]any)["rules"].([]any) {
		require.Equal(t, []string{"action", "goal", "id", "reading", "source", "value"}, keys(r))
	}
	require.Equal(t, []string{"apparatus_dead_space_ml", "paco2_mmhg", "pao2_mmhg", "ph", "spo2_pct"}, keys(obj["gas_readings"]))
	require.Nil(t, obj["gas_readings"].(map[string]any)["pao2_mmhg"])
	// A check without a reading has none of these keys.
	plain := checkJSON(t, handover()...)
	for _, k := range []string{"gas_readings", "protocol_step", "protocol_rule_status", "proposal_from"} {
		_, ok := plain[k]
		require.False(t, ok, k)
	}
}

func TestHandProposalWinsOverTheStep(t *testing.T) {
	obj := checkJSON(t, handover("--spo2", "85", "--propose-peep", "8")...)
	require.Equal(t, "entered", obj["proposal_from"])
	require.Equal(t, 8.0, num(t, obj["proposed"].(map[string]any)["setting"].(map[string]any), "peep_cmh2o"))
	require.Equal(t, 5.0, num(t, stepProposed(obj), "peep_cmh2o"), "the step is still shown")
	r := crankside(t, handover("--spo2", "85", "--propose-peep", "8")...)
	require.Contains(t, r.stdout, "The proposal entered by hand is evaluated here, not the protocol's step")
	require.Contains(t, r.stdout, "THE STEP ON THIS MACHINE (not evaluated: the proposal entered differs from it)")
}

func TestGasReadingsOutsideTheirRangesAreRefused(t *testing.T) {
	// Plausible ranges (common practice): SpO2 50-100 %, pH 6.8-7.8, PaCO2
	// 10-150 mmHg, PaO2 20-600 mmHg.
	for _, c := range []struct{ flag, value, want string }{
		{"--spo2", "45", "spo2"}, {"--ph", "7.9", "ph"}, {"--paco2", "5", "paco2"}, {"--pao2", "700", "pao2"},
		{"--spo2", "abc", "spo2"}, {"--dead-space-ml", "-5", "dead-space-ml"},
	} {
		r := crankside(t, handover(c.flag, c.value)...)
		require.Equal(t, 2, r.status, "%s %s: %s", c.flag, c.value, r.stdout)
		require.Contains(t, r.stderr, c.want, c.flag)
		require.NotContains(t, r.stderr, "panic")
	}
}

func TestUnexplainedReadingsGiveNoStep(t *testing.T) {
	obj := checkJSON(t, handover("--peak", "120", "--end-pressure", "100", "--spo2", "85")...)
	require.Contains(t, obj["protocol_problem"], "cannot be explained")
	_, ok := obj["protocol_step"]
	require.False(t, ok)
	require.Nil(t, obj["proposed"])
	require.NotNil(t, obj["gas_readings"], "the readings are kept")
}

func TestTheRecordAndCardCarryTheStep(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "log.jsonl")
	r := crankside(t, handover("--spo2", "85", "--bed", "B4", "--log", logPath)...)
	require.Equal(t, 0, r.status, r.stderr)
	raw, err := os.ReadFile(logPath)
	require.NoError(t, err)
	var rec map[string]any
	require.NoError(t, json.Unmarshal(raw, &rec))
	require.Equal(t, 85.0, rec["gas_readings"].(map[string]any)["spo2_pct"])
	require.Equal(t, "fired", rec["protocol_rule_status"].(map[string]any)["oxygenation"])
	require.NotNil(t, rec["protocol_step"])
	card := crankside(t, handover("--spo2", "85", "--bed", "B4", "--card")...)
	require.Equal(t, 0, card.status, card.stderr)
	require.Contains(t, card.stdout, "PROTOCOL STEP")
	require.Contains(t, card.stdout, "FIRED      oxygenation")
	for _, l := range strings.Split(card.stdout, "\n") {
		require.LessOrEqual(t, len([]rune(l)), 80, l)
	}
}
