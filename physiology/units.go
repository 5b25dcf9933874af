package physiology

// PascalPerCmH2O is the conventional centimetre of water (NIST SP 811, B.8).
const PascalPerCmH2O = 98.0665

// PascalPerAtm is one standard atmosphere.
const PascalPerAtm = 101325.0

// CmH2OPerAtm is one standard atmosphere in cmH2O (about 1033.2).
const CmH2OPerAtm = PascalPerAtm / PascalPerCmH2O
