package setup

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/machine"
	"crankside/physiology"
)

// The numbers inside the cautions' messages are the figures judged: each
// case sets the figures, and the message, value and limit are checked
// against numbers worked out by hand (the derivation beside each), so a
// changed operator or constant in a message fails here.

func messageOf(t *testing.T, cs []Caution, id CautionID, level Level) Caution {
	t.Helper()
	c := find(cs, id)
	require.NotNil(t, c, "%s must appear", id)
	require.Equal(t, level, c.Level, "%s: %s", id, c.Message)
	return *c
}

// Alveolar ventilation = rate x (Vt - dead space), the dead space 2.2 mL/kg
// PBW (Radford 1955, from memory); minute ventilation = rate x Vt. At PBW
// 50 kg the dead space is 2.2 x 50 = 110 mL (derived).
func TestVentilationCautionsSayTheirNumbers(t *testing.T) {
	for _, c := range []struct {
		name      string
		rate, vt  float64 // /min, mL/kg PBW
		minute    string
		alveolar  string
		level     Level
		value, lm float64
	}{
		// 10 x 5 = 50 mL/kg/min, 2.5 L/min at 50 kg; 10 x (5 - 2.2) = 28
		// mL/kg/min, 1.4 L/min; Vt 250 mL.
		{"warn", 10, 5, "minute ventilation 50 mL/kg PBW/min (2.5 L/min) is below 60 mL/kg/min",
			"alveolar ventilation 28 mL/kg PBW/min (1.4 L/min = rate 10.0 x (Vt 250 mL - dead space 110 mL)) is below 40 mL/kg/min", Warn, 28, 40},
		// 10 x 4 = 40 mL/kg/min, 2.0 L/min; 10 x 1.8 = 18, 0.9 L/min;
		// Vt 200 mL.
		{"stop", 10, 4, "minute ventilation 40 mL/kg PBW/min (2.0 L/min) is below 60 mL/kg/min",
			"alveolar ventilation 18 mL/kg PBW/min (0.9 L/min = rate 10.0 x (Vt 200 mL - dead space 110 mL)) is below 20 mL/kg/min: the patient is barely ventilated", Stop, 18, 20},
		// 20 x (2 - 2.2) = -4: Vt 100 mL does not exceed 110 mL. The limit
		// reported is the warn's 40 (as since version 2).
		{"none", 20, 2, "minute ventilation 40 mL/kg PBW/min (2.0 L/min) is below 60 mL/kg/min",
			"tidal volume 100 mL does not exceed the estimated dead space 110 mL (2.2 mL/kg PBW): no alveolar ventilation", Stop, -4, 40},
	} {
		a := clean()
		a.pbwKg = 50
		a.f.Timing.RateBPM, a.f.Hole.MLPerKg = c.rate, c.vt
		cs := assess(a)
		require.Equal(t, c.minute, messageOf(t, cs, CautionMinuteVentilationLow, Warn).Message, c.name)
		av := messageOf(t, cs, CautionAlveolarVentilationLow, c.level)
		require.Equal(t, c.alveolar, av.Message, c.name)
		require.InDelta(t, c.value, av.Value, 1e-9, c.name)
		require.Equal(t, c.lm, av.Limit, c.name)
		require.Equal(t, "mL/kg PBW/min", av.Unit, c.name)
	}
	// Just inside: 10 x (6.2 - 2.2) = 40 exactly is not below 40, and
	// 10 x 6.2 = 62 not below 60 (derived).
	a := clean()
	a.pbwKg = 50
	a.f.Timing.RateBPM, a.f.Hole.MLPerKg = 10, 6.25
	require.Nil(t, find(assess(a), CautionAlveolarVentilationLow))
	require.Nil(t, find(assess(a), CautionMinuteVentilationLow))
	// 10 x (4.2 - 2.2) = 20: a warn, not a stop; 10 x 4.19 ... = 19.9: stop.
	a.f.Hole.MLPerKg = 4.2
	messageOf(t, assess(a), CautionAlveolarVentilationLow, Warn)
	a.f.Hole.MLPerKg = 4.19
	messageOf(t, assess(a), CautionAlveolarVentilationLow, Stop)
	// Without a rate or a PBW nothing is judged (the figures are not
	// known), rather than a zero ventilation.
	for _, set := range []func(a *assessment){func(a *assessment) { a.f.Timing.RateBPM = 0 }, func(a *assessment) { a.pbwKg = 0 }} {
		b := clean()
		b.f.Hole.MLPerKg = 1
		set(&b)
		cs := assess(b)
		require.Nil(t, find(cs, CautionMinuteVentilationLow))
		require.Nil(t, find(cs, CautionAlveolarVentilationLow))
	}
}

// A wanted Ti other than 1 s: the change is (Ti - wanted) / wanted, so a
// division and a multiplication by the wanted Ti differ. 1.5 s for a
// wanted 1.25 s is +20 % (derived: 0.25 / 1.25); 1.4 s is +12 %.
func TestTiNotReachableSaysItsChange(t *testing.T) {
	for _, c := range []struct {
		ti    float64
		fixed bool
		level Level
		pct   string
	}{
		{1.5, false, Warn, "+20%"},
		{1.5, true, Warn, "+20%"}, // a fixed motor's note is under 20 % only
		{1.4, true, Note, "+12%"},
		{1.4, false, Warn, "+12%"},
		{1.0, true, Warn, "-20%"}, // (1.0 - 1.25) / 1.25
		{1.1, true, Note, "-12%"},
	} {
		a := clean()
		a.fixedMotor = c.fixed
		a.f.Timing = machine.Timing{RateBPM: 14, TiS: c.ti, RPM: 20, IE: 2.1}
		a.timing = &machine.TimingPlan{WantedTiS: 1.25, WantedRPM: 24, Speed: machine.SpeedLimited}
		got := messageOf(t, assess(a), CautionTiNotReachable, c.level)
		require.Equal(t, "inspiratory time 1.25 s wanted needs 24.0 rpm; the motor is set to 20.0 rpm, giving Ti "+
			plainTi(c.ti)+" s ("+c.pct+"), I:E 1:2.1", got.Message)
		require.Equal(t, c.ti, got.Value)
		require.Equal(t, 1.25, got.Limit)
	}
}

func plainTi(v float64) string {
	return map[float64]string{1.5: "1.50", 1.4: "1.40", 1.0: "1.00", 1.1: "1.10"}[v]
}

// A rate of exactly 8 or 35 /min is inside the warn's limits and outside
// 10-30: the note speaks alone (MHRA RMVS001 2020: 10-30; ARDS Network:
// at most 35; common practice: at least 8).
func TestRateNoteAtTheWarnsLimits(t *testing.T) {
	for _, c := range []struct {
		rate       float64
		note, warn CautionID
		limit      float64
	}{
		{8, CautionRateOutside10To30, "", 10},
		{35, CautionRateOutside10To30, "", 30},
		{9.99, CautionRateOutside10To30, "", 10},
		{30.01, CautionRateOutside10To30, "", 30},
		{7.99, "", CautionRateLow, 8},
		{35.01, "", CautionRateHigh, 35},
	} {
		a := clean()
		a.f.Timing.RateBPM = c.rate
		cs := assess(a)
		if c.note != "" {
			n := messageOf(t, cs, c.note, Note)
			require.Equal(t, c.limit, n.Limit)
			require.Contains(t, n.Message, "is outside 10-30 /min")
			require.Nil(t, find(cs, CautionRateLow), "%v", c.rate)
			require.Nil(t, find(cs, CautionRateHigh), "%v", c.rate)
		} else {
			require.Nil(t, find(cs, CautionRateOutside10To30), "%v: the warn speaks, not the note", c.rate)
			w := messageOf(t, cs, c.warn, Warn)
			require.Equal(t, c.limit, w.Limit)
		}
	}
	for _, r := range []float64{10, 30, 20} {
		a := clean()
		a.f.Timing.RateBPM = r
		require.Nil(t, find(assess(a), CautionRateOutside10To30), "%v is inside 10-30", r)
	}
}

// I:E outside 1:1-1:3 (ARDS Network; MHRA RMVS001): E of 1:E 0.8 is an
// inverse ratio, 3.5 a long expiration; 1 and 3 are inside.
func TestIECautionSaysWhichSide(t *testing.T) {
	for _, c := range []struct {
		ie    float64
		limit float64
		msg   string
	}{
		{0.8, 1, "I:E 1:0.8 is outside 1:1-1:3: inspiration is longer than expiration (inverse ratio)"},
		{3.5, 3, "I:E 1:3.5 is outside 1:1-1:3: expiration is more than three times inspiration"},
	} {
		a := clean()
		a.f.Timing.IE = c.ie
		got := messageOf(t, assess(a), CautionIEOutside, Warn)
		require.Equal(t, c.msg, got.Message)
		require.Equal(t, c.limit, got.Limit)
		require.Equal(t, "E of 1:E", got.Unit)
	}
	for _, ie := range []float64{1, 3, 0} { // 0: not known
		a := clean()
		a.f.Timing.IE = ie
		require.Nil(t, find(assess(a), CautionIEOutside), "%v", ie)
	}
}

// A relief valve of 0 is one the judgement does not know (a record read
// back from a log): the breath is not judged against it, whatever the
// peak.
func TestNoReliefValveKnownJudgesNoRelief(t *testing.T) {
	a := clean()
	a.reliefCmH2O = 0
	a.f.PeakCmH2O = 20
	require.Nil(t, find(assess(a), CautionPeakAboveRelief))
	require.Nil(t, find(ReadingCautions(physiology.Readings{PeakCmH2O: 20, EndCmH2O: 15}, 5, 0), CautionMeasuredPeakAboveRelief))
	// With a relief of 18 both speak (the peak is above it).
	a.reliefCmH2O = 18
	got := messageOf(t, assess(a), CautionPeakAboveRelief, Stop)
	require.Equal(t, 18.0, got.Limit)
	rc := messageOf(t, ReadingCautions(physiology.Readings{PeakCmH2O: 20, EndCmH2O: 15}, 5, 18), CautionMeasuredPeakAboveRelief, Stop)
	require.Equal(t, "the manometer reads a peak of 20.0 cmH2O, above this machine's relief valve at 18: the valve or the manometer is not working", rc.Message)
	// A breath the model held at the relief is pressure-limited even
	// with its peak on the relief: 120 mL vented, 380 delivered.
	a.reliefCmH2O = 30
	a.f.PeakCmH2O, a.f.PressureLimited, a.f.ReliefVentedML, a.f.Hole.DeliveredML = 30, true, 120, 380
	got = messageOf(t, assess(a), CautionPeakAboveRelief, Stop)
	require.Equal(t, "the breath reaches this machine's relief valve at 30 cmH2O: it is pressure-limited, 120 mL vents, and the patient gets less (380 mL) than the hole would give", got.Message)
}

// A motor without a rating is not judged for torque, whatever the share.
func TestNoRatingJudgesNoTorque(t *testing.T) {
	a := clean()
	a.ratedTorque = 0
	a.f.TorqueShareOfRating = 2
	require.Nil(t, find(assess(a), CautionTorqueHigh))
}

// The readings' own stops, with their numbers: the end at PEEP is a stop
// (at or below), a hair above it is not; a peak below the end is a stop,
// equal to it is not (a plateau breath). MHRA RMVS001 2020 (pressure not
// reached); common practice.
func TestReadingCautionsSayTheirNumbers(t *testing.T) {
	got := messageOf(t, ReadingCautions(physiology.Readings{PeakCmH2O: 20, EndCmH2O: 8}, 8, 40), CautionMeasuredEndAtOrBelowPEEP, Stop)
	require.Equal(t, "the end-inspiratory reading 8.0 cmH2O is at or below PEEP 8.0: a leak, a disconnection, or the reading was taken at the wrong moment", got.Message)
	require.Equal(t, 8.0, got.Value)
	require.Equal(t, 8.0, got.Limit)
	require.Empty(t, ReadingCautions(physiology.Readings{PeakCmH2O: 20, EndCmH2O: 8.01}, 8, 40))
	got = messageOf(t, ReadingCautions(physiology.Readings{PeakCmH2O: 14, EndCmH2O: 15}, 5, 40), CautionMeasuredPeakBelowEnd, Stop)
	require.Equal(t, "the peak reading 14.0 cmH2O is below the end reading 15.0: the peak is the highest pressure of the breath", got.Message)
	require.Equal(t, 15.0, got.Limit)
	require.Empty(t, ReadingCautions(physiology.Readings{PeakCmH2O: 15, EndCmH2O: 15}, 5, 40))
	got = messageOf(t, ReadingCautions(physiology.Readings{PeakCmH2O: 40.5, EndCmH2O: 15}, 5, 60), CautionMeasuredPeakHigh, Stop)
	require.Equal(t, "the manometer reads a peak of 40.5 cmH2O, above 40: the patient must never see more than 40", got.Message)
	require.Empty(t, ReadingCautions(physiology.Readings{PeakCmH2O: 40, EndCmH2O: 15}, 5, 60))
	cs := ReadingCautions(physiology.Readings{PeakCmH2O: math.NaN(), EndCmH2O: 15}, 5, 60)
	require.Len(t, cs, 1)
	require.Equal(t, CautionReadingsNotNumbers, cs[0].ID)
	require.Len(t, ReadingCautions(physiology.Readings{PeakCmH2O: 20, EndCmH2O: math.Inf(1)}, 5, 60), 1)
}

// The rate a timing plan could not reach, with both rates.
func TestRateUnreachableSaysBothRates(t *testing.T) {
	for _, c := range []struct {
		rate machine.Reach
		msg  string
	}{
		{machine.TooFast, "rate 40.0 /min cannot be reached: the fastest turn with no dwell gives 33.5 /min"},
		{machine.TooSlow, "rate 40.0 /min cannot be reached: the longest dwell gives 33.5 /min"},
	} {
		a := clean()
		a.f.Timing.RateBPM = 33.5
		a.timing = &machine.TimingPlan{WantedTiS: 1.4, WantedRateBPM: 40, Rate: c.rate}
		got := messageOf(t, assess(a), CautionRateUnreachable, Stop)
		require.Equal(t, c.msg, got.Message)
		require.Equal(t, 40.0, got.Value)
		require.Equal(t, 33.5, got.Limit)
	}
}

// The calibration's own cautions with their numbers: 31 days is more than
// 30, 2 holes fewer than 3, k 0.69 below 0.7 and 1.11 above 1.1 (common
// practice); a line k 1.0 + 10 mL gives the 1200 mL hole 1210 mL, more
// than it sweeps (derived).
func TestCalibrationCautionsSayTheirNumbers(t *testing.T) {
	cal := clean().cal
	cal.AgeDays, cal.Holes, cal.Outside = 31, 2, 2
	cs := calibrationCautions(cal)
	require.Equal(t, "the bench calibration is 31 days old (more than 30)", messageOf(t, cs, CautionCalibrationOld, Warn).Message)
	require.Equal(t, "the calibration measured 2 hole(s); at least 3 make a trustworthy line", messageOf(t, cs, CautionCalibrationThin, Note).Message)
	require.Equal(t, 2.0, messageOf(t, cs, CautionCalibrationResidual, Warn).Value)
	cal.AgeDays = -2
	require.Equal(t, -2.0, messageOf(t, calibrationCautions(cal), CautionCalibrationFuture, Warn).Value)
	for _, c := range []struct {
		k, limit float64
		msg      string
	}{
		{0.69, 0.7, "the bench calibration's k 0.690 is outside 0.7-1.1: more than 30% of the swept volume is lost: a leak or a valve fault, not a calibration"},
		{1.11, 1.1, "the bench calibration's k 1.110 is outside 0.7-1.1: the piston would deliver more than it sweeps"},
	} {
		cal := clean().cal
		cal.K, cal.BML = c.k, -100 // a negative offset keeps every hole below its swept volume
		got := messageOf(t, calibrationCautions(cal), CautionCalibrationKImplausible, Warn)
		require.Equal(t, c.msg, got.Message)
		require.Equal(t, c.limit, got.Limit)
	}
	for _, k := range []float64{0.7, 1.0} {
		cal := clean().cal
		cal.K = k
		require.Empty(t, calibrationCautions(cal), "k %v", k)
	}
	cal = clean().cal
	cal.K, cal.BML = 1, 10
	got := messageOf(t, calibrationCautions(cal), CautionCalibrationAboveSwept, Warn)
	require.Equal(t, "the calibration gives a hole of 1200 mL geometric swept volume an effective 1210 mL: more than the piston sweeps", got.Message)
	require.Equal(t, 1210.0, got.Value)
	require.Equal(t, 1200.0, got.Limit)
	// k 1.0 - 10 mL: the largest hole 1190 mL, the smallest 140: below
	// both; k 1.05 - 10: the largest 1250 above 1200.
	cal.BML = -10
	require.Empty(t, calibrationCautions(cal))
	cal.K = 1.05
	require.Equal(t, 1200.0, messageOf(t, calibrationCautions(cal), CautionCalibrationAboveSwept, Warn).Limit)
	// An offset that lifts only the smallest hole: k 0.9 + 20 gives 150
	// mL 155 mL (derived: 0.9 x 150 + 20), above it; 1200 gives 1100.
	cal.K, cal.BML = 0.9, 20
	got = messageOf(t, calibrationCautions(cal), CautionCalibrationAboveSwept, Warn)
	require.Equal(t, 150.0, got.Limit)
	require.InDelta(t, 155, got.Value, 1e-9)
	// A profile without a calibration line is judged as missing only.
	cal.Fit = nil
	cs = calibrationCautions(cal)
	require.Len(t, cs, 1)
	require.Equal(t, CautionCalibrationMissing, cs[0].ID)
}

// Relief valves above 40 cmH2O (MHRA RMVS001 2020), with the number.
func TestReliefAbove40SaysIt(t *testing.T) {
	got := messageOf(t, reliefCautions(45), CautionReliefAbove40, Warn)
	require.Equal(t, "this machine's relief valve opens at 45 cmH2O, above 40: it does not keep the patient below 40 cmH2O", got.Message)
	require.Empty(t, reliefCautions(40))
	require.Empty(t, reliefCautions(math.NaN()))
}

// The plateau and intrinsic PEEP messages name the figure, the limit and
// the gas trapped.
func TestPressureCautionsSayTheirNumbers(t *testing.T) {
	a := clean()
	a.f.PlateauCmH2O, a.f.IntrinsicPEEPCmH2O, a.f.TrappedML = 36, 6, 85
	cs := assess(a)
	require.Equal(t, "plateau pressure 36.0 cmH2O is above 35, the limit of an emergency ventilator", messageOf(t, cs, CautionPlateauHigh, Stop).Message)
	require.Equal(t, "intrinsic PEEP 6.0 cmH2O is above 5: gas builds up breath after breath (85 mL trapped)", messageOf(t, cs, CautionIntrinsicPEEP, Stop).Message)
	a.f.PlateauCmH2O, a.f.IntrinsicPEEPCmH2O = 31, 3
	cs = assess(a)
	require.Equal(t, "plateau pressure 31.0 cmH2O is above 30", messageOf(t, cs, CautionPlateauHigh, Warn).Message)
	require.Equal(t, "intrinsic PEEP 3.0 cmH2O is above 2: exhalation does not finish (85 mL trapped)", messageOf(t, cs, CautionIntrinsicPEEP, Warn).Message)
	a.f.PlateauCmH2O, a.f.IntrinsicPEEPCmH2O = 35, 5 // on the stops' limits: warns
	cs = assess(a)
	messageOf(t, cs, CautionPlateauHigh, Warn)
	messageOf(t, cs, CautionIntrinsicPEEP, Warn)
	a.f.Hole.MLPerKg = 10
	require.Equal(t, "tidal volume 10.0 mL/kg PBW is at or above 10", messageOf(t, assess(a), CautionTidalVolumeHigh, Stop).Message)
	a.f.Hole.MLPerKg = 1.9
	require.Equal(t, "tidal volume 1.9 mL/kg PBW is below 2: little or no gas passes the dead space", messageOf(t, assess(a), CautionTidalVolumeLow, Stop).Message)
	a.f.Hole.MLPerKg = 2
	messageOf(t, assess(a), CautionTidalVolumeLow, Warn)
}

// Cautions of one level keep the order they were judged in (a stable sort,
// most serious first): the volume before the pressures, the readings'
// own stops before the unexplained one.
func TestCautionsOfOneLevelKeepTheirOrder(t *testing.T) {
	a := clean()
	a.f.Hole.MLPerKg, a.f.PlateauCmH2O, a.f.DrivingCmH2O = 8.5, 31, 16
	a.cal.AgeDays = 40
	var ids []CautionID
	for _, c := range assess(a) {
		ids = append(ids, c.ID)
	}
	require.Equal(t, []CautionID{CautionTidalVolumeHigh, CautionPlateauHigh, CautionDrivingPressureHigh, CautionCalibrationOld}, ids)
	rd := physiology.Readings{PeakCmH2O: 45, EndCmH2O: 5}
	cs := checkCautions(&rd, 5, 42, "no lung", []Caution{{ID: CautionPEEPLow, Level: Warn}, {ID: CautionPatientTriggering, Level: Stop}})
	ids = nil
	for _, c := range cs {
		ids = append(ids, c.ID)
	}
	require.Equal(t, []CautionID{CautionMeasuredPeakHigh, CautionMeasuredPeakAboveRelief, CautionMeasuredEndAtOrBelowPEEP,
		CautionReadingsUnexplained, CautionPatientTriggering, CautionPEEPLow}, ids)
	require.Equal(t, Stop, Highest(cs))
	require.Equal(t, Level(0), Highest(nil))
}

// A calibration line is judged on the swept volumes the profile has: a
// swept volume of 0 (not known) is skipped, not judged as a hole of 0 mL
// that any positive offset would lift above its geometric volume.
func TestCalibrationAboveSweptSkipsAnUnknownHole(t *testing.T) {
	cal := clean().cal
	cal.K, cal.BML, cal.SweptMinML = 0.9, 10, 0 // 1200 mL -> 1090 mL
	require.Empty(t, calibrationCautions(cal))
}

// The calibration's tolerance: a line within a part in a billion of the
// geometric volume (k = 1 + 1e-9, no offset) is rounding, not a piston
// delivering more than it sweeps; k = 1 + 1e-6 is above.
func TestCalibrationAboveSweptTolerance(t *testing.T) {
	cal := clean().cal
	cal.K, cal.BML = 1+1e-9, 0
	require.Empty(t, calibrationCautions(cal))
	cal.K = 1 + 1e-6
	messageOf(t, calibrationCautions(cal), CautionCalibrationAboveSwept, Warn)
}
