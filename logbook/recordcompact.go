package logbook

import (
	"bytes"
	"encoding/json"
	"fmt"

	"crankside/setup"
)

// The compact record (RecordV3). A record repeats nothing the reader can
// put back by itself, and keeps what the ward and a bed's history show, so
// that they need no profile:
//
//   - left out, and recomputed by the reader: the clinical caution (a
//     constant), the withheld-figures sentence (a constant, when no lung
//     explains the readings), and the setting's hole, motor speed, dwell,
//     PEEP and O2 flow repeated among a setting's figures (written when
//     they differ from the setting, which a check never makes them);
//   - left out, and reproducible from the record's entries on its profile
//     (profile_id, calibration_date, the patient, the setting, the
//     readings, the gas and room): the watch band and the timing check,
//     which neither the ward nor a history shows and which a record of the
//     first writers lacked too;
//   - left out: every key whose value is null (absent reads as null);
//   - kept: the figures and cautions, with their words, that the ward, the
//     history, the card of a record and the rules of a record read.

// compactDropped are the top-level keys the compact writer never writes.
var compactDropped = map[string]bool{"clinical_caution": true, "figures_withheld": true, "watch": true, "timing_check": true}

// settingCopies are a setting's own values among its figures.
var settingCopies = map[string]bool{"hole": true, "motor_rpm": true, "dwell_s": true, "peep_cmh2o": true, "o2_flow_l_min": true}

// copiesSetting reports whether the figures repeat the setting exactly.
func copiesSetting(f setup.MachineFiguresJSON, s setup.Setting) bool {
	return f.Hole == s.Hole && f.MotorRPM == s.RPM && f.DwellS == s.DwellS && f.PEEPCmH2O == s.PEEPCmH2O && f.O2FlowLMin == s.O2LPerMin
}

// encodeRecordLine is a record as RecordVersion's writer writes it: its
// JSON (setup.Record's keys, in their order) without what the compact
// record leaves out.
func encodeRecordLine(rec setup.Record) ([]byte, error) {
	rec.WriterVersion = RecordVersion
	full, err := json.Marshal(rec)
	if err != nil {
		return nil, err
	}
	dropCopies := copiesSetting(rec.MachineFiguresJSON, rec.Setting)
	dropProposed := rec.Proposed != nil && copiesSetting(rec.Proposed.MachineFiguresJSON, rec.Proposed.Setting)
	var out bytes.Buffer
	out.Grow(len(full))
	err = compactRaw(full, &out, 0, "", func(depth int, parent, key string) bool {
		switch {
		case depth == 1:
			return compactDropped[key] || dropCopies && settingCopies[key]
		case depth == 2 && parent == "proposed":
			return dropProposed && settingCopies[key]
		}
		return false
	})
	if err != nil {
		return nil, fmt.Errorf("record: %w", err)
	}
	return out.Bytes(), nil
}

// compactRaw copies one JSON value, as json.Marshal wrote it, to out,
// leaving out the members of its objects that are null or that drop names
// (by the depth of the member, 1 for the record's own keys, the key that
// holds its object, and its key). Array elements are all kept.
func compactRaw(raw []byte, out *bytes.Buffer, depth int, parent string, drop func(depth int, parent, key string) bool) error {
	if len(raw) == 0 || raw[0] != '{' && raw[0] != '[' {
		out.Write(raw)
		return nil
	}
	dec := json.NewDecoder(bytes.NewReader(raw))
	if _, err := dec.Token(); err != nil {
		return err
	}
	object := raw[0] == '{'
	out.WriteByte(raw[0])
	first := true
	for dec.More() {
		key := parent
		if object {
			tok, err := dec.Token()
			if err != nil {
				return err
			}
			key, _ = tok.(string)
		}
		var v json.RawMessage
		if err := dec.Decode(&v); err != nil {
			return err
		}
		if object && (string(v) == "null" || drop(depth+1, parent, key)) {
			continue
		}
		if !first {
			out.WriteByte(',')
		}
		first = false
		next := depth
		if object {
			kb, err := json.Marshal(key)
			if err != nil {
				return err
			}
			out.Write(kb)
			out.WriteByte(':')
			next = depth + 1
		}
		if err := compactRaw(v, out, next, key, drop); err != nil {
			return err
		}
	}
	out.WriteByte(raw[len(raw)-1])
	return nil
}

// expandCompact puts back into a decoded compact record (RecordV3) what
// its writer left out and the reader can recompute, before the record's
// rules are checked; a record of an earlier writer is left as it is. It
// says why the line is not one the compact writer wrote when it holds a
// key that writer never writes.
func expandCompact(r *setup.Record) string {
	if r.WriterVersion != RecordV3 {
		return ""
	}
	var never []string
	if r.ClinicalCaution != "" {
		never = append(never, "clinical_caution")
	}
	if r.FiguresWithheld != "" {
		never = append(never, "figures_withheld")
	}
	if r.Watch != nil {
		never = append(never, "watch")
	}
	if r.TimingCheck != nil {
		never = append(never, "timing_check")
	}
	if len(never) > 0 {
		return fmt.Sprintf("%v, which a record version %d never writes", never, RecordV3)
	}
	r.ClinicalCaution = setup.ClinicalCaution
	fillSettingCopies(&r.MachineFiguresJSON, r.Setting)
	if r.Proposed != nil {
		fillSettingCopies(&r.Proposed.MachineFiguresJSON, r.Proposed.Setting)
	}
	return ""
}

// fillSettingCopies puts the setting's values back among its figures when
// the writer left them out (it writes all five or none: a figure's hole is
// never blank).
func fillSettingCopies(f *setup.MachineFiguresJSON, s setup.Setting) {
	if f.Hole != "" {
		return
	}
	f.Hole, f.MotorRPM, f.DwellS, f.PEEPCmH2O, f.O2FlowLMin = s.Hole, s.RPM, s.DwellS, s.PEEPCmH2O, s.O2LPerMin
}
