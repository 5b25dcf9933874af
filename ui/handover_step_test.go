package ui

import (
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
	"github.com/charmbracelet/x/exp/teatest"
	"github.com/stretchr/testify/require"

	"crankside/setup"
)

var ctrlT = tea.KeyMsg{Type: tea.KeyCtrlT}

// The acidotic handover used below, derived by hand (demo-a: in-line crank,
// 0.5 rpm and 0.1 s steps; the delivery is half a turn, Ti = 30 / rpm), for
// an ARDS patient of 185 cm (PBW 50 + 0.91 x 32.6 = 79.7 kg, ARDS Network
// 2000): the protocol's rules are for ARDS, and at that PBW hole 9's breath
// is 6.0 mL/kg PBW, so the card's Vt step does not fire:
//   - now: hole 9, 21 rpm, dwell 1.4 s: breath 60/21 + 1.4 = 4.257 s,
//     14.09 /min, Ti 1.429 s, I:E 1:1.98;
//   - pH 7.22, PaCO2 58: HCO3 = 0.03 x 58 x 10^(7.22 - 6.1) = 22.94 mmol/L;
//     held, pH 7.35 needs PaCO2 22.94 / (0.03 x 10^1.25) = 43.0 mmHg
//     (Henderson-Hasselbalch, REFERENCES); at the same Vt the rate scales
//     as PaCO2 / PaCO2': 14.09 x 58 / 43.0 = 19.0 /min (alveolar
//     ventilation equation; ARDS Network protocol card: pH 7.15-7.30,
//     raise the rate);
//   - at the same I:E 1:1.98 a 3.158 s breath has Ti 1.060 s: 28.31 rpm,
//     28.5 on the motor's step (Ti 1.053 s, turn 2.105 s); the dwell 3.158 -
//     2.105 = 1.053 s is 1.1 s on the controller's step: breath 3.205 s,
//     18.72 /min;
//   - SpO2 92 is inside 88-95 and FiO2 stays 0.21: no O2 (0 L/min); hole 9
//     sweeps pi x 5^2 x 6.0 = 471 mL, so the plateau is about 5 + 471 / 30
//     (the ARDS lung's assumed compliance) = 21, under 25 and 30, and Vt
//     about 6.0 mL/kg PBW is neither under nor above 6: no Vt step, the hole
//     stays 9.

// ardsHandoverModel is handoverModel for that patient.
func ardsHandoverModel(t *testing.T) *Model {
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow,
		Prefill: map[string]string{"height-cm": "185", "sex": "male", "lung": "ards"}})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(6))
	require.Equal(t, panelHandover, m.focus)
	return m
}

func typeAcidoticHandover(m *Model) {
	press(m, runes("B4"), enter, runes("ab"), enter, runes("9"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, enter, enter, // PEEP, O2, peak, end: blank
		enter, // the gas unit: mmHg
		runes("92"), enter, enter, runes("7.22"), enter, runes("58"))
}

func TestHandoverTakesTheProtocolStep(t *testing.T) {
	m := ardsHandoverModel(t)
	require.False(t, m.handover.keys.Take.Enabled(), "no reading, no step to take")
	typeAcidoticHandover(m)
	ck := m.out.check
	require.NotNil(t, ck, "%v", m.out.checkWaiting)
	require.NotNil(t, ck.Protocol)
	require.True(t, m.handover.keys.Take.Enabled())
	v := screen(m)
	require.Contains(t, v, "Protocol step: hole 9, 28.5 rpm")
	require.Contains(t, v, "Ctrl+T takes it")
	require.Contains(t, m.fullHelp(), "ctrl+t take the protocol step", "the keys list offers it")

	press(m, ctrlT)
	// derived above
	for name, want := range map[string]string{"propose-hole": "9", "propose-rpm": "28.5", "propose-dwell-s": "1.1",
		"propose-peep": "5", "propose-o2-lpm": "0"} {
		require.Equal(t, want, m.checkField(name).Value(), name)
	}
	ck = m.out.check
	require.Equal(t, setup.ProposalEnteredAsStep, ck.ProposalFrom)
	require.NotNil(t, ck.Proposed)
	require.InDelta(t, 18.72, ck.Proposed.Figures.Timing.RateBPM, 0.01, "derived above")
	require.InDelta(t, 14.09, ck.Current.Figures.Timing.RateBPM, 0.01, "derived above")
	require.False(t, m.handover.keys.Take.Enabled(), "taken: nothing more to take")
	v = screen(m)
	require.Contains(t, v, "Protocol step taken into PROPOSE")
	panel := ansi.Strip(m.handover.View())
	require.Contains(t, panel, "proposed", "the comparison beside the current setting")
	require.Regexp(t, `Motor speed\s+21\.0\s+28\.5 \* rpm`, panel)
	require.Regexp(t, `Dwell\s+1\.4\s+1\.1 \* s`, panel)
	require.True(t, m.unsaved, "a new proposal is a check not yet recorded")

	// The person may still change the step before recording: a dwell of
	// 1.2 s gives 60 / (60/28.5 + 1.2) = 18.15 /min (derived), evaluated
	// as the proposal entered, and the step is offered again.
	m.handover.form.move(19)
	require.Equal(t, "propose-dwell-s", m.handover.form.current().name)
	press(m, runes("1.2"))
	ck = m.out.check
	require.Equal(t, setup.ProposalEntered, ck.ProposalFrom)
	require.InDelta(t, 18.15, ck.Proposed.Figures.Timing.RateBPM, 0.01)
	require.Contains(t, screen(m), "Ctrl+T takes it (replaces the proposal")
	require.True(t, m.handover.keys.Take.Enabled())
}

func TestHandoverGasReadingOutOfRangeIsMarked(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter,
		enter, enter, enter, enter, enter, runes("45"))
	// ARDS Network protocol card aside, an SpO2 of 45 % is outside the
	// plausible 50-100 % (common practice): refused on its own field.
	require.Nil(t, m.out.check)
	require.Contains(t, m.checkField("spo2").err, "outside 50-100")
	require.Contains(t, screen(m), "oxygenation goal SpO2 88-95 %", "the goal is shown beside the focused reading")
}

func TestHandoverCtrlTWithoutAStepSaysSo(t *testing.T) {
	m, _ := handoverModel(t)
	m.Update(stepTakeRequested{})
	require.Contains(t, screen(m), "no protocol step to take")
	require.Equal(t, "", m.checkField("propose-rpm").Value())
}

// A real program at 80x24: the readings typed, Ctrl+T, and the proposal
// fields hold the step.
func TestTakingTheStepInATerminal(t *testing.T) {
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow,
		Prefill: map[string]string{"height-cm": "185", "sex": "male", "lung": "ards"}})
	tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(80, 24))
	tm.Send(tea.KeyMsg{Type: tea.KeyF6})
	for _, k := range []string{"B4", "\r", "ab", "\r", "9", "\r", "21", "\r", "1.4", "\r", "\r", "\r", "\r", "\r", "\r",
		"92", "\r", "\r", "7.22", "\r", "58"} {
		if k == "\r" {
			tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
			continue
		}
		tm.Type(k)
	}
	teatest.WaitFor(t, tm.Output(), func(b []byte) bool { return strings.Contains(ansi.Strip(string(b)), "Ctrl+T takes it") },
		teatest.WithDuration(20*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
	tm.Send(ctrlT)
	teatest.WaitFor(t, tm.Output(), func(b []byte) bool { return strings.Contains(ansi.Strip(string(b)), "taken into PROPOSE") },
		teatest.WithDuration(20*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
	// Not recorded: the first Ctrl+C asks, the second quits.
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlC})
	tm.Send(tea.KeyMsg{Type: tea.KeyCtrlC})
	tm.WaitFinished(t, teatest.WithFinalTimeout(20*time.Second))
	final := tm.FinalModel(t).(*Model)
	require.Equal(t, "28.5", final.checkField("propose-rpm").Value(), "derived in typeAcidoticHandover")
	require.Equal(t, "1.1", final.checkField("propose-dwell-s").Value())
	require.Equal(t, setup.ProposalEnteredAsStep, final.out.check.ProposalFrom)
}
