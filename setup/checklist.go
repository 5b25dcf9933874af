package setup

import "fmt"

// ChecklistItem is one thing to have in place at the bed of a patient on
// an improvised unit, with where the rule comes from.
type ChecklistItem struct {
	ID     string `json:"id"`
	Text   string `json:"text"`
	Source string `json:"source"`
}

// Checklist is the bedside checklist for a setting. With a watch band the
// alarm item carries its limits; without one (readings no lung explains,
// or a setting with a stop) it says that no limits are given.
func Checklist(w *WatchJSON) []ChecklistItem {
	alarm := "External pressure alarm on the circuit, limits to be set once a usable setting is found (none given here); a power and gas supply failure alarm"
	if w != nil {
		alarm = fmt.Sprintf("External pressure alarm on the circuit: HIGH %s cmH2O, LOW/disconnection %s cmH2O; a power and gas supply failure alarm",
			plain(w.AlarmHighCmH2O), plain(w.AlarmLowCmH2O))
	}
	return []ChecklistItem{
		{ID: "external-alarm", Text: alarm, Source: "RMVS001 2020 (alarms for high pressure, pressure not reached, supply failure); limits: common practice"},
		{ID: "bag-at-bed", Text: "A self-inflating bag with mask and an oxygen connection at the bed, checked", Source: "common practice"},
		{ID: "humidification", Text: "Humidification in the circuit: a heat-and-moisture exchanger (HME) at the patient end", Source: "common practice"},
		{ID: "oxygen-away-from-motor", Text: "Oxygen cylinder, tubing and bleed away from the motor and its switch; no oil or grease on oxygen fittings", Source: "common practice"},
		{ID: "passive-patient", Text: "The patient is passive (sedated as prescribed): the unit cannot sense a breath, and breathing against it makes the readings meaningless", Source: "common practice"},
	}
}
