package report

import (
	"crankside/setup"
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

// SettingHeading is the heading over a setting: it never reads as an
// instruction when the setting has a stop.
func SettingHeading(cs []setup.Caution, instruction string) string {
	if s := setup.FirstStop(cs); s != nil {
		return "STOP: DO NOT USE THIS SETTING (" + string(s.ID) + ")"
	}
	return instruction
}

// StopLine names the first stop in full, for the line over a setting that
// must not be used; "" without a stop.
func StopLine(cs []setup.Caution) string {
	if s := setup.FirstStop(cs); s != nil {
		return "STOP  " + string(s.ID) + ": " + s.Message
	}
	return ""
}

// UnexplainedLine says, with the level word, that the readings cannot be
// explained and why, in full.
func UnexplainedLine(fitProblem string) string {
	return "STOP  THE READINGS CANNOT BE EXPLAINED: " + fitProblem +
		". Nothing here is what the patient gets now: check the patient and the circuit, then re-take both readings."
}

// AssumedLungLabel heads a proposal's figures when the readings could not
// be explained.
const AssumedLungLabel = "with the ASSUMED lung (the readings could not be explained)"

func (w *reportWriter) checkBody(j setup.CheckJSON) {
	cur := j.Setting
	var prop *setup.Setting
	var propFigures *setup.FiguresJSON
	if j.Proposed != nil {
		prop, propFigures = &j.Proposed.Setting, &j.Proposed.FiguresJSON
	}
	if j.Unexplained() {
		w.line("%s", UnexplainedLine(j.FitProblem))
	}
	if s := setup.FirstStop(j.Cautions); s != nil && s.ID != setup.CautionReadingsUnexplained {
		w.line("%s", StopLine(j.Cautions))
	}
	if line := setup.ConversionLine(j.EntriesConverted); line != "" {
		w.line("ENTERED  %s", line)
	}
	w.protocolSection(j)
	w.settingTable(cur, prop, j.Cautions)
	if j.InferredFromStopwatch != "" {
		w.line("%s", j.InferredFromStopwatch)
	}
	if j.Readings != nil {
		w.line("MANOMETER  peak %.1f cmH2O, end of inspiration %.1f cmH2O", j.Readings.PeakCmH2O, j.Readings.EndCmH2O)
	}
	switch {
	case j.FittedResistanceAtLeast != nil:
		w.line("LUNG (fitted to the end pressure: the peak is at the relief valve)  C %s mL/cmH2O; R at least %s cmH2O/(L/s) (the peak cannot tell more)",
			setup.Sig2(*j.FittedComplianceMLPerCmH2O), setup.Sig2(*j.FittedResistanceAtLeast))
		w.fitRanges(j)
	case j.FittedComplianceMLPerCmH2O != nil && j.FittedResistanceCmH2OPerLS == nil:
		w.line("LUNG (fitted to the end pressure alone: the peak is at the relief valve and cannot tell R)  C %s mL/cmH2O; R %s cmH2O/(L/s) assumed (the peak cannot tell it)",
			setup.Sig2(*j.FittedComplianceMLPerCmH2O), setup.Sig2(j.ResistanceCmH2OPerLS))
		w.fitRanges(j)
	case j.FittedComplianceMLPerCmH2O != nil:
		w.line("LUNG (fitted)  C %s mL/cmH2O, R %s cmH2O/(L/s)", setup.Sig2(*j.FittedComplianceMLPerCmH2O), setup.Sig2(*j.FittedResistanceCmH2OPerLS))
		w.fitRanges(j)
	case j.Unexplained():
		w.line("LUNG (ASSUMED, the readings could not be explained)  C %.0f mL/cmH2O, R %.0f cmH2O/(L/s) (%s)", j.ComplianceMLPerCmH2O, j.ResistanceCmH2OPerLS, j.MechanicsSource)
	default:
		w.line("LUNG (assumed)  C %.0f mL/cmH2O, R %.0f cmH2O/(L/s) (%s)", j.ComplianceMLPerCmH2O, j.ResistanceCmH2OPerLS, j.MechanicsSource)
	}
	if j.Gas != nil {
		w.line("ROOM  %s C, %s %% RH, %s mmHg: BTPS factor %.3f; %s", plain(j.Gas.Room["temperature_c"].Value), plain(j.Gas.Room["humidity_pct"].Value),
			plain(j.Gas.Room["barometric_mmhg"].Value), j.BTPSFactor, setup.BTPSNote)
		if j.Gas.ClearanceNote != "" {
			w.line("NOTE  %s", j.Gas.ClearanceNote)
		}
	}
	if j.LungFiguresJSON == nil {
		w.unexplainedFigures(j.FiguresJSON, propFigures)
	} else {
		w.figureTable(PatientGetsHeading(j), FigureRows(j.FiguresJSON, propFigures))
	}
	if j.TimingCheck != nil {
		w.watchSection(checkWatchToSet(j), *j.TimingCheck, WhyNoWatch(j.Unexplained()))
	}
	w.cautionList("NOW", j.Cautions)
	if j.Proposed != nil {
		label := "PROPOSED"
		if j.Unexplained() {
			label += " " + AssumedLungLabel
		}
		w.cautionList(label, j.Proposed.Cautions)
	}
}

// checkWatchToSet is the check's watch band when the current setting has no
// stop, nil otherwise: no alarm limits are given for a setting not to be
// used.
func checkWatchToSet(j setup.CheckJSON) *setup.WatchJSON {
	if setup.FirstStop(j.Cautions) != nil {
		return nil
	}
	return j.Watch
}

// fitRanges prints what the manometer's step allows of the fitted lung,
// the patient-effort note, and the room's BTPS factor.
func (w *reportWriter) fitRanges(j setup.CheckJSON) {
	if j.FittedComplianceRange != nil && j.ManometerStepCmH2O != nil {
		c, r, v := j.FittedComplianceRange, j.FittedResistanceRange, j.DeliveredVtRangeML
		w.line("  readings +/- half the manometer's %s cmH2O step allow C %s, R %s, tidal volume %s mL (BTPS), %s",
			plain(*j.ManometerStepCmH2O), jsonRangeText(c, setup.Sig2), jsonRangeText(r, setup.Sig2), jsonRangeText(v, func(x float64) string { return fmt.Sprintf("%.0f", x) }), setup.FitRangeLabel)
	}
	if j.FitRangeNote != "" {
		w.line("  %s", j.FitRangeNote)
	}
	if j.PatientEffortNote != "" {
		w.line("  %s", j.PatientEffortNote)
	}
}

// PatientGetsHeading heads the current figures: what the patient gets, or,
// when the volumes are upper bounds, that and why.
func PatientGetsHeading(j setup.CheckJSON) string {
	if j.VolumeUpperBound {
		return "AT MOST (UPPER BOUNDS: " + j.VolumeNote + ")"
	}
	return "THE PATIENT GETS"
}

// PatientGetsShort is PatientGetsHeading for a screen's table column.
func PatientGetsShort(j setup.CheckJSON) string {
	if j.VolumeUpperBound {
		return "AT MOST"
	}
	return "PATIENT GETS"
}

// jsonRangeText prints a JSON range, a null end as "open".
func jsonRangeText(r *[2]*float64, format func(float64) string) string {
	var v [2]float64
	var open [2]bool
	for i, x := range r {
		if x == nil {
			open[i] = true
		} else {
			v[i] = *x
		}
	}
	return setup.RangeText(v, open, format)
}

// unexplainedFigures replaces THE PATIENT GETS when the lung's figures
// are withheld: the machine's own figures (the rows FigureRows gives
// without the lung's part), and a proposal's figures labelled as resting
// on the assumed lung.
func (w *reportWriter) unexplainedFigures(cur setup.FiguresJSON, prop *setup.FiguresJSON) {
	w.line("THE PATIENT GETS: NOT KNOWN (the readings cannot be explained; no predicted figure is shown for this setting)")
	w.line("THE MACHINE'S TIMING NOW (does not depend on the lung)")
	for _, r := range FigureRows(cur, nil) {
		w.line("%-28s %10s", "  "+r.Label+unitSuffix(r.Unit), r.Text)
	}
	if prop != nil {
		w.figureTable("PROPOSED, "+AssumedLungLabel, FigureRows(*prop, nil))
	}
}

func (w *reportWriter) settingTable(cur setup.Setting, prop *setup.Setting, cs []setup.Caution) {
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

func (w *reportWriter) figureTable(title string, rows []Row) {
	proposal := len(rows) > 0 && rows[0].HasProposal
	if proposal {
		w.line("%-28s %10s %10s %8s", title, "now", "proposed", "change")
	} else {
		w.line("%s", title)
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

func (w *reportWriter) cautionList(label string, cs []setup.Caution) {
	if len(cs) == 0 {
		w.line("CAUTIONS %s: none", label)
		return
	}
	w.line("CAUTIONS %s (%d, highest %s)", label, len(cs), setup.LevelWord(setup.Highest(cs)))
	for _, c := range cs {
		w.line("  %-4s %s: %s; %s [%s]", setup.LevelWord(c.Level), c.ID, c.Message, c.Advice, c.Source)
	}
}

// CheckText prints a check for a person: the setting (beside a proposed
// change), the readings and the lung used, the figures with the change,
// and the cautions of each.
func CheckText(w io.Writer, ck setup.Check) error {
	rw := &reportWriter{}
	rw.line("crankside check on %s: %.0f cm %s, PBW %.1f kg", ck.ProfileID, ck.Patient.HeightCm, ck.Patient.Sex, ck.PBWKg)
	rw.checkBody(ck.JSON())
	rw.line("")
	rw.line("%s", setup.ClinicalCaution)
	_, err := io.WriteString(w, rw.b.String())
	return err
}

// CardWidth is the widest line of a handover card: it fits an 80-column
// terminal, and the screen's frame at 80x24 (76 columns inside), where a
// wider card would be wrapped a second time into fragments.
const CardWidth = 76

// WriteCard prints a handover card: plain text, at most 80 columns, for a
// printer or the bedside folder.
func WriteCard(w io.Writer, r setup.Record) error {
	rw := &reportWriter{width: CardWidth}
	rule := strings.Repeat("=", CardWidth)
	rw.line("%s", rule)
	by := checkedBy(r)
	if r.Unexplained() {
		rw.line("STOP: READINGS UNEXPLAINED - NOTHING ON THIS CARD IS WHAT THE PATIENT GETS")
	}
	if s := setup.FirstStop(r.Cautions); s != nil {
		rw.line("STOP: THIS SETTING IS NOT TO BE USED AS IT IS (%s)", s.ID)
	}
	if r.VolumeUpperBound {
		rw.line("THE VOLUMES ON THIS CARD ARE UPPER BOUNDS, NOT WHAT THE PATIENT GETS")
	}
	rw.line("HANDOVER CARD  bed %s  %s  checked by %s", r.Bed, setup.LocalDateTime(r.Time), by)
	rw.line("Machine %s, calibration %s", r.ProfileID, orNone(r.CalibrationDate))
	rw.line("Patient %.0f cm %s, PBW %.1f kg (no name or identifier recorded)", r.HeightCm, r.Sex, r.PBWKg)
	rw.line("%s", rule)
	rw.checkBody(r.CheckJSON)
	if l := secondSignatureLine(r); l != "" {
		rw.line("%s", l)
	}
	rw.line("%s", rule)
	rw.line("%s", setup.ClinicalCaution)
	_, err := io.WriteString(w, rw.b.String())
	return err
}
