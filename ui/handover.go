package ui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"crankside/report"
	"crankside/setup"
)

// handoverKeys save the check, show the card and the bed's history, and
// take the protocol's step into the proposal fields.
type handoverKeys struct {
	Save, Card, History, Take key.Binding
}

func newHandoverKeys() handoverKeys {
	k := handoverKeys{
		Save:    key.NewBinding(key.WithKeys("ctrl+s"), key.WithHelp("ctrl+s", "record")),
		Card:    key.NewBinding(key.WithKeys("ctrl+o"), key.WithHelp("ctrl+o", "card")),
		History: key.NewBinding(key.WithKeys("ctrl+r"), key.WithHelp("ctrl+r", "history")),
		Take:    key.NewBinding(key.WithKeys("ctrl+t"), key.WithHelp("ctrl+t", "take the protocol step")),
	}
	// Only once a gas reading gives a step that changes the setting.
	k.Take.SetEnabled(false)
	return k
}

// handoverPanel asks what the machine is set to and what the manometer
// reads, and shows what the patient gets, the lung the readings imply and a
// proposed change beside the current setting. The patient it computes for
// is pinned at its top, so that the last bed's height never carries into
// the next one unseen.
type handoverPanel struct {
	formPanel
	keys handoverKeys
	bed  bedsideKeys
}

func newHandoverPanel(s *Styles) *handoverPanel {
	f := newForm(s,
		section{title: "THE MACHINE IS SET TO", fields: []*field{
			textField("bed", "Bed label", "", "like B4", kindLabel),
			textField("initials", "Initials", "", "", kindInitials),
			textField("hole", "Hole", "", "", kindLabel),
			numberField("rpm", "Motor rpm", "rpm", ""),
			numberField("dwell-s", "Dwell s", "s", ""),
			numberField("peep", "PEEP cmH2O", "cmH2O", "blank: 5"),
			numberField("o2-lpm", "O2 L/min", "L/min", "blank: none"),
		}},
		section{title: "MANOMETER READS", fields: []*field{
			numberField("peak", "Peak cmH2O", "cmH2O", ""),
			numberField("end-pressure", "End cmH2O", "cmH2O", ""),
		}},
		section{title: "BLOOD GAS / OXIMETER", fields: []*field{
			choiceField("gas-unit", "Gas unit", "", 0, choice{"m", "mmHg", setup.GasUnitMmHg}, choice{"k", "kPa", setup.GasUnitKPa}),
			numberField("spo2", "SpO2 %", "%", ""),
			numberField("pao2", "PaO2 mmHg", "mmHg", ""),
			numberField("ph", "pH", "", ""),
			numberField("paco2", "PaCO2 mmHg", "mmHg", ""),
			numberField("dead-space-ml", "Dead sp mL", "mL", ""),
		}},
		section{title: "O2 CYLINDER", fields: []*field{
			numberField("cylinder-l", "Cyl. L", "L", ""),
			numberField("cylinder-bar", "Cyl. bar", "bar", ""),
		}},
		section{title: "PROPOSE", fields: []*field{
			textField("propose-hole", "Hole", "", "", kindLabel),
			numberField("propose-rpm", "Motor rpm", "rpm", ""),
			numberField("propose-dwell-s", "Dwell s", "s", ""),
			numberField("propose-peep", "PEEP cmH2O", "cmH2O", ""),
			numberField("propose-o2-lpm", "O2 L/min", "L/min", ""),
		}},
		section{title: "NO SPEED DISPLAY: TIMED", fields: []*field{
			numberField("turn-s", "Turn s", "s", "in place of rpm"),
			numberField("pause-s", "Pause s", "s", "in place of dwell"),
			numberField("breaths-per-min", "Count/min", "/min", "counted, in place of dwell"),
		}},
		// Asked at every check: this unit cannot follow a patient's
		// breath (setup's patient-triggering stop).
		section{title: "BREATHING AGAINST THE UNIT?", fields: []*field{
			choiceField("breathing-against", "Fights unit", "", -1, choice{"y", "yes", "yes"}, choice{"n", "no", "no"}),
		}},
		// Optional: a ward that double-checks a change of hole or PEEP
		// records the second checker too (the card leaves a line to sign).
		section{title: "SECOND CHECKER", fields: []*field{
			textField("second-initials", "Initials 2", "", "optional", kindInitials),
		}},
	)
	f.compact = true
	p := &handoverPanel{keys: newHandoverKeys(), bed: newBedsideKeys()}
	p.styles, p.form = s, f
	return p
}

func (p *handoverPanel) Title() string { return "Handover" }

func (p *handoverPanel) SetSize(w, h int) {
	p.w, p.h = w, h
	// The form scrolls inside its column to keep the focused field in
	// view, under the pinned patient line.
	p.form.width, p.form.height = formColumn, max(h-3, 4)
}

// formColumn is the width of the entries beside the results.
const formColumn = 29

func (p *handoverPanel) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok {
		return p, nil
	}
	switch {
	case key.Matches(km, p.keys.Save):
		return p, ask(recordRequested{})
	case key.Matches(km, p.keys.Card):
		return p, ask(cardRequested{})
	case key.Matches(km, p.keys.History):
		return p, ask(historyRequested{})
	case key.Matches(km, p.keys.Take), km.String() == "ctrl+t":
		// Shown in the help only when there is a step; without one the
		// key says why rather than nothing.
		return p, ask(stepTakeRequested{})
	}
	if cmd := p.bed.request(km, true); cmd != nil {
		return p, cmd
	}
	return p, p.updateForm(km)
}

func (p *handoverPanel) View() string {
	s := p.styles
	head := s.Label.Render("For ") + s.Value.Render(p.patientLine()) + s.Hint.Render(" (F1 to change)")
	if f := p.form.current(); p.form.focused && f.note != "" {
		// The form beside the results is compact: a refused key's
		// reason goes here, where it can be read.
		head += "\n" + s.Error.Render("! "+f.note)
	} else if p.form.focused && f.unconfirmed {
		head += "\n" + s.Error.Render(f.label+" "+orNone(f.Value())+" is "+f.from+": Enter confirms it at the machine, typing changes it")
	} else if p.form.focused && f.isText() && f.selected {
		// Said in words, as the full-width forms say it beside the field:
		// without colour the highlight of a selected value is not drawn.
		head += "\n" + s.Hint.Render(f.label+": typing replaces "+f.Value()+"; an arrow edits it")
	} else if g := setup.CheckHint(f.name); p.form.focused && g != "" {
		// What the entry is and what a blank one is taken to be (a gas
		// reading's goal and the rule it serves), as the full-width forms
		// say it beside the field.
		head += "\n" + s.Hint.Render(f.label+": "+g)
	}
	rw := max(p.w-formColumn-2, 20)
	left := lipgloss.NewStyle().Width(formColumn).Render(p.form.view())
	right := strings.Join(wrapBlock(p.results(), rw), "\n")
	return head + "\n" + lipgloss.JoinHorizontal(lipgloss.Top, left, "  ", right)
}

// patientLine is who the check is computed for.
func (p *handoverPanel) patientLine() string {
	if p.out == nil || p.out.check == nil {
		if p.out != nil && p.out.plan != nil {
			pl := p.out.plan
			return fmt.Sprintf("%.0f cm %s, PBW %.1f kg, lung %s", pl.Patient.HeightCm, pl.Patient.Sex, pl.PBWKg, pl.Lung)
		}
		return "no patient yet: height and sex on F1"
	}
	ck := p.out.check
	return fmt.Sprintf("%.0f cm %s, PBW %.1f kg, lung %s", ck.Patient.HeightCm, ck.Patient.Sex, ck.PBWKg, p.out.checkLung)
}

func (p *handoverPanel) results() string {
	s := p.styles
	o := p.out
	var l []string
	add := func(x string) { l = append(l, x) }
	if o != nil && o.saveNote != "" {
		add(o.saveNote)
	}
	if o != nil && o.unitNote != "" {
		add(s.Error.Render("! " + o.unitNote))
	}
	if o == nil || o.check == nil {
		if o != nil && o.saveNote == "" {
			add(s.Hint.Render(o.logNote))
		}
		var reasons []string
		if o != nil {
			reasons = o.checkWaiting
			for _, c := range o.readingStops {
				add(s.levelWord(c.Level) + " " + s.Error.Render(c.Message+": "+c.Advice))
			}
		}
		add(s.waitingView(reasons))
		return strings.Join(l, "\n")
	}
	ck := o.check
	// The level of the setting and of the proposal, and what to dial,
	// first: at 80x24 they are on the panel's first screen beside the
	// entries, and the detail follows.
	p.levelLine(add, ck)
	for _, w := range o.checkWaiting {
		add(s.Hint.Render(w))
	}
	p.recordLines(add)
	if ck.Unexplained() {
		// A measured alarm is never replaced by a calm prediction: the
		// reason comes first, in full, and no figure is shown as what
		// the patient gets.
		add(s.levelWord(setup.Stop) + " " + s.Error.Render(strings.TrimPrefix(report.UnexplainedLine(ck.FitProblem), "STOP  ")))
	}
	if st := setup.FirstStop(ck.Current.Cautions); st != nil {
		add(s.levelWord(setup.Stop) + " " + s.Error.Render("DO NOT USE THIS SETTING AS IT IS: "+st.Message))
	}
	p.enteredLine(add, ck)
	if j := o.checkJSON; ck.Proposed != nil && (j.ProposalFrom == "" || j.ProposalFrom == setup.ProposalEntered) {
		// A proposal typed by hand is judged as loudly as the setting (the
		// step's own stop is said with its offer).
		if st := setup.FirstStop(ck.Proposed.Cautions); st != nil {
			add(s.levelWord(setup.Stop) + " " + s.Error.Render("DO NOT MAKE THE PROPOSED CHANGE AS IT IS: "+st.Message))
		}
	}
	// Then, in this order so that at 80x24 the comparison is in view
	// under the alarms: the lung in one line, the protocol's offer, the
	// setting and what the patient gets now and proposed, the cautions,
	// and only then why the step, how sure the fit is, and the log.
	j := o.checkJSON
	p.gasLine(add, j)
	p.lungLine(add, ck)
	p.protocolOffer(add, j)
	p.settingTable(add, j)
	if j.LungFiguresJSON == nil {
		// The lung's figures are withheld: there is none to show.
		add(s.Error.Render("THE PATIENT GETS: NOT KNOWN (the readings cannot be explained)"))
		if ck.Proposed != nil {
			add(s.Section.Render("PROPOSED " + report.AssumedLungLabel))
			prop := j.Proposed.FiguresJSON
			for _, r := range report.FigureRows(prop, nil) {
				add(s.Label.Render(fmt.Sprintf("%-15s", r.Label)) + s.Value.Render(fmt.Sprintf(" %7s", r.Text)) + " " + s.Unit.Render(r.Unit))
			}
		}
	} else {
		p.figureTable(add, j)
	}
	p.cautionLines(add, "Now", ck.Current.Cautions)
	if ck.Proposed != nil {
		p.cautionLines(add, "Proposed", ck.Proposed.Cautions)
	}
	p.oxygenationLines(add, j)
	p.protocolWhy(add, j)
	p.fitLines(add, ck)
	if o.saveNote == "" {
		add(s.Hint.Render(o.logNote))
	}
	return strings.Join(l, "\n")
}

// gasLine is the patient's own numbers in a few words, above the
// machine's figures: the gas cautions with their levels and the graded
// P/F or S/F (the full list is under the figures and on F5).
func (p *handoverPanel) gasLine(add func(string), j setup.CheckJSON) {
	s := p.styles
	g := setup.GasCheckText(j)
	if g == "" {
		return
	}
	st := s.Value
	if h := setup.Highest(gasOnly(j.Cautions)); h >= setup.Warn {
		st = s.Caution
	}
	add(s.Label.Render("Patient's ") + st.Render(g))
}

// oxygenationLines are P/F and S/F with the Berlin band and its sources.
func (p *handoverPanel) oxygenationLines(add func(string), j setup.CheckJSON) {
	if o := setup.OxygenationText(j.OxygenationJSON); o != "" {
		add(p.styles.Section.Render("OXYGENATION (P/F, S/F)"))
		add(p.styles.Hint.Render(o))
	}
}

// gasOnly are the gas cautions among cs.
func gasOnly(cs []setup.Caution) []setup.Caution {
	var out []setup.Caution
	for _, c := range cs {
		if setup.IsGasCaution(c.ID) {
			out = append(out, c)
		}
	}
	return out
}

// recordLines say which record the check was started from and, until
// each value of the setting is confirmed or changed at the machine, that
// it is still the record's; only then whether it was found as recorded.
func (p *handoverPanel) recordLines(add func(string)) {
	s, o := p.styles, p.out
	if o.started == "" {
		return
	}
	add(s.Hint.Render(o.started))
	switch {
	case len(o.toConfirm) > 0:
		// Nobody has looked at the machine yet: nothing here is called
		// found until each value is confirmed or changed.
		add(s.Error.Render(strings.ToUpper(o.fromAt[:1]) + o.fromAt[1:] + ": confirm each value at the machine (" +
			strings.Join(o.toConfirm, ", ") + "): Enter confirms, typing changes"))
	case len(o.changedFromRecord) == 0:
		add(s.Label.Render("Found as recorded."))
	}
	for _, c := range o.changedFromRecord {
		add(s.Caution.Render("Found otherwise: " + c))
	}
}

// levelLine is the highest level now and proposed, and the dial line.
func (p *handoverPanel) levelLine(add func(string), ck *setup.Check) {
	s := p.styles
	level := func(cs []setup.Caution) string {
		if len(cs) == 0 {
			return s.Label.Render("no cautions")
		}
		return s.levelWord(setup.Highest(cs))
	}
	line := s.Label.Render("Now ") + level(ck.Current.Cautions)
	if ck.Proposed != nil {
		line += s.Label.Render("  Proposed ") + level(ck.Proposed.Cautions)
	}
	add(line)
	if d := dialText(ck); d != "" {
		add(s.Label.Render("Dial: ") + s.Big.Render(d))
	}
}

// lungLine says which lung the figures are for: fitted, or assumed.
func (p *handoverPanel) lungLine(add func(string), ck *setup.Check) {
	s := p.styles
	lung := fmt.Sprintf("C %.0f mL/cmH2O, R %.0f cmH2O/(L/s)", ck.Mechanics.Value, ck.Resistance.Value)
	switch {
	case ck.Fitted != nil && ck.Fitted.EndOnly:
		add(s.Label.Render("Lung from the end pressure alone ") + s.Value.Render(lung) + s.Hint.Render(" (R "+ck.Resistance.Source+")"))
	case ck.Fitted != nil:
		add(s.Label.Render("Fitted lung ") + s.Value.Render(lung))
	case ck.Unexplained():
		add(s.Label.Render("ASSUMED lung (readings unexplained) ") + s.Value.Render(lung))
	default:
		add(s.Label.Render("Assumed lung ") + s.Value.Render(lung) + s.Hint.Render(" ("+ck.Mechanics.Source+")"))
	}
}

// fitLines say how sure a fitted lung is: what the manometer's resolution
// allows of it, and what a patient's own effort does to the readings.
func (p *handoverPanel) fitLines(add func(string), ck *setup.Check) {
	s := p.styles
	if ck.Fitted == nil {
		return
	}
	add(s.Section.Render("HOW SURE THE FITTED LUNG IS"))
	if r := ck.Ranges; r != nil {
		add(s.Label.Render(fmt.Sprintf("readings +/- %g/2 cmH2O: ", r.StepCmH2O.Value)) + s.Value.Render(r.Text()) +
			s.Hint.Render(", "+setup.FitRangeLabel))
		if n := r.Note(); n != "" {
			add(s.Hint.Render(n))
		}
	}
	add(s.Hint.Render(setup.PatientEffortNote))
}

func (p *handoverPanel) settingTable(add func(string), j setup.CheckJSON) {
	s := p.styles
	var prop *setup.Setting
	if j.Proposed != nil {
		prop = &j.Proposed.Setting
	}
	rows := report.SettingRows(j.Setting, prop)
	head := fmt.Sprintf("%-12s %7s", "SETTING", "now")
	if prop != nil {
		head += fmt.Sprintf(" %8s", "proposed")
	}
	add(s.Section.Render(head))
	for _, r := range rows {
		line := s.Label.Render(fmt.Sprintf("%-12s", r.Label)) + s.Value.Render(fmt.Sprintf(" %7s", r.Now))
		if prop != nil {
			line += s.Value.Render(fmt.Sprintf(" %8s", r.Proposed))
			if r.Changed {
				line += s.Caution.Render(" *")
			}
		}
		add(line + " " + s.Unit.Render(r.Unit))
	}
	if j.InferredFromStopwatch != "" {
		add(s.Hint.Render(j.InferredFromStopwatch))
	}
}

func (p *handoverPanel) figureTable(add func(string), j setup.CheckJSON) {
	s := p.styles
	var prop *setup.FiguresJSON
	if j.Proposed != nil {
		prop = &j.Proposed.FiguresJSON
	}
	rows := report.FigureRows(j.FiguresJSON, prop)
	lw := 15
	for _, r := range rows {
		lw = max(lw, len(r.Label))
	}
	if j.VolumeUpperBound {
		add(s.Error.Render(j.VolumeNote))
	}
	head := fmt.Sprintf("%-*s %7s", lw, report.PatientGetsShort(j), "now")
	if prop != nil {
		head += fmt.Sprintf(" %8s %6s", "proposed", "change")
	}
	add(s.Section.Render(head))
	for _, r := range rows {
		line := s.Label.Render(fmt.Sprintf("%-*s", lw, r.Label)) + s.Value.Render(fmt.Sprintf(" %7s", r.Text))
		if prop != nil {
			line += s.Value.Render(fmt.Sprintf(" %8s", r.ProposedText)) + s.Unit.Render(fmt.Sprintf(" %6s", r.ChangeText))
		}
		add(line + " " + s.Unit.Render(r.Unit))
	}
	add(s.Hint.Render(report.DrivingNote))
}

// cautionLines lists every caution in full: none is cut short.
func (p *handoverPanel) cautionLines(add func(string), label string, cs []setup.Caution) {
	s := p.styles
	if len(cs) == 0 {
		add(s.Label.Render(label + ": no cautions"))
		return
	}
	add(s.Label.Render(fmt.Sprintf("%s: %d caution%s, highest ", label, len(cs), plural(len(cs)))) + s.levelWord(setup.Highest(cs)))
	for _, c := range cs {
		add(" " + s.levelWord(c.Level) + " " + s.Caution.Render(c.Message))
	}
}

func (p *handoverPanel) ShortHelp() []key.Binding {
	k := p.form.keys
	return []key.Binding{k.Advance, p.keys.Save, p.keys.Card, p.keys.History, p.keys.Take, p.bed.Sheet, p.bed.Pace}
}

func (p *handoverPanel) FullHelp() [][]key.Binding {
	k := p.form.keys
	return [][]key.Binding{{k.Advance, k.Up, k.Down, k.Clear}, {p.keys.Save, p.keys.Card, p.keys.History, p.keys.Take}, {p.bed.Sheet, p.bed.Pace}}
}

// orNone is a blank entry in words.
func orNone(v string) string {
	if v == "" {
		return "(blank)"
	}
	return v
}
