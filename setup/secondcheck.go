package setup

import (
	"fmt"
	"strings"

	"crankside/physiology"
)

// CheckSecondInitials accepts a second checker's initials as the first
// operator's are accepted (one to four letters, or none); the problem
// names the field "second-initials".
func CheckSecondInitials(in string) error {
	if err := CheckInitials(in); err != nil {
		return &InputError{Field: "second-initials", Reason: strings.Replace(err.(*InputError).Reason, "the operator's", "the second checker's", 1)}
	}
	return nil
}

// WithSecondInitials adds a second checker's initials to a record (upper
// case, as the first's), or refuses them. A second checker without a first
// is refused: the record would say the check was double-checked by nobody.
func (r Record) WithSecondInitials(in string) (Record, error) {
	if err := CheckSecondInitials(in); err != nil {
		return Record{}, err
	}
	if in != "" && r.Initials == "" {
		return Record{}, &InputError{Field: "second-initials", Reason: fmt.Sprintf("%s: a second checker goes with the first's initials; give those too", physiology.Quote(in))}
	}
	r.SecondInitials = strings.ToUpper(in)
	return r, nil
}

// NeedsSecondSignature reports whether the record's proposal changes the
// hole or the PEEP: the changes a ward double-checks (common practice for
// high-risk changes), for which the card carries a line for a second
// signature.
func NeedsSecondSignature(r Record) bool {
	p := r.Proposed
	return p != nil && (!strings.EqualFold(p.Setting.Hole, r.Setting.Hole) || p.Setting.PEEPCmH2O != r.Setting.PEEPCmH2O)
}
