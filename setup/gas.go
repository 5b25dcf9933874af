package setup

import (
	"fmt"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// Room is the room's air as entered for a plan or a check; a nil field
// means its default (physiology.DefaultRoom, with its source).
type Room struct {
	TemperatureC   *float64
	HumidityPct    *float64 // relative humidity, %
	BarometricMmHg *float64
}

// RoomStatus is the room used, each value with where it came from, and
// the BTPS factor it gives: the volume in the lung (37 C, saturated) of one
// unit of the room air the piston draws (ATS/ERS spirometry standard 2005
// for the convention; Buck 1981 for the vapour pressure).
type RoomStatus struct {
	TemperatureC   physiology.Value
	HumidityPct    physiology.Value
	BarometricMmHg physiology.Value
	BTPSFactor     float64
}

// BTPSNote says on screen which volumes are at body conditions.
const BTPSNote = "volumes in the lung, mL/kg and plateau are at body conditions (BTPS: 37 C, saturated); the piston draws room air, which expands by the BTPS factor when warmed and wetted"

// PatientEffortNote goes beside a lung fitted to manometer readings.
const PatientEffortNote = "readings are taken with the patient passive: a patient's own breathing effort lowers both readings and inflates the fitted compliance"

// resolveRoom fills the room's defaults and computes the BTPS factor; an
// entry outside its range is an *InputError naming its flag.
func resolveRoom(r Room) (RoomStatus, error) {
	d := physiology.DefaultRoom()
	st := RoomStatus{TemperatureC: d.TemperatureC, HumidityPct: d.HumidityPct, BarometricMmHg: d.BarometricMmHg}
	for _, e := range []struct {
		field, quantity string
		v               *float64
		dst             *physiology.Value
		lo, hi          float64
		unit            string
	}{
		{"room-c", "room temperature", r.TemperatureC, &st.TemperatureC, physiology.RoomCMin, physiology.RoomCMax, "C"},
		{"room-rh", "room relative humidity", r.HumidityPct, &st.HumidityPct, physiology.RoomRHMinPercent, physiology.RoomRHMaxPercent, "%"},
		{"barometric-mmhg", "barometric pressure", r.BarometricMmHg, &st.BarometricMmHg, physiology.BarometricMinMmHg, physiology.BarometricMaxMmHg, "mmHg"},
	} {
		if e.v == nil {
			continue
		}
		if err := checkRange(e.field, e.quantity, *e.v, e.lo, e.hi, e.unit); err != nil {
			return st, err
		}
		*e.dst = physiology.Value{Value: *e.v, Source: entered}
	}
	f, err := physiology.BTPSFactor(st.TemperatureC.Value, st.HumidityPct.Value, st.BarometricMmHg.Value)
	if err != nil {
		return st, inputErr("room-c", err)
	}
	st.BTPSFactor = f
	return st, nil
}

// GasModel is what the version 2 breath takes from the room and the
// profile: the BTPS factor, the cylinder head, the leak and the relief valve.
type GasModel struct {
	Room RoomStatus
	// ClearanceCm is the cylinder head's distance beyond the largest hole's
	// top dead centre; ClearanceDefaulted when the profile did not say it.
	ClearanceCm        float64
	ClearanceDefaulted bool
	HeadPositionCm     float64 // from the wheel's centre (machine.CylinderHeadCm)
	LeakLPerMinAt20    float64 // L/min at 20 cmH2O, from the profile (or the bench fit)
	ReliefCmH2O        float64 // the profile's relief valve; 0: none stated

	// noCylinderGas, for tests only, leaves the cylinder's gas out of every
	// stroke (the head position is then 0 in the machine's input).
	noCylinderGas bool
}

// gasModelOf reads the cylinder, the leak and the relief valve from p, with
// the default room.
func gasModelOf(p profiles.Profile) GasModel {
	room, _ := resolveRoom(Room{})
	g := GasModel{Room: room, ClearanceCm: p.Cylinder.ClearanceCm, ClearanceDefaulted: p.Defaulted("cylinder.clearance_cm"),
		LeakLPerMinAt20: p.Circuit.LeakLMinAt20CmH2O, ReliefCmH2O: p.Circuit.ReliefCmH2O}
	if g.ClearanceCm > 0 && len(p.Crank.Holes) > 0 {
		largest := p.Crank.Holes[0]
		for _, h := range p.Crank.Holes {
			if h.RadiusCm > largest.RadiusCm {
				largest = h
			}
		}
		g.HeadPositionCm = machine.CylinderHeadCm(machine.Crank{RadiusCm: largest.RadiusCm, RodCm: p.Crank.RodCm, OffsetCm: p.Crank.OffsetCm}, g.ClearanceCm)
	}
	return g
}

// withRoom is g with the room used; v1 (tests only) makes the BTPS
// factor exactly 1 and leaves the cylinder's gas out.
func withRoom(g GasModel, room RoomStatus, v1 bool) GasModel {
	g.Room = room
	if v1 {
		g.Room.BTPSFactor, g.noCylinderGas = 1, true
	}
	return g
}

// patientPath is the gas path of a stroke into the patient.
func (g GasModel) patientPath() machine.GasPath {
	gp := machine.GasPath{BTPSFactor: g.Room.BTPSFactor, HeadPositionCm: g.HeadPositionCm,
		BarometricCmH2O:      physiology.BarometricCmH2O(g.Room.BarometricMmHg.Value),
		LeakLPerMinAt20CmH2O: g.LeakLPerMinAt20, ReliefCmH2O: g.ReliefCmH2O}
	if g.noCylinderGas {
		gp.HeadPositionCm = 0
	}
	return gp
}

// benchPath is the gas path of a bench breath: room air into a
// room-temperature test lung (F = 1), at the standard atmosphere (the
// bench's barometer is not recorded), through the same cylinder, leak and
// relief valve.
func (g GasModel) benchPath() machine.GasPath {
	gp := g.patientPath()
	gp.BTPSFactor, gp.BarometricCmH2O = 1, 0
	return gp
}

// ClearanceNote says that the profile's clearance was a default, or is "".
func (g GasModel) ClearanceNote() string {
	if !g.ClearanceDefaulted {
		return ""
	}
	return fmt.Sprintf("the profile does not give cylinder.clearance_cm: %.1f cm assumed (the format's default); measure it, the cylinder's gas costs volume", g.ClearanceCm)
}
