package setup

import (
	"math"
	"strings"
)

// HoleJSON is a hole in the JSON report.
type HoleJSON struct {
	Hole          string  `json:"hole"`
	SweptML       float64 `json:"swept_ml"`
	DeliveredVtML float64 `json:"delivered_vt_ml"`
	MLPerKg       float64 `json:"ml_per_kg"`
}

// DefaultJSON is a target with where its value comes from.
type DefaultJSON struct {
	Value  float64 `json:"value"`
	Source string  `json:"source"`
}

// FiguresJSON are one setting's figures, as every JSON object prints them:
// the machine's own (the setting and what it sets whatever the lung) and,
// in LungFiguresJSON, those the lung decides. The lung's part is nil when
// no lung explains a check's readings: nothing then is what the patient
// gets, and a report has no lung figure to print (see CheckJSON.MarshalJSON
// for how its keys are written then).
type FiguresJSON struct {
	MachineFiguresJSON
	*LungFiguresJSON
}

// MachineFiguresJSON are a setting's figures that do not depend on the
// lung: the hole and its swept volumes, the timing, the PEEP valve, the
// oxygen flow and the cylinder's time, the lung the figures were computed
// with (fitted or assumed, said beside it) and the room's BTPS factor.
type MachineFiguresJSON struct {
	Hole             string   `json:"hole"`
	SweptML          float64  `json:"swept_ml"`
	EffectiveSweptML float64  `json:"effective_swept_ml"`
	RateBPM          float64  `json:"rate_bpm"`
	MotorRPM         float64  `json:"motor_rpm"`
	DwellS           float64  `json:"dwell_s"`
	TiS              float64  `json:"ti_s"`
	TeS              float64  `json:"te_s"`
	IERatio          float64  `json:"ie_ratio"`
	PEEPCmH2O        float64  `json:"peep_cmh2o"`
	O2FlowLMin       float64  `json:"o2_flow_l_min"`
	CylinderMinutes  *float64 `json:"cylinder_minutes"` // null with no cylinder or no oxygen flowing
	CylinderEntered  bool     `json:"cylinder_entered,omitempty"`
	// cylinder_minutes runs to the reserve (cylinder_reserve_bar);
	// cylinder_minutes_to_empty to 0 bar, after which FiO2 falls to 0.21.
	CylinderMinutesToEmpty *float64 `json:"cylinder_minutes_to_empty,omitempty"`
	CylinderReserveBar     float64  `json:"cylinder_reserve_bar,omitempty"`
	ComplianceMLPerCmH2O   float64  `json:"compliance_ml_per_cmh2o"`
	ResistanceCmH2OPerLS   float64  `json:"resistance_cmh2o_per_l_s"`
	BTPSFactor             float64  `json:"btps_factor"`
}

// LungFiguresJSON are a setting's figures that the lung decides: what the
// patient gets (volume, pressures, flows, trapped gas, the FiO2 estimate),
// the load on the crank, and where the stroke's gas went. Version 2:
// delivered_vt_ml, ml_per_kg, trapped volume and plateau are at body
// conditions (BTPS); delivered_vt_room_ml is the room air that entered
// the lung, delivered_vt_ml / btps_factor.
type LungFiguresJSON struct {
	DeliveredVtML               float64 `json:"delivered_vt_ml"`
	MLPerKg                     float64 `json:"ml_per_kg"`
	FiO2                        float64 `json:"fio2"`
	MinuteVentilationLMin       float64 `json:"minute_ventilation_l_min"`
	PeakFlowLMin                float64 `json:"peak_flow_l_min"`
	PeakPressureCmH2O           float64 `json:"peak_pressure_cmh2o"`
	EndInspiratoryPressureCmH2O float64 `json:"end_inspiratory_pressure_cmh2o"`
	PlateauPressureCmH2O        float64 `json:"plateau_pressure_cmh2o"`
	DrivingPressureCmH2O        float64 `json:"driving_pressure_cmh2o"`
	IntrinsicPEEPCmH2O          float64 `json:"intrinsic_peep_cmh2o"`
	TrappedVolumeML             float64 `json:"trapped_volume_ml"`
	ExhalationTauS              float64 `json:"exhalation_tau_s"`
	PeakTorqueNm                float64 `json:"peak_torque_nm"`
	RatedTorqueShare            float64 `json:"rated_torque_share"`
	DeliveredVtRoomML           float64 `json:"delivered_vt_room_ml"`
	CompressionLossML           float64 `json:"compression_loss_ml"`
	LeakedML                    float64 `json:"leaked_ml"`
	ReliefVentedML              float64 `json:"relief_vented_ml"`
	PressureLimited             bool    `json:"pressure_limited"`
}

// figuresJSON rounds a setting's figures for printing, the lung's part
// included (a check withholds it with WithholdLung).
func figuresJSON(f Figures) FiguresJSON {
	j := FiguresJSON{MachineFiguresJSON: MachineFiguresJSON{
		Hole: f.Hole.Label, SweptML: r4(f.Hole.SweptML), EffectiveSweptML: r4(f.Hole.EffectiveSweptML),
		RateBPM: r4(f.Timing.RateBPM), MotorRPM: r4(f.Timing.RPM), DwellS: r4(f.Timing.DwellS),
		TiS: r4(f.Timing.TiS), TeS: r4(f.Timing.TeS), IERatio: r4(f.Timing.IE),
		PEEPCmH2O: r4(f.PEEPCmH2O), O2FlowLMin: r4(f.O2FlowLPerMin),
		ComplianceMLPerCmH2O: r4(f.ComplianceMLPerCmH2O), ResistanceCmH2OPerLS: r4(f.ResistanceCmH2OPerLS),
		BTPSFactor: r4(f.BTPSFactor),
	}, LungFiguresJSON: &LungFiguresJSON{
		DeliveredVtML: r4(f.Hole.DeliveredML), MLPerKg: r4(f.Hole.MLPerKg), FiO2: r4(f.FiO2),
		MinuteVentilationLMin: r4(f.MinuteVentLPerMin), PeakFlowLMin: r4(f.PeakFlowLPerMin),
		PeakPressureCmH2O: r4(f.PeakCmH2O), EndInspiratoryPressureCmH2O: r4(f.EndInspCmH2O),
		PlateauPressureCmH2O: r4(f.PlateauCmH2O), DrivingPressureCmH2O: r4(f.DrivingCmH2O),
		IntrinsicPEEPCmH2O: r4(f.IntrinsicPEEPCmH2O), TrappedVolumeML: r4(f.TrappedML), ExhalationTauS: r4(f.TauS),
		PeakTorqueNm: r4(f.PeakTorqueNm), RatedTorqueShare: r4(f.TorqueShareOfRating),
		DeliveredVtRoomML: r4(f.DeliveredRoomML), CompressionLossML: r4(f.CompressionLossML),
		LeakedML: r4(f.LeakedML), ReliefVentedML: r4(f.ReliefVentedML), PressureLimited: f.PressureLimited,
	}}
	j.CylinderEntered = f.CylinderGiven
	if f.CylinderGiven && !math.IsInf(f.CylinderMinutes, 0) {
		m, e := r4(f.CylinderMinutes), r4(f.CylinderEmptyMinutes)
		j.CylinderMinutes, j.CylinderMinutesToEmpty = &m, &e
		j.CylinderReserveBar = r4(f.CylinderReserveBar)
	}
	return j
}

// PlanJSON is the object `crankside plan --json` prints. Keys are
// snake_case and carry their units.
type PlanJSON struct {
	ProfileID     string  `json:"profile_id"`
	HeightCm      float64 `json:"height_cm"`
	Sex           string  `json:"sex"`
	Lung          string  `json:"lung"`
	PBWKg         float64 `json:"pbw_kg"`
	TargetMLPerKg float64 `json:"target_ml_per_kg"`
	TargetVtML    float64 `json:"target_vt_ml"`
	FiguresJSON
	OffTargetPct    float64                `json:"off_target_pct"`
	HoleBelow       *HoleJSON              `json:"hole_below"`
	HoleAbove       *HoleJSON              `json:"hole_above"`
	CalibrationK    float64                `json:"calibration_k"`
	CalibrationBML  float64                `json:"calibration_b_ml"`
	CalibrationDate string                 `json:"calibration_date"`
	Defaults        map[string]DefaultJSON `json:"targets"`
	Changes         []Change               `json:"changes"`
	Cautions        []Caution              `json:"cautions"`
	ClinicalCaution string                 `json:"clinical_caution"`
	GasJSON
	// What to watch and time at the bed (setup/watch.go) and the bedside
	// checklist (setup/checklist.go).
	Watch       WatchJSON       `json:"watch"`
	TimingCheck TimingCheck     `json:"timing_check"`
	Checklist   []ChecklistItem `json:"checklist"`
	// EntriesConverted are the entries typed in the ward's units and what
	// each was read as; absent when every entry was in the tool's units.
	EntriesConverted []Conversion `json:"entries_converted,omitempty"`
}

// GasJSON is the room and the machine's gas path used by every stroke.
type GasJSON struct {
	Room               map[string]DefaultJSON `json:"room"` // temperature_c, humidity_pct, barometric_mmhg
	ClearanceCm        float64                `json:"clearance_cm"`
	ClearanceDefaulted bool                   `json:"clearance_defaulted"`
	ClearanceNote      string                 `json:"clearance_note,omitempty"`
	LeakLMinAt20CmH2O  float64                `json:"leak_l_min_at_20_cmh2o"`
	ReliefCmH2O        float64                `json:"relief_cmh2o"`
}

func gasJSON(g GasModel) GasJSON {
	return GasJSON{
		Room: map[string]DefaultJSON{
			"temperature_c":   {r4(g.Room.TemperatureC.Value), g.Room.TemperatureC.Source},
			"humidity_pct":    {r4(g.Room.HumidityPct.Value), g.Room.HumidityPct.Source},
			"barometric_mmhg": {r4(g.Room.BarometricMmHg.Value), g.Room.BarometricMmHg.Source},
		},
		ClearanceCm: r4(g.ClearanceCm), ClearanceDefaulted: g.ClearanceDefaulted, ClearanceNote: g.ClearanceNote(),
		LeakLMinAt20CmH2O: r4(g.LeakLPerMinAt20), ReliefCmH2O: r4(g.ReliefCmH2O),
	}
}

// r4 rounds for the report: 4 decimals is far below any meaningful change.
func r4(v float64) float64 { return math.Round(v*1e4) / 1e4 }

func holeJSON(h *HoleFigure) *HoleJSON {
	if h == nil {
		return nil
	}
	return &HoleJSON{Hole: h.Label, SweptML: r4(h.SweptML), DeliveredVtML: r4(h.DeliveredML), MLPerKg: r4(h.MLPerKg)}
}

// JSON is the plan as the --json object.
func (pl Plan) JSON() PlanJSON {
	return PlanJSON{
		ProfileID: pl.ProfileID, HeightCm: r4(pl.Patient.HeightCm), Sex: pl.Patient.Sex.String(), Lung: pl.Lung.String(),
		PBWKg: r4(pl.PBWKg), TargetMLPerKg: r4(pl.MLPerKg.Value), TargetVtML: r4(pl.TargetVtML),
		FiguresJSON:  figuresJSON(pl.Figures),
		OffTargetPct: r4(pl.OffTargetPct),
		HoleBelow:    holeJSON(pl.Below), HoleAbove: holeJSON(pl.Above),
		CalibrationK: r4(pl.Calibration.K), CalibrationBML: r4(pl.Calibration.BML), CalibrationDate: pl.Calibration.Date,
		Defaults: map[string]DefaultJSON{
			"ml_per_kg":                {r4(pl.MLPerKg.Value), pl.MLPerKg.Source},
			"rate_bpm":                 {r4(pl.Rate.Value), pl.Rate.Source},
			"ie_ratio":                 {r4(pl.IE.Value), pl.IE.Source},
			"peep_cmh2o":               {r4(pl.PEEP.Value), pl.PEEP.Source},
			"fio2":                     {r4(pl.FiO2.Value), pl.FiO2.Source},
			"compliance_ml_per_cmh2o":  {r4(pl.Compliance.Value), pl.Compliance.Source},
			"resistance_cmh2o_per_l_s": {r4(pl.Resistance.Value), pl.Resistance.Source},
			"cylinder_reserve_bar":     {r4(pl.CylinderReserve.Value), pl.CylinderReserve.Source},
		},
		Changes: roundChanges(pl.Changes), Cautions: roundCautions(pl.Cautions), ClinicalCaution: ClinicalCaution,
		GasJSON: gasJSON(pl.Gas), EntriesConverted: pl.Converted,
		Watch: pl.Watch.JSON(), TimingCheck: pl.TimingCheck.JSON(), Checklist: Checklist(pl.WatchToSet()),
	}
}

// WatchToSet is the plan's watch band when its setting may be set, nil
// with a stop: no alarm limits are given for a setting not to be used.
func (pl Plan) WatchToSet() *WatchJSON {
	if FirstStop(pl.Cautions) != nil {
		return nil
	}
	w := pl.Watch.JSON()
	return &w
}

func roundChanges(cs []Change) []Change {
	out := make([]Change, len(cs))
	for i, c := range cs {
		out[i] = Change{What: c.What, Wanted: r4(c.Wanted), Got: r4(c.Got), Unit: c.Unit}
	}
	return out
}

func roundCautions(cs []Caution) []Caution {
	out := make([]Caution, len(cs))
	for i, c := range cs {
		c.Value, c.Limit = r4(c.Value), r4(c.Limit)
		out[i] = c
	}
	return out
}

// LevelWord is a caution level as printed: upper case, so it reads without
// colour.
func LevelWord(l Level) string { return strings.ToUpper(l.String()) }

// FiguresJSON are the plan's figures as its JSON prints them (a plan
// always has its lung's: the lung is the one it assumes).
func (pl Plan) FiguresJSON() FiguresJSON { return figuresJSON(pl.Figures) }
