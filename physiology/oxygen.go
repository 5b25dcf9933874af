package physiology

import "math"

// RoomAirFiO2 is the oxygen fraction of air.
const RoomAirFiO2 = 0.21

// FiO2FromBleed estimates the inspired oxygen fraction when o2LPerMin of
// oxygen is bled into an intake reservoir that the piston draws a minute
// ventilation of mvLPerMin from: 0.21 + 0.79 min(1, Q/VE). It assumes the
// reservoir holds at least one tidal volume.
func FiO2FromBleed(o2LPerMin, mvLPerMin float64) float64 {
	if o2LPerMin <= 0 || mvLPerMin <= 0 {
		if o2LPerMin > 0 {
			return 1
		}
		return RoomAirFiO2
	}
	return RoomAirFiO2 + (1-RoomAirFiO2)*math.Min(1, o2LPerMin/mvLPerMin)
}

// O2FlowForFiO2 is the inverse: the oxygen flow in L/min that gives fio2 at
// a minute ventilation of mvLPerMin. FiO2 1.0 needs the whole minute
// ventilation; more oxygen than that only spills from the reservoir.
func O2FlowForFiO2(fio2, mvLPerMin float64) float64 {
	f := math.Min(1, math.Max(RoomAirFiO2, fio2))
	return (f - RoomAirFiO2) / (1 - RoomAirFiO2) * mvLPerMin
}

// CylinderGasL is the free gas in a cylinder: water capacity (L) times
// gauge pressure (bar).
func CylinderGasL(waterCapacityL, pressureBar float64) float64 {
	return waterCapacityL * pressureBar
}

// CylinderMinutesLeft is the time a cylinder lasts at a flow, in minutes;
// +Inf with no flow.
func CylinderMinutesLeft(waterCapacityL, pressureBar, flowLPerMin float64) float64 {
	if flowLPerMin <= 0 {
		return math.Inf(1)
	}
	return CylinderGasL(waterCapacityL, pressureBar) / flowLPerMin
}

// PistonIntakeLPerMin is what the piston draws from the intake reservoir
// each minute: its effective swept volume (mL) every turn, at rateBPM turns
// per minute. The whole stroke is drawn in, whatever part of it reaches the
// lung, so this and not the delivered minute volume dilutes the oxygen.
func PistonIntakeLPerMin(effectiveSweptML, rateBPM float64) float64 {
	return effectiveSweptML * rateBPM / 1000
}

// FiO2FromPistonIntake estimates FiO2 when o2LPerMin of oxygen is bled
// into the reservoir that the piston empties at effectiveSweptML per turn
// and rateBPM turns per minute: 0.21 + 0.79 min(1, Q / (swept x rate)).
func FiO2FromPistonIntake(o2LPerMin, effectiveSweptML, rateBPM float64) float64 {
	return FiO2FromBleed(o2LPerMin, PistonIntakeLPerMin(effectiveSweptML, rateBPM))
}

// O2FlowForFiO2AtPistonIntake is the inverse of FiO2FromPistonIntake: the
// oxygen flow in L/min for fio2 (held to 0.21-1) at that intake.
func O2FlowForFiO2AtPistonIntake(fio2, effectiveSweptML, rateBPM float64) float64 {
	return O2FlowForFiO2(fio2, PistonIntakeLPerMin(effectiveSweptML, rateBPM))
}
