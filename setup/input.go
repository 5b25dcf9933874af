package setup

import (
	"errors"
	"fmt"
	"time"

	"crankside/physiology"
)

// Patient is who the machine is set for. No name or identifier is held.
type Patient struct {
	HeightCm float64
	Sex      physiology.Sex
}

// Targets are what the clinician asks for. A zero field means the default
// for the lung condition (physiology.DefaultsFor), which the plan reports
// with its source.
type Targets struct {
	Lung                 physiology.Lung // 0: normal
	MLPerKg              float64         // 0: 6 mL/kg PBW
	RateBPM              float64         // 0: by lung condition
	IE                   float64         // E of 1:E; 0: 1:2 (obstructive 1:3)
	PEEPCmH2O            *float64        // nil: 5, or for ARDS the lower-PEEP/FiO2 table
	FiO2                 float64         // 0: 0.21, no oxygen bled in
	ComplianceMLPerCmH2O float64         // 0: by lung condition
	ResistanceCmH2OPerLS float64         // 0: by lung condition, tube included
	// Oxygen cylinder, optional: both zero means none entered.
	CylinderWaterL float64
	CylinderBar    float64
	// CylinderReserveBar is where the cylinder's time runs to; 0:
	// DefaultCylinderReserveBar.
	CylinderReserveBar float64
}

// Request is one plan to make.
type Request struct {
	Patient Patient
	Targets Targets
	// Now dates the calibration's age; zero means time.Now().
	Now time.Time
	// Room is the room's air (BTPS); nil fields mean the defaults.
	Room Room
	// Converted are the entries typed in the ward's units, echoed by the
	// plan (BuildRequest fills it).
	Converted []Conversion

	// v1Gas, for tests only (export_test.go): the BTPS factor exactly 1
	// and the cylinder's gas left out, which with no leak and a relief
	// above the peak is the version 1 model.
	v1Gas bool
}

// InputError is a value a person entered that cannot be used.
type InputError struct {
	Field  string // the flag or field, like "height-cm"
	Reason string // the value and the accepted range
	// Missing marks a required entry that is blank: a form shows it as
	// waiting for the entry rather than as a mistake.
	Missing bool
}

func (e *InputError) Error() string { return e.Field + ": " + e.Reason }

// ErrInput is matched by errors.Is for every *InputError.
var ErrInput = errors.New("setup: input")

func (e *InputError) Is(target error) bool { return target == ErrInput }

func inputErr(field string, err error) error {
	var re *physiology.RangeError
	if errors.As(err, &re) {
		return &InputError{Field: field, Reason: re.Error()}
	}
	return &InputError{Field: field, Reason: err.Error()}
}

func checkRange(field, quantity string, v, lo, hi float64, unit string) error {
	if err := physiology.CheckRange(quantity, v, lo, hi, unit); err != nil {
		return inputErr(field, err)
	}
	return nil
}

// Cylinder limits: a cylinder's water capacity and filling pressure.
const (
	CylinderWaterMinL = 0.1
	CylinderWaterMaxL = 100
	CylinderBarMax    = 300
)

// resolved is Targets with every default filled in and its source.
type resolved struct {
	lung       physiology.Lung
	mlPerKg    physiology.Value
	rate       physiology.Value
	ie         physiology.Value
	peep       physiology.Value
	fio2       physiology.Value
	compliance physiology.Value
	resistance physiology.Value
	table      physiology.TablePEEP
	reserve    physiology.Value // the cylinder's reserve, bar
}

const entered = "entered"

func resolveTargets(t Targets) (resolved, error) {
	lung := t.Lung
	if lung == 0 {
		lung = physiology.Normal
	}
	if lung < physiology.Normal || lung > physiology.Obstructive {
		return resolved{}, &InputError{Field: "lung", Reason: fmt.Sprintf("condition %d is not known; use normal, ards or obstructive", lung)}
	}
	d := physiology.DefaultsFor(lung)
	r := resolved{lung: lung}
	pick := func(field, quantity string, v float64, def physiology.Value, lo, hi float64, unit string) (physiology.Value, error) {
		if v == 0 {
			return def, nil
		}
		if err := checkRange(field, quantity, v, lo, hi, unit); err != nil {
			return physiology.Value{}, err
		}
		return physiology.Value{Value: v, Source: entered}, nil
	}
	var err error
	if r.mlPerKg, err = pick("ml-per-kg", "tidal volume", t.MLPerKg, d.MLPerKg, physiology.MLPerKgMin, physiology.MLPerKgMax, "mL/kg PBW"); err != nil {
		return r, err
	}
	if r.rate, err = pick("rate", "rate", t.RateBPM, d.RateBPM, physiology.RateMin, physiology.RateMax, "/min"); err != nil {
		return r, err
	}
	if r.ie, err = pick("ie", "I:E expiratory part", t.IE, d.IE, physiology.IEMin, physiology.IEMax, "(E of 1:E)"); err != nil {
		return r, err
	}
	if r.fio2, err = pick("fio2", "FiO2 (a fraction: 40% is 0.4)", t.FiO2, d.FiO2, physiology.FiO2Min, physiology.FiO2Max, ""); err != nil {
		return r, err
	}
	if r.compliance, err = pick("compliance", "compliance", t.ComplianceMLPerCmH2O, d.Compliance, physiology.CMin, physiology.CMax, "mL/cmH2O"); err != nil {
		return r, err
	}
	if r.resistance, err = pick("resistance", "resistance", t.ResistanceCmH2OPerLS, d.Resistance, physiology.RMin, physiology.RMax, "cmH2O/(L/s)"); err != nil {
		return r, err
	}
	if r.table, err = physiology.PEEPForFiO2(r.fio2.Value); err != nil {
		return r, inputErr("fio2", err)
	}
	switch {
	case t.PEEPCmH2O != nil:
		if err := checkRange("peep", "PEEP", *t.PEEPCmH2O, physiology.PEEPMin, physiology.PEEPMax, "cmH2O"); err != nil {
			return r, err
		}
		r.peep = physiology.Value{Value: *t.PEEPCmH2O, Source: entered}
	case lung == physiology.ARDS:
		r.peep = physiology.Value{Value: r.table.LowestCmH2O,
			Source: fmt.Sprintf("ARDSNet 2000 lower-PEEP/FiO2 table at FiO2 %.1f", r.table.FiO2Step)}
	default:
		r.peep = d.PEEPCmH2O
	}
	if r.reserve, err = resolveReserve(t.CylinderReserveBar); err != nil {
		return r, err
	}
	if t.CylinderWaterL != 0 || t.CylinderBar != 0 {
		if err := checkRange("cylinder-l", "cylinder water capacity", t.CylinderWaterL, CylinderWaterMinL, CylinderWaterMaxL, "L"); err != nil {
			return r, err
		}
		if err := checkRange("cylinder-bar", "cylinder pressure", t.CylinderBar, 0, CylinderBarMax, "bar"); err != nil {
			return r, err
		}
	}
	return r, nil
}

// pbwOf is the patient's predicted body weight, or an *InputError naming
// the height or the sex.
func pbwOf(p Patient) (float64, error) {
	if p.Sex != physiology.Male && p.Sex != physiology.Female {
		return 0, &InputError{Field: "sex", Reason: "must be male or female"}
	}
	pbw, err := physiology.PredictedBodyWeightKg(p.HeightCm, p.Sex)
	if err != nil {
		return 0, inputErr("height-cm", err)
	}
	return pbw, nil
}

// orNow is t, or the current time when t is zero (a request that does not
// say when it is made).
func orNow(t time.Time) time.Time {
	if t.IsZero() {
		return time.Now()
	}
	return t
}

// A bedside manometer's readings: anything outside 0-150 cmH2O is a
// typing slip, not a reading (common practice: the scale of a ventilator's
// airway manometer; the cautions judge readings far inside it).
const (
	ManometerMinCmH2O = 0
	ManometerMaxCmH2O = 150
)

// CheckReadings refuses manometer readings outside ManometerMinCmH2O-
// ManometerMaxCmH2O, naming the entry ("peak", "end-pressure"). The entry
// builder calls it on a check's readings.
func CheckReadings(rd physiology.Readings) Problems {
	var ps Problems
	for _, r := range []struct {
		field, quantity string
		v               float64
	}{{"peak", "peak reading", rd.PeakCmH2O}, {"end-pressure", "end reading", rd.EndCmH2O}} {
		if err := checkRange(r.field, r.quantity, r.v, ManometerMinCmH2O, ManometerMaxCmH2O, "cmH2O"); err != nil {
			ps = append(ps, err.(*InputError))
		}
	}
	return ps
}
