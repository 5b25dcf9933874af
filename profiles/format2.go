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
	// DefaultMaxO2FlowLMin: ordinary wall and cylinder oxygen flowmeters
	// top out at 15 L/min (common practice).
	DefaultMaxO2FlowLMin = 15.0
)

type optionalField struct {
	path  string
	value float64
	since string // the first format that has the field
}

// v2Fields are the fields that versions 2 and 3 added, all optional, with
// their defaults and the format that brought them, in the order they are
// reported.
func v2Fields() []optionalField {
	return []optionalField{
		{"cylinder.clearance_cm", DefaultClearanceCm, FormatV2},
		{"circuit.leak_l_min_at_20_cmh2o", DefaultLeakLMinAt20CmH2O, FormatV2},
		{"oxygen.max_flow_l_min", DefaultMaxO2FlowLMin, FormatV3},
	}
}

// formatRank orders the formats this version reads; 0 for another.
func formatRank(format string) int {
	switch format {
	case FormatV1:
		return 1
	case FormatV2:
		return 2
	case FormatV3:
		return 3
	}
	return 0
}

// versionFields refuses a field of a later version in a file that says it
// is an earlier one: such a file was written by hand or by a newer tool,
// and reading it as the older version would silently drop what it says.
// The object "oxygen" itself belongs to version 3.
func versionFields(present map[string]bool, format string) []FieldError {
	rank := formatRank(format)
	if rank == 0 {
		return nil // validate says the format is not known
	}
	var out []FieldError
	for _, f := range v2Fields() {
		if formatRank(f.since) <= rank {
			continue
		}
		path := f.path
		if f.since == FormatV3 && present["oxygen"] && !present[path] {
			path = "oxygen"
		}
		if present[path] {
			out = append(out, FieldError{Path: path, Problem: fmt.Sprintf(
				"is a field of %s, but this file says %q; change format to %q to use it", f.since, format, f.since)})
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
		case "oxygen.max_flow_l_min":
			p.Oxygen.MaxFlowLMin = f.value
		}
		p.Defaults = append(p.Defaults, f.path)
	}
}
