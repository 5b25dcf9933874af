package profiles

import (
	"fmt"
	"strings"
)

// Warnings returns what in a valid profile deserves a second look but is
// not wrong enough to refuse: hole labels that are easy to confuse when
// read off a wheel or typed in a hurry (I, l and 1; O and 0; labels that
// differ only in case) and labels with spaces at either end. Each warning
// names the field path like a FieldError. The order is that of the holes.
func Warnings(p Profile) []FieldError {
	var out []FieldError
	seen := map[string]int{}
	for i, h := range p.Crank.Holes {
		path := fmt.Sprintf("crank.holes[%d].label", i)
		if h.Label != strings.TrimSpace(h.Label) {
			out = append(out, FieldError{Path: path, Problem: fmt.Sprintf("%s has a space at its start or end, which nobody sees when typing it", quote(h.Label))})
		}
		key := lookAlike(h.Label)
		j, clash := seen[key]
		if !clash {
			seen[key] = i
			continue
		}
		other := p.Crank.Holes[j].Label
		why := "is easy to confuse with"
		if strings.EqualFold(strings.TrimSpace(other), strings.TrimSpace(h.Label)) {
			why = "differs only in case from"
		}
		out = append(out, FieldError{Path: path, Problem: fmt.Sprintf("%s %s crank.holes[%d].label %s; relabel one so that the pin cannot go in the wrong hole",
			quote(h.Label), why, j, quote(other))})
	}
	return out
}

// lookAlike maps a label to a form in which labels that look alike are
// equal: case folded, spaces at the ends dropped, I and l read as 1, O as 0
// (the pairs that stamped or hand-written labels confuse; common practice).
func lookAlike(label string) string {
	return strings.Map(func(r rune) rune {
		switch r {
		case 'i', 'l', '|':
			return '1'
		case 'o':
			return '0'
		}
		return r
	}, strings.ToLower(strings.TrimSpace(label)))
}
