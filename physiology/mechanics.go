package physiology

import "math"

// AirwayPressureCmH2O is the equation of motion of a single-compartment lung:
// Paw = PEEP + V/C + R x flow, with V in mL above the relaxed volume at PEEP,
// C in mL/cmH2O, R in cmH2O/(L/s) and flow in L/s.
func AirwayPressureCmH2O(peepCmH2O, volumeML, complianceMLPerCmH2O, resistanceCmH2OPerLS, flowLPerS float64) float64 {
	return peepCmH2O + volumeML/complianceMLPerCmH2O + resistanceCmH2OPerLS*flowLPerS
}

// TimeConstantS is the passive exhalation time constant R x C in seconds,
// for R in cmH2O/(L/s) (airway plus expiratory valve) and C in mL/cmH2O.
func TimeConstantS(resistanceCmH2OPerLS, complianceMLPerCmH2O float64) float64 {
	return resistanceCmH2OPerLS / 1000 * complianceMLPerCmH2O
}

// TrappedVolumeML is the volume left above the relaxed volume at the end of
// expiration once breaths repeat to a steady state: Vee = (Vee + Vt) k with
// k = e^(-Te/tau), so Vee = Vt k / (1 - k).
func TrappedVolumeML(tidalML, expiratoryTimeS, tauS float64) float64 {
	if tidalML <= 0 {
		return 0
	}
	if tauS <= 0 {
		return 0
	}
	if expiratoryTimeS <= 0 {
		return math.Inf(1)
	}
	k := math.Exp(-expiratoryTimeS / tauS)
	return tidalML * k / (1 - k)
}
