package setup

import (
	"strings"
)

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}

// wrap breaks text at spaces into lines of at most width; continuation
// lines are indented by four spaces.
func wrap(text string, width int) []string {
	var out []string
	for len(text) > width {
		cut := strings.LastIndexByte(text[:width], ' ')
		if cut <= 4 {
			cut = width
		}
		out = append(out, strings.TrimRight(text[:cut], " "))
		text = "    " + strings.TrimLeft(text[cut:], " ")
	}
	return append(out, text)
}
