// Package physiology computes the patient side of a ventilator setting:
// predicted body weight, lung-protective targets and their defaults by lung
// condition, the lower-PEEP/FiO2 table, the equation of motion, passive
// exhalation and trapped gas at steady state, oxygen (FiO2 from oxygen bled
// into the intake, from the minute volume or from the piston's whole intake,
// the inverses, and cylinder time left), units (the conventional cmH2O, the
// standard atmosphere, Boyle's law and the compliance of a volume of gas),
// the gas conditions of version 2 (Buck's saturated vapour pressure, the BTPS
// factor from the room's temperature, humidity and barometric pressure,
// defaults 22 C, 50 %, 760 mmHg with sources), the lung's compliance and
// resistance fitted to two manometer readings (FitMechanics, which takes the
// pressure model as a function), the ARDS Network protocol's next step
// (NextProtocolStep, Henderson-Hasselbalch, the alveolar ventilation
// equation), the oxyhaemoglobin curve (Severinghaus 1979) and the Berlin
// bands of ARDS by P/F or S/F (SaturationPctSeveringhaus, SpO2RangeForPaO2,
// BandFromPF, BandFromSF), and parsing of what people type (ParseNumber, ParseIE,
// ParseSex, ParseLung, Quote).
//
// Units at every exported boundary: height in cm, weight in kg, volume in mL,
// time in s, pressure in cmH2O, compliance in mL/cmH2O, resistance in
// cmH2O/(L/s), flows shown to people in L/min. Fractions (FiO2) are 0.21-1.
//
// Valid ranges: heights 130-230 cm (HeightMinCm, HeightMaxCm); tidal volume
// entries 4-10 mL/kg PBW; FiO2 0.21-1; room 0-45 C, 0-100 % relative
// humidity, 450-800 mmHg. Functions that take data a person typed
// return an error naming the quantity, the value and the accepted range; none
// of them panics on bad numbers, and NaN or Inf is always refused.
// FitMechanics returns a *ReadingError (matched by ErrNoMechanics) saying
// which reading to re-take when no plausible lung reproduces the readings.
//
// The package imports the standard library only.
package physiology
