package physiology

// PascalPerCmH2O is the conventional centimetre of water (NIST SP 811, B.8).
const PascalPerCmH2O = 98.0665

// PascalPerAtm is one standard atmosphere.
const PascalPerAtm = 101325.0

// CmH2OPerAtm is one standard atmosphere in cmH2O (about 1033.2).
const CmH2OPerAtm = PascalPerAtm / PascalPerCmH2O

// CompressedVolumeML is the volume an amount of gas occupies after its
// pressure rises by riseCmH2O from one atmosphere, at constant temperature
// (Boyle's law).
func CompressedVolumeML(volumeML, riseCmH2O float64) float64 {
	return volumeML * CmH2OPerAtm / (CmH2OPerAtm + riseCmH2O)
}

// GasCompressionComplianceMLPerCmH2O is the compliance of a volume of gas at
// one atmosphere: the mL lost per cmH2O of pressure rise, to first order.
func GasCompressionComplianceMLPerCmH2O(gasVolumeML float64) float64 {
	return gasVolumeML / CmH2OPerAtm
}
