package profiles

import "fmt"

// Defaults of the version 2 fields, applied when a file does not have them.
const (
	// DefaultClearanceCm: 1 cm between the piston at its top dead centre and
	// the cylinder head is engineering judgement for a home-built unit
	// (room for the valves), not a measured figure; measure your own.
	DefaultClearanceCm = 1.0
	// DefaultLeakLMinAt20CmH2O: no leak, which a bench calibration can
	// revise.
	DefaultLeakLMinAt20CmH2O = 0.0
)

type optionalField struct {
	path  string
	value float64
}

// v2Fields are the fields that version 2 added, all optional, with their
// defaults, in the order they are reported.
func v2Fields() []optionalField {
	return []optionalField{
		{"cylinder.clearance_cm", DefaultClearanceCm},
		{"circuit.leak_l_min_at_20_cmh2o", DefaultLeakLMinAt20CmH2O},
	}
}

// versionFields refuses a version 2 field in a file that says it is version
// 1: such a file was written by hand or by a newer tool, and reading it as
// version 1 would silently drop what it says.
func versionFields(present map[string]bool, format string) []FieldError {
	if format != FormatV1 {
		return nil
	}
	var out []FieldError
	for _, f := range v2Fields() {
		if present[f.path] {
			out = append(out, FieldError{Path: f.path, Problem: fmt.Sprintf(
				"is a field of %s, but this file says %q; change format to %q to use it", FormatV2, FormatV1, FormatV2)})
		}
	}
	return out
}

// applyDefaults fills the optional fields that the file did not have and
// records which.
func applyDefaults(present map[string]bool, p *Profile) {
	for _, f := range v2Fields() {
		if present[f.path] {
			continue
		}
		switch f.path {
		case "cylinder.clearance_cm":
			p.Cylinder.ClearanceCm = f.value
		case "circuit.leak_l_min_at_20_cmh2o":
			p.Circuit.LeakLMinAt20CmH2O = f.value
		}
		p.Defaults = append(p.Defaults, f.path)
	}
}
