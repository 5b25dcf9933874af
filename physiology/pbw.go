package physiology

import (
	"fmt"
	"math"
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

func trim(v float64) string { return fmt.Sprintf("%.4g", v) }

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
