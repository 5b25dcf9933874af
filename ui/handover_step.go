package ui

import (
	"strings"

	"crankside/report"
	"crankside/setup"
)

// The protocol's next step on the handover panel: offered once a gas
// reading is typed, taken into the proposal fields with Ctrl+T, where the
// person can still change any value before recording. Every word and
// number of it comes from setup.

// stepToTake is the step's proposal entries when there is a step that
// changes the setting and it is not yet what the proposal fields hold.
func stepToTake(o *outcome) (setup.Entries, bool) {
	if o == nil || o.check == nil || o.check.ProposalFrom == setup.ProposalEnteredAsStep {
		return nil, false
	}
	return setup.StepEntries(*o.check)
}

// SetOutcome also switches the Take key on only when there is a step to
// take, so that the help line shows it only then.
func (p *handoverPanel) SetOutcome(o *outcome) {
	p.out = o
	_, ok := stepToTake(o)
	p.keys.Take.SetEnabled(ok)
}

// protocolOffer is the readings' step above the comparison: the setting
// it proposes and how to take it, what the machine's steps changed, and
// where the proposal evaluated below came from. Why the step is what it
// is comes after the comparison (protocolWhy), so that on a small screen
// the offer and the figures it leads to are in view together.
func (p *handoverPanel) protocolOffer(add func(string), j setup.CheckJSON) {
	s := p.styles
	if j.GasReadings == nil {
		return
	}
	if j.ProtocolProblem != "" {
		add(s.Section.Render("PROTOCOL STEP: NONE"))
		add(s.Error.Render(j.ProtocolProblem))
		return
	}
	if j.ProtocolStep == nil {
		return
	}
	text := report.StepSettingText(j)
	if j.Proposed != nil && j.ProposalFrom != setup.ProposalEntered {
		// The step's own setting has a stop: said before it, in words.
		if st := setup.FirstStop(j.Proposed.Cautions); st != nil {
			add(s.levelWord(setup.Stop) + " " + s.Error.Render("DO NOT USE THE STEP'S SETTING AS IT IS: "+st.Message))
		}
	}
	switch {
	case !report.StepChanges(j):
		add(s.Section.Render("Protocol step: ") + s.Value.Render(text))
	case j.ProposalFrom == setup.ProposalEnteredAsStep:
		add(s.Section.Render("Protocol step taken into PROPOSE: ") + s.Value.Render(text) +
			s.Hint.Render(" (change any value there before recording)"))
	default:
		take := " - Ctrl+T takes it"
		if j.ProposalFrom == setup.ProposalEntered {
			take += " (replaces the proposal entered)"
		}
		add(s.Section.Render("Protocol step: ") + s.Value.Render(text) + s.FieldFocused.Render(take))
	}
	for _, c := range report.StepChangeLines(j) {
		add(s.Label.Render(" machine: ") + s.Value.Render(c))
	}
	if l := report.ProposalFromLine(j); l != "" {
		add(s.Hint.Render(l))
	}
}

// protocolWhy is every rule of the step with its reading, goal and action
// (and the source of those that fired), and the protocol's notes.
func (p *handoverPanel) protocolWhy(add func(string), j setup.CheckJSON) {
	s := p.styles
	if j.GasReadings == nil || j.ProtocolProblem != "" || j.ProtocolStep == nil {
		return
	}
	add(s.Section.Render("WHY THIS PROTOCOL STEP"))
	// The rules that fired in full; the others one line each, as the
	// screen beside the form is narrow (the card has them all in full).
	for _, r := range report.ProtocolRuleRows(j) {
		if r.Fired {
			add(" " + s.Caution.Render(r.Word) + " " + s.Value.Render(r.Head))
			add(s.Hint.Render("   " + r.Action + " [" + r.Source + "]"))
			continue
		}
		// "IN GOAL plateau: Vt stays 6.5", not "IN GOAL plateau: in goal: ...".
		add(" " + s.Label.Render(r.Word) + " " + s.Hint.Render(r.ID+": "+strings.TrimPrefix(r.Action, "in goal: ")))
	}
	for _, n := range j.ProtocolNotes {
		add(s.Label.Render(" note: ") + s.Hint.Render(n))
	}
}

// takeStep fills the proposal fields with the protocol's step and
// recomputes, as if they had been typed: the check then evaluates them,
// and the person may change any before recording.
func (m *Model) takeStep() {
	e, ok := stepToTake(&m.out)
	if !ok {
		m.handoverNote(m.styles.Error.Render("! no protocol step to take: enter a blood gas or oximeter reading with a complete check"))
		return
	}
	for name, v := range e {
		if f := m.checkField(name); f != nil {
			f.SetValue(v)
		}
	}
	m.entryChanged()
}
