package ui

import (
	"os"
	"path/filepath"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/ansi"
	"github.com/stretchr/testify/require"

	"crankside/setup"
)

// focusCheckField moves the handover form's cursor to a field by name.
func focusCheckField(t *testing.T, m *Model, name string) {
	t.Helper()
	for i, f := range m.handover.form.fields {
		if f.name == name {
			m.handover.form.move(i)
			return
		}
	}
	t.Fatalf("no handover field %s", name)
}

// The gas unit is chosen on the handover panel by its letter; a PaO2 of
// 25 kPa is then read as 187.5 mmHg (NIST SP 811: 25 x 7.50062 = 187.52)
// and the conversion is shown; the choice is written to the preferences
// file, and a screen started from that file starts in kPa.
func TestGasUnitChosenOnTheScreenIsEchoedAndKept(t *testing.T) {
	p, src := demoProfile(t, "demo-a")
	prefs := filepath.Join(t.TempDir(), "crankside", "preferences.json")
	start := func() *Model {
		read, err := setup.ReadPreferences(prefs)
		require.NoError(t, err)
		m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow, LogPath: "",
			Prefill: map[string]string{"height-cm": "175", "sex": "male"}, Preferences: read, PreferencesPath: prefs})
		m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
		press(m, fkey(6))
		return m
	}
	m := start()
	require.Equal(t, setup.GasUnitMmHg, m.checkField("gas-unit").Value(), "no file: mmHg")
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter)
	focusCheckField(t, m, "gas-unit")
	press(m, runes("k"))
	require.Equal(t, "PaO2 kPa", m.checkField("pao2").label)
	require.Equal(t, "PaCO2 kPa", m.checkField("paco2").label)
	_, err := os.Stat(prefs)
	require.NoError(t, err, "the choice is kept")
	focusCheckField(t, m, "pao2")
	press(m, runes("25"))
	require.NotNil(t, m.out.check, "%v", m.out.checkWaiting)
	require.Contains(t, ansi.Strip(m.handover.View()), "PaO2 25 kPa = 187.5 mmHg")
	require.InDelta(t, 187.5, *m.out.check.BloodGas.PaO2MmHg, 0.05, "NIST SP 811: 25 x 7.50062")

	again := start()
	require.Equal(t, setup.GasUnitKPa, again.checkField("gas-unit").Value(), "the next start is in kPa")
	require.Equal(t, "PaO2 kPa", again.checkField("pao2").label)
}

// In mmHg, a PaO2 of 7.7 is refused beside its field with the conversion
// (derived: 7.7 x 7.50062 = 57.8 mmHg); plausible PaO2 from 30 mmHg (from
// memory).
func TestGasInTheOtherUnitIsRefusedOnTheScreen(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"), enter)
	focusCheckField(t, m, "pao2")
	press(m, runes("7.7"))
	require.Nil(t, m.out.check)
	require.Contains(t, m.checkField("pao2").err, "7.7 looks like kPa (= 57.8 mmHg): say the unit")
	// Typed in kPa, then the unit put back to mmHg: refused, and the
	// waiting line names the entry by its new label.
	focusCheckField(t, m, "gas-unit")
	press(m, runes("k"))
	require.Empty(t, m.checkField("pao2").err)
	press(m, runes("m"))
	require.Contains(t, m.out.checkWaiting, "PaO2 mmHg: "+m.checkField("pao2").err)
}

// A preferences file the writer could not have written is not used, and
// the handover panel says so.
func TestARefusedPreferencesFileIsSaid(t *testing.T) {
	p, src := demoProfile(t, "demo-a")
	m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow,
		Preferences: setup.Preferences{GasUnit: setup.GasUnitMmHg}, PreferencesNote: "preferences /x/preferences.json not used: gas_unit \"torr\" is not mmhg or kpa"})
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	press(m, fkey(6))
	v := ansi.Strip(m.handover.View())
	require.Contains(t, v, "! preferences /x/preferences.json not")
	require.Contains(t, v, `used: gas_unit "torr" is not mmhg or kpa`)
}

// The height field takes feet and inches: 5'10" is 70 in = 177.8 cm
// (1 in = 2.54 cm exactly), echoed beside the field, and the plan is the
// one for 177.8 cm (ARDS Network 2000 card: 70 in male -> PBW 73 kg; 73.1
// from the cm form).
func TestHeightInFeetAndInchesOnTheScreen(t *testing.T) {
	m := newTestModel(t, nil)
	press(m, runes(`5'10"`), enter, runes("m"))
	require.NotNil(t, m.out.plan, "%v", m.out.waiting)
	require.InDelta(t, 177.8, m.out.plan.Patient.HeightCm, 1e-9)
	require.InDelta(t, 73.1, m.out.plan.PBWKg, 0.05)
	require.Contains(t, screen(m), "read as 177.8 cm")
	// A bad form is refused with one line beside the field.
	m = newTestModel(t, nil)
	press(m, runes(`5'13"`), enter, runes("m"))
	require.Nil(t, m.out.plan)
	require.Contains(t, m.field("height-cm").err, "under 12")
}

// The card of a recorded check carries the record's time, not the time the
// card is opened (derived: recorded at 09:00 UTC, opened at 10:30).
func TestTheCardCarriesTheRecordsTime(t *testing.T) {
	m, _ := handoverModel(t)
	press(m, runes("B4"), enter, runes("ab"), enter, runes("8"), enter, runes("21"), enter, runes("1.4"))
	press(m, ctrlS)
	require.Contains(t, screen(m), "Recorded for bed B4 at 09:00 UTC")
	m.now = func() time.Time { return testNow().Add(90 * time.Minute) }
	press(m, ctrlO)
	require.NotNil(t, m.overlay)
	require.Contains(t, m.overlay.text, "HANDOVER CARD  bed B4  2026-12-01 09:00 UTC")
	require.Contains(t, m.overlay.title, "as recorded at 09:00 UTC")
}
