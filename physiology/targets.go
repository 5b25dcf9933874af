package physiology

import (
	"fmt"
	"math"
	"strings"
)

// Lung is the lung condition that selects the default targets and mechanics.
type Lung int

const (
	Normal Lung = iota + 1
	ARDS
	Obstructive
)

func (l Lung) String() string {
	switch l {
	case Normal:
		return "normal"
	case ARDS:
		return "ards"
	case Obstructive:
		return "obstructive"
	}
	return "unknown"
}

// ParseLung accepts normal, ards and obstructive, in any case.
func ParseLung(text string) (Lung, error) {
	switch strings.ToLower(strings.TrimSpace(text)) {
	case "normal":
		return Normal, nil
	case "ards":
		return ARDS, nil
	case "obstructive", "copd", "asthma":
		return Obstructive, nil
	}
	return 0, fmt.Errorf("lung condition %s is not known; use normal, ards or obstructive", Quote(text))
}

// Accepted entry ranges for the targets.
const (
	MLPerKgMin = 4.0
	MLPerKgMax = 10.0
	// IEMin and IEMax bound the expiratory part E of an I:E written 1:E.
	// E below 1 is an inverse ratio, which this kind of machine cannot do:
	// expiration always lasts at least as long as the delivery half-turn.
	IEMin = 1.0
	IEMax = 4.0
	// RateMin and RateMax bound the rate a person may enter (per min).
	RateMin = 4.0
	RateMax = 60.0
	PEEPMin = 0.0
	PEEPMax = 25.0
	FiO2Min = 0.21
	FiO2Max = 1.0
	CMin    = 5.0 // mL/cmH2O
	CMax    = 200.0
	RMin    = 1.0 // cmH2O/(L/s)
	RMax    = 100.0
)

// Value is a default together with where it comes from.
type Value struct {
	Value  float64
	Source string
}

// Defaults are the starting targets and mechanics for one lung condition.
type Defaults struct {
	MLPerKg    Value
	RateBPM    Value
	IE         Value // E of 1:E
	PEEPCmH2O  Value // ARDS: replaced by the lower-PEEP/FiO2 table
	FiO2       Value
	Compliance Value // mL/cmH2O
	Resistance Value // cmH2O/(L/s), tube included
}

const (
	srcARDSNet   = "ARDS Network 2000 protocol"
	srcCommon    = "common practice"
	srcMemory    = "from memory: typical intubated adult values"
	srcRoomAir   = "room air: no oxygen bled in"
	srcPEEPTable = "ARDS Network 2000 lower-PEEP/FiO2 table"
)

// DefaultsFor returns the defaults for a lung condition. An unknown
// condition gets the normal-lung defaults.
func DefaultsFor(l Lung) Defaults {
	d := Defaults{
		MLPerKg:    Value{6, srcARDSNet + ": 6 mL/kg PBW"},
		RateBPM:    Value{14, srcCommon},
		IE:         Value{2, srcCommon + ": I:E 1:2"},
		PEEPCmH2O:  Value{5, srcARDSNet + ": PEEP at least 5"},
		FiO2:       Value{0.21, srcRoomAir},
		Compliance: Value{60, srcMemory},
		Resistance: Value{10, srcMemory},
	}
	switch l {
	case ARDS:
		d.RateBPM = Value{18, srcCommon + " for ARDS"}
		d.PEEPCmH2O = Value{5, srcPEEPTable}
		d.Compliance = Value{30, srcMemory + " (ARDS)"}
		d.Resistance = Value{12, srcMemory + " (ARDS)"}
	case Obstructive:
		d.RateBPM = Value{10, srcCommon + ": slow rate for obstructive disease"}
		d.IE = Value{3, srcCommon + ": I:E 1:3 for obstructive disease"}
		d.Resistance = Value{25, srcMemory + " (obstructive)"}
	}
	return d
}

// TidalVolumeML is mL/kg times PBW; mL/kg outside 4-10 is refused.
func TidalVolumeML(mlPerKg, pbwKg float64) (float64, error) {
	if err := CheckRange("tidal volume", mlPerKg, MLPerKgMin, MLPerKgMax, "mL/kg PBW"); err != nil {
		return 0, err
	}
	if math.IsNaN(pbwKg) || pbwKg <= 0 {
		return 0, fmt.Errorf("predicted body weight %v kg must be positive", pbwKg)
	}
	return mlPerKg * pbwKg, nil
}

// ParseIE reads an I:E written "1:2", "1:2.5" or just "2" and returns E.
// An inverse ratio (E below 1) is refused.
func ParseIE(text string) (float64, error) {
	t := strings.TrimSpace(text)
	i, e := "1", t
	if k := strings.IndexByte(t, ':'); k >= 0 {
		i, e = strings.TrimSpace(t[:k]), strings.TrimSpace(t[k+1:])
	}
	iv, err1 := parseFinite(i)
	ev, err2 := parseFinite(e)
	if err1 != nil || err2 != nil || iv <= 0 || ev <= 0 {
		return 0, fmt.Errorf("I:E %s is not a ratio like 1:2", Quote(text))
	}
	ratio := ev / iv
	if ratio < IEMin {
		return 0, fmt.Errorf("I:E %s is inverse; this machine's expiration is never shorter than inspiration: use 1:1 to 1:%g", Quote(text), IEMax)
	}
	if ratio > IEMax {
		return 0, fmt.Errorf("I:E %s is outside 1:1 to 1:%g", Quote(text), IEMax)
	}
	return ratio, nil
}
