package physiology

import (
	"fmt"
	"regexp"
	"strings"
)

// PascalPerCmH2O is the conventional centimetre of water (NIST SP 811, B.8).
const PascalPerCmH2O = 98.0665

// PascalPerAtm is one standard atmosphere.
const PascalPerAtm = 101325.0

// CmH2OPerAtm is one standard atmosphere in cmH2O (about 1033.2).
const CmH2OPerAtm = PascalPerAtm / PascalPerCmH2O

// The ward's units and the factors that turn them into the tool's own
// (mmHg for blood gases and the barometer, cmH2O for airway pressures, cm
// for height).
const (
	// MmHgPerKPa is the published factor: 1 kPa = 7.50062 mmHg (NIST SP 811).
	MmHgPerKPa = 7.50062
	// PascalPerHPa: 1 hPa = 1 mbar = 100 Pa (SI prefixes).
	PascalPerHPa = 100.0
	// CmH2OPerHPa is 100 Pa / 98.0665 Pa = 1.01972 cmH2O (derived from
	// the conventional centimetre of water, NIST SP 811 B.8).
	CmH2OPerHPa = PascalPerHPa / PascalPerCmH2O
	// CmPerInch: 1 in = 2.54 cm exactly (international inch, 1959).
	CmPerInch = 2.54
	// InchesPerFoot: 12.
	InchesPerFoot = 12.0
)

// KPaToMmHg turns a blood gas tension in kPa into mmHg.
func KPaToMmHg(kPa float64) float64 { return kPa * MmHgPerKPa }

// MmHgToKPa turns mmHg into kPa.
func MmHgToKPa(mmHg float64) float64 { return mmHg / MmHgPerKPa }

// HPaToCmH2O turns a pressure in hPa (or mbar, the same) into cmH2O.
func HPaToCmH2O(hPa float64) float64 { return hPa * CmH2OPerHPa }

// HPaToMmHg turns a barometer's hPa into mmHg (1 hPa = 0.1 kPa).
func HPaToMmHg(hPa float64) float64 { return KPaToMmHg(hPa * PascalPerHPa / 1000) }

// InchesToCm turns inches into cm.
func InchesToCm(in float64) float64 { return in * CmPerInch }

// Height is a height as a person typed it: in cm, or in inches (from
// feet and inches or inches alone).
type Height struct {
	Cm       float64
	Inches   float64 // the inches typed (feet counted as 12 each); 0 for cm
	InInches bool
}

var (
	feetInchesForm = regexp.MustCompile(`^([0-9]+)\s*(?:'|ft|feet|foot)\s*(?:([0-9]+(?:[.,][0-9]+)?)\s*(?:"|''|in|inch|inches)?)?$`)
	inchesForm     = regexp.MustCompile(`^([0-9]+(?:[.,][0-9]+)?)\s*(?:"|''|in|inch|inches)$`)
	cmForm         = regexp.MustCompile(`^(.*[0-9])\s*cm$`)
)

// heightForms is what a height entry accepts, for messages.
const heightForms = `a number of cm (178), cm (178cm), inches (70in or 70") or feet and inches (5'10" or 5ft 10in)`

// ParseHeight reads a height: a plain number is cm; 178cm is cm; 70in,
// 70" and 5'10" (or 5ft 10in, 5' 10) are inches. Inches after feet must be
// under 12. Anything else is refused with one line naming the forms
// accepted; the range of heights is the caller's to check.
func ParseHeight(text string) (Height, error) {
	t := strings.ToLower(strings.TrimSpace(text))
	if v, err := ParseNumber(t); err == nil {
		return Height{Cm: v}, nil
	}
	if m := cmForm.FindStringSubmatch(t); m != nil {
		v, err := ParseNumber(m[1])
		if err != nil {
			return Height{}, fmt.Errorf("%s is not a height: give %s", Quote(text), heightForms)
		}
		return Height{Cm: v}, nil
	}
	if m := inchesForm.FindStringSubmatch(t); m != nil {
		in, err := ParseNumber(m[1])
		if err != nil {
			return Height{}, fmt.Errorf("%s is not a height: give %s", Quote(text), heightForms)
		}
		return Height{Cm: InchesToCm(in), Inches: in, InInches: true}, nil
	}
	if m := feetInchesForm.FindStringSubmatch(t); m != nil {
		ft, err := ParseNumber(m[1])
		in := 0.0
		if err == nil && m[2] != "" {
			in, err = ParseNumber(m[2])
		}
		if err != nil {
			return Height{}, fmt.Errorf("%s is not a height: give %s", Quote(text), heightForms)
		}
		if in >= InchesPerFoot {
			return Height{}, fmt.Errorf("%s is not a height: the inches after the feet must be under 12 (5'10\", not 5'13\")", Quote(text))
		}
		total := ft*InchesPerFoot + in
		return Height{Cm: InchesToCm(total), Inches: total, InInches: true}, nil
	}
	return Height{}, fmt.Errorf("%s is not a height: give %s", Quote(text), heightForms)
}
