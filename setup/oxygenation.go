package setup

import (
	"fmt"
	"math"

	"crankside/physiology"
)

// The oxygenation indices of a check: PaO2/FiO2 and SpO2/FiO2 with the
// FiO2 estimated from the oxygen bled into the piston's intake, and the
// band of the Berlin definition of ARDS they fall in (P/F when a PaO2 was
// taken; S/F by Rice et al.'s conversion otherwise, for SpO2 up to 97 %).

// Bases of a graded band (OxygenationJSON.ARDSSeverityBasis).
const (
	BasisPF = "pf"
	BasisSF = "sf"
)

// OxygenationJSON are the indices; in a check's JSON their keys stand
// beside the others, and all of them are present (null when not known)
// once a gas or oximeter reading was entered. ARDSSeverity is "none",
// "mild", "moderate", "severe", or null when the band cannot be graded
// (ARDSSeverityNote says why).
type OxygenationJSON struct {
	PFRatio           *float64 `json:"pf_ratio"`
	SFRatio           *float64 `json:"sf_ratio"`
	ARDSSeverity      *string  `json:"ards_severity"`
	ARDSSeverityBasis *string  `json:"ards_severity_basis"`
	ARDSSeverityNote  string   `json:"ards_severity_note"`
	RatioFiO2         *float64 `json:"ratio_fio2"`
}

// oxygenationOf computes the indices. A ratio is rounded to a whole mmHg
// (or %) before it is banded, so that the number shown and its band agree
// (300 is mild, 301 is not).
func oxygenationOf(g GasReadings, ctx GasContext) *OxygenationJSON {
	o := &OxygenationJSON{}
	if g.SpO2Pct == nil && g.PaO2MmHg == nil {
		o.ARDSSeverityNote = "no PaO2 or SpO2: no oxygenation index"
		return o
	}
	if !ctx.FiO2Known {
		o.ARDSSeverityNote = "FiO2 not known: no oxygenation index"
		return o
	}
	f := r4(ctx.FiO2)
	o.RatioFiO2 = &f
	if g.PaO2MmHg != nil {
		pf := math.Round(*g.PaO2MmHg / ctx.FiO2)
		o.PFRatio = &pf
	}
	if g.SpO2Pct != nil && *g.SpO2Pct <= physiology.SFValidMaxSpO2Pct+1e-9 {
		sf := math.Round(*g.SpO2Pct / ctx.FiO2)
		o.SFRatio = &sf
	}
	var sev physiology.ARDSSeverity
	var basis string
	switch {
	case below(ctx.PEEPCmH2O, physiology.BerlinMinPEEPCmH2O):
		o.ARDSSeverityNote = fmt.Sprintf("not graded: PEEP %s cmH2O is below the %s cmH2O the Berlin definition asks for", plain(ctx.PEEPCmH2O), plain(physiology.BerlinMinPEEPCmH2O))
		return o
	case disagreementOf(g).oximetry:
		o.ARDSSeverityNote = "not graded: SpO2 and PaO2 disagree (gas-readings-disagree)"
		return o
	case o.PFRatio != nil:
		sev, basis = physiology.BandFromPF(*o.PFRatio), BasisPF
	case o.SFRatio != nil:
		sev, basis = physiology.BandFromSF(*o.SFRatio), BasisSF
	default:
		o.ARDSSeverityNote = fmt.Sprintf("not graded: SpO2 above %s %%, where S/F does not stand for P/F (Rice et al. 2007); a PaO2 grades it", plain(physiology.SFValidMaxSpO2Pct))
		return o
	}
	word := sev.String()
	o.ARDSSeverity, o.ARDSSeverityBasis = &word, &basis
	o.ARDSSeverityNote = bandEdges(sev, basis) + " [" + physiology.SrcBerlin
	if basis == BasisSF {
		o.ARDSSeverityNote += "; " + physiology.SrcRice
	}
	o.ARDSSeverityNote += "]; it grades oxygenation only, not a diagnosis"
	return o
}

// bandEdges says where a band lies on the ratio it was graded by.
func bandEdges(s physiology.ARDSSeverity, basis string) string {
	name, mild, moderate, severe := "P/F", physiology.BerlinMildMaxPF, physiology.BerlinModerateMaxPF, physiology.BerlinSevereMaxPF
	if basis == BasisSF {
		name, mild, moderate, severe = "S/F", physiology.BerlinMildMaxSF, physiology.BerlinModerateMaxSF, physiology.BerlinSevereMaxSF
	}
	switch s {
	case physiology.ARDSNone:
		return fmt.Sprintf("%s above %s", name, plain(mild))
	case physiology.ARDSMild:
		return fmt.Sprintf("%s above %s up to %s", name, plain(moderate), plain(mild))
	case physiology.ARDSModerate:
		return fmt.Sprintf("%s above %s up to %s", name, plain(severe), plain(moderate))
	}
	return fmt.Sprintf("%s %s or less", name, plain(severe))
}

// OxygenationText is the indices on one line ("S/F 414 (FiO2 0.21
// estimated from the O2 bleed): ARDS band none, S/F above 315 [...]"),
// or "" when no index was computed.
func OxygenationText(o *OxygenationJSON) string {
	if o == nil {
		return ""
	}
	var ratios string
	if o.PFRatio != nil {
		ratios = "P/F " + plain(*o.PFRatio) + " mmHg"
	}
	if o.SFRatio != nil {
		if ratios != "" {
			ratios += ", "
		}
		ratios += "S/F " + plain(*o.SFRatio)
	}
	if ratios == "" {
		return o.ARDSSeverityNote
	}
	if o.RatioFiO2 != nil {
		ratios += fmt.Sprintf(" (FiO2 %.2f, estimated from the O2 bleed)", *o.RatioFiO2)
	}
	if o.ARDSSeverity == nil {
		return ratios + "; ARDS band " + o.ARDSSeverityNote
	}
	return ratios + ": ARDS band " + *o.ARDSSeverity + ", " + o.ARDSSeverityNote
}

// OxygenationShort is the graded ratio and band in a few words for a ward
// row or a history line ("S/F 414 none", "P/F 150 moderate"), or "".
func OxygenationShort(o *OxygenationJSON) string {
	if o == nil || o.ARDSSeverity == nil || o.ARDSSeverityBasis == nil {
		return ""
	}
	switch {
	case *o.ARDSSeverityBasis == BasisPF && o.PFRatio != nil:
		return "P/F " + plain(*o.PFRatio) + " " + *o.ARDSSeverity
	case *o.ARDSSeverityBasis == BasisSF && o.SFRatio != nil:
		return "S/F " + plain(*o.SFRatio) + " " + *o.ARDSSeverity
	}
	return ""
}
