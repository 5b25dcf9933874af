package setup

import (
	"fmt"
	"io"
	"strings"
)

// A check is printed in one way, whether as the command's text or as the
// handover card: both are drawn from the check's JSON body (which is what
// a record keeps), its setting rows and its figure rows. Only the heading
// differs.

// reportWriter collects lines, wrapped to a width when one is set.
type reportWriter struct {
	b     strings.Builder
	width int // 0: no wrapping
}

func (w *reportWriter) line(format string, args ...any) {
	text := fmt.Sprintf(format, args...)
	if w.width == 0 {
		w.b.WriteString(text + "\n")
		return
	}
	for _, l := range wrap(text, w.width) {
		w.b.WriteString(l + "\n")
	}
}

// FirstStop is the first stop among the cautions, or nil.
func FirstStop(cs []Caution) *Caution {
	for i := range cs {
		if cs[i].Level == Stop {
			return &cs[i]
		}
	}
	return nil
}

// SettingHeading is the heading over a setting: it never reads as an
// instruction when the setting has a stop.
func SettingHeading(cs []Caution, instruction string) string {
	if s := FirstStop(cs); s != nil {
		return "STOP: DO NOT USE THIS SETTING (" + s.ID + ")"
	}
	return instruction
}

func (w *reportWriter) checkBody(j CheckJSON) {
	cur := j.Setting
	var prop *Setting
	var propFigures *FiguresJSON
	if j.Proposed != nil {
		prop, propFigures = &j.Proposed.Setting, &j.Proposed.FiguresJSON
	}
	if s := FirstStop(j.Cautions); s != nil {
		w.line("STOP  %s", s.Message)
	}
	w.settingTable(cur, prop, j.Cautions)
	if j.Readings != nil {
		w.line("MANOMETER  peak %.1f cmH2O, end of inspiration %.1f cmH2O", j.Readings.PeakCmH2O, j.Readings.EndCmH2O)
	}
	if j.FittedComplianceMLPerCmH2O != nil {
		w.line("LUNG (fitted)  C %.0f mL/cmH2O, R %.0f cmH2O/(L/s)", *j.FittedComplianceMLPerCmH2O, *j.FittedResistanceCmH2OPerLS)
	} else {
		w.line("LUNG (assumed)  C %.0f mL/cmH2O, R %.0f cmH2O/(L/s) (%s)", j.ComplianceMLPerCmH2O, j.ResistanceCmH2OPerLS, j.MechanicsSource)
	}
	if j.FitProblem != "" {
		w.line("READINGS  %s", j.FitProblem)
	}
	w.figureTable(FigureRows(j.FiguresJSON, propFigures))
	w.cautionList("NOW", j.Cautions)
	if j.Proposed != nil {
		w.cautionList("PROPOSED", j.Proposed.Cautions)
	}
}

func (w *reportWriter) settingTable(cur Setting, prop *Setting, cs []Caution) {
	head := SettingHeading(cs, "THE MACHINE IS SET TO")
	rows := SettingRows(cur, prop)
	if prop == nil {
		w.line("%s", head)
		for _, r := range rows {
			w.line("  %-14s %8s%s", r.Label, r.Now, strings.TrimRight(" "+r.Unit, " "))
		}
		return
	}
	w.line("%-24s %9s %9s", head, "now", "proposed")
	for _, r := range rows {
		mark := ""
		if r.Changed {
			mark = "  <- changes"
		}
		w.line("  %-22s %9s %9s%s", r.Label+unitSuffix(r.Unit), r.Now, r.Proposed, mark)
	}
}

func unitSuffix(unit string) string {
	if unit == "" {
		return ""
	}
	return " (" + unit + ")"
}

func (w *reportWriter) figureTable(rows []Row) {
	proposal := len(rows) > 0 && rows[0].HasProposal
	if proposal {
		w.line("%-28s %10s %10s %8s", "THE PATIENT GETS", "now", "proposed", "change")
	} else {
		w.line("THE PATIENT GETS")
	}
	for _, r := range rows {
		label := "  " + r.Label + unitSuffix(r.Unit)
		if proposal {
			w.line("%-28s %10s %10s %8s", label, r.Text, r.ProposedText, r.ChangeText)
		} else {
			w.line("%-28s %10s", label, r.Text)
		}
	}
	w.line("  %s", DrivingNote)
}

func (w *reportWriter) cautionList(label string, cs []Caution) {
	if len(cs) == 0 {
		w.line("CAUTIONS %s: none", label)
		return
	}
	w.line("CAUTIONS %s (%d, highest %s)", label, len(cs), LevelWord(Highest(cs)))
	for _, c := range cs {
		w.line("  %-4s %s: %s; %s [%s]", LevelWord(c.Level), c.ID, c.Message, c.Advice, c.Source)
	}
}

// WriteText prints a check for a person: the setting (beside a proposed
// change), the readings and the lung used, the figures with the change,
// and the cautions of each.
func (ck Check) WriteText(w io.Writer) error {
	rw := &reportWriter{}
	rw.line("crankside check on %s: %.0f cm %s, PBW %.1f kg", ck.ProfileID, ck.Patient.HeightCm, ck.Patient.Sex, ck.PBWKg)
	rw.checkBody(ck.JSON())
	rw.line("")
	rw.line("%s", ClinicalCaution)
	_, err := io.WriteString(w, rw.b.String())
	return err
}

// CardWidth is the widest line of a handover card.
const CardWidth = 80

// WriteCard prints a handover card: plain text, at most 80 columns, for a
// printer or the bedside folder.
func WriteCard(w io.Writer, r Record) error {
	rw := &reportWriter{width: CardWidth}
	rule := strings.Repeat("=", CardWidth)
	rw.line("%s", rule)
	by := r.Initials
	if by == "" {
		by = "(initials not given)"
	}
	if s := FirstStop(r.Cautions); s != nil {
		rw.line("STOP: THIS SETTING IS NOT TO BE USED AS IT IS (%s)", s.ID)
	}
	rw.line("HANDOVER CARD  bed %s  %s UTC  checked by %s", r.Bed, r.Time.UTC().Format("2006-01-02 15:04"), by)
	rw.line("Machine %s, calibration %s", r.ProfileID, orNone(r.CalibrationDate))
	rw.line("Patient %.0f cm %s, PBW %.1f kg (no name or identifier recorded)", r.HeightCm, r.Sex, r.PBWKg)
	rw.line("%s", rule)
	rw.checkBody(r.CheckJSON)
	rw.line("%s", rule)
	rw.line("%s", ClinicalCaution)
	_, err := io.WriteString(w, rw.b.String())
	return err
}

// WriteCard prints the record's handover card (see WriteCard).
func (r Record) WriteCard(w io.Writer) error { return WriteCard(w, r) }
