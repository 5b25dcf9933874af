package setup_test

import (
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

func cautionOf(cs []setup.Caution, id setup.CautionID) *setup.Caution {
	for i := range cs {
		if cs[i].ID == id {
			return &cs[i]
		}
	}
	return nil
}

func TestPlanOxygenAboveTheFlowmeter(t *testing.T) {
	// 200 cm male, 8 mL/kg, rate 30, FiO2 1.0 on demo-a: hole 17 (radius
	// 4.6 cm, bore 10 cm) sweeps pi/4 x 10^2 x 9.2 = 722.6 mL; 40 rpm and
	// 0.5 s dwell give 60 / 2.0 = 30 /min, so the piston draws 21.68 L/min
	// and FiO2 1.0 needs all of it (derived: version 2, oxygen at the
	// intake). Flowmeters stop at 15 L/min (common practice): FiO2 =
	// 0.21 + 0.79 x 15 / 21.68 = 0.757 (derived).
	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 200, Sex: physiology.Male},
		Targets: setup.Targets{MLPerKg: 8, RateBPM: 30, FiO2: 1.0}, Now: today}, profile(t, "demo-a"))
	require.NoError(t, err)
	require.Equal(t, "17", pl.Hole.Label)
	require.InDelta(t, 21.68, pl.O2FlowLPerMin, 0.01)
	c := cautionOf(pl.Cautions, setup.CautionO2FlowAboveFlowmeter)
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	require.InDelta(t, 15, c.Limit, 1e-9)
	require.Contains(t, c.Message, "at 15 L/min the FiO2 reaches only 0.76")
	require.Contains(t, c.Source, "this machine's profile", "demo-a gives its flowmeter")
	require.Equal(t, "STOP: DO NOT USE THIS SETTING (o2-flow-above-flowmeter)", report.SettingHeading(pl.Cautions, "SET THE MACHINE"))
	// The same plan at FiO2 0.7 needs 0.49 / 0.79 x 21.68 = 13.45 L/min:
	// inside the flowmeter (derived).
	pl, err = setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 200, Sex: physiology.Male},
		Targets: setup.Targets{MLPerKg: 8, RateBPM: 30, FiO2: 0.7}, Now: today}, profile(t, "demo-a"))
	require.NoError(t, err)
	require.InDelta(t, 13.45, pl.O2FlowLPerMin, 0.01)
	require.Nil(t, cautionOf(pl.Cautions, setup.CautionO2FlowAboveFlowmeter))
}

func TestFlowmeterDefaultIsSaid(t *testing.T) {
	// A profile without oxygen.max_flow_l_min: 15 L/min (common practice),
	// and the caution's source says it is the default.
	p := profile(t, "demo-a")
	p.Defaults = append(p.Defaults, "oxygen.max_flow_l_min")
	p.Oxygen.MaxFlowLMin = 15
	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 200, Sex: physiology.Male},
		Targets: setup.Targets{MLPerKg: 8, RateBPM: 30, FiO2: 1.0}, Now: today}, p)
	require.NoError(t, err)
	c := cautionOf(pl.Cautions, setup.CautionO2FlowAboveFlowmeter)
	require.NotNil(t, c)
	require.Contains(t, c.Source, "common practice")
	require.Contains(t, c.Source, "default")
	// A profile whose flowmeter gives 25 L/min takes the plan.
	p.Defaults, p.Oxygen.MaxFlowLMin = nil, 25
	pl, err = setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 200, Sex: physiology.Male},
		Targets: setup.Targets{MLPerKg: 8, RateBPM: 30, FiO2: 1.0}, Now: today}, p)
	require.NoError(t, err)
	require.Nil(t, cautionOf(pl.Cautions, setup.CautionO2FlowAboveFlowmeter))
}

func TestPlanForASmallPatientHasNoSuitableHole(t *testing.T) {
	// 130 cm female: PBW 45.5 + 0.91 x (130 - 152.4) = 25.1 kg (ARDS
	// Network 2000 formula, extrapolated). demo-a's smallest hole (radius
	// 1.4 cm) sweeps pi/4 x 10^2 x 2.8 = 219.9 mL: at least 8.7 mL/kg
	// before BTPS, above 8 (ARDS Network 2000: 4-8 mL/kg PBW).
	pl := plan(t, "demo-a", setup.Patient{HeightCm: 130, Sex: physiology.Female}, setup.Targets{})
	require.InDelta(t, 25.1, pl.PBWKg, 0.05)
	require.Equal(t, "1", pl.Hole.Label)
	c := cautionOf(pl.Cautions, setup.CautionNoSuitableHole)
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	require.Greater(t, c.Value, 8.0)
	require.Contains(t, c.Message, "the smallest hole (1) gives")
	require.True(t, strings.HasPrefix(report.SettingHeading(pl.Cautions, "SET THE MACHINE"), "STOP"))
	h := cautionOf(pl.Cautions, setup.CautionHeightBelowFormula)
	require.NotNil(t, h)
	require.Contains(t, h.Message, "for adults")
	v := cautionOf(pl.Cautions, setup.CautionTidalVolumeHigh)
	require.NotNil(t, v)
	require.NotContains(t, v.Advice, "smaller hole", "there is none")
	// A 175 cm male is inside every hole limit.
	pl = plan(t, "demo-a", setup.Patient{HeightCm: 175, Sex: physiology.Male}, setup.Targets{})
	require.Nil(t, cautionOf(pl.Cautions, setup.CautionNoSuitableHole))
}

func TestCheckWithThePatientBreathingAgainstTheUnit(t *testing.T) {
	e := setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21", "dwell-s": "1.4", "breathing-against": "yes"}
	req, ps := setup.BuildCheckRequest(e, today)
	require.Empty(t, ps)
	require.True(t, req.BreathingAgainst)
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	c := cautionOf(ck.Current.Cautions, setup.CautionPatientTriggering)
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	require.Contains(t, c.Advice, "sedation or another ventilator")
	e["breathing-against"] = "n"
	req, ps = setup.BuildCheckRequest(e, today)
	require.Empty(t, ps)
	ck, err = setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.Nil(t, cautionOf(ck.Current.Cautions, setup.CautionPatientTriggering))
	e["breathing-against"] = "perhaps"
	_, ps = setup.BuildCheckRequest(e, today)
	require.NotNil(t, ps.Field("breathing-against"))
	require.Contains(t, ps.Field("breathing-against").Reason, `"perhaps" is not yes or no`)
}

func TestCylinderReserveEntry(t *testing.T) {
	// 10 L x (100 - 50) bar = 500 L to a 50-bar reserve at the O2 flow
	// (common practice: gas = capacity x pressure).
	e := setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21", "dwell-s": "1.4",
		"o2-lpm": "5", "cylinder-l": "10", "cylinder-bar": "100", "cylinder-reserve-bar": "50"}
	req, ps := setup.BuildCheckRequest(e, today)
	require.Empty(t, ps)
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	f := ck.Current.Figures
	require.InDelta(t, 100, f.CylinderMinutes, 1e-9, "500 L / 5 L/min")
	require.InDelta(t, 200, f.CylinderEmptyMinutes, 1e-9, "1000 L / 5 L/min")
	// Blank: the default 40 bar (a fifth of a full 200-bar cylinder).
	delete(e, "cylinder-reserve-bar")
	req, _ = setup.BuildCheckRequest(e, today)
	ck, err = setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	require.InDelta(t, 120, ck.Current.Figures.CylinderMinutes, 1e-9, "600 L / 5 L/min")
	for _, bad := range []string{"0", "0.99", "150.01"} {
		e["cylinder-reserve-bar"] = bad
		_, ps = setup.BuildCheckRequest(e, today)
		require.NotNil(t, ps.Field("cylinder-reserve-bar"), bad)
	}
	for _, ok := range []string{"1", "150"} {
		e["cylinder-reserve-bar"] = ok
		_, ps = setup.BuildCheckRequest(e, today)
		require.Nil(t, ps.Field("cylinder-reserve-bar"), ok)
	}
	require.False(t, math.IsNaN(f.CylinderMinutes))
}
