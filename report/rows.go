package report

import (
	"crankside/setup"
	"fmt"
	"strings"
)

// Row is one figure as every report shows it: the command line's text,
// the handover card and each panel of the screen draw their figures from
// these rows, so a figure is formatted, and a difference computed, in one
// place only.
type Row struct {
	ID    string // stable, like the JSON key: "delivered_vt_ml"
	Label string // "Tidal volume"
	Unit  string // "mL"; empty for a ratio or a fraction
	Value float64
	Text  string // Value formatted, or why there is no number ("not in use")
	// With a proposal: its value and text, and the change as a number and
	// as text ("+12", "-0.4"); HasProposal is false without one.
	HasProposal  bool
	Proposed     float64
	ProposedText string
	Change       float64
	ChangeText   string
}

// rowSpec is how one figure is read from Figures and printed. A figure
// the lung decides is read from the lung's part alone (lung), so that
// when it is withheld there is no number to print.
type rowSpec struct {
	id, label, unit, format string
	get                     func(f setup.FiguresJSON) float64
	lung                    func(l *setup.LungFiguresJSON) float64
	// text, when set, replaces the formatted number (for figures that can
	// have no number, like a cylinder with no oxygen flowing).
	text func(f setup.FiguresJSON) (string, bool)
}

var figureRows = []rowSpec{
	{id: "delivered_vt_ml", label: "Tidal vol. BTPS", unit: "mL", format: "%.0f", lung: func(l *setup.LungFiguresJSON) float64 { return l.DeliveredVtML }},
	{id: "ml_per_kg", label: "  per kg PBW", unit: "mL/kg", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.MLPerKg }},
	{id: "peak_pressure_cmh2o", label: "Peak", unit: "cmH2O", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.PeakPressureCmH2O }},
	{id: "plateau_pressure_cmh2o", label: "Plateau", unit: "cmH2O", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.PlateauPressureCmH2O }},
	{id: "driving_pressure_cmh2o", label: "Driving*", unit: "cmH2O", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.DrivingPressureCmH2O }},
	{id: "intrinsic_peep_cmh2o", label: "Intrinsic PEEP", unit: "cmH2O", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.IntrinsicPEEPCmH2O }},
	{id: "rate_bpm", label: "Rate", unit: "/min", format: "%.1f", get: func(f setup.FiguresJSON) float64 { return f.RateBPM }},
	{id: "ti_s", label: "Ti", unit: "s", format: "%.2f", get: func(f setup.FiguresJSON) float64 { return f.TiS }},
	{id: "te_s", label: "Te", unit: "s", format: "%.2f", get: func(f setup.FiguresJSON) float64 { return f.TeS }},
	{id: "ie_ratio", label: "I:E", format: "1:%.1f", get: func(f setup.FiguresJSON) float64 { return f.IERatio }},
	{id: "minute_ventilation_l_min", label: "Minute vent.", unit: "L/min", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.MinuteVentilationLMin }},
	{id: "peak_flow_l_min", label: "Peak flow", unit: "L/min", format: "%.0f", lung: func(l *setup.LungFiguresJSON) float64 { return l.PeakFlowLMin }},
	{id: "end_inspiratory_pressure_cmh2o", label: "End-insp.", unit: "cmH2O", format: "%.1f", lung: func(l *setup.LungFiguresJSON) float64 { return l.EndInspiratoryPressureCmH2O }},
	{id: "trapped_ml", label: "Trapped gas", unit: "mL", format: "%.0f", lung: func(l *setup.LungFiguresJSON) float64 { return l.TrappedVolumeML }},
	{id: "fio2", label: "FiO2 (est.)", format: "%.2f", lung: func(l *setup.LungFiguresJSON) float64 { return l.FiO2 }},
	{id: "cylinder_minutes", label: "O2 to reserve", unit: "min", format: "%.0f", get: func(f setup.FiguresJSON) float64 {
		if f.CylinderMinutes == nil {
			return 0
		}
		return *f.CylinderMinutes
	},
		text: func(f setup.FiguresJSON) (string, bool) {
			if f.CylinderMinutes == nil {
				return "not in use (no O2 flow)", true
			}
			return "", false
		}},
	{id: "peak_torque_nm", label: "Crank torque", unit: "N m", format: "%.2f", lung: func(l *setup.LungFiguresJSON) float64 { return l.PeakTorqueNm }},
}

// DrivingNote explains the asterisk on the driving pressure's label.
const DrivingNote = "*driving pressure: plateau minus total PEEP (PEEP valve + intrinsic PEEP)"

// FigureRows are the figures of one setting, and of a proposal beside it
// when prop is not nil. The cylinder's row is left out when no cylinder
// was entered, and the lung's rows when the current setting's lung
// figures are withheld (no lung explains the readings): what is left is
// what the machine sets whatever the lung.
func FigureRows(cur setup.FiguresJSON, prop *setup.FiguresJSON) []Row {
	var rows []Row
	for _, s := range figureRows {
		if s.id == "cylinder_minutes" && !cur.CylinderEntered {
			continue
		}
		v, ok := s.value(cur)
		if !ok {
			continue
		}
		r := Row{ID: s.id, Label: s.label, Unit: s.unit, Value: v, Text: s.format1(cur, v)}
		if prop != nil {
			pv, pok := s.value(*prop)
			if !pok {
				continue
			}
			r.HasProposal = true
			r.Proposed, r.ProposedText = pv, s.format1(*prop, pv)
			_, noNumber := s.noNumber(cur)
			_, noNumberProp := s.noNumber(*prop)
			if noNumber || noNumberProp {
				r.ChangeText = ""
			} else {
				r.Change = r.Proposed - r.Value
				r.ChangeText = signed(s.format, r.Change)
			}
		}
		rows = append(rows, r)
	}
	return rows
}

// value is the row's figure, false when it is the lung's and the lung's
// figures are withheld.
func (s rowSpec) value(f setup.FiguresJSON) (float64, bool) {
	if s.lung == nil {
		return s.get(f), true
	}
	if f.LungFiguresJSON == nil {
		return 0, false
	}
	return s.lung(f.LungFiguresJSON), true
}

func (s rowSpec) noNumber(f setup.FiguresJSON) (string, bool) {
	if s.text == nil {
		return "", false
	}
	return s.text(f)
}

func (s rowSpec) format1(f setup.FiguresJSON, v float64) string {
	if t, ok := s.noNumber(f); ok {
		return t
	}
	return fmt.Sprintf(s.format, v)
}

// signed prints a change with its sign at the row's precision; a change
// that rounds to nothing prints as 0.
func signed(format string, v float64) string {
	format = strings.TrimPrefix(format, "1:")
	t := fmt.Sprintf(strings.Replace(format, "%", "%+", 1), v)
	if strings.Trim(t, "+-0.") == "" {
		return "0"
	}
	return t
}

// SettingRow is one quantity of a setting, now and proposed.
type SettingRow struct {
	ID, Label, Unit string
	Now, Proposed   string
	Changed         bool
}

// SettingRows are what the machine is set to, beside a proposal when one
// is made: every proposed quantity has its row.
func SettingRows(cur setup.Setting, prop *setup.Setting) []SettingRow {
	row := func(id, label, unit, format string, get func(s setup.Setting) any) SettingRow {
		r := SettingRow{ID: id, Label: label, Unit: unit, Now: fmt.Sprintf(format, get(cur))}
		if prop != nil {
			r.Proposed = fmt.Sprintf(format, get(*prop))
			r.Changed = r.Proposed != r.Now
		}
		return r
	}
	return []SettingRow{
		row("hole", "Hole", "", "%s", func(s setup.Setting) any { return s.Hole }),
		row("motor_rpm", "Motor speed", "rpm", "%.1f", func(s setup.Setting) any { return s.RPM }),
		row("dwell_s", "Dwell", "s", "%.1f", func(s setup.Setting) any { return s.DwellS }),
		row("peep_cmh2o", "PEEP valve", "cmH2O", "%.0f", func(s setup.Setting) any { return s.PEEPCmH2O }),
		row("o2_flow_l_min", "O2 bleed", "L/min", "%.1f", func(s setup.Setting) any { return s.O2LPerMin }),
	}
}

// PlanFigureRows are the plan's figures as rows.
func PlanFigureRows(pl setup.Plan) []Row { return FigureRows(pl.FiguresJSON(), nil) }
