package setup

import (
	"fmt"
	"math"
	"sort"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// Level is how serious a caution is. The level is always shown as a word;
// colour only repeats it.
type Level int

const (
	// Note is worth knowing.
	Note Level = iota + 1
	// Warn needs a clinician's decision.
	Warn
	// Stop: do not use this setting.
	Stop
)

func (l Level) String() string {
	switch l {
	case Note:
		return "note"
	case Warn:
		return "warn"
	case Stop:
		return "stop"
	}
	return "unknown"
}

// MarshalText writes the level as its word.
func (l Level) MarshalText() ([]byte, error) { return []byte(l.String()), nil }

// UnmarshalText reads a level's word, as a log record holds it.
func (l *Level) UnmarshalText(b []byte) error {
	for _, c := range []Level{Note, Warn, Stop} {
		if string(b) == c.String() {
			*l = c
			return nil
		}
	}
	return fmt.Errorf("caution level %q is not note, warn or stop", b)
}

// Caution is one finding about a setting.
type Caution struct {
	ID      string  `json:"id"`
	Level   Level   `json:"level"`
	Message string  `json:"message"` // one line with the number and the limit
	Value   float64 `json:"value"`
	Limit   float64 `json:"limit"`
	Unit    string  `json:"unit"`
	Advice  string  `json:"advice"`
	Source  string  `json:"source"`
}

// ClinicalCaution is carried by every screen and printout.
const ClinicalCaution = "Decision support only: every setting must be confirmed by the responsible clinician under local protocols."

// ClinicalCautionShort is the same caution for an 80-column screen line.
const ClinicalCautionShort = "Settings must be confirmed by the responsible clinician under local protocols."

// Limits behind the cautions, with their sources.
const (
	srcARDSNet = "ARDS Network 2000 protocol"
	srcAmato   = "Amato et al. 2015 (15 cmH2O: common practice after it)"
	srcMHRA    = "MHRA RMVS001 2020"
	srcCommon  = "common practice"
	srcISO     = "ISO 80601-2-12:2020 (secondary source, from memory)"

	VtWarnMLPerKg      = 8.0
	VtStopMLPerKg      = 10.0
	VtLowMLPerKg       = 4.0
	PlateauMaxCmH2O    = 30.0
	DrivingMaxCmH2O    = 15.0
	PeakMaxCmH2O       = 40.0
	RateMaxBPM         = 35.0
	RateMinBPM         = 8.0
	IntrinsicPEEPMax   = 2.0
	PEEPMinCmH2O       = 5.0
	HoleOffTargetPct   = 10.0
	CalibrationMaxDays = 30
	CylinderMinMinutes = 120.0
	TorqueWarnShare    = 0.8
	TorqueStopShare    = 1.0
	TiChangeWarnPct    = 10.0

	// Version 2 limits.
	VtStopLowMLPerKg  = 2.0  // below: the breath barely passes the dead space
	PlateauStopCmH2O  = 35.0 // MHRA RMVS001 2020: plateau limited to 35
	IEMinE            = 1.0  // I:E 1:1 to 1:3 (E of 1:E): ARDS Network, RMVS001
	IEMaxE            = 3.0
	RateNoteMinBPM    = 10.0 // MHRA RMVS001 2020: rate 10-30 /min
	RateNoteMaxBPM    = 30.0
	IntrinsicPEEPStop = 5.0
	ReliefMaxCmH2O    = 40.0 // MHRA RMVS001 2020: never more than 40 cmH2O
	// Anatomic dead space per kg PBW ("1 mL per pound"; Radford 1955, from
	// memory), before the tube and any filter.
	DeadSpaceMLPerKg = 2.2
	// Minute ventilation below 60 mL/kg PBW/min is low for an adult
	// (common practice: about 100 mL/kg/min, 7 L/min at 70 kg, is usual).
	MinuteVentLowMLPerKgMin = 60.0
	// Alveolar ventilation below 40 mL/kg PBW/min: at a usual CO2
	// production that is about two thirds of the usual 60 mL/kg/min, so
	// PaCO2 rises by half (alveolar ventilation equation; common practice).
	AlveolarVentLowMLPerKgMin = 40.0
	// Alveolar ventilation below 20 mL/kg PBW/min is a stop: a third of
	// the usual 60 mL/kg/min, so at a usual CO2 production PaCO2 is about
	// three times normal (alveolar ventilation equation, PaCO2
	// proportional to VCO2/VA; common practice). Vt at or below the dead
	// space (no alveolar ventilation at all) is a stop too.
	AlveolarVentStopMLPerKgMin = 20.0
	// A fixed-speed motor cannot be turned to a wanted Ti: a change under
	// this share is a note, above it a warn.
	TiChangeFixedNotePct = 20.0
	// Bench calibration k (effective / geometric swept volume) outside
	// CalKMin-CalKMax is implausible: a piston cannot deliver much more
	// than it sweeps (10% allows for the bench's own error), and losing
	// more than 30% means a leak or a valve fault, not a calibration.
	CalKMin = 0.7
	CalKMax = 1.1
)

const (
	srcRadford = "Radford 1955 dead space 2.2 mL/kg PBW (from memory); threshold common practice"
	srcProfile = "this machine's profile"
)

// assessment is every figure a caution may need.
type assessment struct {
	heightCm     float64
	pbwKg        float64
	f            Figures
	reliefCmH2O  float64
	timing       *machine.TimingPlan // nil in a check of an observed setting
	targetMLPerK float64             // 0 when there is no target
	offTargetPct float64
	cal          CalibrationStatus
	ratedTorque  float64
	fixedMotor   bool // the motor runs at one speed only
	// clearanceNote is set when the profile's cylinder clearance was a
	// default (GasModel.ClearanceNote).
	clearanceNote string
	// hz is what the hazards of an improvised unit need
	// (cautions_hazards.go).
	hz hazards
}

// assess computes every caution for a setting, most serious first.
func assess(a assessment) []Caution {
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	f := a.f

	out = append(out, patientTriggeringCaution(a)...)
	out = append(out, heightCaution(a)...)

	mlkg := f.Hole.MLPerKg
	switch {
	case mlkg >= VtStopMLPerKg:
		add(Caution{ID: "tidal-volume-high", Level: Stop, Value: mlkg, Limit: VtStopMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is at or above %.0f", mlkg, VtStopMLPerKg),
			Advice:  smallerHoleAdvice(a, true), Source: srcARDSNet})
	case mlkg > VtWarnMLPerKg:
		add(Caution{ID: "tidal-volume-high", Level: Warn, Value: mlkg, Limit: VtWarnMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is above %.0f", mlkg, VtWarnMLPerKg),
			Advice:  smallerHoleAdvice(a, false), Source: srcARDSNet})
	case mlkg < VtStopLowMLPerKg:
		add(Caution{ID: "tidal-volume-low", Level: Stop, Value: mlkg, Limit: VtStopLowMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is below %.0f: little or no gas passes the dead space", mlkg, VtStopLowMLPerKg),
			Advice:  "do not use: larger hole; check the circuit for a leak", Source: "common practice (ARDS Network 2000 floor is 4)"})
	case mlkg < VtLowMLPerKg:
		add(Caution{ID: "tidal-volume-low", Level: Warn, Value: mlkg, Limit: VtLowMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is below %.0f", mlkg, VtLowMLPerKg),
			Advice:  "watch CO2; consider a larger hole or a higher rate", Source: srcARDSNet})
	}
	out = append(out, pressureCautions(a)...)
	if r := f.Timing.RateBPM; r > RateMaxBPM {
		add(Caution{ID: "rate-high", Level: Warn, Value: r, Limit: RateMaxBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min is above %.0f", r, RateMaxBPM),
			Advice:  "check for trapped gas; the protocol's ceiling is 35", Source: srcARDSNet})
	} else if r < RateMinBPM {
		add(Caution{ID: "rate-low", Level: Warn, Value: r, Limit: RateMinBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min is below %.0f", r, RateMinBPM),
			Advice:  "check minute ventilation and CO2", Source: srcCommon})
	}
	out = append(out, timingCautions(a)...)
	out = append(out, ventilationCautions(a)...)
	out = append(out, reliefCautions(a.reliefCmH2O)...)
	out = append(out, holeCautions(a)...)
	out = append(out, calibrationCautions(a.cal)...)
	if a.clearanceNote != "" {
		add(Caution{ID: "clearance-default", Level: Note, Value: 0, Limit: 0, Unit: "cm",
			Message: a.clearanceNote, Advice: "measure the gap between the piston at its top and the cylinder head; put it in the profile",
			Source: srcProfile + " (format /2 default)"})
	}
	out = append(out, o2FlowCautions(a)...)
	out = append(out, cylinderCautions(a)...)
	if a.ratedTorque > 0 {
		share := f.TorqueShareOfRating
		switch {
		case share > TorqueStopShare:
			add(Caution{ID: "torque-high", Level: Stop, Value: 100 * share, Limit: 100 * TorqueStopShare, Unit: "% of rating",
				Message: fmt.Sprintf("peak crank torque %.1f N m is %.0f%% of the motor's %.1f N m rating", f.PeakTorqueNm, 100*share, a.ratedTorque),
				Advice:  "the motor may stall mid-breath: smaller hole or lower pressure", Source: "this machine's profile"})
		case share > TorqueWarnShare:
			add(Caution{ID: "torque-high", Level: Warn, Value: 100 * share, Limit: 100 * TorqueWarnShare, Unit: "% of rating",
				Message: fmt.Sprintf("peak crank torque %.1f N m is %.0f%% of the motor's %.1f N m rating (over 80%%)", f.PeakTorqueNm, 100*share, a.ratedTorque),
				Advice:  "little margin before the motor stalls", Source: srcCommon})
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Level > out[j].Level })
	return out
}

// pressureCautions are the predicted pressures against their limits.
func pressureCautions(a assessment) []Caution {
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	f := a.f
	if f.PlateauCmH2O > PlateauStopCmH2O {
		add(Caution{ID: "plateau-high", Level: Stop, Value: f.PlateauCmH2O, Limit: PlateauStopCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("plateau pressure %.1f cmH2O is above %.0f, the limit of an emergency ventilator", f.PlateauCmH2O, PlateauStopCmH2O),
			Advice:  "do not use: smaller hole; check the lung model against a measured plateau", Source: srcMHRA})
	} else if f.PlateauCmH2O > PlateauMaxCmH2O {
		add(Caution{ID: "plateau-high", Level: Warn, Value: f.PlateauCmH2O, Limit: PlateauMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("plateau pressure %.1f cmH2O is above %.0f", f.PlateauCmH2O, PlateauMaxCmH2O),
			Advice:  "reduce tidal volume (smaller hole)", Source: srcARDSNet})
	}
	if f.DrivingCmH2O > DrivingMaxCmH2O {
		add(Caution{ID: "driving-pressure-high", Level: Warn, Value: f.DrivingCmH2O, Limit: DrivingMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("driving pressure (plateau above total PEEP) %.1f cmH2O is above %.0f", f.DrivingCmH2O, DrivingMaxCmH2O),
			Advice:  "reduce tidal volume; review PEEP", Source: srcAmato})
	}
	if a.reliefCmH2O > 0 && (f.PressureLimited || f.PeakCmH2O > a.reliefCmH2O) {
		// The model holds the circuit at the relief pressure and vents the
		// rest: the figures shown are already the vented breath's.
		add(Caution{ID: "peak-above-relief", Level: Stop, Value: f.PeakCmH2O, Limit: a.reliefCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the breath reaches this machine's relief valve at %.0f cmH2O: it is pressure-limited, %.0f mL vents, and the patient gets less (%.0f mL) than the hole would give",
				a.reliefCmH2O, f.ReliefVentedML, f.Hole.DeliveredML),
			Advice: "use a smaller hole or a slower motor speed", Source: srcProfile})
	}
	if f.PeakCmH2O > PeakMaxCmH2O {
		add(Caution{ID: "peak-high", Level: Stop, Value: f.PeakCmH2O, Limit: PeakMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("peak pressure %.1f cmH2O is above %.0f", f.PeakCmH2O, PeakMaxCmH2O),
			Advice:  "the patient must never see more than 40 cmH2O; smaller hole or slower speed", Source: srcMHRA})
	}
	if f.IntrinsicPEEPCmH2O > IntrinsicPEEPStop {
		add(Caution{ID: "intrinsic-peep", Level: Stop, Value: f.IntrinsicPEEPCmH2O, Limit: IntrinsicPEEPStop, Unit: "cmH2O",
			Message: fmt.Sprintf("intrinsic PEEP %.1f cmH2O is above %.0f: gas builds up breath after breath (%.0f mL trapped)", f.IntrinsicPEEPCmH2O, IntrinsicPEEPStop, f.TrappedML),
			Advice:  "do not use: lower the rate or lengthen expiration (longer dwell)", Source: srcCommon})
	} else if f.IntrinsicPEEPCmH2O > IntrinsicPEEPMax {
		add(Caution{ID: "intrinsic-peep", Level: Warn, Value: f.IntrinsicPEEPCmH2O, Limit: IntrinsicPEEPMax, Unit: "cmH2O",
			Message: fmt.Sprintf("intrinsic PEEP %.1f cmH2O is above %.0f: exhalation does not finish (%.0f mL trapped)", f.IntrinsicPEEPCmH2O, IntrinsicPEEPMax, f.TrappedML),
			Advice:  "lower the rate or lengthen expiration (longer dwell)", Source: srcCommon})
	}
	out = append(out, leakShareCautions(f)...)
	if f.PEEPCmH2O < PEEPMinCmH2O {
		add(Caution{ID: "peep-low", Level: Warn, Value: f.PEEPCmH2O, Limit: PEEPMinCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("PEEP %.1f cmH2O is below %.0f", f.PEEPCmH2O, PEEPMinCmH2O),
			Advice:  "the protocol keeps PEEP at 5 or more", Source: srcARDSNet})
	}
	return out
}

// ReadingCautions judge what the manometer shows, before and without any
// fit: a measured peak above 40 cmH2O or above the relief valve, an
// end-inspiratory reading at or below PEEP, or a peak below the end
// reading is a stop whatever a lung model makes of it. reliefCmH2O is
// the profile's relief valve: every profile has one (validation accepts
// 10-80 cmH2O and refuses a profile without it), so 0 never means "no
// valve". 0 only leaves the relief comparison out where the valve is not
// known: a record read back from a log (recordrules.go) carries no profile.
func ReadingCautions(r physiology.Readings, peepCmH2O, reliefCmH2O float64) []Caution {
	const look = "check the patient now (tube, airway, chest), the circuit and its connections, and the manometer; "
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	peak, end := r.PeakCmH2O, r.EndCmH2O
	if !finiteNumber(peak) || !finiteNumber(end) {
		return []Caution{{ID: "readings-not-numbers", Level: Stop, Unit: "cmH2O",
			Message: "a manometer reading is not a number", Advice: look + "re-take both readings", Source: srcCommon}}
	}
	if peak > PeakMaxCmH2O {
		add(Caution{ID: "measured-peak-high", Level: Stop, Value: peak, Limit: PeakMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the manometer reads a peak of %.1f cmH2O, above %.0f: the patient must never see more than %.0f", peak, PeakMaxCmH2O, PeakMaxCmH2O),
			Advice:  look + "then re-take the peak", Source: srcMHRA + " (high inspiratory pressure)"})
	}
	if reliefCmH2O > 0 && peak > reliefCmH2O {
		add(Caution{ID: "measured-peak-above-relief", Level: Stop, Value: peak, Limit: reliefCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the manometer reads a peak of %.1f cmH2O, above this machine's relief valve at %.0f: the valve or the manometer is not working", peak, reliefCmH2O),
			Advice:  look + "test the relief valve", Source: srcProfile + " (relief pressure)"})
	}
	if end <= peepCmH2O {
		add(Caution{ID: "measured-end-at-or-below-peep", Level: Stop, Value: end, Limit: peepCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the end-inspiratory reading %.1f cmH2O is at or below PEEP %.1f: a leak, a disconnection, or the reading was taken at the wrong moment", end, peepCmH2O),
			Advice:  look + "then re-take it as the piston stops", Source: srcMHRA + " (pressure not reached: disconnection)"})
	}
	if peak < end {
		add(Caution{ID: "measured-peak-below-end", Level: Stop, Value: peak, Limit: end, Unit: "cmH2O",
			Message: fmt.Sprintf("the peak reading %.1f cmH2O is below the end reading %.1f: the peak is the highest pressure of the breath", peak, end),
			Advice:  look + "re-take both readings on one breath", Source: srcCommon})
	}
	return out
}

func finiteNumber(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// unexplainedCaution is the stop for readings no lung explains: nothing the
// model predicts for this setting is then what the patient gets.
func unexplainedCaution(fitProblem string) Caution {
	return Caution{ID: "readings-unexplained", Level: Stop, Unit: "",
		Message: "the readings cannot be explained by any lung at this setting: " + fitProblem,
		Advice:  "no figure is shown as what the patient gets; check the circuit and the patient, then re-take both readings", Source: srcCommon}
}

// assumedLungCaution marks a proposal evaluated on the assumed lung because
// the readings rd at the current setting could not be explained. It is a
// stop: a measured alarm is never hidden by a prediction, and the
// proposal's figures, however mild, rest on a lung the manometer
// contradicts (DESIGN.md, Cautions, version 2: readings no lung explains,
// stop).
func assumedLungCaution(rd *physiology.Readings) Caution {
	reads := "readings that no lung explains"
	if rd != nil && finiteNumber(rd.PeakCmH2O) && finiteNumber(rd.EndCmH2O) {
		reads = fmt.Sprintf("%s/%s cmH2O (peak/end)", plain(rd.PeakCmH2O), plain(rd.EndCmH2O))
	}
	return Caution{ID: "proposal-on-assumed-lung", Level: Stop, Unit: "",
		Message: "this proposal's figures rest on an ASSUMED lung, while the manometer reads " + reads + " at the current setting",
		Advice:  "do not use: find the cause (patient, tube, circuit, manometer) and re-take both readings before any change is made",
		Source:  srcCommon + ": a figure from an assumed lung never stands in for what the manometer shows"}
}

// judgesAssumedLung reports whether the caution id judges a figure
// the lung model predicts (volume, plateau, driving pressure, peak,
// trapped gas, minute and alveolar ventilation from the predicted volume,
// crank torque from the predicted pressures). The rest judge what does not
// depend on the lung: the patient's height, the rate, I:E and reach of the
// motor and controller, the PEEP valve, the relief valve, the calibration,
// the cylinder. A new caution is kept unless it is listed here: when in
// doubt a caution is shown.
func judgesAssumedLung(id string) bool {
	switch id {
	case "tidal-volume-high", "tidal-volume-low", "plateau-high", "driving-pressure-high",
		"peak-above-relief", "peak-high", "intrinsic-peep", "minute-ventilation-low",
		"alveolar-ventilation-low", "torque-high":
		return true
	}
	return false
}

// withoutAssumedLungFigures drops from a setting's cautions those that
// judge the assumed lung's predicted figures: with readings no lung
// explains, none of them is what the patient gets, and a screen that says
// THE PATIENT GETS: NOT KNOWN must not judge them beside it. The readings'
// own stops and the unexplained stop say what is known.
func withoutAssumedLungFigures(cs []Caution) []Caution {
	out := make([]Caution, 0, len(cs))
	for _, c := range cs {
		if !judgesAssumedLung(c.ID) {
			out = append(out, c)
		}
	}
	return out
}

// checkCautions are a check's current cautions: the readings' own first,
// then the unexplained readings, then the setting's, most serious first.
func checkCautions(rd *physiology.Readings, peepCmH2O, reliefCmH2O float64, fitProblem string, setting []Caution) []Caution {
	var out []Caution
	if rd != nil {
		out = append(out, ReadingCautions(*rd, peepCmH2O, reliefCmH2O)...)
	}
	if fitProblem != "" {
		out = append(out, unexplainedCaution(fitProblem))
	}
	out = append(out, setting...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Level > out[j].Level })
	return out
}

// timingCautions are a setting's rate and I:E against the limits, and
// what the motor's and controller's steps did to a planned timing.
func timingCautions(a assessment) []Caution {
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	t := a.f.Timing
	if r := t.RateBPM; (r >= RateMinBPM && r < RateNoteMinBPM) || (r > RateNoteMaxBPM && r <= RateMaxBPM) {
		add(Caution{ID: "rate-outside-10-30", Level: Note, Value: r, Limit: ternary(r < RateNoteMinBPM, RateNoteMinBPM, RateNoteMaxBPM), Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min is outside %.0f-%.0f /min, the range an emergency ventilator must offer", r, RateNoteMinBPM, RateNoteMaxBPM),
			Advice:  "check minute ventilation, CO2 and trapped gas", Source: srcMHRA})
	}
	if ie := t.IE; ie > 0 && (ie < IEMinE || ie > IEMaxE) {
		limit, what := IEMaxE, "expiration is more than three times inspiration"
		if ie < IEMinE {
			limit, what = IEMinE, "inspiration is longer than expiration (inverse ratio)"
		}
		add(Caution{ID: "ie-outside-1-1-to-1-3", Level: Warn, Value: ie, Limit: limit, Unit: "E of 1:E",
			Message: fmt.Sprintf("I:E 1:%.1f is outside 1:%.0f-1:%.0f: %s", ie, IEMinE, IEMaxE, what),
			Advice:  "change the dwell or the motor speed; inverse ratio traps gas", Source: srcARDSNet + "; " + srcMHRA})
	}
	tp := a.timing
	if tp == nil {
		return out
	}
	switch tp.Rate {
	case machine.TooFast:
		add(Caution{ID: "rate-unreachable", Level: Stop, Value: tp.WantedRateBPM, Limit: t.RateBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min cannot be reached: the fastest turn with no dwell gives %.1f /min", tp.WantedRateBPM, t.RateBPM),
			Advice:  "choose a rate this motor can run", Source: srcProfile})
	case machine.TooSlow:
		add(Caution{ID: "rate-unreachable", Level: Stop, Value: tp.WantedRateBPM, Limit: t.RateBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min cannot be reached: the longest dwell gives %.1f /min", tp.WantedRateBPM, t.RateBPM),
			Advice:  "choose a faster rate or a longer inspiration", Source: srcProfile})
	}
	if tp.Speed == machine.SpeedLimited || tp.Raised {
		pct := 100 * (t.TiS - tp.WantedTiS) / tp.WantedTiS
		level := Warn
		if a.fixedMotor && math.Abs(pct) < TiChangeFixedNotePct {
			level = Note
		}
		add(Caution{ID: "ti-not-reachable", Level: level, Value: t.TiS, Limit: tp.WantedTiS, Unit: "s",
			Message: fmt.Sprintf("inspiratory time %.2f s wanted needs %.1f rpm; the motor is set to %.1f rpm, giving Ti %.2f s (%+.0f%%), I:E 1:%.1f",
				tp.WantedTiS, tp.WantedRPM, t.RPM, t.TiS, pct, t.IE),
			Advice: "accept the changed Ti and I:E or choose another rate", Source: srcProfile})
	}
	return out
}

func ternary(cond bool, a, b float64) float64 {
	if cond {
		return a
	}
	return b
}

// ventilationCautions are the minute and alveolar ventilation per kg PBW.
// Alveolar ventilation = rate x (Vt - dead space), the dead space
// estimated as 2.2 mL/kg PBW (anatomic only; the tube and any filter add
// to it).
func ventilationCautions(a assessment) []Caution {
	var out []Caution
	f := a.f
	rate, mlkg := f.Timing.RateBPM, f.Hole.MLPerKg
	if !(rate > 0) || !(a.pbwKg > 0) {
		return out
	}
	ve := rate * mlkg
	dead := DeadSpaceMLPerKg * a.pbwKg
	va := rate * (mlkg - DeadSpaceMLPerKg)
	if ve < MinuteVentLowMLPerKgMin {
		out = append(out, Caution{ID: "minute-ventilation-low", Level: Warn, Value: ve, Limit: MinuteVentLowMLPerKgMin, Unit: "mL/kg PBW/min",
			Message: fmt.Sprintf("minute ventilation %.0f mL/kg PBW/min (%.1f L/min) is below %.0f mL/kg/min", ve, ve*a.pbwKg/1000, MinuteVentLowMLPerKgMin),
			Advice:  lowVentilationAdvice(a), Source: srcCommon + " (about 100 mL/kg/min is usual)"})
	}
	switch {
	case va <= 0:
		out = append(out, Caution{ID: "alveolar-ventilation-low", Level: Stop, Value: va, Limit: AlveolarVentLowMLPerKgMin, Unit: "mL/kg PBW/min",
			Message: fmt.Sprintf("tidal volume %.0f mL does not exceed the estimated dead space %.0f mL (%.1f mL/kg PBW): no alveolar ventilation", mlkg*a.pbwKg, dead, DeadSpaceMLPerKg),
			Advice:  "do not use: larger hole", Source: srcRadford})
	case va < AlveolarVentStopMLPerKgMin:
		out = append(out, Caution{ID: "alveolar-ventilation-low", Level: Stop, Value: va, Limit: AlveolarVentStopMLPerKgMin, Unit: "mL/kg PBW/min",
			Message: fmt.Sprintf("alveolar ventilation %.0f mL/kg PBW/min (%.1f L/min = rate %.1f x (Vt %.0f mL - dead space %.0f mL)) is below %.0f mL/kg/min: the patient is barely ventilated",
				va, va*a.pbwKg/1000, rate, mlkg*a.pbwKg, dead, AlveolarVentStopMLPerKgMin),
			Advice: "do not use: larger hole or higher rate; PaCO2 would be about three times normal or more", Source: srcRadford + "; stop below 20 mL/kg/min, a third of the usual 60 (alveolar ventilation equation): common practice"})
	case va < AlveolarVentLowMLPerKgMin:
		out = append(out, Caution{ID: "alveolar-ventilation-low", Level: Warn, Value: va, Limit: AlveolarVentLowMLPerKgMin, Unit: "mL/kg PBW/min",
			Message: fmt.Sprintf("alveolar ventilation %.0f mL/kg PBW/min (%.1f L/min = rate %.1f x (Vt %.0f mL - dead space %.0f mL)) is below %.0f mL/kg/min",
				va, va*a.pbwKg/1000, rate, mlkg*a.pbwKg, dead, AlveolarVentLowMLPerKgMin),
			Advice: "expect CO2 to rise; the tube and any filter add dead space; check blood gas", Source: srcRadford})
	}
	return out
}

// reliefCautions judge the relief valve a profile declares.
func reliefCautions(reliefCmH2O float64) []Caution {
	if !(reliefCmH2O > ReliefMaxCmH2O) {
		return nil
	}
	return []Caution{{ID: "relief-above-40", Level: Warn, Value: reliefCmH2O, Limit: ReliefMaxCmH2O, Unit: "cmH2O",
		Message: fmt.Sprintf("this machine's relief valve opens at %.0f cmH2O, above %.0f: it does not keep the patient below 40 cmH2O", reliefCmH2O, ReliefMaxCmH2O),
		Advice:  "set the relief valve to 40 cmH2O or less and correct the profile", Source: srcMHRA}}
}

func profileCautions(p profiles.Profile, cal CalibrationStatus) []Caution {
	out := append(reliefCautions(p.Circuit.ReliefCmH2O), calibrationCautions(cal)...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Level > out[j].Level })
	return out
}

// calibrationCautions are what a profile's bench calibration says on its
// own, for a plan and for reviewing the machine.
func calibrationCautions(cal CalibrationStatus) []Caution {
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	switch {
	case cal.Fit == nil:
		add(Caution{ID: "calibration-missing", Level: Warn, Unit: "days",
			Message: "this machine has no bench calibration: volumes are geometric, before leaks",
			Advice:  "measure the delivered volume at the bedside; calibrate on a test lung", Source: srcCommon})
	case cal.AgeDays > CalibrationMaxDays:
		add(Caution{ID: "calibration-old", Level: Warn, Value: float64(cal.AgeDays), Limit: CalibrationMaxDays, Unit: "days",
			Message: fmt.Sprintf("the bench calibration is %d days old (more than %d)", cal.AgeDays, CalibrationMaxDays),
			Advice:  "recalibrate on a test lung", Source: srcCommon})
	case cal.AgeDays < 0:
		add(Caution{ID: "calibration-future", Level: Warn, Value: float64(cal.AgeDays), Unit: "days",
			Message: fmt.Sprintf("the bench calibration is dated %s, in the future", cal.Date),
			Advice:  "check the date on the profile and the computer's clock", Source: srcCommon})
	}
	if cal.Fit != nil && cal.Outside > 0 {
		add(Caution{ID: "calibration-residual", Level: Warn, Value: float64(cal.Outside), Unit: "points",
			Message: fmt.Sprintf("%d bench point(s) are outside +/-(4 mL + 15%%) of the fitted calibration", cal.Outside),
			Advice:  "re-measure those holes", Source: srcISO})
	}
	out = append(out, calibrationFitCautions(cal)...)
	if cal.Fit != nil && cal.Holes < 3 {
		add(Caution{ID: "calibration-thin", Level: Note, Value: float64(cal.Holes), Limit: 3, Unit: "holes",
			Message: fmt.Sprintf("the calibration measured %d hole(s); at least 3 make a trustworthy line", cal.Holes),
			Advice:  "measure more holes", Source: srcCommon})
	}
	return out
}

// calibrationFitCautions judge a fitted calibration line k x swept + b:
// k outside CalKMin-CalKMax, or an effective volume above the geometric
// one for any hole (the line is straight, so the smallest and largest
// holes decide).
func calibrationFitCautions(cal CalibrationStatus) []Caution {
	if cal.Fit == nil {
		return nil
	}
	var out []Caution
	k := cal.K
	if k < CalKMin || k > CalKMax {
		limit, why := CalKMin, "more than 30% of the swept volume is lost: a leak or a valve fault, not a calibration"
		if k > CalKMax {
			limit, why = CalKMax, "the piston would deliver more than it sweeps"
		}
		out = append(out, Caution{ID: "calibration-k-implausible", Level: Warn, Value: k, Limit: limit, Unit: "k",
			Message: fmt.Sprintf("the bench calibration's k %.3f is outside %.1f-%.1f: %s", k, CalKMin, CalKMax, why),
			Advice:  "check the machine for leaks and the bench measurements, then recalibrate", Source: srcCommon + " (derived: a piston delivers at most what it sweeps)"})
	}
	for _, swept := range []float64{cal.SweptMaxML, cal.SweptMinML} {
		if !(swept > 0) {
			continue
		}
		if eff := cal.EffectiveSweptML(swept); eff > swept*(1+1e-9) {
			out = append(out, Caution{ID: "calibration-above-swept", Level: Warn, Value: eff, Limit: swept, Unit: "mL",
				Message: fmt.Sprintf("the calibration gives a hole of %.0f mL geometric swept volume an effective %.0f mL: more than the piston sweeps", swept, eff),
				Advice:  "re-measure on the bench; volumes from this calibration may be too high", Source: srcCommon + " (derived: effective volume cannot exceed geometric)"})
			break
		}
	}
	return out
}

// Highest is the most serious level among cautions, or 0 with none.
func Highest(cs []Caution) Level {
	var l Level
	for _, c := range cs {
		if c.Level > l {
			l = c.Level
		}
	}
	return l
}
