package physiology

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// ParseNumber reads a decimal number a person typed. A comma is a decimal
// mark, as it is written in much of the world: "0,9" is 0.9. NaN, Inf, hex,
// text with both a comma and a point, and empty text are refused: only
// plain finite decimals are numbers here, never text reduced to its digits.
func ParseNumber(text string) (float64, error) {
	return parseFinite(text)
}

func parseFinite(text string) (float64, error) {
	t := strings.TrimSpace(text)
	if t == "" {
		return 0, fmt.Errorf("empty")
	}
	if strings.Contains(t, ",") {
		k := strings.IndexByte(t, ',')
		digit := func(i int) bool { return i >= 0 && i < len(t) && t[i] >= '0' && t[i] <= '9' }
		if strings.Contains(t, ".") || strings.Count(t, ",") > 1 || !digit(k-1) || !digit(k+1) {
			return 0, fmt.Errorf("%s is not a number: use one decimal mark, like 0.9 or 0,9", Quote(text))
		}
		t = strings.Replace(t, ",", ".", 1)
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
