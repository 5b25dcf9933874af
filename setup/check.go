package setup

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// Setting is what a machine is set to: the hole pinned, the motor speed,
// the dwell, the PEEP valve and the oxygen bled in.
type Setting struct {
	Hole      string  `json:"hole"`
	RPM       float64 `json:"motor_rpm"`
	DwellS    float64 `json:"dwell_s"`
	PEEPCmH2O float64 `json:"peep_cmh2o"`
	O2LPerMin float64 `json:"o2_flow_l_min"`
	// Measured is what was timed with a stopwatch in place of the speed
	// and dwell dials (setup/stopwatch.go); nil when both were read off
	// the dials.
	Measured *MeasuredTiming `json:"measured,omitempty"`
}

// Proposal is a change to a setting; a nil field keeps the current
// value.
type Proposal struct {
	Hole      *string
	RPM       *float64
	DwellS    *float64
	PEEPCmH2O *float64
	O2LPerMin *float64 // L/min bled into the intake
}

// Apply returns the setting with the proposal's fields replaced.
func (p Proposal) Apply(s Setting) Setting {
	if p.Hole != nil {
		s.Hole = *p.Hole
	}
	s.Measured = s.Measured.keepOnly(p.RPM == nil, p.DwellS == nil)
	if p.RPM != nil {
		s.RPM = *p.RPM
	}
	if p.DwellS != nil {
		s.DwellS = *p.DwellS
	}
	if p.PEEPCmH2O != nil {
		s.PEEPCmH2O = *p.PEEPCmH2O
	}
	if p.O2LPerMin != nil {
		s.O2LPerMin = *p.O2LPerMin
	}
	return s
}

// Empty reports whether nothing is proposed.
func (p Proposal) Empty() bool {
	return p.Hole == nil && p.RPM == nil && p.DwellS == nil && p.PEEPCmH2O == nil && p.O2LPerMin == nil
}

// CheckRequest is a handover check: the patient, what the machine is set
// to, optionally what the manometer reads, and optionally a change.
type CheckRequest struct {
	Patient Patient
	Lung    physiology.Lung // for the assumed mechanics when no readings fit
	// Assumed mechanics; zero means the lung condition's default.
	ComplianceMLPerCmH2O float64
	ResistanceCmH2OPerLS float64
	Setting              Setting
	Readings             *physiology.Readings
	Proposal             Proposal
	CylinderWaterL       float64
	CylinderBar          float64
	// CylinderReserveBar is where the cylinder's time runs to; 0:
	// DefaultCylinderReserveBar.
	CylinderReserveBar float64
	// BreathingAgainst: the patient is breathing against the unit (the
	// patient-triggering stop).
	BreathingAgainst bool
	// NoAlveolarHold switches off the protocol step's rate scaling when
	// the tidal volume changes (--hold-alveolar-ventilation=false).
	NoAlveolarHold bool
	// Gas is the blood gas and oximeter; with any reading the check also
	// computes the protocol's next step (see RunCheck).
	Gas GasReadings
	Now time.Time
	// Room is the room's air (BTPS); nil fields mean the defaults.
	Room Room
	// ManometerStepCmH2O is the manometer's resolution (0: DefaultManometerStepCmH2O);
	// each reading is taken as +/- half a step.
	ManometerStepCmH2O float64
	// Converted are the entries typed in the ward's units, echoed by the
	// check (BuildCheckRequest fills it).
	Converted []Conversion

	// v1Gas, for tests only (export_test.go): the BTPS factor exactly 1
	// and the cylinder's gas left out, which with no leak and a relief
	// above the peak is the version 1 model.
	v1Gas bool
}

// Evaluation is one setting's figures and cautions.
type Evaluation struct {
	Setting  Setting
	Figures  Figures
	Cautions []Caution
}

// Check is a handover check's outcome.
type Check struct {
	Patient     Patient
	PBWKg       float64
	ProfileID   string
	Calibration CalibrationStatus
	Readings    *physiology.Readings
	Mechanics   physiology.Value // compliance used, with where it came from
	Resistance  physiology.Value
	Fitted      *physiology.Mechanics
	FitProblem  string // why the readings gave no mechanics, and what to re-take
	Current     Evaluation
	Proposed    *Evaluation
	Differences []Difference
	// The protocol's next step, when a gas reading was entered: Gas holds
	// the readings, Protocol the step on this machine (its Check field is
	// left empty: this check is it), ProtocolProblem why there is no step,
	// and ProposalFrom where Proposed came from (ProposalFromStep, ...).
	BloodGas        *GasReadings
	Protocol        *ProtocolStepResult
	ProtocolProblem string
	ProposalFrom    string
	// Oxygenation are P/F, S/F and the Berlin band, with a gas or
	// oximeter reading (see judgeGas).
	Oxygenation *OxygenationJSON

	// Gas is the version 2 breath's room (with the BTPS factor), cylinder
	// head, leak and relief valve, as used in every stroke of the check.
	Gas GasModel
	// Ranges are what the manometer's resolution allows of the fit (nil
	// without readings or when no lung explains them).
	Ranges *FitRanges
	// Watch is the current setting's watch band and alarm limits; nil when
	// no lung explains the readings. TimingCheck is what to time to
	// confirm the current setting (the machine's timing, whatever the lung).
	Watch       *Watch
	TimingCheck TimingCheck
	// Inferred says what a stopwatch check inferred ("" when the dials were
	// read): the speed and dwell, the measured values, the nearest steps.
	Inferred string
	// Converted are the entries typed in the ward's units.
	Converted []Conversion
}

// Unexplained reports whether no lung explains the readings: then none of
// the current setting's predicted figures is what the patient gets, and a
// screen must show the FitProblem in their place (the JSON prints them as
// null; see CheckJSON.Unexplained).
func (ck Check) Unexplained() bool { return ck.FitProblem != "" }

// Difference is one figure of the current and proposed settings.
type Difference struct {
	What     string  `json:"what"`
	Unit     string  `json:"unit"`
	Current  float64 `json:"current"`
	Proposed float64 `json:"proposed"`
	Change   float64 `json:"change"`
	// machineOnly marks a figure the machine's timing and valves set
	// whatever the lung (rate, Ti, Te, I:E, PEEP): it stays known when no
	// lung explains the readings.
	machineOnly bool
}

// RunCheck evaluates an observed setting. A setting the machine cannot run
// (an unknown hole, a speed off the motor's range or step, a dwell off the
// controller's step) is refused with the reason. Readings that no lung
// reproduces do not stop the check: FitProblem says which to re-take, the
// current cautions carry the readings-unexplained stop, and the figures
// use the assumed mechanics (the JSON and every report then withhold the
// current setting's predicted figures, and the current cautions leave out
// those that judge them: withoutAssumedLungFigures). A proposal is then
// evaluated on the assumed lung and carries the proposal-on-assumed-lung
// stop. The readings are judged on their
// own (ReadingCautions) whatever the fit gives.
//
// With a gas reading in req.Gas the check also carries the protocol's next
// step (runCheckWithStep): a proposal entered by hand is still the one
// evaluated, and the check says whether it is the step's.
func RunCheck(req CheckRequest, p profiles.Profile) (Check, error) {
	ck, err := runCheck(req, p)
	if err == nil {
		ck.Converted = req.Converted
	}
	return ck, err
}

func runCheck(req CheckRequest, p profiles.Profile) (Check, error) {
	if !req.Gas.Empty() {
		return runCheckWithStep(req, p)
	}
	if req.Gas.ApparatusDeadSpaceML != nil {
		return runCheckDeadSpaceOnly(req, p)
	}
	now := orNow(req.Now)
	pbw, err := pbwOf(req.Patient)
	if err != nil {
		return Check{}, err
	}
	r, err := resolveTargets(Targets{Lung: req.Lung, ComplianceMLPerCmH2O: req.ComplianceMLPerCmH2O,
		ResistanceCmH2OPerLS: req.ResistanceCmH2OPerLS, CylinderWaterL: req.CylinderWaterL, CylinderBar: req.CylinderBar,
		CylinderReserveBar: req.CylinderReserveBar})
	if err != nil {
		return Check{}, err
	}
	room, err := resolveRoom(req.Room)
	if err != nil {
		return Check{}, err
	}
	u, err := newUnitV(p, now, req.v1Gas)
	if err != nil {
		return Check{}, err
	}
	u.gas = withRoom(u.gas, room, req.v1Gas)
	u.cylinderReserveBar = r.reserve.Value
	if err := canonicalHoles(&req, p); err != nil {
		return Check{}, err
	}
	cur := req.Setting
	if err := checkSetting(u, cur, ""); err != nil {
		return Check{}, err
	}
	ck := Check{Patient: req.Patient, PBWKg: pbw, ProfileID: p.ID, Calibration: u.cal, Readings: req.Readings,
		Mechanics: r.compliance, Resistance: r.resistance, Gas: u.gas}
	if req.Readings != nil {
		m, err := newReadingsFit(u, cur, pbw, req, r.resistance.Value).fit(*req.Readings, nil)
		var re *physiology.ReadingError
		switch {
		case errors.As(err, &re):
			ck.FitProblem = re.Error()
		case err != nil:
			ck.FitProblem = err.Error()
		default:
			ck.Fitted = &m
			ck.Mechanics, ck.Resistance = fittedValues(m, r.resistance)
		}
	}
	lung := machine.Lung{ComplianceMLPerCmH2O: ck.Mechanics.Value, ResistanceCmH2OPerLS: ck.Resistance.Value}
	ck.Current, err = evaluateSetting(u, cur, lung, pbw, req)
	if err != nil {
		return Check{}, err
	}
	if ck.FitProblem != "" {
		ck.Current.Cautions = withoutAssumedLungFigures(ck.Current.Cautions)
	}
	if ck.Fitted != nil {
		ck.Ranges = fitRanges(newReadingsFit(u, cur, pbw, req, r.resistance.Value), *req.Readings, *ck.Fitted, req)
		ck.Current.Cautions = append(ck.Current.Cautions, rangeCautions(ck.Ranges, ck.Current.Figures, pbw)...)
	}
	ck.Current.Cautions = checkCautions(req.Readings, cur.PEEPCmH2O, u.p.Circuit.ReliefCmH2O, ck.FitProblem, ck.Current.Cautions)
	ck.Current.Cautions = withFitCautions(ck, req, u.p.Circuit.ReliefCmH2O)
	if !req.Proposal.Empty() {
		next := req.Proposal.Apply(cur)
		if err := checkSetting(u, next, "propose-"); err != nil {
			return Check{}, err
		}
		ev, err := evaluateSetting(u, next, lung, pbw, req)
		if err != nil {
			return Check{}, err
		}
		if ck.FitProblem != "" {
			ev.Cautions = append([]Caution{assumedLungCaution(req.Readings)}, ev.Cautions...)
			sort.SliceStable(ev.Cautions, func(i, j int) bool { return ev.Cautions[i].Level > ev.Cautions[j].Level })
		}
		ck.Proposed = &ev
		ck.Differences = differences(ck.Current.Figures, ev.Figures)
	}
	if !finiteFigures(ck.Current.Figures) || (ck.Proposed != nil && !finiteFigures(ck.Proposed.Figures)) {
		return Check{}, &InputError{Field: "setting", Reason: "the model gave no finite figures for this setting"}
	}
	ck.atTheBed(u, req)
	return ck, nil
}

// atTheBed adds what the bed needs between checks: what to time, the
// watch band (none when no lung explains the readings), and what a
// stopwatch check inferred.
func (ck *Check) atTheBed(u unit, req CheckRequest) {
	ck.TimingCheck = timingCheckOf(ck.Current.Figures)
	if ck.FitProblem == "" {
		w := watchOf(ck.Current.Figures, u.p.Circuit.ReliefCmH2O, manometerStep(req), ck.Fitted != nil)
		ck.Watch = &w
	}
	ck.Inferred = inferredLine(u, ck.Current.Setting)
}

// checkSetting refuses a setting this machine cannot be set to.
func checkSetting(u unit, s Setting, prefix string) error {
	if _, ok := u.p.HoleByLabel(s.Hole); !ok {
		return &InputError{Field: prefix + "hole", Reason: fmt.Sprintf("%s is not a hole of %s (holes: %s)", physiology.Quote(s.Hole), u.p.ID, holeLabels(u.p))}
	}
	m := u.p.Motor
	if err := checkTimed(u, s, prefix); err != nil {
		return err
	}
	if !s.Measured.speedTimed() && !u.motor.Settable(s.RPM) {
		if m.Fixed() {
			return &InputError{Field: prefix + "rpm", Reason: fmt.Sprintf("%s rpm: this motor runs only at %s rpm", plain(s.RPM), plain(m.RPM))}
		}
		return &InputError{Field: prefix + "rpm", Reason: fmt.Sprintf("%s rpm is not a speed of this motor: %s-%s rpm in %s rpm steps", plain(s.RPM), plain(m.MinRPM), plain(u.motor.TopRPM()), plain(m.RPMStep))}
	}
	if !s.Measured.dwellTimed() && !u.controller.Settable(s.DwellS) {
		return &InputError{Field: prefix + "dwell-s", Reason: fmt.Sprintf("%s s is not a dwell of this controller: 0-%s s in %s s steps", plain(s.DwellS), plain(u.controller.MaxSettableDwellS()), plain(u.controller.DwellStepS))}
	}
	if err := checkRange(prefix+"peep", "PEEP", s.PEEPCmH2O, physiology.PEEPMin, physiology.PEEPMax, "cmH2O"); err != nil {
		return err
	}
	if err := checkRange(prefix+"o2-lpm", "oxygen flow", s.O2LPerMin, 0, 60, "L/min"); err != nil {
		return err
	}
	return nil
}

// plain prints a number in an error as a plain decimal, never 1.402e+05.
func plain(v float64) string { return physiology.PlainNumber(v) }

func holeLabels(p profiles.Profile) string {
	var out string
	for i, h := range p.Crank.Holes {
		if i > 0 {
			out += ", "
		}
		if i == 12 {
			return out + "..."
		}
		out += h.Label
	}
	return out
}

func evaluateSetting(u unit, s Setting, lung machine.Lung, pbw float64, req CheckRequest) (Evaluation, error) {
	h, _ := u.p.HoleByLabel(s.Hole)
	t := machine.TimingOf(s.RPM, s.DwellS, u.crank(h).DeliveryAngle())
	f, err := evaluate(u, h, t, lungState{lung: lung, peep: s.PEEPCmH2O, pbwKg: pbw}, s.O2LPerMin, req.CylinderWaterL, req.CylinderBar)
	if err != nil {
		return Evaluation{}, &InputError{Field: "setting", Reason: err.Error()}
	}
	cs := assess(newAssessment(u, req.Patient, pbw, f, nil, nil, checkHazards(u, s, req)))
	return Evaluation{Setting: s, Figures: f, Cautions: cs}, nil
}

func differences(a, b Figures) []Difference {
	row := func(what, unit string, x, y float64) Difference {
		return Difference{What: what, Unit: unit, Current: x, Proposed: y, Change: y - x}
	}
	fixed := func(what, unit string, x, y float64) Difference {
		d := row(what, unit, x, y)
		d.machineOnly = true
		return d
	}
	return []Difference{
		row("tidal volume", "mL", a.Hole.DeliveredML, b.Hole.DeliveredML),
		row("tidal volume", "mL/kg PBW", a.Hole.MLPerKg, b.Hole.MLPerKg),
		fixed("rate", "/min", a.Timing.RateBPM, b.Timing.RateBPM),
		fixed("Ti", "s", a.Timing.TiS, b.Timing.TiS),
		fixed("Te", "s", a.Timing.TeS, b.Timing.TeS),
		fixed("I:E (E of 1:E)", "", a.Timing.IE, b.Timing.IE),
		row("minute ventilation", "L/min", a.MinuteVentLPerMin, b.MinuteVentLPerMin),
		row("peak flow", "L/min", a.PeakFlowLPerMin, b.PeakFlowLPerMin),
		row("peak pressure", "cmH2O", a.PeakCmH2O, b.PeakCmH2O),
		row("end-inspiratory pressure", "cmH2O", a.EndInspCmH2O, b.EndInspCmH2O),
		row("plateau pressure", "cmH2O", a.PlateauCmH2O, b.PlateauCmH2O),
		row("driving pressure", "cmH2O", a.DrivingCmH2O, b.DrivingCmH2O),
		fixed("PEEP", "cmH2O", a.PEEPCmH2O, b.PEEPCmH2O),
		row("intrinsic PEEP", "cmH2O", a.IntrinsicPEEPCmH2O, b.IntrinsicPEEPCmH2O),
		row("FiO2", "", a.FiO2, b.FiO2),
		row("peak torque", "N m", a.PeakTorqueNm, b.PeakTorqueNm),
	}
}

// finiteFigures is the check's guard against handing out NaN or Inf.
func finiteFigures(f Figures) bool {
	for _, v := range []float64{f.Hole.DeliveredML, f.PeakCmH2O, f.EndInspCmH2O, f.PlateauCmH2O, f.TrappedML, f.MinuteVentLPerMin, f.PeakTorqueNm} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}
