package physiology

import (
	"fmt"
	"math"
)

// PascalPerMmHg is one millimetre of mercury: 101325 / 760 Pa (NIST SP 811,
// B.8, the conventional mmHg).
const PascalPerMmHg = PascalPerAtm / 760

// CmH2OPerMmHg is one mmHg in cmH2O (about 1.3595).
const CmH2OPerMmHg = PascalPerMmHg / PascalPerCmH2O

// BodyTemperatureC and BodyVapourMmHg are the lung's conditions in the BTPS
// convention (ATS/ERS spirometry standard 2005): 37 C, saturated, 47 mmHg.
const (
	BodyTemperatureC = 37.0
	BodyVapourMmHg   = 47.0
)

// Accepted room entries for the BTPS factor. A machine is not run in a room
// below freezing or above 45 C (and Buck's fit is for water, not ice);
// relative humidity is 0-100 % by definition; 450 mmHg is the barometric
// pressure near 4,500 m, above the highest towns where a hospital works, and
// 800 mmHg is above the highest natural pressure at the lowest inhabited
// land (about 795 mmHg at the Dead Sea shore). Outside these a typing
// mistake is far likelier than the room.
const (
	RoomCMin           = 0.0
	RoomCMax           = 45.0
	RoomRHMinPercent   = 0.0
	RoomRHMaxPercent   = 100.0
	BarometricMinMmHg  = 450.0
	BarometricMaxMmHg  = 800.0
	kPaToMmHg          = 1000 / PascalPerMmHg
	buckA, buckB       = 0.61121, 18.678
	buckC, buckD       = 234.5, 257.14
	celsiusToKelvin    = 273.15
	srcRoomTemperature = "common practice: an indoor room, 22 C"
	srcRoomHumidity    = "common practice: an indoor room, 50 % relative humidity"
	srcBarometric      = "standard atmosphere at sea level, 760 mmHg; enter the local barometer at altitude"
)

// RoomDefaults are the room conditions used when none are entered.
type RoomDefaults struct {
	TemperatureC   Value
	HumidityPct    Value // relative humidity, %
	BarometricMmHg Value
}

// DefaultRoom is 22 C, 50 % relative humidity and 760 mmHg, with sources.
func DefaultRoom() RoomDefaults {
	return RoomDefaults{
		TemperatureC:   Value{22, srcRoomTemperature},
		HumidityPct:    Value{50, srcRoomHumidity},
		BarometricMmHg: Value{760, srcBarometric},
	}
}

// SaturatedVapourPressureMmHg is the vapour pressure of water over a flat
// water surface at tempC, by Buck's formula (J Appl Meteorol 1981;20:1527):
// 0.61121 exp((18.678 - T/234.5) (T / (257.14 + T))) kPa, in mmHg. It is
// fitted for -40..50 C; callers check the range (BTPSFactor does).
func SaturatedVapourPressureMmHg(tempC float64) float64 {
	t := tempC
	return buckA * math.Exp((buckB-t/buckC)*(t/(buckD+t))) * kPaToMmHg
}

// BTPSFactor is the volume at body conditions (37 C, saturated, at the
// barometric pressure) of one unit of room air at roomC and rhPercent:
// (310.15 / (273.15 + Ta)) x (PB - RH Psat(Ta)) / (PB - 47) (the gas laws;
// ATS/ERS 2005 for the convention). Entries outside RoomCMin..RoomCMax,
// 0-100 % and BarometricMinMmHg..BarometricMaxMmHg are refused with a
// *RangeError naming the entry.
func BTPSFactor(roomC, rhPercent, barometricMmHg float64) (float64, error) {
	if err := CheckRange("room temperature", roomC, RoomCMin, RoomCMax, "C"); err != nil {
		return 0, err
	}
	if err := CheckRange("room relative humidity", rhPercent, RoomRHMinPercent, RoomRHMaxPercent, "%"); err != nil {
		return 0, err
	}
	if err := CheckRange("barometric pressure", barometricMmHg, BarometricMinMmHg, BarometricMaxMmHg, "mmHg"); err != nil {
		return 0, err
	}
	room := barometricMmHg - rhPercent/100*SaturatedVapourPressureMmHg(roomC)
	body := barometricMmHg - BodyVapourMmHg
	f := (celsiusToKelvin + BodyTemperatureC) / (celsiusToKelvin + roomC) * room / body
	if !(f > 0) || math.IsInf(f, 0) {
		return 0, fmt.Errorf("BTPS factor %v from room %v C, %v %%, %v mmHg is not usable", f, roomC, rhPercent, barometricMmHg)
	}
	return f, nil
}

// BarometricCmH2O converts a barometric pressure in mmHg to cmH2O.
func BarometricCmH2O(mmHg float64) float64 { return mmHg * CmH2OPerMmHg }
