package profiles

import (
	"fmt"
	"strconv"
)

// quote quotes a value from a file or a person for a message, cut so a
// huge value never fills the screen.
func quote(text string) string {
	const max = 40
	if r := []rune(text); len(r) > max {
		return strconv.Quote(string(r[:max])) + fmt.Sprintf("... (%d characters)", len(r))
	}
	return strconv.Quote(text)
}
