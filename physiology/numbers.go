package physiology

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// ParseNumber reads a decimal number a person typed. NaN, Inf, hex and
// empty text are refused: only plain finite decimals are numbers here.
func ParseNumber(text string) (float64, error) {
	return parseFinite(text)
}

func parseFinite(text string) (float64, error) {
	t := strings.TrimSpace(text)
	if t == "" {
		return 0, fmt.Errorf("empty")
	}
	for _, r := range t {
		if !strings.ContainsRune("0123456789.-+eE", r) {
			return 0, fmt.Errorf("%s is not a number", Quote(text))
		}
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%s is not a finite number", Quote(text))
	}
	return v, nil
}

// Quote quotes text a person typed for a message, cut to a readable length
// so a pasted page never fills the screen.
func Quote(text string) string {
	const max = 40
	r := []rune(text)
	if len(r) <= max {
		return strconv.Quote(text)
	}
	return strconv.Quote(string(r[:max])) + fmt.Sprintf("... (%d characters)", len(r))
}
