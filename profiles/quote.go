package profiles

import (
	"fmt"
	"strconv"

	"crankside/profiles/safetext"
)

// quote quotes a value from a file or a person for a message, cut so a
// huge value never fills the screen. strconv.Quote already writes most
// unsafe characters as escapes; safetext.Escape makes sure of the rest.
func quote(text string) string {
	const max = 40
	if r := []rune(text); len(r) > max {
		return safetext.Escape(strconv.Quote(string(r[:max]))) + fmt.Sprintf("... (%d characters)", len(r))
	}
	return safetext.Escape(strconv.Quote(text))
}
