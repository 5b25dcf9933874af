package physiology

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Sex selects the predicted-body-weight formula.
type Sex int

const (
	Male Sex = iota + 1
	Female
)

func (s Sex) String() string {
	switch s {
	case Male:
		return "male"
	case Female:
		return "female"
	}
	return "unknown"
}

// ParseSex accepts "male"/"m" and "female"/"f", in any case.
func ParseSex(text string) (Sex, error) {
	switch strings.ToLower(strings.TrimSpace(text)) {
	case "male", "m":
		return Male, nil
	case "female", "f":
		return Female, nil
	}
	return 0, fmt.Errorf("sex %s is not known; use male or female", Quote(text))
}

// Heights accepted for the PBW formula. Outside these the formula is not
// meaningful for an adult and the height is most likely a typing error.
const (
	HeightMinCm = 130.0
	HeightMaxCm = 230.0
	// DevineBaseCm is 60 in: the Devine formula is stated for heights above
	// it and is extrapolated below.
	DevineBaseCm = 152.4
)

// RangeError is a number outside its accepted range.
type RangeError struct {
	Quantity string
	Value    float64
	Min, Max float64
	Unit     string
}

func (e *RangeError) Error() string {
	unit := ""
	if e.Unit != "" {
		unit = " " + e.Unit
	}
	if math.IsNaN(e.Value) || math.IsInf(e.Value, 0) {
		return fmt.Sprintf("%s %v is not a finite number; allowed %s-%s%s",
			e.Quantity, e.Value, trim(e.Min), trim(e.Max), unit)
	}
	return fmt.Sprintf("%s %s%s is outside %s-%s%s",
		e.Quantity, trim(e.Value), unit, trim(e.Min), trim(e.Max), unit)
}

// trim prints a number as a plain decimal with at most four significant
// digits (140200, never 1.402e+05), and says "far above" or "far below"
// for numbers no decimal of reasonable length can show.
func trim(v float64) string { return PlainNumber(v) }

// PlainNumber is v as a person reads it: a plain decimal with up to four
// significant digits and no exponent.
func PlainNumber(v float64) string {
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return fmt.Sprint(v)
	case math.Abs(v) >= 1e9:
		if v > 0 {
			return "more than 1000000000"
		}
		return "less than -1000000000"
	case v != 0 && math.Abs(v) < 1e-4:
		return "0.0000 (nearly zero)"
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 4, 64), 64)
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// CheckRange returns a *RangeError unless min <= v <= max and v is finite.
func CheckRange(quantity string, v, min, max float64, unit string) error {
	if math.IsNaN(v) || math.IsInf(v, 0) || v < min || v > max {
		return &RangeError{Quantity: quantity, Value: v, Min: min, Max: max, Unit: unit}
	}
	return nil
}

// PredictedBodyWeightKg is the ARDS Network (2000) form of Devine's formula:
// male 50 + 0.91 (height - 152.4), female 45.5 + 0.91 (height - 152.4).
func PredictedBodyWeightKg(heightCm float64, sex Sex) (float64, error) {
	if err := CheckRange("height", heightCm, HeightMinCm, HeightMaxCm, "cm"); err != nil {
		return 0, err
	}
	switch sex {
	case Male:
		return 50 + 0.91*(heightCm-DevineBaseCm), nil
	case Female:
		return 45.5 + 0.91*(heightCm-DevineBaseCm), nil
	}
	return 0, fmt.Errorf("sex is not set; use male or female")
}
