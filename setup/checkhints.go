package setup

import (
	"fmt"

	"crankside/physiology"
)

// CheckHint is what a handover entry means and what a blank one is taken
// to be, with the source of a default, for a form to show beside the
// focused entry; "" for an entry it does not know. (Hint is the same for
// the plan's entries; a check's PEEP valve, say, is what the valve is set
// to, not the protocol's table.)
func CheckHint(name string) string {
	switch name {
	case "bed":
		return "the bed's label, like B4: never a patient's name"
	case "initials":
		return "who checks: 1 to 4 letters, or blank"
	case "second-initials":
		return "a second checker, for a change of hole or PEEP checked by two: 1 to 4 letters, or blank"
	case "hole", "rpm", "dwell-s", "turn-s", "pause-s", "breaths-per-min":
		return Hint(name, physiology.Normal)
	case "peep":
		return fmt.Sprintf("what the PEEP valve is set to; blank: %d cmH2O assumed (ARDS Network 2000 protocol: at least 5)", DefaultPEEPCmH2O)
	case "o2-lpm":
		return "the O2 bleed into the reservoir; blank: none (room air)"
	case "peak":
		return "the manometer at the peak of delivery, patient passive; with the end reading, or neither"
	case "end-pressure":
		return "the manometer when the piston stops (end of delivery); with the peak, or neither"
	case "cylinder-l", "cylinder-bar":
		return "optional: the cylinder's capacity and pressure together"
	case "gas-unit":
		return "the unit of PaO2 and PaCO2: m mmHg or k kPa (1 kPa = 7.50062 mmHg, NIST SP 811); kept for the next start"
	case "cylinder-reserve-bar", "breathing-against":
		return Hint(name, physiology.Normal)
	case "propose-hole", "propose-rpm", "propose-dwell-s", "propose-peep", "propose-o2-lpm":
		return "a change to evaluate beside the setting; blank: as now"
	}
	return GasGoalLine(name)
}
