package setup

import (
	"fmt"
	"math"
	"strconv"

	"crankside/profiles"
)

// A check with a blood gas or oximeter reading also carries the
// protocol's next step (protocolStep, in protocol.go). How it meets a proposal entered
// by hand: the hand's proposal wins and is the one evaluated, since the
// person may have taken the step and then changed a value, and the check
// says so (ProposalFrom). Without a hand proposal the step is the
// proposal, evaluated with its cautions.

// Where a check's proposal came from (Check.ProposalFrom, the JSON's
// proposal_from).
const (
	// ProposalFromStep: nothing was proposed by hand; the proposal is the
	// protocol's step.
	ProposalFromStep = "protocol-step"
	// ProposalEnteredAsStep: the proposal entered is the step's setting
	// (as the screen fills it when the step is taken).
	ProposalEnteredAsStep = "entered-as-protocol-step"
	// ProposalEntered: the proposal entered differs from the step's; the
	// step is shown but not evaluated.
	ProposalEntered = "entered"
)

// unexplainedNoStep is why a check whose readings no lung explains has no
// protocol step: the plateau rule would act on an assumed plateau while
// the manometer says something else is going on.
const unexplainedNoStep = "no protocol step while the manometer readings cannot be explained: the plateau rule would rest on an assumed lung; check the patient and the circuit and re-take the readings, then the step is computed"

// checkBesideGas checks the setting of a request with gas entries, which
// are refused outside their ranges, and carries them on the check; req is
// returned without them, as the step's rules read them apart.
func checkBesideGas(req CheckRequest, p profiles.Profile) (Check, CheckRequest, error) {
	if bad := CheckGasEntries(req.Gas); len(bad) > 0 {
		return Check{}, req, bad[0]
	}
	gas := req.Gas
	req.Gas = GasReadings{}
	ck, err := RunCheck(req, p)
	if err != nil {
		return Check{}, req, err
	}
	ck.BloodGas = &gas
	return ck, req, nil
}

// runCheckDeadSpaceOnly is RunCheck for a request whose only gas entry is
// the apparatus dead space: there is no step, and the check says that the
// entry was not used rather than dropping it without a word.
func runCheckDeadSpaceOnly(req CheckRequest, p profiles.Profile) (Check, error) {
	ck, _, err := checkBesideGas(req, p)
	if err != nil {
		return Check{}, err
	}
	ck.ProtocolProblem = fmt.Sprintf("no blood gas or oximeter reading: the apparatus dead space entered (%g mL) is used only by the pH rule, with pH and PaCO2", *ck.BloodGas.ApparatusDeadSpaceML)
	return ck, nil
}

// runCheckWithStep is RunCheck for a request with gas readings: the check
// of the setting (and of a hand proposal, if any) and the protocol's next
// step beside it. Gas readings outside their ranges are refused; a step
// that cannot be computed at this setting leaves the check standing and
// says why in ProtocolProblem.
func runCheckWithStep(req CheckRequest, p profiles.Profile) (Check, error) {
	gas := req.Gas
	ck, req, err := checkBesideGas(req, p)
	if err != nil {
		return Check{}, err
	}
	setting := ck // the setting's check, before the gas is judged: the step's starting point
	ck.judgeGas(gas)
	if ck.Unexplained() {
		ck.ProtocolProblem = unexplainedNoStep
		return ck, nil
	}
	fed, refused := gasForStep(gas)
	if fed.Empty() {
		ck.ProtocolProblem = "no protocol step: " + refused + "; re-take the gas, then the step is computed"
		return ck, nil
	}
	res, err := protocolStep(setting, req, fed, p)
	if err != nil {
		ck.ProtocolProblem = "no protocol step at this setting: " + err.Error()
		return ck, nil
	}
	if refused != "" {
		res.note(refused)
	}
	hand := req.Proposal
	stepEv, stepDiff := res.Check.Proposed, res.Check.Differences
	res.Check = Check{}
	ck.Protocol = &res
	switch {
	case hand.Empty():
		ck.Proposed, ck.Differences = stepEv, stepDiff
		if stepEv != nil {
			ck.ProposalFrom = ProposalFromStep
		}
	case SameSetting(hand.Apply(req.Setting), res.Proposed) && stepEv != nil:
		// The same setting: the step's evaluation also carries what the
		// machine's reach did to the step (a rate it cannot reach).
		ck.Proposed, ck.Differences = stepEv, stepDiff
		ck.ProposalFrom = ProposalEnteredAsStep
	default:
		ck.ProposalFrom = ProposalEntered
	}
	return ck, nil
}

// SameSetting compares two settings to well below any step of a dial.
func SameSetting(a, b Setting) bool {
	near := func(x, y float64) bool { return math.Abs(x-y) < 1e-6 }
	return a.Hole == b.Hole && near(a.RPM, b.RPM) && near(a.DwellS, b.DwellS) &&
		near(a.PEEPCmH2O, b.PEEPCmH2O) && near(a.O2LPerMin, b.O2LPerMin)
}

// StepEntries are the protocol step's setting as the proposal's entries
// ("propose-hole", "propose-rpm", "propose-dwell-s", "propose-peep",
// "propose-o2-lpm"), for a form to fill when the person takes the step;
// ok is false when the check has no step or the step changes nothing.
func StepEntries(ck Check) (e Entries, ok bool) {
	st := ck.Protocol
	if st == nil || SameSetting(st.Proposed, ck.Current.Setting) {
		return nil, false
	}
	num := func(v float64) string { return strconv.FormatFloat(r4(v), 'f', -1, 64) }
	s := st.Proposed
	return Entries{
		"propose-hole": s.Hole, "propose-rpm": num(s.RPM), "propose-dwell-s": num(s.DwellS),
		"propose-peep": num(s.PEEPCmH2O), "propose-o2-lpm": num(s.O2LPerMin),
	}, true
}

// protocolJSON fills the check's JSON with the readings and the step.
func (ck Check) protocolJSON(j *CheckJSON) {
	if ck.BloodGas != nil {
		j.GasReadings = roundedGas(*ck.BloodGas)
	}
	j.OxygenationJSON = ck.Oxygenation
	j.ProtocolProblem, j.ProposalFrom = ck.ProtocolProblem, ck.ProposalFrom
	st := ck.Protocol
	if st == nil {
		return
	}
	ps := st.JSON()
	j.ProtocolStep = &ps
	j.ProtocolRuleStatus = map[string]string{}
	for _, r := range st.Step.Rules {
		j.ProtocolRuleStatus[r.ID] = r.Status.String()
	}
	if len(st.Changes) > 0 {
		j.ProtocolChanges = st.ChangesJSON()
	}
	j.ProtocolNotes = append([]string(nil), st.Notes...)
}
