package setup

import (
	"fmt"
	"math"
	"sort"

	"crankside/machine"
	"crankside/physiology"
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
}

// assess computes every caution for a setting, most serious first.
func assess(a assessment) []Caution {
	var out []Caution
	add := func(c Caution) { out = append(out, c) }
	f := a.f

	if a.heightCm < physiology.DevineBaseCm {
		add(Caution{ID: "height-below-formula", Level: Warn, Value: a.heightCm, Limit: physiology.DevineBaseCm, Unit: "cm",
			Message: fmt.Sprintf("height %.1f cm is below %.1f cm (60 in), where the PBW formula is extrapolated", a.heightCm, physiology.DevineBaseCm),
			Advice:  "check PBW against local tables for short stature", Source: "Devine 1974, ARDS Network 2000"})
	}

	mlkg := f.Hole.MLPerKg
	switch {
	case mlkg >= VtStopMLPerKg:
		add(Caution{ID: "tidal-volume-high", Level: Stop, Value: mlkg, Limit: VtStopMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is at or above %.0f", mlkg, VtStopMLPerKg),
			Advice:  "use a smaller hole", Source: srcARDSNet})
	case mlkg > VtWarnMLPerKg:
		add(Caution{ID: "tidal-volume-high", Level: Warn, Value: mlkg, Limit: VtWarnMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is above %.0f", mlkg, VtWarnMLPerKg),
			Advice:  "lung-protective range is 4-8 mL/kg; consider a smaller hole", Source: srcARDSNet})
	case mlkg < VtLowMLPerKg:
		add(Caution{ID: "tidal-volume-low", Level: Warn, Value: mlkg, Limit: VtLowMLPerKg, Unit: "mL/kg PBW",
			Message: fmt.Sprintf("tidal volume %.1f mL/kg PBW is below %.0f", mlkg, VtLowMLPerKg),
			Advice:  "watch CO2; consider a larger hole or a higher rate", Source: srcARDSNet})
	}
	if f.PlateauCmH2O > PlateauMaxCmH2O {
		add(Caution{ID: "plateau-high", Level: Warn, Value: f.PlateauCmH2O, Limit: PlateauMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("plateau pressure %.1f cmH2O is above %.0f", f.PlateauCmH2O, PlateauMaxCmH2O),
			Advice:  "reduce tidal volume (smaller hole)", Source: srcARDSNet})
	}
	if f.DrivingCmH2O > DrivingMaxCmH2O {
		add(Caution{ID: "driving-pressure-high", Level: Warn, Value: f.DrivingCmH2O, Limit: DrivingMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("driving pressure %.1f cmH2O is above %.0f", f.DrivingCmH2O, DrivingMaxCmH2O),
			Advice:  "reduce tidal volume; review PEEP", Source: srcAmato})
	}
	if a.reliefCmH2O > 0 && f.PeakCmH2O > a.reliefCmH2O {
		add(Caution{ID: "peak-above-relief", Level: Stop, Value: f.PeakCmH2O, Limit: a.reliefCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("peak pressure %.1f cmH2O is above this machine's relief valve at %.0f: the breath will not be delivered", f.PeakCmH2O, a.reliefCmH2O),
			Advice:  "use a smaller hole or a slower motor speed", Source: "this machine's profile"})
	}
	if f.PeakCmH2O > PeakMaxCmH2O {
		add(Caution{ID: "peak-high", Level: Stop, Value: f.PeakCmH2O, Limit: PeakMaxCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("peak pressure %.1f cmH2O is above %.0f", f.PeakCmH2O, PeakMaxCmH2O),
			Advice:  "the patient must never see more than 40 cmH2O; smaller hole or slower speed", Source: srcMHRA})
	}
	if r := f.Timing.RateBPM; r > RateMaxBPM {
		add(Caution{ID: "rate-high", Level: Warn, Value: r, Limit: RateMaxBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min is above %.0f", r, RateMaxBPM),
			Advice:  "check for trapped gas; the protocol's ceiling is 35", Source: srcARDSNet})
	} else if r < RateMinBPM {
		add(Caution{ID: "rate-low", Level: Warn, Value: r, Limit: RateMinBPM, Unit: "/min",
			Message: fmt.Sprintf("rate %.1f /min is below %.0f", r, RateMinBPM),
			Advice:  "check minute ventilation and CO2", Source: srcCommon})
	}
	if f.IntrinsicPEEPCmH2O > IntrinsicPEEPMax {
		add(Caution{ID: "intrinsic-peep", Level: Warn, Value: f.IntrinsicPEEPCmH2O, Limit: IntrinsicPEEPMax, Unit: "cmH2O",
			Message: fmt.Sprintf("intrinsic PEEP %.1f cmH2O is above %.0f: exhalation does not finish (%.0f mL trapped)", f.IntrinsicPEEPCmH2O, IntrinsicPEEPMax, f.TrappedML),
			Advice:  "lower the rate or lengthen expiration (longer dwell)", Source: srcCommon})
	}
	if f.PEEPCmH2O < PEEPMinCmH2O {
		add(Caution{ID: "peep-low", Level: Warn, Value: f.PEEPCmH2O, Limit: PEEPMinCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("PEEP %.1f cmH2O is below %.0f", f.PEEPCmH2O, PEEPMinCmH2O),
			Advice:  "the protocol keeps PEEP at 5 or more", Source: srcARDSNet})
	}
	if tp := a.timing; tp != nil {
		switch tp.Rate {
		case machine.TooFast:
			add(Caution{ID: "rate-unreachable", Level: Stop, Value: tp.WantedRateBPM, Limit: f.Timing.RateBPM, Unit: "/min",
				Message: fmt.Sprintf("rate %.1f /min cannot be reached: the fastest turn with no dwell gives %.1f /min", tp.WantedRateBPM, f.Timing.RateBPM),
				Advice:  "choose a rate this motor can run", Source: "this machine's profile"})
		case machine.TooSlow:
			add(Caution{ID: "rate-unreachable", Level: Stop, Value: tp.WantedRateBPM, Limit: f.Timing.RateBPM, Unit: "/min",
				Message: fmt.Sprintf("rate %.1f /min cannot be reached: the longest dwell gives %.1f /min", tp.WantedRateBPM, f.Timing.RateBPM),
				Advice:  "choose a faster rate or a longer inspiration", Source: "this machine's profile"})
		}
		if tp.Speed == machine.SpeedLimited || tp.Raised {
			pct := 100 * (f.Timing.TiS - tp.WantedTiS) / tp.WantedTiS
			add(Caution{ID: "ti-not-reachable", Level: Warn, Value: f.Timing.TiS, Limit: tp.WantedTiS, Unit: "s",
				Message: fmt.Sprintf("inspiratory time %.2f s wanted needs %.1f rpm; the motor is set to %.1f rpm, giving Ti %.2f s (%+.0f%%), I:E 1:%.1f",
					tp.WantedTiS, tp.WantedRPM, f.Timing.RPM, f.Timing.TiS, pct, f.Timing.IE),
				Advice: "accept the changed Ti and I:E or choose another rate", Source: "this machine's profile"})
		}
	}
	if a.targetMLPerK > 0 && math.Abs(a.offTargetPct) > HoleOffTargetPct {
		add(Caution{ID: "hole-off-target", Level: Warn, Value: a.offTargetPct, Limit: HoleOffTargetPct, Unit: "%",
			Message: fmt.Sprintf("the nearest hole delivers %+.0f%% off the target volume (more than %.0f%%)", a.offTargetPct, HoleOffTargetPct),
			Advice:  "no hole on this machine is closer; review the target", Source: srcCommon})
	}
	out = append(out, calibrationCautions(a.cal)...)
	if f.CylinderGiven && f.CylinderMinutes < CylinderMinMinutes {
		add(Caution{ID: "o2-cylinder-low", Level: Warn, Value: f.CylinderMinutes, Limit: CylinderMinMinutes, Unit: "min",
			Message: fmt.Sprintf("oxygen cylinder lasts %.0f min at %.1f L/min (under 2 hours)", f.CylinderMinutes, f.O2FlowLPerMin),
			Advice:  "arrange a full cylinder now", Source: srcCommon})
	}
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
	if cal.Fit != nil && cal.Holes < 3 {
		add(Caution{ID: "calibration-thin", Level: Note, Value: float64(cal.Holes), Limit: 3, Unit: "holes",
			Message: fmt.Sprintf("the calibration measured %d hole(s); at least 3 make a trustworthy line", cal.Holes),
			Advice:  "measure more holes", Source: srcCommon})
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
