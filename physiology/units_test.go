package physiology

import (
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// The ward's units against the published factors (REFERENCES.md, "The
// patient's numbers").
func TestUnitConversions(t *testing.T) {
	for _, c := range []struct {
		name          string
		conv          func(float64) float64
		in, want, tol float64
		source        string
	}{
		{"KPaToMmHg", KPaToMmHg, 10.5, 78.8, 0.05, "NIST SP 811: 1 kPa = 7.50062 mmHg; 10.5 x 7.50062 = 78.757"},
		{"KPaToMmHg", KPaToMmHg, 25, 187.5, 0.05, "NIST SP 811: 25 x 7.50062 = 187.52"},
		{"KPaToMmHg", KPaToMmHg, 1, 7.50062, 1e-9, "NIST SP 811: the factor itself"},
		{"MmHgToKPa", MmHgToKPa, 760, 101.325, 0.001, "1 atm = 760 mmHg = 101.325 kPa (definition of the standard atmosphere)"},
		{"HPaToCmH2O", HPaToCmH2O, 17, 17.34, 0.005, "derived: 1700 Pa / 98.0665 Pa per cmH2O = 17.335"},
		{"HPaToCmH2O", HPaToCmH2O, 1, 1.01972, 0.000005, "derived: 100 / 98.0665 = 1.019716"},
		{"HPaToMmHg", HPaToMmHg, 1013.25, 760.0, 0.05, "1 atm = 1013.25 hPa = 760 mmHg (standard atmosphere)"},
		{"InchesToCm", InchesToCm, 70, 177.8, 1e-9, "1 in = 2.54 cm exactly; 70 x 2.54 = 177.8"},
	} {
		got := c.conv(c.in)
		require.InDelta(t, c.want, got, c.tol, "%s(%v): got %v want %v (%s)", c.name, c.in, got, c.want, c.source)
	}
}

func TestParseHeight(t *testing.T) {
	for _, c := range []struct {
		text     string
		cm, in   float64
		inInches bool
		source   string
	}{
		{"178", 178, 0, false, "a plain number is cm"},
		{"178,5", 178.5, 0, false, "a decimal comma is a decimal mark"},
		{"178cm", 178, 0, false, "cm said"},
		{"178 CM", 178, 0, false, "cm said, upper case"},
		{`5'10"`, 177.8, 70, true, "derived: 5 x 12 + 10 = 70 in x 2.54 = 177.8 cm"},
		{`5' 10"`, 177.8, 70, true, "derived: as above, with a space"},
		{`5'10`, 177.8, 70, true, "derived: inches mark left off after feet"},
		{`5'10''`, 177.8, 70, true, "derived: two single quotes for the inch mark"},
		{"5ft 10in", 177.8, 70, true, "derived: words"},
		{"5 feet 10 inches", 177.8, 70, true, "derived: long words"},
		{"6'", 182.88, 72, true, "derived: 72 in x 2.54 = 182.88 cm"},
		{"70in", 177.8, 70, true, "derived: 70 x 2.54"},
		{`70"`, 177.8, 70, true, "derived: 70 x 2.54"},
		{"70,5 in", 179.07, 70.5, true, "derived: 70.5 x 2.54 = 179.07"},
		{`5'11.5"`, 181.61, 71.5, true, "derived: 71.5 x 2.54 = 181.61"},
	} {
		h, err := ParseHeight(c.text)
		require.NoError(t, err, c.text)
		require.InDelta(t, c.cm, h.Cm, 1e-9, "%q cm (%s)", c.text, c.source)
		require.InDelta(t, c.in, h.Inches, 1e-9, "%q inches (%s)", c.text, c.source)
		require.Equal(t, c.inInches, h.InInches, c.text)
	}
}

func TestParseHeightRefusesBadForms(t *testing.T) {
	for _, text := range []string{
		`5'12"`, `5'13"`, `'10"`, `5 10`, `5'10"3`, `5.5'`, `-5'10"`, `5''10`, `in`, `70 cmm`, `70 mm`, `"`, `5'10" 2`, `seventy in`, `70in70`,
	} {
		_, err := ParseHeight(text)
		require.Error(t, err, text)
		msg := err.Error()
		require.NotContains(t, msg, "\n", "one line: %q", msg)
		require.Contains(t, msg, Quote(text), "the message names the value: %q", msg)
		require.True(t, strings.Contains(msg, `5'10"`), "the message shows a form accepted: %q", msg)
	}
}

// Just inside and outside the under-12 rule for inches after feet
// (common practice: 12 inches to a foot).
func TestParseHeightInchesAfterFeetBoundary(t *testing.T) {
	h, err := ParseHeight(`5'11.9"`)
	require.NoError(t, err)
	require.InDelta(t, 71.9, h.Inches, 1e-9, "derived: 60 + 11.9")
	_, err = ParseHeight(`5'12"`)
	require.ErrorContains(t, err, "under 12")
}

// A typed value is quoted whole up to 40 characters and cut after them,
// with the length said (a readable message line, common practice).
func TestQuoteCutsAfterForty(t *testing.T) {
	forty := strings.Repeat("é", 40)
	require.Equal(t, strconv.Quote(forty), Quote(forty))
	require.Equal(t, strconv.Quote(forty)+"... (41 characters)", Quote(forty+"x"))
}
