package setup

import (
	"fmt"
	"math"

	"crankside/physiology"
)

// The watch band is what the bedside manometer should show between checks
// on one setting, the limits to set on an external pressure alarm, and
// the rhythm to keep by hand (or with a bag) when the power fails. It is
// built from the setting's predicted peak and end-inspiratory pressures:
// on a plan those rest on the assumed lung, on a check with readings on
// the lung fitted to them (the prediction then reproduces the readings),
// and a check whose readings no lung explains has no band at all.

// Band rule: the model's uncertainty is taken as the volume accuracy that
// ISO 80601-2-12:2020 asks of a critical-care ventilator, +/-(4 mL + 15 %
// of the volume) (from memory, per REFERENCES.md). In a linear lung a
// pressure above PEEP is proportional to the volume delivered (the
// equation of motion: V/C + R x flow, both scale with the stroke;
// derived), so the same share is applied to the pressure above PEEP, and
// the 4 mL to it as 4 mL / C. The manometer is read to the nearest step,
// so half a step widens each side; each end is then rounded outward to
// the manometer's step, since a reading falls on the dial's marks.
const (
	WatchModelSharePct = 15.0 // ISO 80601-2-12:2020 volume accuracy, from memory
	WatchModelFloorML  = 4.0  // ISO 80601-2-12:2020 volume accuracy, from memory
)

// Alarm rules (common practice, REFERENCES.md "Hazards of an improvised
// unit"): the high-pressure alarm about 10 cmH2O above the usual peak,
// never above the relief valve or 40 cmH2O (RMVS001 2020: the patient is
// never exposed to more than 40); the low-pressure (disconnection) alarm a
// few cmH2O below the usual peak and above PEEP. The high limit is
// rounded down and the low one up to whole cmH2O, the side nearer the
// breath, so that rounding never makes an alarm later.
const (
	AlarmHighAbovePeakCmH2O = 10.0 // common practice
	AlarmCeilingCmH2O       = 40.0 // RMVS001 2020: never more than 40 cmH2O
	AlarmLowBelowPeakCmH2O  = 5.0  // common practice: "a few cmH2O below the usual peak"
	AlarmLowAbovePEEPCmH2O  = 2.0  // common practice: clearly above PEEP, so a breath that never rises is caught
	AlarmLowBelowBandCmH2O  = 1.0  // common practice: below every peak the band expects, so an ordinary breath never sounds it
)

const (
	srcBandRuleFitted = "the readings the lung was fitted to +/- one manometer step (half a step for each of two readings), rounded outward to the step"
	srcBandRule       = "prediction on the assumed lung +/- (15 % of the pressure above PEEP + 4 mL / C) (ISO 80601-2-12:2020 volume accuracy, from memory) +/- half the manometer's step, rounded outward to the step"
	srcAlarmHigh      = "common practice: about 10 cmH2O above the usual peak, never above the relief valve or 40 cmH2O (RMVS001 2020)"
	srcAlarmLow       = "common practice: a few (5) cmH2O below the usual peak and 1 below the band, but at least 2 cmH2O above PEEP"
	srcHandTurn       = "the setting's own timing: one turn at the motor's speed, then the dwell"
	srcBagRate        = "the setting's rate, to the nearest whole breath (common practice: bag at the set rate)"
)

// HandTurn is the rhythm of the setting for a person turning the wheel by
// hand: one turn, then a pause, so many breaths a minute.
type HandTurn struct {
	TurnS         float64 `json:"turn_s"`
	PauseS        float64 `json:"pause_s"`
	BreathsPerMin float64 `json:"breaths_per_min"`
}

// Watch is what to watch and set at the bed for one setting.
type Watch struct {
	// PeakBand and EndBand are [low, high] in cmH2O: the readings expected
	// on the manometer.
	PeakBand, EndBand [2]float64
	// PredictedPeak and PredictedEnd are the model's own figures the bands
	// are built round.
	PredictedPeakCmH2O, PredictedEndCmH2O float64
	PEEPCmH2O                             float64
	Step                                  physiology.Value // the manometer's step, with its source
	Fitted                                bool             // the band rests on a lung fitted to readings
	AlarmHighCmH2O, AlarmLowCmH2O         float64
	// CeilingCmH2O is what capped the high alarm: the lower of the relief
	// valve and 40 cmH2O.
	CeilingCmH2O float64
	HandTurn     HandTurn
	BagRateBPM   float64
	// Notes say where a limit could not keep its rule's margin.
	Notes []string
}

// TimingCheck is what to time with a stopwatch to confirm a setting.
type TimingCheck struct {
	TurnS               float64 `json:"turn_s"`
	PauseS              float64 `json:"pause_s"`
	BreathsIn60S        float64 `json:"breaths_in_60_s"`
	SecondsFor10Breaths float64 `json:"seconds_for_10_breaths"`
}

// timingCheckOf is the stopwatch view of a setting's figures.
func timingCheckOf(f Figures) TimingCheck {
	return TimingCheck{TurnS: f.Timing.TurnS, PauseS: f.Timing.DwellS, BreathsIn60S: f.Timing.RateBPM, SecondsFor10Breaths: 10 * f.Timing.PeriodS}
}

// watchOf builds the watch band for a setting's figures on a circuit whose
// relief valve opens at reliefCmH2O (0: none stated, 40 caps alone).
// fitted says the figures rest on a lung fitted to manometer readings:
// the prediction then reproduces the readings and the model's uncertainty
// is not added, only the manometer's (see bandHalfWidth).
func watchOf(f Figures, reliefCmH2O float64, step physiology.Value, fitted bool) Watch {
	w := Watch{PredictedPeakCmH2O: f.PeakCmH2O, PredictedEndCmH2O: f.EndInspCmH2O, PEEPCmH2O: f.PEEPCmH2O, Step: step, Fitted: fitted}
	w.CeilingCmH2O = AlarmCeilingCmH2O
	if reliefCmH2O > 0 && reliefCmH2O < w.CeilingCmH2O {
		w.CeilingCmH2O = reliefCmH2O
	}
	c := f.ComplianceMLPerCmH2O
	w.PeakBand = band(f.PeakCmH2O, bandHalfWidth(f.PeakCmH2O, f.PEEPCmH2O, c, step.Value, fitted), step.Value, w.CeilingCmH2O)
	w.EndBand = band(f.EndInspCmH2O, bandHalfWidth(f.EndInspCmH2O, f.PEEPCmH2O, c, step.Value, fitted), step.Value, w.CeilingCmH2O)
	w.AlarmHighCmH2O = math.Floor(math.Min(f.PeakCmH2O+AlarmHighAbovePeakCmH2O, w.CeilingCmH2O) + 1e-9)
	low := math.Min(f.PeakCmH2O-AlarmLowBelowPeakCmH2O, w.PeakBand[0]-AlarmLowBelowBandCmH2O)
	w.AlarmLowCmH2O = math.Ceil(math.Max(low, f.PEEPCmH2O+AlarmLowAbovePEEPCmH2O) - 1e-9)
	if w.AlarmHighCmH2O <= w.PeakBand[1] {
		w.Notes = append(w.Notes, fmt.Sprintf("the high alarm (%s cmH2O, capped by the relief valve or 40) is not above the expected peak's band (up to %s cmH2O): it may sound on ordinary breaths; see the cautions",
			plain(w.AlarmHighCmH2O), plain(w.PeakBand[1])))
	}
	if w.AlarmLowCmH2O >= w.PeakBand[0] {
		w.Notes = append(w.Notes, fmt.Sprintf("the low alarm (%s cmH2O, kept %s above PEEP) is not below the expected peak's band (from %s cmH2O): the breath rises too little above PEEP for the alarm to tell a disconnection apart reliably",
			plain(w.AlarmLowCmH2O), plain(AlarmLowAbovePEEPCmH2O), plain(w.PeakBand[0])))
	}
	w.HandTurn = HandTurn{TurnS: f.Timing.TurnS, PauseS: f.Timing.DwellS, BreathsPerMin: f.Timing.RateBPM}
	w.BagRateBPM = math.Round(f.Timing.RateBPM)
	return w
}

// bandHalfWidth is how far either side of a predicted pressure p the
// gauge may read. On an assumed lung: the model's uncertainty on the
// pressure above PEEP (WatchModelSharePct and WatchModelFloorML / C) plus
// half the manometer's step. On a lung fitted to readings the prediction
// is the readings, so: half a step for the reading the fit was made from
// and half a step for the reading being taken now (derived from the
// manometer's resolution).
func bandHalfWidth(p, peep, complianceML, step float64, fitted bool) float64 {
	if fitted {
		return step
	}
	half := WatchModelSharePct/100*math.Max(p-peep, 0) + step/2
	if complianceML > 0 {
		half += WatchModelFloorML / complianceML
	}
	return half
}

// band widens a predicted pressure p by half on either side, rounds each
// end outward to the manometer's step, and keeps it within [0, ceiling]:
// the relief valve vents above its pressure, so the gauge cannot read
// more.
func band(p, half, step, ceiling float64) [2]float64 {
	lo := math.Floor((p-half)/step+bandSlackSteps) * step
	hi := math.Ceil((p+half)/step-bandSlackSteps) * step
	lo = math.Max(lo, 0)
	hi = math.Min(hi, math.Max(ceiling, p))
	return [2]float64{clean4(lo), clean4(hi)}
}

// bandSlackSteps is how near a mark of the dial, in steps, an end of the
// band counts as on it: a fitted prediction reproduces a reading only to
// the fit's tolerance (17.0000004 for a reading of 17), far below a
// thousandth of any manometer's step.
const bandSlackSteps = 1e-3

// clean4 trims float noise from a multiple of a step (0.30000000000000004).
func clean4(v float64) float64 { return math.Round(v*1e6) / 1e6 }

// WatchJSON is the watch band in a plan's or check's JSON.
type WatchJSON struct {
	ExpectedPeakCmH2O  [2]float64 `json:"expected_peak_cmh2o"`
	ExpectedEndCmH2O   [2]float64 `json:"expected_end_cmh2o"`
	PredictedPeakCmH2O float64    `json:"predicted_peak_cmh2o"`
	PredictedEndCmH2O  float64    `json:"predicted_end_cmh2o"`
	ManometerStepCmH2O float64    `json:"manometer_step_cmh2o"`
	BandRule           string     `json:"band_rule"`
	LungFitted         bool       `json:"lung_fitted"` // false: the band rests on the assumed lung
	AlarmHighCmH2O     float64    `json:"alarm_high_cmh2o"`
	AlarmHighRule      string     `json:"alarm_high_rule"`
	AlarmLowCmH2O      float64    `json:"alarm_low_cmh2o"`
	AlarmLowRule       string     `json:"alarm_low_rule"`
	HandTurn           HandTurn   `json:"hand_turn"`
	HandTurnSource     string     `json:"hand_turn_source"`
	BagRateBPM         float64    `json:"bag_rate_bpm"`
	BagRateSource      string     `json:"bag_rate_source"`
	Notes              []string   `json:"notes,omitempty"`
}

// JSON is the watch band as printed.
func (w Watch) JSON() WatchJSON {
	return WatchJSON{
		ExpectedPeakCmH2O: w.PeakBand, ExpectedEndCmH2O: w.EndBand,
		PredictedPeakCmH2O: r4(w.PredictedPeakCmH2O), PredictedEndCmH2O: r4(w.PredictedEndCmH2O),
		ManometerStepCmH2O: r4(w.Step.Value), BandRule: w.bandRule(), LungFitted: w.Fitted,
		AlarmHighCmH2O: w.AlarmHighCmH2O, AlarmHighRule: srcAlarmHigh, AlarmLowCmH2O: w.AlarmLowCmH2O, AlarmLowRule: srcAlarmLow,
		HandTurn:       HandTurn{TurnS: r4(w.HandTurn.TurnS), PauseS: r4(w.HandTurn.PauseS), BreathsPerMin: r4(w.HandTurn.BreathsPerMin)},
		HandTurnSource: srcHandTurn, BagRateBPM: w.BagRateBPM, BagRateSource: srcBagRate, Notes: w.Notes,
	}
}

func (w Watch) bandRule() string {
	if w.Fitted {
		return srcBandRuleFitted
	}
	return srcBandRule
}

// JSON is the timing check as printed.
func (t TimingCheck) JSON() TimingCheck {
	return TimingCheck{TurnS: r4(t.TurnS), PauseS: r4(t.PauseS), BreathsIn60S: r4(t.BreathsIn60S), SecondsFor10Breaths: r4(t.SecondsFor10Breaths)}
}
