package report

import (
	"crankside/setup"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// The protocol step is printed from the check's JSON body, as the rest of
// a check is, so that the command's text, the handover card and the screen
// say the same thing about the same record.

// StepHeading heads the step's setting; it never reads as an instruction
// when the step's setting has a stop.
const StepHeading = "THE STEP ON THIS MACHINE"

// GasLine is the gas and oximeter entries on one line, each not taken said
// so.
func GasLine(g setup.GasReadings) string {
	one := func(name string, v *float64, unit string, digits int) string {
		if v == nil {
			return name + " not taken"
		}
		return name + " " + strconv.FormatFloat(*v, 'f', digits, 64) + unit
	}
	parts := []string{
		one("SpO2", g.SpO2Pct, " %", 0), one("PaO2", g.PaO2MmHg, " mmHg", 0),
		one("pH", g.PH, "", 2), one("PaCO2", g.PaCO2MmHg, " mmHg", 0),
	}
	if g.ApparatusDeadSpaceML == nil {
		parts = append(parts, "apparatus dead space not entered (0 mL assumed)")
	} else {
		parts = append(parts, fmt.Sprintf("apparatus dead space %.0f mL", *g.ApparatusDeadSpaceML))
	}
	return "BLOOD GAS / OXIMETER  " + strings.Join(parts, ", ")
}

// ProtocolRuleRow is one rule of the step as a person reads it: a status
// word (FIRED, IN GOAL, NO STEP, NO READING); Head, the rule with its
// reading and goal; Action, what it proposes or why it cannot; Source.
type ProtocolRuleRow struct {
	ID     string
	Word   string
	Fired  bool
	Head   string
	Action string
	Source string
}

var ruleWords = map[string]string{"fired": "FIRED", "in-goal": "IN GOAL", "no-step": "NO STEP", "no-reading": "NO READING"}

// ProtocolRuleRows are the step's rules in the order they were applied;
// nil without a step.
func ProtocolRuleRows(j setup.CheckJSON) []ProtocolRuleRow {
	if j.ProtocolStep == nil {
		return nil
	}
	var out []ProtocolRuleRow
	for _, r := range j.ProtocolStep.Rules {
		status := j.ProtocolRuleStatus[r.ID]
		word, ok := ruleWords[status]
		if !ok {
			word = "?"
		}
		value := "not taken"
		if r.Value != nil {
			value = ruleValue(r.ID, *r.Value)
		}
		head := fmt.Sprintf("%s: %s = %s, goal %s", r.ID, r.Reading, value, r.Goal)
		if r.Value == nil && r.ID == "protocol-scope" {
			head = fmt.Sprintf("%s: %s, goal %s", r.ID, r.Reading, r.Goal) // a word, not a number
		}
		out = append(out, ProtocolRuleRow{ID: r.ID, Word: word, Fired: status == "fired",
			Head:   head,
			Action: r.Action, Source: r.Source})
	}
	return out
}

func ruleValue(id string, v float64) string {
	if id == "ph" {
		return strconv.FormatFloat(v, 'f', 2, 64)
	}
	return strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64)
}

// stepSetting is the step's setting from its JSON.
func stepSetting(p setup.ProtocolProposedJSON) setup.Setting {
	return setup.Setting{Hole: p.Hole, RPM: p.MotorRPM, DwellS: p.DwellS, PEEPCmH2O: p.PEEPCmH2O, O2LPerMin: p.O2FlowLMin}
}

// StepChanges reports whether the step changes the setting.
func StepChanges(j setup.CheckJSON) bool {
	if j.ProtocolStep == nil {
		return false
	}
	return !setup.SameSetting(stepSetting(j.ProtocolStep.Proposed), roundedSetting(j.Setting))
}

func roundedSetting(s setup.Setting) setup.Setting {
	return setup.Setting{Hole: s.Hole, RPM: r4(s.RPM), DwellS: r4(s.DwellS), PEEPCmH2O: r4(s.PEEPCmH2O), O2LPerMin: r4(s.O2LPerMin)}
}

// StepSettingText is the step's setting on one line, without a heading:
// "hole 8, 21.0 rpm, dwell 1.4 s (15.0 /min), PEEP 5 cmH2O, FiO2 0.30
// (O2 3.2 L/min), Vt 6.1 mL/kg PBW", or why there is none.
func StepSettingText(j setup.CheckJSON) string {
	if j.ProtocolStep == nil {
		return ""
	}
	if !StepChanges(j) {
		return "no change on this machine: the setting stays (see the rules and notes)"
	}
	p := j.ProtocolStep.Proposed
	return fmt.Sprintf("hole %s, %.1f rpm, dwell %.1f s (%.1f /min), PEEP %.0f cmH2O, FiO2 %.2f (O2 %.1f L/min), Vt %.1f mL/kg PBW",
		p.Hole, p.MotorRPM, p.DwellS, p.RateBPM, p.PEEPCmH2O, p.FiO2, p.O2FlowLMin, p.TargetMLPerKg)
}

// StepSettingHeading heads the step's setting: a stop of the step's
// setting replaces the heading; a step not evaluated says so.
func StepSettingHeading(j setup.CheckJSON) string {
	switch {
	case j.ProposalFrom == setup.ProposalEntered && StepChanges(j):
		return StepHeading + " (not evaluated: the proposal entered differs from it)"
	case j.Proposed != nil && (j.ProposalFrom == setup.ProposalFromStep || j.ProposalFrom == setup.ProposalEnteredAsStep):
		return SettingHeading(j.Proposed.Cautions, StepHeading)
	}
	return StepHeading
}

// StepChangeLines say what the machine's steps changed from what the
// protocol wanted ("rate: wanted 21.1 /min, this machine 20.0 /min").
func StepChangeLines(j setup.CheckJSON) []string {
	var out []string
	for _, c := range j.ProtocolChanges {
		u := strings.TrimRight(" "+c.Unit, " ")
		out = append(out, fmt.Sprintf("%s: wanted %s%s, this machine %s%s", c.What, plain(r4(c.Wanted)), u, plain(r4(c.Got)), u))
	}
	return out
}

// ProposalFromLine says where the proposal evaluated came from, or "".
func ProposalFromLine(j setup.CheckJSON) string {
	switch j.ProposalFrom {
	case setup.ProposalFromStep:
		return "The proposal evaluated here is the protocol's step."
	case setup.ProposalEnteredAsStep:
		return "The proposal entered is the protocol's step, evaluated here."
	case setup.ProposalEntered:
		if StepChanges(j) {
			return "The proposal entered by hand is evaluated here, not the protocol's step: clear it, or enter the step's setting, to see the step's figures and cautions."
		}
		return "The proposal entered by hand is evaluated here; the protocol has no step."
	}
	return ""
}

// protocolSection prints the readings, every rule with its reading, goal,
// action and source, the step's setting on this machine, what the
// machine's steps changed and where the proposal came from.
func (w *reportWriter) protocolSection(j setup.CheckJSON) {
	if j.GasReadings == nil {
		return
	}
	w.line("%s", GasLine(*j.GasReadings))
	if g := setup.GasWardWords(j.Cautions); g != "" {
		// Near the top: the full list is under the figures.
		w.line("GAS CAUTIONS  %s (in full under CAUTIONS NOW)", g)
	}
	if o := setup.OxygenationText(j.OxygenationJSON); o != "" {
		w.line("OXYGENATION  %s", o)
	}
	if j.ProtocolProblem != "" {
		w.line("PROTOCOL STEP: NONE  %s", j.ProtocolProblem)
		return
	}
	if j.ProtocolStep == nil {
		return
	}
	w.line("PROTOCOL STEP (ARDS Network protocol; one step at a time; the clinician decides)")
	for _, r := range ProtocolRuleRows(j) {
		w.line("  %-10s %s", r.Word, r.Head)
		w.line("             %s [%s]", r.Action, r.Source)
	}
	w.line("%s  %s", StepSettingHeading(j), StepSettingText(j))
	for _, c := range StepChangeLines(j) {
		w.line("  MACHINE    %s", c)
	}
	for _, n := range j.ProtocolNotes {
		w.line("  NOTE       %s", n)
	}
	if l := ProposalFromLine(j); l != "" {
		w.line("  %s", l)
	}
}
