package setup_test

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/report"
	"crankside/setup"
)

func acidoticEntries() setup.Entries {
	return setup.Entries{"height-cm": "175", "sex": "male", "hole": "9", "rpm": "21", "dwell-s": "1.4",
		"spo2": "92", "ph": "7.22", "paco2": "58"}
}

// Round-trip property: the step's entries, typed back as a proposal, are
// the step (the screen's Ctrl+T), and the check says so.
func TestStepEntriesRoundTrip(t *testing.T) {
	p := profile(t, "demo-a")
	req, problems := setup.BuildCheckRequest(acidoticEntries(), today)
	require.Empty(t, problems)
	ck, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	require.Equal(t, setup.ProposalFromStep, ck.ProposalFrom)
	e, ok := setup.StepEntries(ck)
	require.True(t, ok)
	all := acidoticEntries()
	for k, v := range e {
		all[k] = v
	}
	req, problems = setup.BuildCheckRequest(all, today)
	require.Empty(t, problems)
	taken, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	require.Equal(t, setup.ProposalEnteredAsStep, taken.ProposalFrom)
	require.Equal(t, ck.Proposed.Setting, taken.Proposed.Setting)
	require.Equal(t, ck.Proposed.Cautions, taken.Proposed.Cautions)
	_, ok = setup.StepEntries(taken)
	require.True(t, ok, "the step is still there to see; the screen switches its key off")

	// One value changed by hand: the proposal entered, evaluated as typed.
	all["propose-dwell-s"] = "1.2"
	req, _ = setup.BuildCheckRequest(all, today)
	mine, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	require.Equal(t, setup.ProposalEntered, mine.ProposalFrom)
	require.Equal(t, 1.2, mine.Proposed.Setting.DwellS)
}

func TestGasEntriesAreEachMarked(t *testing.T) {
	e := acidoticEntries()
	e["spo2"], e["ph"], e["paco2"], e["pao2"], e["dead-space-ml"] = "45", "7,9", "x", "700", "-1"
	_, problems := setup.BuildCheckRequest(e, today)
	var fields []string
	for _, p := range problems {
		fields = append(fields, p.Field)
	}
	// In the order of the form; plausible ranges are common practice.
	require.Equal(t, []string{"spo2", "pao2", "ph", "paco2", "dead-space-ml"}, fields)
	require.Contains(t, problems.Field("ph").Reason, "7.9", "a decimal comma is read as a point")
	for _, name := range []string{"spo2", "pao2", "ph"} {
		require.Contains(t, setup.Hint(name, 0), "ARDS Network", name)
	}
	require.Contains(t, setup.Hint("spo2", 0), "88-95 %")
	require.Contains(t, setup.Hint("pao2", 0), "55-80 mmHg")
	require.Contains(t, setup.Hint("ph", 0), "7.30-7.45")
}

// A record written before the protocol step still reads, and its card has
// no protocol section.
func TestOldRecordsStillRead(t *testing.T) {
	p := profile(t, "demo-a")
	req, _ := setup.BuildCheckRequest(setup.Entries{"height-cm": "175", "sex": "male", "hole": "9", "rpm": "21", "dwell-s": "1.4"}, today)
	ck, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B4", "ab", today)
	require.NoError(t, err)
	b, err := json.Marshal(rec)
	require.NoError(t, err)
	for _, k := range []string{"gas_readings", "protocol_step", "proposal_from"} {
		require.NotContains(t, string(b), `"`+k+`"`, "omitted when empty, as in older records")
	}
	path := filepath.Join(t.TempDir(), "log.jsonl")
	require.NoError(t, os.WriteFile(path, append(b, '\n'), 0o600))
	recs, bad, err := readLog(path)
	require.NoError(t, err)
	require.Empty(t, bad)
	require.Len(t, recs, 1)
	require.Nil(t, recs[0].GasReadings)
	var card strings.Builder
	require.NoError(t, report.WriteCard(&card, recs[0]))
	require.NotContains(t, card.String(), "PROTOCOL STEP")
}

// The record keeps the readings and the step, and its card prints them as
// the command's text does (one renderer).
func TestRecordCarriesTheStep(t *testing.T) {
	p := profile(t, "demo-a")
	req, _ := setup.BuildCheckRequest(acidoticEntries(), today)
	ck, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B4", "ab", today)
	require.NoError(t, err)
	b, err := json.Marshal(rec)
	require.NoError(t, err)
	path := filepath.Join(t.TempDir(), "log.jsonl")
	require.NoError(t, os.WriteFile(path, append(b, '\n'), 0o600))
	recs, _, err := readLog(path)
	require.NoError(t, err)
	got := recs[0]
	require.Equal(t, 7.22, *got.GasReadings.PH)
	require.Equal(t, "fired", got.ProtocolRuleStatus["ph"])
	require.Equal(t, "in-goal", got.ProtocolRuleStatus["oxygenation"])
	require.Equal(t, rec.ProtocolStep, got.ProtocolStep, "round-trip property of the record")
	var card, text strings.Builder
	require.NoError(t, report.WriteCard(&card, got))
	require.NoError(t, report.CheckText(&text, ck))
	for _, want := range []string{"BLOOD GAS / OXIMETER", "FIRED      ph: pH = 7.22", "THE STEP ON THIS MACHINE", "MACHINE    rate"} {
		require.Contains(t, card.String(), want)
		require.Contains(t, text.String(), want)
	}
}

// An apparatus dead space with no gas reading feeds no rule (the pH rule
// reads pH and PaCO2: ARDS Network protocol card); the check says the
// entry was not used, in the text and the JSON, rather than dropping it.
func TestDeadSpaceAloneIsSaidToBeUnused(t *testing.T) {
	p := profile(t, "demo-a")
	req, problems := setup.BuildCheckRequest(setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21",
		"dwell-s": "1.4", "dead-space-ml": "50"}, today)
	require.Empty(t, problems)
	ck, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	require.Nil(t, ck.Protocol, "no step without a reading")
	require.Contains(t, ck.ProtocolProblem, "dead space entered (50 mL) is used only by the pH rule")
	j := ck.JSON()
	require.NotNil(t, j.GasReadings)
	require.Equal(t, 50.0, *j.GasReadings.ApparatusDeadSpaceML)
	var text strings.Builder
	require.NoError(t, report.CheckText(&text, ck))
	require.Contains(t, text.String(), "PROTOCOL STEP: NONE  no blood gas or oximeter reading")

	negative := -5.0
	req.Gas.ApparatusDeadSpaceML = &negative
	_, err = setup.RunCheck(req, p)
	require.Error(t, err, "its range is still checked")
}

// A PaO2 below the goal of 55-80 mmHg (ARDS Network protocol card) steps
// up FiO2 first at PEEP 5: on this machine only the O2 bleed changes. The
// history's proposal line must show it and say it is the protocol's step,
// or it would read as the setting itself.
func TestHistoryProposalLineShowsTheOxygenAndTheStep(t *testing.T) {
	p := profile(t, "demo-a")
	req, problems := setup.BuildCheckRequest(setup.Entries{"height-cm": "175", "sex": "male", "hole": "8", "rpm": "21",
		"dwell-s": "1.4", "pao2": "50"}, today)
	require.Empty(t, problems)
	ck, err := setup.RunCheck(req, p)
	require.NoError(t, err)
	require.Equal(t, setup.ProposalFromStep, ck.ProposalFrom)
	rec, err := setup.NewRecord(ck, "B4", "ab", today)
	require.NoError(t, err)
	line := report.ProposalLine(rec)
	require.Contains(t, line, "(the protocol's step)")
	require.Contains(t, line, "; O2 ")
	require.NotContains(t, report.HistoryLine(rec), "; O2 ", "the setting has no O2 bleed")
	require.Greater(t, rec.Proposed.Setting.O2LPerMin, 0.0)
}

// The step's entries are written as a person types them: a whole number
// without a decimal point, a value off the 0.1 marks to its last digit.
// SpO2 85 on room air at PEEP 5 steps to FiO2 0.3, PEEP 5 (ARDS Network
// lower-PEEP/FiO2 table) and, at 182 cm where hole 8 is 6 mL/kg PBW
// (atHeight), only the O2 flow changes. A check whose gas
// was all used carries no empty note.
func TestStepEntriesAreWrittenAsTyped(t *testing.T) {
	req := atHeight(protocolReq("8", 21, 1.4, 5, 0), 182)
	req.Gas = setup.GasReadings{SpO2Pct: gas(85)}
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	e, ok := setup.StepEntries(ck)
	require.True(t, ok)
	require.Equal(t, "5", e["propose-peep"])
	require.Equal(t, "21", e["propose-rpm"])
	require.Equal(t, "1.4", e["propose-dwell-s"])
	require.NotEqual(t, "0", e["propose-o2-lpm"])
	require.NotNil(t, ck.Protocol)
	for _, n := range ck.Protocol.Notes {
		require.NotEmpty(t, n)
	}
}
