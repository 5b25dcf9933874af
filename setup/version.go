package setup

import (
	"bytes"
	"encoding/json"
	"fmt"
	"runtime/debug"
)

// ModelVersion is the version of the computation behind every figure and
// caution (DESIGN.md's rounds: 1 the breath and the crank; 2 the machine's
// arithmetic exact and the gas path of every stroke; 3 the patient's
// numbers judged: readings, blood gases, units, records). A script that
// compares figures from two runs compares them only at one model version.
const ModelVersion = 3

// The "format" of each --json output: a name and a number raised whenever
// a key changes meaning or goes away (new keys do not raise it). The
// outputs before formats were named are the /1 of each; a log line keeps
// its own RecordFormat.
const (
	FormatPlanJSON        = "crankside-plan/2"
	FormatCheckJSON       = "crankside-check/2" // the check object; a log line is RecordFormat
	FormatCalibrationJSON = "crankside-calibration/2"
	FormatHistoryJSON     = "crankside-history/3"            // log show --json: /3 shows the newest checks and counts the rest
	FormatWardJSON        = "crankside-ward/3"               // log beds --json: {"beds": [...], "problems": [...]}; /3: ml_per_kg null, not 0, for a bed whose readings no lung explains
	FormatProfileListJSON = "crankside-profile-list/1"       // profiles list --json
	FormatValidationJSON  = "crankside-profile-validation/1" // profiles validate --json
)

// ProgramRelease is this program's release, as `crankside --version`
// prints it.
const ProgramRelease = "0.2.0"

// ProgramVersion is the release and, when the build recorded it, the
// commit it was built from ("0.2.0 (1a2b3c4d5e6f)", "+modified" for a
// build from a changed tree).
func ProgramVersion() string {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return ProgramRelease
	}
	var rev, dirty string
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			if s.Value == "true" {
				dirty = "+modified"
			}
		}
	}
	if rev == "" {
		return ProgramRelease
	}
	return fmt.Sprintf("%s (%s%s)", ProgramRelease, rev[:min(12, len(rev))], dirty)
}

// VersionedJSON is v (which must encode as a JSON object) with "format",
// "model_version" and "program_version" as its first keys, indented for a
// person.
func VersionedJSON(format string, v any) ([]byte, error) {
	body, err := json.Marshal(v)
	if err != nil {
		return nil, err
	}
	body = bytes.TrimSpace(body)
	if len(body) < 2 || body[0] != '{' {
		return nil, fmt.Errorf("setup: %s output is not a JSON object", format)
	}
	head, err := json.Marshal(struct {
		Format         string `json:"format"`
		ModelVersion   int    `json:"model_version"`
		ProgramVersion string `json:"program_version"`
	}{format, ModelVersion, ProgramVersion()})
	if err != nil {
		return nil, err
	}
	joined := head[:len(head)-1]
	if rest := bytes.TrimSpace(body[1:]); len(rest) > 1 {
		joined = append(append(joined, ','), rest...)
	} else {
		joined = append(joined, '}')
	}
	var out bytes.Buffer
	if err := json.Indent(&out, joined, "", "  "); err != nil {
		return nil, err
	}
	out.WriteByte('\n')
	return out.Bytes(), nil
}

// HighestLevel is the highest level of the plan's cautions (0: none).
func (pl Plan) HighestLevel() Level { return Highest(pl.Cautions) }

// HighestLevel is the highest level of the check's cautions: its
// setting's and, when a change was proposed, the proposal's.
func (ck Check) HighestLevel() Level {
	l := Highest(ck.Current.Cautions)
	if ck.Proposed != nil {
		l = max(l, Highest(ck.Proposed.Cautions))
	}
	return l
}
