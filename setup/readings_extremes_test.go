package setup_test

import (
	"encoding/json"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

func cautionByID(cs []setup.Caution, id setup.CautionID) *setup.Caution {
	for i := range cs {
		if cs[i].ID == id {
			return &cs[i]
		}
	}
	return nil
}

// The low readings: 12/9 cmH2O on hole 8 of demo-a for a 183 cm
// man fit a compliance far above the 100 mL/cmH2O an intubated adult
// rarely exceeds (REFERENCES version 3, from memory): a leak is suggested
// (a stop above 150), and the volume is an upper bound everywhere.
func TestLowReadingsSuggestALeak(t *testing.T) {
	ck := v2Check(t, profile(t, "demo-a"), func(r *setup.CheckRequest) {
		r.Patient.HeightCm = 183
		r.Readings = &physiology.Readings{PeakCmH2O: 12, EndCmH2O: 9}
	})
	require.NotNil(t, ck.Fitted)
	c := cautionByID(ck.Current.Cautions, setup.CautionReadingsSuggestLeak)
	require.NotNil(t, c)
	require.Greater(t, ck.Fitted.ComplianceMLPerCmH2O, 150.0, "the issue saw C 160.8")
	require.Equal(t, setup.Stop, c.Level)
	require.Equal(t, setup.Stop, setup.FirstStop(ck.Current.Cautions).Level)
	// The JSON says the volume is an upper bound.
	b, err := json.Marshal(ck.JSON())
	require.NoError(t, err)
	var m map[string]any
	require.NoError(t, json.Unmarshal(b, &m))
	require.Equal(t, true, m["delivered_vt_is_upper_bound"])
	require.Equal(t, setup.LeakVolumeNote, m["volume_note"])
	// The text and the card never head the volume as what the patient gets.
	var tx strings.Builder
	require.NoError(t, report.CheckText(&tx, ck))
	rec, err := setup.NewRecord(ck, "B4", "jk", today)
	require.NoError(t, err)
	var card strings.Builder
	require.NoError(t, report.WriteCard(&card, rec))
	for name, out := range map[string]string{"text": tx.String(), "card": card.String()} {
		require.Contains(t, out, "UPPER BOUND", name)
		for _, line := range strings.Split(out, "\n") {
			require.NotEqual(t, "THE PATIENT GETS", strings.TrimSpace(line), name)
		}
	}
	require.Contains(t, card.String(), "THE VOLUMES ON THIS CARD ARE UPPER BOUNDS")
	// The history and the ward say it too (473 mL, 6.1 mL/kg: the volume
	// this check shows).
	require.Contains(t, report.HistoryLine(rec), ": at most 473 mL 6.1 mL/kg")
	require.Contains(t, report.WardLine(logbook.NewWardRow(rec, "h.jsonl", today, time.Hour)), ": at most 6.1 mL/kg")
	// A check whose volume is what the patient gets says no such thing.
	plain := v2Check(t, profile(t, "demo-a"), func(r *setup.CheckRequest) {
		r.Readings = &physiology.Readings{PeakCmH2O: 17, EndCmH2O: 14}
	})
	prec, err := setup.NewRecord(plain, "B4", "jk", today)
	require.NoError(t, err)
	require.NotContains(t, report.HistoryLine(prec), "at most")
}

// A peak of 40.0 on demo-a's 40 cmH2O relief valve: the valve is venting.
// The fit keeps what the end pressure tells (C) and says the peak gives
// only a least resistance; the volume is an upper bound; a gas reading
// still gets its protocol step, which says what its plateau rests on.
func TestPeakAtTheReliefValve(t *testing.T) {
	ck := v2Check(t, profile(t, "demo-a"), func(r *setup.CheckRequest) {
		r.Readings = &physiology.Readings{PeakCmH2O: 40, EndCmH2O: 30}
	})
	require.Empty(t, ck.FitProblem)
	require.NotNil(t, ck.Fitted)
	require.True(t, ck.Fitted.EndOnly)
	c := cautionByID(ck.Current.Cautions, setup.CautionMeasuredPeakAtRelief)
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	require.InDelta(t, 40, c.Limit, 0, "this machine's profile: relief 40 cmH2O")
	require.Contains(t, c.Message, "the relief valve is venting")
	require.Contains(t, ck.Mechanics.Source, "end pressure")
	// The model's breath at the fitted lung reaches the relief valve
	// (round trip, named as such: the peak it was fitted to).
	require.InDelta(t, 40, ck.Current.Figures.PeakCmH2O, 0.05)
	require.InDelta(t, 30, ck.Current.Figures.EndInspCmH2O, 0.01)
	j := ck.JSON()
	require.True(t, j.FitEndOnly)
	require.Nil(t, j.FittedResistanceCmH2OPerLS)
	require.NotNil(t, j.FittedResistanceAtLeast)
	require.True(t, j.VolumeUpperBound)
	require.Nil(t, j.FittedResistanceRange[1], "open above")

	step := v2Check(t, profile(t, "demo-a"), func(r *setup.CheckRequest) {
		r.Readings = &physiology.Readings{PeakCmH2O: 40, EndCmH2O: 30}
		spo2 := 90.0
		r.Gas.SpO2Pct = &spo2
	})
	require.NotNil(t, step.Protocol, step.ProtocolProblem)
	var tx strings.Builder
	require.NoError(t, report.CheckText(&tx, step))
	require.Contains(t, tx.String(), "plateau cmH2O (fitted to the end pressure alone (the peak is at the relief valve))")
}

// A profile whose leak is 30 L/min at 20 cmH2O (the most validation
// accepts): the plan's hole loses about half its stroke to the leak, a
// stop. Derived lower bound: the leak's conductance is 30000/60/20 = 25
// mL/s per cmH2O, the circuit never falls below PEEP 5 during the 1.43 s
// delivery, so at least 25 x 5 x 1.43 = 179 mL leak of the 785 mL
// stroke of hole 19 (23 %); the issue measured 397 mL.
func TestLeakyProfileIsAStop(t *testing.T) {
	p := profile(t, "demo-a")
	p.Circuit.LeakLMinAt20CmH2O = 30
	pl, err := setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male}, Now: today}, p)
	require.NoError(t, err)
	c := cautionByID(pl.Cautions, setup.CautionLeakShareOfStroke)
	require.NotNil(t, c)
	require.Equal(t, setup.Stop, c.Level)
	require.InDelta(t, 30, c.Limit, 0)
	require.Greater(t, c.Value, 23.0, "derived lower bound")
	require.Contains(t, c.Advice, "find and fix the leak")
	// The same machine with no leak has no such caution.
	p.Circuit.LeakLMinAt20CmH2O = 0
	pl, err = setup.MakePlan(setup.Request{Patient: setup.Patient{HeightCm: 175, Sex: physiology.Male}, Now: today}, p)
	require.NoError(t, err)
	require.Nil(t, cautionByID(pl.Cautions, setup.CautionLeakShareOfStroke))
}
