package setup

import (
	"bytes"
	"encoding/json"
	"fmt"
	"reflect"
	"strings"
	"time"
	"unicode"

	"crankside/physiology"
)

// RecordFormat marks one handover check in the log.
const RecordFormat = "crankside-check/1"

// EvaluationJSON is one setting's figures and cautions.
type EvaluationJSON struct {
	FiguresJSON
	Cautions []Caution `json:"cautions"`
}

// ReadingsJSON are the manometer readings entered.
type ReadingsJSON struct {
	PeakCmH2O float64 `json:"peak_cmh2o"`
	EndCmH2O  float64 `json:"end_pressure_cmh2o"`
}

// CheckJSON is the object `crankside check --json` prints, and the body
// of a log record.
type CheckJSON struct {
	ProfileID       string        `json:"profile_id"`
	CalibrationDate string        `json:"calibration_date"`
	HeightCm        float64       `json:"height_cm"`
	Sex             string        `json:"sex"`
	PBWKg           float64       `json:"pbw_kg"`
	Setting         Setting       `json:"setting"`
	Readings        *ReadingsJSON `json:"readings"`
	// The fitted lung, when the readings gave one.
	FittedComplianceMLPerCmH2O *float64 `json:"fitted_compliance_ml_per_cmh2o"`
	FittedResistanceCmH2OPerLS *float64 `json:"fitted_resistance_cmh2o_per_l_s"`
	FitProblem                 string   `json:"fit_problem,omitempty"`
	// FitEndOnly: the fit is to the end pressure alone (the peak sat at
	// the relief valve), so there is no fitted resistance (null).
	FitEndOnly bool `json:"fit_end_only,omitempty"`
	// FittedResistanceAtLeast: with FitEndOnly, the least resistance that
	// brings the model's peak to the relief valve (the real one may be
	// higher); null when the resistance is assumed.
	FittedResistanceAtLeast *float64 `json:"fitted_resistance_at_least_cmh2o_per_l_s,omitempty"`
	// VolumeUpperBound: the readings suggest a leak (readings-suggest-leak)
	// or the peak sat at the relief valve, so the volumes are upper bounds,
	// never what the patient gets; VolumeNote says why in a sentence.
	VolumeUpperBound bool   `json:"delivered_vt_is_upper_bound,omitempty"`
	VolumeNote       string `json:"volume_note,omitempty"`
	MechanicsSource  string `json:"mechanics_source"`
	EvaluationJSON
	// FiguresWithheld says why the lung's figures are withheld (nil in
	// EvaluationJSON, null in the JSON); "" when they are given.
	FiguresWithheld string        `json:"figures_withheld,omitempty"`
	Proposed        *ProposedJSON `json:"proposed,omitempty"`
	// The blood gas and oximeter, and the protocol's next step they led
	// to (see Check.Protocol); absent from checks without a reading.
	GasReadings        *GasReadings      `json:"gas_readings,omitempty"`
	ProtocolStep       *ProtocolStepJSON `json:"protocol_step,omitempty"`
	ProtocolRuleStatus map[string]string `json:"protocol_rule_status,omitempty"` // rule id: fired, in-goal, no-step, no-reading
	ProtocolChanges    []Change          `json:"protocol_changes,omitempty"`
	ProtocolNotes      []string          `json:"protocol_notes,omitempty"`
	ProtocolProblem    string            `json:"protocol_problem,omitempty"`
	ProposalFrom       string            `json:"proposal_from,omitempty"`
	// P/F, S/F and the Berlin band; absent without a gas reading.
	*OxygenationJSON
	ClinicalCaution string `json:"clinical_caution"`
	// Version 2: what the manometer's resolution allows of the fit, each
	// [low, high] (null without a fit; an end null when the range is open
	// on that side, said in FitRangeNote), and the room and gas path.
	ManometerStepCmH2O    *float64     `json:"manometer_step_cmh2o,omitempty"`
	FittedComplianceRange *[2]*float64 `json:"fitted_compliance_range"`
	FittedResistanceRange *[2]*float64 `json:"fitted_resistance_range"`
	DeliveredVtRangeML    *[2]*float64 `json:"delivered_vt_range_ml"`
	FitRangeNote          string       `json:"fit_range_note,omitempty"`
	PatientEffortNote     string       `json:"patient_effort_note,omitempty"`
	Gas                   *GasJSON     `json:"gas,omitempty"`
	// What to time to confirm the setting, and the watch band (absent when
	// no lung explains the readings); older records have neither.
	TimingCheck *TimingCheck `json:"timing_check,omitempty"`
	// What a stopwatch check inferred ("" when the dials were read).
	InferredFromStopwatch string     `json:"inferred_from_stopwatch,omitempty"`
	Watch                 *WatchJSON `json:"watch,omitempty"`
	// EntriesConverted are the entries typed in the ward's units and what
	// each was read as (absent when all were in the tool's own).
	EntriesConverted []Conversion `json:"entries_converted,omitempty"`
}

// Unexplained reports whether no lung explains the readings: then no
// predicted figure of the current setting is what the patient gets, the
// lung's figures are withheld (LungFiguresJSON is nil, FiguresWithheld
// says why) and every report says so in their place.
func (j CheckJSON) Unexplained() bool { return j.FitProblem != "" }

// WithholdLung drops the current setting's lung figures when no lung
// explains the readings, and says why beside them. Check.JSON calls it,
// and so does the log's reader on every record it decodes (a record
// written with the figures as null decodes them as zeros otherwise).
func (j *CheckJSON) WithholdLung() {
	if !j.Unexplained() {
		return
	}
	j.LungFiguresJSON = nil
	j.FiguresWithheld = WithheldReason
}

// WithheldReason is what stands beside the withheld lung figures.
const WithheldReason = "no lung explains the readings: no figure that depends on the lung is known for this setting"

// lungFigureKeys are the JSON keys of LungFiguresJSON, read off its type:
// a figure added there is withheld with the others, with no list to keep.
func lungFigureKeys() []string {
	t := reflect.TypeOf(LungFiguresJSON{})
	keys := make([]string, 0, t.NumField())
	for i := 0; i < t.NumField(); i++ {
		name, _, _ := strings.Cut(t.Field(i).Tag.Get("json"), ",")
		keys = append(keys, name)
	}
	return keys
}

// checkJSONFields has CheckJSON's fields without its methods.
type checkJSONFields CheckJSON

// MarshalJSON writes the check with every key in order. Without the
// lung's figures (withheld) each of their keys is written as null, where
// the figure would stand, so that a script reading "delivered_vt_ml"
// finds null, never a number, and the log's records keep one shape.
func (j CheckJSON) MarshalJSON() ([]byte, error) {
	if j.LungFiguresJSON != nil {
		return json.Marshal(checkJSONFields(j))
	}
	j.LungFiguresJSON = &LungFiguresJSON{}
	b, err := json.Marshal(checkJSONFields(j))
	if err != nil {
		return nil, err
	}
	return nullTopLevel(b, lungFigureKeys())
}

// nullTopLevel rewrites the values of the named keys of a JSON object (its
// own keys, not those of nested objects) as null, keeping the key order.
func nullTopLevel(obj []byte, keys []string) ([]byte, error) {
	withheld := map[string]bool{}
	for _, k := range keys {
		withheld[k] = true
	}
	dec := json.NewDecoder(bytes.NewReader(obj))
	if t, err := dec.Token(); err != nil || t != json.Delim('{') {
		return nil, fmt.Errorf("setup: check JSON is not an object")
	}
	var out bytes.Buffer
	out.WriteByte('{')
	for i := 0; dec.More(); i++ {
		t, err := dec.Token()
		if err != nil {
			return nil, err
		}
		key, _ := t.(string)
		var v json.RawMessage
		if err := dec.Decode(&v); err != nil {
			return nil, err
		}
		if withheld[key] {
			v = json.RawMessage("null")
		}
		kb, _ := json.Marshal(key)
		if i > 0 {
			out.WriteByte(',')
		}
		out.Write(kb)
		out.WriteByte(':')
		out.Write(v)
	}
	out.WriteByte('}')
	return out.Bytes(), nil
}

// ProposedJSON is a proposed change's setting, figures and differences.
type ProposedJSON struct {
	Setting Setting `json:"setting"`
	EvaluationJSON
	Differences []DifferenceJSON `json:"differences"`
}

// DifferenceJSON is one figure now and proposed. Current and change are
// null when the readings are unexplained and the figure depends on the
// lung: nothing is then known of what the patient gets now.
type DifferenceJSON struct {
	What     string   `json:"what"`
	Unit     string   `json:"unit"`
	Current  *float64 `json:"current"`
	Proposed float64  `json:"proposed"`
	Change   *float64 `json:"change"`
}

func differenceJSON(d Difference, unexplained bool) DifferenceJSON {
	j := DifferenceJSON{What: d.What, Unit: d.Unit, Proposed: r4(d.Proposed)}
	if !unexplained || d.machineOnly {
		c, ch := r4(d.Current), r4(d.Change)
		j.Current, j.Change = &c, &ch
	}
	return j
}

func evaluationJSON(e Evaluation) EvaluationJSON {
	return EvaluationJSON{FiguresJSON: figuresJSON(e.Figures), Cautions: roundCautions(e.Cautions)}
}

// JSON is the check as the --json object.
func (ck Check) JSON() CheckJSON {
	j := CheckJSON{
		ProfileID: ck.ProfileID, CalibrationDate: ck.Calibration.Date, EntriesConverted: ck.Converted,
		HeightCm: r4(ck.Patient.HeightCm), Sex: ck.Patient.Sex.String(), PBWKg: r4(ck.PBWKg),
		Setting: ck.Current.Setting, FitProblem: ck.FitProblem, MechanicsSource: ck.Mechanics.Source,
		EvaluationJSON: evaluationJSON(ck.Current), ClinicalCaution: ClinicalCaution,
	}
	if ck.Readings != nil {
		j.Readings = &ReadingsJSON{PeakCmH2O: ck.Readings.PeakCmH2O, EndCmH2O: ck.Readings.EndCmH2O}
	}
	if ck.Fitted != nil {
		c, r := r4(ck.Fitted.ComplianceMLPerCmH2O), r4(ck.Fitted.ResistanceCmH2OPerLS)
		j.FittedComplianceMLPerCmH2O = &c
		switch {
		case ck.Fitted.RAtLeast:
			j.FittedResistanceAtLeast = &r
		case !ck.Fitted.EndOnly:
			j.FittedResistanceCmH2OPerLS = &r
		}
		j.FitEndOnly = ck.Fitted.EndOnly
		if n := ck.VolumeBoundNote(); n != "" {
			j.VolumeUpperBound, j.VolumeNote = true, n
		}
		j.PatientEffortNote = PatientEffortNote
	}
	if fr := ck.Ranges; fr != nil {
		step := r4(fr.StepCmH2O.Value)
		j.ManometerStepCmH2O = &step
		j.FittedComplianceRange, j.FittedResistanceRange = rangeJSON(fr.ComplianceMLPerCmH2O, fr.OpenC), rangeJSON(fr.ResistanceCmH2OPerLS, fr.OpenR)
		j.DeliveredVtRangeML, j.FitRangeNote = rangeJSON(fr.DeliveredML, fr.OpenVt), fr.Note()
	}
	if ck.Gas.Room.BTPSFactor > 0 {
		g := gasJSON(ck.Gas)
		j.Gas = &g
	}
	if ck.Proposed != nil {
		p := &ProposedJSON{Setting: ck.Proposed.Setting, EvaluationJSON: evaluationJSON(*ck.Proposed)}
		for _, d := range ck.Differences {
			p.Differences = append(p.Differences, differenceJSON(d, ck.FitProblem != ""))
		}
		j.Proposed = p
	}
	tc := ck.TimingCheck.JSON()
	j.TimingCheck, j.InferredFromStopwatch = &tc, ck.Inferred
	if ck.Watch != nil {
		w := ck.Watch.JSON()
		j.Watch = &w
	}
	ck.protocolJSON(&j)
	j.WithholdLung()
	return j
}

// rangeJSON is a range with an open end as null.
func rangeJSON(v [2]float64, open [2]bool) *[2]*float64 {
	var out [2]*float64
	for i := range v {
		if !open[i] {
			x := r4(v[i])
			out[i] = &x
		}
	}
	return &out
}

// Record is one handover check as kept in the log: a bed label and the
// operator's initials, never a patient's name or other identifier.
type Record struct {
	Format   string    `json:"format"`
	Time     time.Time `json:"time"`
	Bed      string    `json:"bed"`
	Initials string    `json:"initials"`
	// SecondInitials are a second checker's, when a ward double-checks a
	// change (written only when given).
	SecondInitials string `json:"second_initials,omitempty"`
	// WriterVersion is the version of the record rules its writer kept
	// (package logbook's RecordVersion, stamped when the record is
	// appended); 0, no "record" key, is a writer from before the key.
	WriterVersion int `json:"record,omitempty"`
	CheckJSON
}

// recordHead is a record's own keys, before the check's.
type recordHead struct {
	Format   string    `json:"format"`
	Time     time.Time `json:"time"`
	Bed      string    `json:"bed"`
	Initials string    `json:"initials"`
	// SecondInitials: see Record.
	SecondInitials string `json:"second_initials,omitempty"`
	// WriterVersion: see Record; after the bed, so that a reader finds
	// format, time and bed first, as the first writers wrote them.
	WriterVersion int `json:"record,omitempty"`
}

// MarshalJSON writes the record's own keys, then the check's as
// CheckJSON writes them (its MarshalJSON would otherwise stand for the
// whole record, since the check is embedded).
func (r Record) MarshalJSON() ([]byte, error) {
	head, err := json.Marshal(recordHead{Format: r.Format, Time: r.Time, Bed: r.Bed, Initials: r.Initials, SecondInitials: r.SecondInitials, WriterVersion: r.WriterVersion})
	if err != nil {
		return nil, err
	}
	body, err := r.CheckJSON.MarshalJSON()
	if err != nil {
		return nil, err
	}
	if len(body) <= 2 {
		return head, nil
	}
	return append(append(head[:len(head)-1], ','), body[1:]...), nil
}

// NewRecord stamps a check with its bed, initials and time. The bed label
// is written upper case (BedKey): b4 and B4 are one bed.
func NewRecord(ck Check, bed, initials string, at time.Time) (Record, error) {
	if err := CheckBedLabel(bed); err != nil {
		return Record{}, err
	}
	if err := CheckInitials(initials); err != nil {
		return Record{}, err
	}
	return Record{Format: RecordFormat, Time: at.UTC().Truncate(time.Second), Bed: BedKey(bed), Initials: strings.ToUpper(initials), CheckJSON: ck.JSON()}, nil
}

// BedKey is the label a bed is recorded, grouped and looked up under: its
// ASCII letters upper case, so that b4 and B4 are one bed (labels hold
// only ASCII letters, digits and - _ . /; see CheckBedLabel). Other bytes
// are kept as they are.
func BedKey(label string) string {
	for i := 0; i < len(label); i++ {
		if c := label[i]; c >= 'a' && c <= 'z' {
			b := []byte(label)
			for j := i; j < len(b); j++ {
				if b[j] >= 'a' && b[j] <= 'z' {
					b[j] -= 'a' - 'A'
				}
			}
			return string(b)
		}
	}
	return label
}

// CheckBedLabel accepts short labels such as "B4" or "ward3-12". A label
// must hold a digit: that keeps a patient's name from being typed as one.
func CheckBedLabel(bed string) error {
	const max = 16
	if bed == "" {
		return &InputError{Field: "bed", Reason: "a bed label is needed, like B4 (never a patient's name)"}
	}
	if len(bed) > max {
		return &InputError{Field: "bed", Reason: fmt.Sprintf("%s is longer than %d characters", physiology.Quote(bed), max)}
	}
	digit := false
	for _, r := range bed {
		switch {
		case r >= '0' && r <= '9':
			digit = true
		case r < 128 && (unicode.IsLetter(r) || strings.ContainsRune("-_./", r)):
		default:
			return &InputError{Field: "bed", Reason: fmt.Sprintf("%s may hold only letters, digits and - _ . /", physiology.Quote(bed))}
		}
	}
	if !digit {
		return &InputError{Field: "bed", Reason: fmt.Sprintf("%s has no digit: use the bed's number, like B4, never a patient's name", physiology.Quote(bed))}
	}
	return nil
}

// CheckInitials accepts one to four letters, or none: a record without
// initials says so on its card.
func CheckInitials(in string) error {
	if in == "" {
		return nil
	}
	if len(in) > 4 {
		return &InputError{Field: "initials", Reason: fmt.Sprintf("%s: give the operator's initials, 1-4 letters", physiology.Quote(in))}
	}
	for _, r := range in {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z') {
			return &InputError{Field: "initials", Reason: fmt.Sprintf("%s: initials are letters only", physiology.Quote(in))}
		}
	}
	return nil
}
