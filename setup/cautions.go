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
	ID      CautionID `json:"id"`
	Level   Level     `json:"level"`
	Message string    `json:"message"` // one line with the number and the limit
	Value   float64   `json:"value"`
	Limit   float64   `json:"limit"`
	Unit    string    `json:"unit"`
	Advice  string    `json:"advice"`
	Source  string    `json:"source"`
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
	srcRadford      = "Radford 1955 dead space 2.2 mL/kg PBW (from memory); threshold common practice"
	srcAlveolarStop = srcRadford + "; stop below 20 mL/kg/min, a third of the usual 60 (alveolar ventilation equation): common practice"
	srcProfile      = "this machine's profile"
	srcDevine       = "Devine 1974, ARDS Network 2000"
	srcVtStopLow    = "common practice (ARDS Network 2000 floor is 4)"
	srcIE           = srcARDSNet + "; " + srcMHRA
	srcMinuteVent   = srcCommon + " (about 100 mL/kg/min is usual)"
	srcCalK         = srcCommon + " (derived: a piston delivers at most what it sweeps)"
	srcMeasuredPeak = srcMHRA + " (high inspiratory pressure)"
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
	if r, l, ok := judged(CautionTidalVolumeHigh, mlkg); ok {
		msg := fmt.Sprintf("tidal volume %.1f mL/kg PBW is above %.0f", mlkg, l.Value)
		if l.Level == Stop {
			msg = fmt.Sprintf("tidal volume %.1f mL/kg PBW is at or above %.0f", mlkg, l.Value)
		}
		add(r.caution(l, mlkg, msg, smallerHoleAdvice(a, l.Level == Stop)))
	}
	if r, l, ok := judged(CautionTidalVolumeLow, mlkg); ok {
		msg, advice := fmt.Sprintf("tidal volume %.1f mL/kg PBW is below %.0f", mlkg, l.Value), "watch CO2; consider a larger hole or a higher rate"
		if l.Level == Stop {
			msg = fmt.Sprintf("tidal volume %.1f mL/kg PBW is below %.0f: little or no gas passes the dead space", mlkg, l.Value)
			advice = "do not use: larger hole; check the circuit for a leak"
		}
		add(r.caution(l, mlkg, msg, advice))
	}
	out = append(out, pressureCautions(a)...)
	out = append(out, rateCautions(f.Timing.RateBPM)...)
	out = append(out, timingCautions(a)...)
	out = append(out, ventilationCautions(a)...)
	out = append(out, reliefCautions(a.reliefCmH2O)...)
	out = append(out, holeCautions(a)...)
	out = append(out, calibrationCautions(a.cal)...)
	if a.clearanceNote != "" {
		add(Caution{ID: CautionClearanceDefault, Level: Note, Value: 0, Limit: 0, Unit: "cm",
			Message: a.clearanceNote, Advice: "measure the gap between the piston at its top and the cylinder head; put it in the profile",
			Source: cautionRule(CautionClearanceDefault).Source})
	}
	out = append(out, o2FlowCautions(a)...)
	out = append(out, cylinderCautions(a)...)
	out = append(out, torqueCautions(a)...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Level > out[j].Level })
	return out
}

// rateCautions are the rate against the protocol's ceiling and a floor.
func rateCautions(rate float64) []Caution {
	if r, l, ok := judged(CautionRateHigh, rate); ok {
		return []Caution{r.caution(l, rate, fmt.Sprintf("rate %.1f /min is above %.0f", rate, l.Value), "check for trapped gas; the protocol's ceiling is 35")}
	}
	if r, l, ok := judged(CautionRateLow, rate); ok {
		return []Caution{r.caution(l, rate, fmt.Sprintf("rate %.1f /min is below %.0f", rate, l.Value), "check minute ventilation and CO2")}
	}
	return nil
}

// torqueCautions are the crank's peak torque against the motor's rating
// (none when the profile gives no rating). The caution is in % of the
// rating; the table's limits are shares of it.
func torqueCautions(a assessment) []Caution {
	f := a.f
	if !(a.ratedTorque > 0) {
		return nil
	}
	share := f.TorqueShareOfRating
	r, l, ok := judged(CautionTorqueHigh, share)
	if !ok {
		return nil
	}
	c := r.caution(l, 100*share, fmt.Sprintf("peak crank torque %.1f N m is %.0f%% of the motor's %.1f N m rating", f.PeakTorqueNm, 100*share, a.ratedTorque),
		"the motor may stall mid-breath: smaller hole or lower pressure")
	if l.Level == Warn {
		c.Message += fmt.Sprintf(" (over %.0f%%)", 100*l.Value)
		c.Advice = "little margin before the motor stalls"
	}
	c.Limit, c.Unit = 100*l.Value, "% of rating"
	return []Caution{c}
}

// pressureCautions are the predicted pressures against their limits.
func pressureCautions(a assessment) []Caution {
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	f := a.f
	if r, l, ok := judged(CautionPlateauHigh, f.PlateauCmH2O); ok && l.Level == Stop {
		add(r.caution(l, f.PlateauCmH2O, fmt.Sprintf("plateau pressure %.1f cmH2O is above %.0f, the limit of an emergency ventilator", f.PlateauCmH2O, l.Value),
			"do not use: smaller hole; check the lung model against a measured plateau"))
	} else if ok {
		add(r.caution(l, f.PlateauCmH2O, fmt.Sprintf("plateau pressure %.1f cmH2O is above %.0f", f.PlateauCmH2O, l.Value), "reduce tidal volume (smaller hole)"))
	}
	if r, l, ok := judged(CautionDrivingPressureHigh, f.DrivingCmH2O); ok {
		add(r.caution(l, f.DrivingCmH2O, fmt.Sprintf("driving pressure (plateau above total PEEP) %.1f cmH2O is above %.0f", f.DrivingCmH2O, l.Value),
			"reduce tidal volume; review PEEP"))
	}
	if a.reliefCmH2O > 0 && (f.PressureLimited || f.PeakCmH2O > a.reliefCmH2O) {
		// The model holds the circuit at the relief pressure and vents the
		// rest: the figures shown are already the vented breath's.
		add(Caution{ID: CautionPeakAboveRelief, Level: Stop, Value: f.PeakCmH2O, Limit: a.reliefCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the breath reaches this machine's relief valve at %.0f cmH2O: it is pressure-limited, %.0f mL vents, and the patient gets less (%.0f mL) than the hole would give",
				a.reliefCmH2O, f.ReliefVentedML, f.Hole.DeliveredML),
			Advice: "use a smaller hole or a slower motor speed", Source: cautionRule(CautionPeakAboveRelief).Source})
	}
	if r, l, ok := judged(CautionPeakHigh, f.PeakCmH2O); ok {
		add(r.caution(l, f.PeakCmH2O, fmt.Sprintf("peak pressure %.1f cmH2O is above %.0f", f.PeakCmH2O, l.Value),
			"the patient must never see more than 40 cmH2O; smaller hole or slower speed"))
	}
	if r, l, ok := judged(CautionIntrinsicPEEP, f.IntrinsicPEEPCmH2O); ok && l.Level == Stop {
		add(r.caution(l, f.IntrinsicPEEPCmH2O, fmt.Sprintf("intrinsic PEEP %.1f cmH2O is above %.0f: gas builds up breath after breath (%.0f mL trapped)", f.IntrinsicPEEPCmH2O, l.Value, f.TrappedML),
			"do not use: lower the rate or lengthen expiration (longer dwell)"))
	} else if ok {
		add(r.caution(l, f.IntrinsicPEEPCmH2O, fmt.Sprintf("intrinsic PEEP %.1f cmH2O is above %.0f: exhalation does not finish (%.0f mL trapped)", f.IntrinsicPEEPCmH2O, l.Value, f.TrappedML),
			"lower the rate or lengthen expiration (longer dwell)"))
	}
	out = append(out, leakShareCautions(f)...)
	if r, l, ok := judged(CautionPEEPLow, f.PEEPCmH2O); ok {
		add(r.caution(l, f.PEEPCmH2O, fmt.Sprintf("PEEP %.1f cmH2O is below %.0f", f.PEEPCmH2O, l.Value), "the protocol keeps PEEP at 5 or more"))
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
		return []Caution{{ID: CautionReadingsNotNumbers, Level: Stop, Unit: "cmH2O",
			Message: "a manometer reading is not a number", Advice: look + "re-take both readings", Source: cautionRule(CautionReadingsNotNumbers).Source}}
	}
	if r, l, ok := judged(CautionMeasuredPeakHigh, peak); ok {
		add(r.caution(l, peak, fmt.Sprintf("the manometer reads a peak of %.1f cmH2O, above %.0f: the patient must never see more than %.0f", peak, l.Value, l.Value),
			look+"then re-take the peak"))
	}
	if reliefCmH2O > 0 && peak > reliefCmH2O {
		add(Caution{ID: CautionMeasuredPeakAboveRelief, Level: Stop, Value: peak, Limit: reliefCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the manometer reads a peak of %.1f cmH2O, above this machine's relief valve at %.0f: the valve or the manometer is not working", peak, reliefCmH2O),
			Advice:  look + "test the relief valve", Source: cautionRule(CautionMeasuredPeakAboveRelief).Source})
	}
	if end <= peepCmH2O {
		add(Caution{ID: CautionMeasuredEndAtOrBelowPEEP, Level: Stop, Value: end, Limit: peepCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the end-inspiratory reading %.1f cmH2O is at or below PEEP %.1f: a leak, a disconnection, or the reading was taken at the wrong moment", end, peepCmH2O),
			Advice:  look + "then re-take it as the piston stops", Source: cautionRule(CautionMeasuredEndAtOrBelowPEEP).Source})
	}
	if peak < end {
		add(Caution{ID: CautionMeasuredPeakBelowEnd, Level: Stop, Value: peak, Limit: end, Unit: "cmH2O",
			Message: fmt.Sprintf("the peak reading %.1f cmH2O is below the end reading %.1f: the peak is the highest pressure of the breath", peak, end),
			Advice:  look + "re-take both readings on one breath", Source: cautionRule(CautionMeasuredPeakBelowEnd).Source})
	}
	return out
}

func finiteNumber(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// unexplainedCaution is the stop for readings no lung explains: nothing the
// model predicts for this setting is then what the patient gets.
func unexplainedCaution(fitProblem string) Caution {
	return Caution{ID: CautionReadingsUnexplained, Level: Stop, Unit: "",
		Message: "the readings cannot be explained by any lung at this setting: " + fitProblem,
		Advice:  "no figure is shown as what the patient gets; check the circuit and the patient, then re-take both readings",
		Source:  cautionRule(CautionReadingsUnexplained).Source}
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
	return Caution{ID: CautionProposalOnAssumedLung, Level: Stop, Unit: "",
		Message: "this proposal's figures rest on an ASSUMED lung, while the manometer reads " + reads + " at the current setting",
		Advice:  "do not use: find the cause (patient, tube, circuit, manometer) and re-take both readings before any change is made",
		Source:  cautionRule(CautionProposalOnAssumedLung).Source}
}

// withoutAssumedLungFigures drops from a setting's cautions those that
// judge the assumed lung's predicted figures: with readings no lung
// explains, none of them is what the patient gets, and a screen that says
// THE PATIENT GETS: NOT KNOWN must not judge them beside it. The readings'
// own stops and the unexplained stop say what is known.
func withoutAssumedLungFigures(cs []Caution) []Caution {
	out := make([]Caution, 0, len(cs))
	for _, c := range cs {
		if !cautionRule(c.ID).AssumedLung {
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
	if r, l, ok := judged(CautionRateOutside10To30, t.RateBPM); ok && rateCautions(t.RateBPM) == nil {
		add(r.caution(l, t.RateBPM, fmt.Sprintf("rate %.1f /min is outside %.0f-%.0f /min, the range an emergency ventilator must offer", t.RateBPM, r.Limits[0].Value, r.Limits[1].Value),
			"check minute ventilation, CO2 and trapped gas"))
	}
	if r, l, ok := judged(CautionIEOutside, t.IE); ok && t.IE > 0 {
		what := "expiration is more than three times inspiration"
		if l.Below {
			what = "inspiration is longer than expiration (inverse ratio)"
		}
		add(r.caution(l, t.IE, fmt.Sprintf("I:E 1:%.1f is outside 1:%.0f-1:%.0f: %s", t.IE, r.Limits[0].Value, r.Limits[1].Value, what),
			"change the dwell or the motor speed; inverse ratio traps gas"))
	}
	tp := a.timing
	if tp == nil {
		return out
	}
	switch tp.Rate {
	case machine.TooFast:
		add(Caution{ID: CautionRateUnreachable, Level: Stop, Value: tp.WantedRateBPM, Limit: t.RateBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min cannot be reached: the fastest turn with no dwell gives %.1f /min", tp.WantedRateBPM, t.RateBPM),
			Advice:  "choose a rate this motor can run", Source: cautionRule(CautionRateUnreachable).Source})
	case machine.TooSlow:
		add(Caution{ID: CautionRateUnreachable, Level: Stop, Value: tp.WantedRateBPM, Limit: t.RateBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min cannot be reached: the longest dwell gives %.1f /min", tp.WantedRateBPM, t.RateBPM),
			Advice:  "choose a faster rate or a longer inspiration", Source: cautionRule(CautionRateUnreachable).Source})
	}
	if tp.Speed == machine.SpeedLimited || tp.Raised {
		pct := 100 * (t.TiS - tp.WantedTiS) / tp.WantedTiS
		r := cautionRule(CautionTiNotReachable)
		level := Warn
		if l, ok := r.Judge(math.Abs(pct)); ok && a.fixedMotor {
			level = l.Level
		}
		add(Caution{ID: r.ID, Level: level, Value: t.TiS, Limit: tp.WantedTiS, Unit: "s",
			Message: fmt.Sprintf("inspiratory time %.2f s wanted needs %.1f rpm; the motor is set to %.1f rpm, giving Ti %.2f s (%+.0f%%), I:E 1:%.1f",
				tp.WantedTiS, tp.WantedRPM, t.RPM, t.TiS, pct, t.IE),
			Advice: "accept the changed Ti and I:E or choose another rate", Source: r.Source})
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
	if r, l, ok := judged(CautionMinuteVentilationLow, ve); ok {
		out = append(out, r.caution(l, ve, fmt.Sprintf("minute ventilation %.0f mL/kg PBW/min (%.1f L/min) is below %.0f mL/kg/min", ve, ve*a.pbwKg/1000, l.Value),
			lowVentilationAdvice(a)))
	}
	r, l, ok := judged(CautionAlveolarVentilationLow, va)
	if !ok {
		return out
	}
	figures := fmt.Sprintf("alveolar ventilation %.0f mL/kg PBW/min (%.1f L/min = rate %.1f x (Vt %.0f mL - dead space %.0f mL)) is below %.0f mL/kg/min",
		va, va*a.pbwKg/1000, rate, mlkg*a.pbwKg, dead, l.Value)
	switch {
	case l.AtLimit:
		// No alveolar ventilation at all: the limit said is the warn's.
		c := r.caution(l, va, fmt.Sprintf("tidal volume %.0f mL does not exceed the estimated dead space %.0f mL (%.1f mL/kg PBW): no alveolar ventilation", mlkg*a.pbwKg, dead, DeadSpaceMLPerKg),
			"do not use: larger hole")
		c.Limit = r.limit(Warn).Value
		out = append(out, c)
	case l.Level == Stop:
		out = append(out, r.caution(l, va, figures+": the patient is barely ventilated",
			"do not use: larger hole or higher rate; PaCO2 would be about three times normal or more"))
	default:
		out = append(out, r.caution(l, va, figures, "expect CO2 to rise; the tube and any filter add dead space; check blood gas"))
	}
	return out
}

// reliefCautions judge the relief valve a profile declares.
func reliefCautions(reliefCmH2O float64) []Caution {
	r, l, ok := judged(CautionReliefAbove40, reliefCmH2O)
	if !ok {
		return nil
	}
	return []Caution{r.caution(l, reliefCmH2O, fmt.Sprintf("this machine's relief valve opens at %.0f cmH2O, above %.0f: it does not keep the patient below 40 cmH2O", reliefCmH2O, l.Value),
		"set the relief valve to 40 cmH2O or less and correct the profile")}
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
	oldRule, oldLimit, old := judged(CautionCalibrationOld, float64(cal.AgeDays))
	switch {
	case cal.Fit == nil:
		add(Caution{ID: CautionCalibrationMissing, Level: Warn, Unit: "days",
			Message: "this machine has no bench calibration: volumes are geometric, before leaks",
			Advice:  "measure the delivered volume at the bedside; calibrate on a test lung", Source: cautionRule(CautionCalibrationMissing).Source})
	case old:
		add(oldRule.caution(oldLimit, float64(cal.AgeDays), fmt.Sprintf("the bench calibration is %d days old (more than %.0f)", cal.AgeDays, oldLimit.Value),
			"recalibrate on a test lung"))
	case cal.AgeDays < 0:
		add(Caution{ID: CautionCalibrationFuture, Level: Warn, Value: float64(cal.AgeDays), Unit: "days",
			Message: fmt.Sprintf("the bench calibration is dated %s, in the future", cal.Date),
			Advice:  "check the date on the profile and the computer's clock", Source: cautionRule(CautionCalibrationFuture).Source})
	}
	if cal.Fit != nil && cal.Outside > 0 {
		add(Caution{ID: CautionCalibrationResidual, Level: Warn, Value: float64(cal.Outside), Unit: "points",
			Message: fmt.Sprintf("%d bench point(s) are outside +/-(4 mL + 15%%) of the fitted calibration", cal.Outside),
			Advice:  "re-measure those holes", Source: cautionRule(CautionCalibrationResidual).Source})
	}
	out = append(out, calibrationFitCautions(cal)...)
	if r, l, ok := judged(CautionCalibrationThin, float64(cal.Holes)); ok && cal.Fit != nil {
		add(r.caution(l, float64(cal.Holes), fmt.Sprintf("the calibration measured %d hole(s); at least %.0f make a trustworthy line", cal.Holes, l.Value),
			"measure more holes"))
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
	if r, l, ok := judged(CautionCalibrationKImplausible, k); ok {
		why := "the piston would deliver more than it sweeps"
		if l.Below {
			why = "more than 30% of the swept volume is lost: a leak or a valve fault, not a calibration"
		}
		out = append(out, r.caution(l, k, fmt.Sprintf("the bench calibration's k %.3f is outside %.1f-%.1f: %s", k, r.Limits[0].Value, r.Limits[1].Value, why),
			"check the machine for leaks and the bench measurements, then recalibrate"))
	}
	for _, swept := range []float64{cal.SweptMaxML, cal.SweptMinML} {
		if !(swept > 0) {
			continue
		}
		if eff := cal.EffectiveSweptML(swept); eff > swept*(1+1e-9) {
			out = append(out, Caution{ID: CautionCalibrationAboveSwept, Level: Warn, Value: eff, Limit: swept, Unit: "mL",
				Message: fmt.Sprintf("the calibration gives a hole of %.0f mL geometric swept volume an effective %.0f mL: more than the piston sweeps", swept, eff),
				Advice:  "re-measure on the bench; volumes from this calibration may be too high", Source: cautionRule(CautionCalibrationAboveSwept).Source})
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
