package physiology

import (
	"fmt"
	"math"
)

// Henderson-Hasselbalch for the bicarbonate buffer in plasma:
// pH = 6.1 + log10(HCO3 / (0.03 x PaCO2)), HCO3 in mmol/L, PaCO2 in mmHg.
const (
	// BicarbonatePKa is the apparent pKa of carbonic acid in plasma.
	BicarbonatePKa = 6.1
	// CO2SolubilityMmolLPerMmHg is the solubility of CO2 in plasma.
	CO2SolubilityMmolLPerMmHg = 0.03
)

// AnatomicDeadSpaceMLPerKg is the anatomic dead space per kg of ideal
// weight, "1 mL per pound" (Radford, J Appl Physiol 1955;7:451-460; from
// memory). The tube, the filter and any other apparatus come on top.
const AnatomicDeadSpaceMLPerKg = 2.2

// BicarbonateMmolL is the plasma bicarbonate that a pH and a PaCO2 (mmHg)
// imply under Henderson-Hasselbalch. Both must be finite and the PaCO2
// positive; a pH outside PHMin-PHMax or a PaCO2 outside PaCO2MinMmHg-
// PaCO2MaxMmHg is refused as a reading that cannot be right.
func BicarbonateMmolL(pH, paco2MmHg float64) (float64, error) {
	if err := CheckRange("pH", pH, PHMin, PHMax, ""); err != nil {
		return 0, err
	}
	if err := CheckRange("PaCO2", paco2MmHg, PaCO2MinMmHg, PaCO2MaxMmHg, "mmHg"); err != nil {
		return 0, err
	}
	return CO2SolubilityMmolLPerMmHg * paco2MmHg * math.Pow(10, pH-BicarbonatePKa), nil
}

// PaCO2ForPH is the PaCO2 (mmHg) that gives targetPH with the bicarbonate
// held at hco3MmolL: the inverse of Henderson-Hasselbalch for PaCO2.
func PaCO2ForPH(targetPH, hco3MmolL float64) (float64, error) {
	if err := CheckRange("target pH", targetPH, PHMin, PHMax, ""); err != nil {
		return 0, err
	}
	if math.IsNaN(hco3MmolL) || math.IsInf(hco3MmolL, 0) || hco3MmolL <= 0 {
		return 0, fmt.Errorf("bicarbonate %v mmol/L must be a positive number", hco3MmolL)
	}
	return hco3MmolL / (CO2SolubilityMmolLPerMmHg * math.Pow(10, targetPH-BicarbonatePKa)), nil
}

// AnatomicDeadSpaceML is the anatomic dead space for an ideal (predicted)
// body weight in kg.
func AnatomicDeadSpaceML(pbwKg float64) (float64, error) {
	if math.IsNaN(pbwKg) || math.IsInf(pbwKg, 0) || pbwKg <= 0 {
		return 0, fmt.Errorf("predicted body weight %v kg must be positive", pbwKg)
	}
	return AnatomicDeadSpaceMLPerKg * pbwKg, nil
}

// RateForPaCO2 is the rate (breaths/min) that brings the PaCO2 from
// paco2MmHg, measured at rateBPM and tidal volume vtML, to targetPaCO2MmHg
// at tidal volume newVtML, with the CO2 production steady. From the
// alveolar ventilation equation PaCO2 = 0.863 x VCO2 / VA with
// VA = rate x (Vt - Vd):
//
//	rate' = rate x (Vt - Vd) / (Vt' - Vd) x PaCO2 / PaCO2'
//
// At the same tidal volume the dead space cancels. Both volumes must be
// larger than the dead space deadSpaceML: a breath that does not reach the
// alveoli has no alveolar ventilation to scale.
func RateForPaCO2(rateBPM, vtML, newVtML, deadSpaceML, paco2MmHg, targetPaCO2MmHg float64) (float64, error) {
	for _, v := range []struct {
		name string
		v    float64
	}{{"rate", rateBPM}, {"tidal volume", vtML}, {"new tidal volume", newVtML},
		{"PaCO2", paco2MmHg}, {"target PaCO2", targetPaCO2MmHg}} {
		if math.IsNaN(v.v) || math.IsInf(v.v, 0) || v.v <= 0 {
			return 0, fmt.Errorf("%s %v must be a positive number", v.name, v.v)
		}
	}
	if math.IsNaN(deadSpaceML) || math.IsInf(deadSpaceML, 0) || deadSpaceML < 0 {
		return 0, fmt.Errorf("dead space %v mL must be zero or more", deadSpaceML)
	}
	if vtML <= deadSpaceML || newVtML <= deadSpaceML {
		return 0, fmt.Errorf("tidal volume %.0f mL (new %.0f mL) is not above the dead space %.0f mL: no alveolar ventilation to scale",
			vtML, newVtML, deadSpaceML)
	}
	return rateBPM * (vtML - deadSpaceML) / (newVtML - deadSpaceML) * paco2MmHg / targetPaCO2MmHg, nil
}
