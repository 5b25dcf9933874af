package setup

import (
	"fmt"

	"crankside/physiology"
	"crankside/profiles"
)

// canonicalHoles replaces the hole labels a person typed with the
// profile's own, when they match ignoring letter case and only one hole
// does ("c" is hole "C"); an ambiguous label is refused, naming both.
func canonicalHoles(req *CheckRequest, p profiles.Profile) error {
	fix := func(field string, label *string) error {
		h, found, ambiguous := p.HoleByLabelFold(*label)
		switch {
		case ambiguous:
			return &InputError{Field: field, Reason: fmt.Sprintf("%s matches more than one hole of %s when letter case is ignored: type it exactly (holes: %s)",
				physiology.Quote(*label), p.ID, holeLabels(p))}
		case found:
			*label = h.Label
		}
		return nil
	}
	if err := fix("hole", &req.Setting.Hole); err != nil {
		return err
	}
	if req.Proposal.Hole != nil {
		h := *req.Proposal.Hole
		if err := fix("propose-hole", &h); err != nil {
			return err
		}
		req.Proposal.Hole = &h
	}
	return nil
}
