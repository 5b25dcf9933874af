package setup_test

import (
	"encoding/json"
	"errors"
	"math"
	"sort"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/setup"
)

func gas(v float64) *float64 { return &v }

func protocolReq(hole string, rpm, dwell, peep, o2 float64) setup.CheckRequest {
	return setup.CheckRequest{
		Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male},
		Setting: setup.Setting{Hole: hole, RPM: rpm, DwellS: dwell, PEEPCmH2O: peep, O2LPerMin: o2},
		Now:     today,
	}
}

// atHeight is req for a taller patient. Hole 8 of demo-a gives about 462 mL
// at these settings; at 182 cm (PBW 50 + 0.91 x 29.6 = 76.9 kg, ARDS
// Network 2000) that is 6.0 mL/kg PBW, so the card's step towards 6 does
// not fire and a test of another rule sees that rule alone. demo-b's hole
// E gives about 504 mL: at 190 cm (PBW 84.2 kg) 6.0 mL/kg.
func atHeight(req setup.CheckRequest, cm float64) setup.CheckRequest {
	req.Patient.HeightCm = cm
	return req
}

func hasChange(cs []setup.Change, what string) (setup.Change, bool) {
	for _, c := range cs {
		if c.What == what {
			return c, true
		}
	}
	return setup.Change{}, false
}

func hasLeveledCaution(cs []setup.Caution, id setup.CautionID, level setup.Level) bool {
	for _, c := range cs {
		if c.ID == id && c.Level == level {
			return true
		}
	}
	return false
}

func TestProtocolHypoxaemicOnRoomAir(t *testing.T) {
	// ARDS Network protocol card: SpO2 85 is below 88-95; from room air the
	// step is the table's first pair, FiO2 0.3 with PEEP 5.
	res, err := setup.ProtocolProposal(atHeight(protocolReq("8", 21, 1.4, 5, 0), 182), setup.GasReadings{SpO2Pct: gas(85)}, profile(t, "demo-a"))
	require.NoError(t, err)
	require.Equal(t, 5.0, res.Proposed.PEEPCmH2O)
	require.Equal(t, "8", res.Proposed.Hole, "no Vt rule fired: the hole stays")
	require.Equal(t, 21.0, res.Proposed.RPM)
	require.Equal(t, 1.4, res.Proposed.DwellS)
	require.Nil(t, res.Timing)
	require.NotNil(t, res.Check.Proposed)
	f := res.Check.Proposed.Figures
	// The flow is rounded up to the flowmeter's 0.1 L/min: the FiO2 at the
	// proposed piston intake (version 2) is at least the 0.30 asked for and
	// at most 0.79 x 0.1 / intake above it (derived from 0.21 + 0.79 Q /
	// intake).
	require.InDelta(t, res.Proposed.O2LPerMin*10, math.Round(res.Proposed.O2LPerMin*10), 1e-9, "a tenth of a litre")
	intake := physiology.PistonIntakeLPerMin(f.Hole.EffectiveSweptML, f.Timing.RateBPM)
	fio2 := physiology.FiO2FromPistonIntake(res.Proposed.O2LPerMin, f.Hole.EffectiveSweptML, f.Timing.RateBPM)
	require.GreaterOrEqual(t, fio2, 0.30-1e-9)
	require.LessOrEqual(t, fio2, 0.30+0.079/intake+1e-9)
	require.InDelta(t, fio2, res.FiO2, 1e-9)
	require.Greater(t, res.Proposed.O2LPerMin, 0.0)
}

func TestProtocolRateCappedAt35(t *testing.T) {
	// demo-a at 40 rpm and 0.5 s dwell: turn 1.5 s, breath 2.0 s, 30 /min
	// (derived). pH 7.15: 30 x 10^(7.35 - 7.15) = 47.5, capped at the
	// protocol's 35 (ARDS Network protocol card). At 40 rpm (the motor's
	// top) the dwell for 35 /min is 60/35 - 1.5 = 0.214 s; the 0.1 s step
	// gives 0.2 s and 60 / 1.7 = 35.3 /min, above 35, so one step longer:
	// 60 / 1.8 = 33.3 /min (derived).
	res, err := setup.ProtocolProposal(protocolReq("8", 40, 0.5, 5, 0),
		setup.GasReadings{PH: gas(7.15), PaCO2MmHg: gas(50)}, profile(t, "demo-a"))
	require.NoError(t, err)
	require.Equal(t, 35.0, res.Step.RateBPM)
	require.Equal(t, 40.0, res.Proposed.RPM)
	require.InDelta(t, 0.3, res.Proposed.DwellS, 1e-9)
	require.InDelta(t, 33.33, res.RateBPM, 0.01)
	require.LessOrEqual(t, res.RateBPM, 35.0)
	require.False(t, hasLeveledCaution(res.Check.Proposed.Cautions, "rate-high", setup.Warn))
	require.True(t, strings.Contains(strings.Join(res.Notes, "\n"), "above the protocol's 35"), "%q", res.Notes)
}

func TestProtocolRateCappedAtTheMotorsMaximum(t *testing.T) {
	// demo-a with its motor limited to 20 rpm: the fastest turn is 3 s, so
	// the fastest rate is 60 / 3 = 20 /min with no dwell (derived). At 20
	// rpm and 1.5 s dwell the rate is 60 / 4.5 = 13.33 /min; pH 7.15 wants
	// 13.33 x 10^0.2 = 21.1 /min (derived), which the motor cannot reach.
	p := profile(t, "demo-a")
	p.Motor.MaxRPM = 20
	res, err := setup.ProtocolProposal(atHeight(protocolReq("8", 20, 1.5, 5, 0), 182),
		setup.GasReadings{PH: gas(7.15), PaCO2MmHg: gas(60)}, p)
	require.NoError(t, err)
	require.InDelta(t, 21.1, res.Step.RateBPM, 0.05)
	require.Equal(t, 20.0, res.Proposed.RPM)
	require.Equal(t, 0.0, res.Proposed.DwellS)
	require.InDelta(t, 20.0, res.RateBPM, 1e-9)
	c, ok := hasChange(res.Changes, "rate")
	require.True(t, ok, "%+v", res.Changes)
	require.InDelta(t, 21.1, c.Wanted, 0.05)
	require.InDelta(t, 20.0, c.Got, 1e-9)
	// The step is this machine's best reachable setting: a warn that names
	// what it could not do and the card's next lever, not a stop.
	require.False(t, hasLeveledCaution(res.Check.Proposed.Cautions, "rate-unreachable", setup.Stop))
	require.True(t, hasLeveledCaution(res.Check.Proposed.Cautions, "protocol-rate-not-reached", setup.Warn))
	for _, c := range res.Check.Proposed.Cautions {
		if c.ID == "protocol-rate-not-reached" {
			require.Contains(t, c.Message, "the protocol's rate 21.1 /min cannot be reached on this machine: its fastest, 20.0 /min, is set here")
			require.Contains(t, c.Advice, "below pH 7.15 its next lever is Vt up in 1 mL/kg steps")
		}
	}
	require.Contains(t, strings.Join(res.Notes, "\n"), "cannot reach 21.1 /min")
}

func TestProtocolFixedSpeedMotorChangesOnlyTheDwell(t *testing.T) {
	// demo-b runs only at 20 rpm: a 3 s turn, Ti 1.5 s. With a 1.0 s dwell
	// the rate is 60 / 4 = 15 /min. pH 7.25 with PaCO2 50, HCO3 held: 15 x
	// 10^(7.35 - 7.25) = 18.9 /min (derived). The dwell is 60/18.9 - 3 =
	// 0.17 s, 0.2 s on the 0.1 s step: 60 / 3.2 = 18.75 /min, Ti still 1.5 s,
	// I:E (3.2 - 1.5) / 1.5 = 1:1.13 (derived).
	res, err := setup.ProtocolProposal(atHeight(protocolReq("E", 20, 1.0, 5, 0), 190),
		setup.GasReadings{PH: gas(7.25), PaCO2MmHg: gas(50)}, profile(t, "demo-b"))
	require.NoError(t, err)
	require.False(t, res.Step.VtChanged, "Vt at or above 6 with the plateau under 30: no Vt step")
	require.InDelta(t, 18.9, res.Step.RateBPM, 0.05)
	require.Equal(t, 20.0, res.Proposed.RPM)
	require.Equal(t, "E", res.Proposed.Hole)
	require.InDelta(t, 0.2, res.Proposed.DwellS, 1e-9)
	require.InDelta(t, 18.75, res.RateBPM, 1e-9)
	f := res.Check.Proposed.Figures
	require.InDelta(t, 1.5, f.Timing.TiS, 1e-9)
	require.InDelta(t, 1.1333, f.Timing.IE, 1e-3)
	_, ok := hasChange(res.Changes, "I:E (E of 1:E)")
	require.True(t, ok, "%+v", res.Changes)
	require.Contains(t, strings.Join(res.Notes, "\n"), "only through the dwell")
}

func TestProtocolPlateauStepTakesASmallerHole(t *testing.T) {
	// Assumed compliance 15 mL/cmH2O makes the plateau above 30 at hole 8
	// (about 430 mL / 15 = 29 above PEEP 10). The ARDS Network protocol card
	// takes Vt down 1 mL/kg PBW: PBW 175 cm male 50 + 0.91 x 22.6 = 70.57 kg
	// (ARDSNet 2000).
	req := protocolReq("8", 21, 1.4, 10, 0)
	req.ComplianceMLPerCmH2O = 15
	res, err := setup.ProtocolProposal(req, setup.GasReadings{}, profile(t, "demo-a"))
	require.NoError(t, err)
	cur := res.Check.Current.Figures
	require.Greater(t, cur.PlateauCmH2O, 30.0)
	require.True(t, res.Step.VtChanged)
	require.InDelta(t, cur.Hole.MLPerKg-1, res.TargetMLPerKg, 1e-9)
	require.InDelta(t, (cur.Hole.MLPerKg-1)*70.566, res.TargetVtML, 0.01)
	next := res.Check.Proposed.Figures
	require.NotEqual(t, "8", res.Proposed.Hole)
	require.Less(t, next.Hole.DeliveredML, cur.Hole.DeliveredML)
	require.GreaterOrEqual(t, next.Hole.MLPerKg, 4.0)
	c, ok := hasChange(res.Changes, "tidal volume")
	require.True(t, ok, "a hole between two volumes is shown: %+v", res.Changes)
	require.InDelta(t, res.TargetVtML, c.Wanted, 1e-9)
	// No gas: the alveolar ventilation is held by a faster rate.
	require.True(t, res.Step.RateChanged)
	require.Greater(t, res.RateBPM, cur.Timing.RateBPM)
	require.NotEmpty(t, res.Check.Differences)
}

func TestProtocolOverOxygenatedOnAHighStep(t *testing.T) {
	// 15 L/min bled into about 6 L/min of minute ventilation is all oxygen:
	// FiO2 1.0 (the bleed formula caps at 1; REFERENCES, derived), so the
	// patient is at the table's 1.0/18. PaO2 110 is above 55-80: the pair
	// below is 0.9/18 (ARDS Network lower-PEEP/FiO2 table).
	res, err := setup.ProtocolProposal(atHeight(protocolReq("8", 21, 1.4, 18, 15), 182), setup.GasReadings{PaO2MmHg: gas(110)}, profile(t, "demo-a"))
	require.NoError(t, err)
	require.InDelta(t, 1.0, res.Check.Current.Figures.FiO2, 1e-9)
	require.Equal(t, 18.0, res.Proposed.PEEPCmH2O)
	// Rounded up to 0.1 L/min: FiO2 0.9 to 0.9 + 0.079 / MV (derived).
	mv := res.Check.Proposed.Figures.MinuteVentLPerMin
	require.GreaterOrEqual(t, res.FiO2, 0.9-1e-9)
	require.LessOrEqual(t, res.FiO2, 0.9+0.079/mv+1e-9)
	require.Less(t, res.Proposed.O2LPerMin, 15.0)
	require.Equal(t, "8", res.Proposed.Hole)
}

func TestProtocolRefusesImplausibleReadings(t *testing.T) {
	g := setup.GasReadings{SpO2Pct: gas(45), PH: gas(7.9), PaCO2MmHg: gas(40), ApparatusDeadSpaceML: gas(-10)}
	bad := setup.CheckGasEntries(g)
	var fields []string
	for _, e := range bad {
		fields = append(fields, e.Field)
	}
	sort.Strings(fields)
	require.Equal(t, []string{"dead-space-ml", "ph", "spo2"}, fields)
	require.Contains(t, bad[0].Error(), "SpO2 45 % is outside 50-100 %")
	_, err := setup.ProtocolProposal(protocolReq("8", 21, 1.4, 5, 0), g, profile(t, "demo-a"))
	var ie *setup.InputError
	require.True(t, errors.As(err, &ie), "%v", err)
	require.Equal(t, "spo2", ie.Field)
}

func TestProtocolStepJSONKeys(t *testing.T) {
	res, err := setup.ProtocolProposal(protocolReq("8", 21, 1.4, 5, 0),
		setup.GasReadings{SpO2Pct: gas(85), PH: gas(7.22), PaCO2MmHg: gas(58)}, profile(t, "demo-a"))
	require.NoError(t, err)
	b, err := json.Marshal(res.JSON())
	require.NoError(t, err)
	var m map[string]any
	require.NoError(t, json.Unmarshal(b, &m))
	keys := func(v any) []string {
		var out []string
		for k := range v.(map[string]any) {
			out = append(out, k)
		}
		sort.Strings(out)
		return out
	}
	// The JSON contract.
	require.Equal(t, []string{"proposed", "rules"}, keys(m))
	require.Equal(t, []string{"dwell_s", "fio2", "hole", "motor_rpm", "o2_flow_l_min", "peep_cmh2o", "rate_bpm", "target_ml_per_kg"}, keys(m["proposed"]))
	rules := m["rules"].([]any)
	require.Len(t, rules, 4, "the lung not stated: the scope first")
	for _, r := range rules {
		require.Equal(t, []string{"action", "goal", "id", "reading", "source", "value"}, keys(r))
	}
	require.Equal(t, "protocol-scope", rules[0].(map[string]any)["id"])
	require.Equal(t, "oxygenation", rules[1].(map[string]any)["id"])
	require.Equal(t, 85.0, rules[1].(map[string]any)["value"])

	// A rule without its reading has a null value.
	res, err = setup.ProtocolProposal(atHeight(protocolReq("8", 21, 1.4, 5, 0), 182), setup.GasReadings{SpO2Pct: gas(90)}, profile(t, "demo-a"))
	require.NoError(t, err)
	b, err = json.Marshal(res.JSON())
	require.NoError(t, err)
	require.Contains(t, string(b), `"id":"ph","reading":"pH","value":null`)
	require.Nil(t, res.Check.Proposed, "in goal everywhere: nothing proposed")
}

func TestProtocolRateFollowsTheHolesVolume(t *testing.T) {
	// demo-b hole D at 20 rpm, 1.0 s dwell: about 5.7 mL/kg PBW with the
	// plateau near 12, so the plateau rule wants Vt up to 6 (ARDS Network
	// protocol card), and pH 7.25 wants the rate for that volume. The hole
	// nearest 6 mL/kg is still D, so the volume does not change; the rate
	// that keeps the step's alveolar ventilation at D's own volume is then
	// the rate at the same Vt: 15 x 10^(7.35 - 7.25) = 18.9 /min, whatever
	// the dead space (derived: rate_step x (Vt_step - Vd) / (Vt_D - Vd) with
	// rate_step = 15 x (Vt_D - Vd) / (Vt_step - Vd) x 10^0.1).
	// The version 1 limit (setup.V1CheckRequest): the volumes above are
	// version 1's; at the default room (BTPS) hole D gives more than 6.
	res, err := setup.ProtocolProposal(setup.V1CheckRequest(protocolReq("D", 20, 1.0, 5, 0)),
		setup.GasReadings{PH: gas(7.25), PaCO2MmHg: gas(50)}, profile(t, "demo-b"))
	require.NoError(t, err)
	require.True(t, res.Step.VtChanged)
	require.Equal(t, "D", res.Proposed.Hole)
	require.Less(t, res.Step.RateBPM, 18.9, "the step's rate was for the larger volume")
	// One rate wanted (the step's), one set: 18.9 /min on the 0.1 s dwell
	// step is 60/18.9 - 3 = 0.17 -> 0.2 s, 60 / 3.2 = 18.75 /min (derived).
	c, ok := hasChange(res.Changes, "rate")
	require.True(t, ok, "%+v", res.Changes)
	require.InDelta(t, res.Step.RateBPM, c.Wanted, 1e-9)
	require.InDelta(t, 18.75, c.Got, 1e-9)
	_, ok = hasChange(res.Changes, "rate for the hole's volume")
	require.False(t, ok, "no third rate")
	require.Contains(t, strings.Join(res.Notes, "\n"), "keeps the step's alveolar ventilation")
	require.Contains(t, strings.Join(res.Notes, "\n"), "the tidal volume does not change on this machine")
}
