package physiology

import "math"

// Oxygenation indices and the plausibility of a blood gas: what an
// oximeter's SpO2 and a gas's PaO2 say together, what pH and PaCO2 imply
// of the bicarbonate, and the ARDS severity band of the Berlin definition.

// SaturationPctSeveringhaus is the oxyhaemoglobin saturation (%) at a PO2
// (mmHg) on the standard dissociation curve (37 C, pH 7.40, PCO2 40 mmHg,
// P50 about 26.8 mmHg): S = 100 / (23400 / (P^3 + 150 P) + 1)
// (Severinghaus, J Appl Physiol 1979;46:599-602; from memory). A PO2 of
// zero or less gives 0; NaN gives NaN.
func SaturationPctSeveringhaus(po2MmHg float64) float64 {
	if po2MmHg <= 0 {
		return 0
	}
	p := po2MmHg
	return 100 / (23400/(p*p*p+150*p) + 1)
}

// The margins of the SpO2-PaO2 plausibility rule. Severinghaus's own
// correction multiplies the PO2 by 10^(0.024 (37 - T) + 0.40 (pH - 7.40) +
// 0.06 log10(40 / PCO2)) for temperature, pH and CO2; from pH 7.0 at 40 C to
// pH 7.6 at 32 C that factor runs from about 0.59 to 1.58 (derived). The
// rule allows 0.5 to 2 (the curve's P50 from 13.4 to 53.6 mmHg), and on top
// an oximeter's error of 6 points of saturation (an oximeter is accepted at
// an Arms of 4 % or less, ISO 80601-2-61; from memory; 6 is 1.5 times it),
// so that a left or right shift, carbon monoxide (SpO2 reads high) or
// methaemoglobin (SpO2 drifts to about 85 %) does not make a true pair
// look false. Only a pair outside all of that is called impossible.
const (
	OxyCurveShiftMin  = 0.5
	OxyCurveShiftMax  = 2.0
	OximeterMarginPct = 6.0
	// SpO2PaO2RuleSource names the source of SpO2RangeForPaO2.
	SpO2PaO2RuleSource = "Severinghaus 1979 oxyhaemoglobin curve (from memory), PO2 x 0.5-2 for its shifts and +/- 6 % for the oximeter (common practice)"
)

// SpO2RangeForPaO2 is the SpO2 (%) range that can go with a PaO2 (mmHg):
// the Severinghaus saturation at PaO2 x OxyCurveShiftMin and at PaO2 x
// OxyCurveShiftMax, widened by OximeterMarginPct and kept within 0-100.
func SpO2RangeForPaO2(pao2MmHg float64) (lowPct, highPct float64) {
	lo := SaturationPctSeveringhaus(pao2MmHg*OxyCurveShiftMin) - OximeterMarginPct
	hi := SaturationPctSeveringhaus(pao2MmHg*OxyCurveShiftMax) + OximeterMarginPct
	return math.Max(0, lo), math.Min(100, hi)
}

// Bicarbonate implied by pH and PaCO2 that a living adult can have: 5-60
// mmol/L (from memory; outside it the pH or the PaCO2 is wrong, or in the
// wrong unit). Check: pH 7.60 with PaCO2 100 mmHg implies 94.9 mmol/L
// (derived).
const (
	BicarbonatePlausibleMinMmolL = 5.0
	BicarbonatePlausibleMaxMmolL = 60.0
)

// ARDSSeverity is the oxygenation band of the Berlin definition of ARDS.
// It grades oxygenation only: the definition also asks for onset within a
// week, bilateral opacities and oedema not explained by the heart.
type ARDSSeverity int

const (
	// ARDSNone: P/F above 300 mmHg (or S/F above 315).
	ARDSNone ARDSSeverity = iota + 1
	// ARDSMild: P/F above 200 up to 300.
	ARDSMild
	// ARDSModerate: P/F above 100 up to 200.
	ARDSModerate
	// ARDSSevere: P/F 100 or less.
	ARDSSevere
)

func (s ARDSSeverity) String() string {
	switch s {
	case ARDSNone:
		return "none"
	case ARDSMild:
		return "mild"
	case ARDSModerate:
		return "moderate"
	case ARDSSevere:
		return "severe"
	}
	return "not graded"
}

// Berlin definition of ARDS (ARDS Definition Task Force, JAMA
// 2012;307:2526-2533): with PEEP (or CPAP) of at least 5 cmH2O, PaO2/FiO2
// 200 < P/F <= 300 mild, 100 < P/F <= 200 moderate, P/F <= 100 severe
// (mmHg).
const (
	BerlinMinPEEPCmH2O  = 5.0
	BerlinMildMaxPF     = 300.0
	BerlinModerateMaxPF = 200.0
	BerlinSevereMaxPF   = 100.0
	SrcBerlin           = "Berlin definition of ARDS, JAMA 2012 (PEEP >= 5 cmH2O)"
	SFValidMaxSpO2Pct   = 97.0 // Rice et al. 2007: S/F stands for P/F only up to SpO2 97 %
	SFRiceIntercept     = 64.0
	SFRiceSlope         = 0.84
	BerlinMildMaxSF     = 315.0 // Rice et al. 2007: S/F 315 ~ P/F 300
	BerlinModerateMaxSF = 235.0 // Rice et al. 2007: S/F 235 ~ P/F 200
	SrcRice             = "Rice et al., Chest 2007 (S/F 235 ~ P/F 200, 315 ~ P/F 300; severe derived from its S/F = 64 + 0.84 x P/F: 148 ~ P/F 100)"
)

// BerlinSevereMaxSF is the S/F that stands for P/F 100, from Rice et al.'s
// published linear relation S/F = 64 + 0.84 x P/F (the paper gives the
// mild and moderate cut points, 315 and 235, not this one): 148.
const BerlinSevereMaxSF = SFRiceIntercept + SFRiceSlope*BerlinSevereMaxPF

// BandFromPF is the Berlin band of a PaO2/FiO2 ratio (mmHg); the upper
// edge of each band belongs to it (P/F 300 is mild, 200 moderate, 100
// severe).
func BandFromPF(pf float64) ARDSSeverity {
	return band(pf, BerlinMildMaxPF, BerlinModerateMaxPF, BerlinSevereMaxPF)
}

// BandFromSF is the Berlin band of an SpO2/FiO2 ratio by Rice et al.'s
// cut points (315, 235) and the derived 148 for severe; the caller keeps
// to SpO2 up to SFValidMaxSpO2Pct.
func BandFromSF(sf float64) ARDSSeverity {
	return band(sf, BerlinMildMaxSF, BerlinModerateMaxSF, BerlinSevereMaxSF)
}

func band(v, mild, moderate, severe float64) ARDSSeverity {
	switch {
	case math.IsNaN(v):
		return 0
	case v <= severe:
		return ARDSSevere
	case v <= moderate:
		return ARDSModerate
	case v <= mild:
		return ARDSMild
	}
	return ARDSNone
}
