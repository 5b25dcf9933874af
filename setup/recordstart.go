package setup

import "strconv"

// ProposedEntries are a record's entries with its proposed setting in
// place of the one found (hole, speed, dwell, PEEP, O2 flow): the entries
// of the next check when the proposal was applied. A record without a
// proposal gives RecordEntries.
func ProposedEntries(r Record) Entries {
	e := RecordEntries(r)
	if r.Proposed == nil {
		return e
	}
	num := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	p := r.Proposed.Setting
	e["hole"], e["rpm"], e["dwell-s"], e["peep"] = p.Hole, num(p.RPM), num(p.DwellS), num(p.PEEPCmH2O)
	delete(e, "o2-lpm")
	if p.O2LPerMin != 0 {
		e["o2-lpm"] = num(p.O2LPerMin)
	}
	return e
}
