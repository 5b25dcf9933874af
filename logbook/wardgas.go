package logbook

import (
	"crankside/setup"
)

// gasJSON fills a ward row's gas keys from its record.
func (r WardRow) gasJSON(j *wardRowJSON) {
	j.GasCautions = []setup.Caution{}
	for _, c := range r.Record.Cautions {
		if setup.IsGasCaution(c.ID) {
			j.GasCautions = append(j.GasCautions, c)
		}
	}
	if g := r.Record.GasReadings; g != nil && !g.Empty() {
		j.GasReadings = g
	}
	if o := r.Record.OxygenationJSON; o != nil {
		j.PFRatio, j.SFRatio, j.ARDSSeverity = o.PFRatio, o.SFRatio, o.ARDSSeverity
	}
}

// gasLevel is the highest level of the row's gas cautions, 0 with none.
func (r WardRow) gasLevel() setup.Level {
	var l setup.Level
	for _, c := range r.Record.Cautions {
		if setup.IsGasCaution(c.ID) && c.Level > l {
			l = c.Level
		}
	}
	return l
}
