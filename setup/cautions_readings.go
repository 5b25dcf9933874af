package setup

import (
	"fmt"

	"crankside/physiology"
)

// Limits on what the readings and the leak say (issue 18).
const (
	// LeakComplianceWarn and LeakComplianceStop (mL/cmH2O): an intubated
	// adult's respiratory-system compliance rarely exceeds about 100
	// (REFERENCES version 3, from memory); a fit above it suggests a leak
	// or a partial disconnection (warn), and one above 150, half as much
	// again, is far more likely a leak than a lung (stop; common practice).
	LeakComplianceWarn = 100.0
	LeakComplianceStop = 150.0
	// LeakShareWarn and LeakShareStop: the share of the piston's stroke
	// that the modelled leak takes. Above a tenth the volume shown rests
	// on the leak's figure (warn); above three tenths more of the stroke
	// is lost than the calibration accepts of any machine (CalKMin 0.7:
	// common practice, the same limit), so no volume can be trusted (stop).
	LeakShareWarn = 0.10
	LeakShareStop = 0.30
)

const srcLeakCompliance = "from memory: an intubated adult's respiratory-system compliance rarely exceeds about 100 mL/cmH2O (REFERENCES, version 3); stop at 150 (common practice)"

const srcLeakShare = "common practice: warn above 10 % of the stroke; stop above 30 %, the loss at which a bench calibration is refused"

// leakAdvice says what to check for a leak.
const leakAdvice = "check the tube's cuff (pressure and audible leak), every connection of the circuit and the PEEP valve, then re-take both readings"

// fitCautions judge what a fit itself says: a peak at the relief valve
// (the fit is then to the end pressure alone) and a compliance no
// intubated adult has (a leak). deliveredML is the volume the fit
// predicts; halfStep is half the manometer's step.
func fitCautions(rd *physiology.Readings, m *physiology.Mechanics, reliefCmH2O, halfStep, deliveredML float64, step physiology.Value) []Caution {
	var out []Caution
	if rd != nil && PeakAtRelief(rd.PeakCmH2O, reliefCmH2O, halfStep) {
		told := "no lung could be fitted to the end pressure either"
		switch {
		case m != nil && m.RAtLeast:
			told = fmt.Sprintf("what the readings still tell: compliance %s mL/cmH2O from the end pressure, and a resistance of at least %s cmH2O/(L/s) (the peak cannot tell more)",
				Sig2(m.ComplianceMLPerCmH2O), Sig2(m.ResistanceCmH2OPerLS))
		case m != nil:
			told = fmt.Sprintf("what the readings still tell: compliance %s mL/cmH2O from the end pressure alone (the resistance is assumed; the peak cannot tell it)", Sig2(m.ComplianceMLPerCmH2O))
		}
		out = append(out, Caution{ID: CautionMeasuredPeakAtRelief, Level: Stop, Value: rd.PeakCmH2O, Limit: reliefCmH2O, Unit: "cmH2O",
			Message: fmt.Sprintf("the manometer reads a peak of %.1f cmH2O, within half a %s cmH2O step of this machine's relief valve at %s: the relief valve is venting: the breath is pressure-limited; the patient gets less than the hole delivers; %s",
				rd.PeakCmH2O, plain(step.Value), plain(reliefCmH2O), told),
			Advice: "check the patient now (tube, secretions, chest), then use a smaller hole or a slower speed and re-take both readings",
			Source: srcProfile + " (relief pressure); manometer step: " + step.Source})
	}
	if m == nil {
		return out
	}
	c := m.ComplianceMLPerCmH2O
	if r, l, ok := judged(CautionReadingsSuggestLeak, c); ok {
		out = append(out, r.caution(l, c, fmt.Sprintf("the readings fit a compliance of %.1f mL/cmH2O, above %s: pressures this low are what a cuff leak or a partial disconnection looks like; the patient may get less than shown: %.0f mL is an upper bound",
			c, plain(l.Value), deliveredML), leakAdvice))
	}
	return out
}

// Notes for volumes that are upper bounds, not what the patient gets.
const (
	LeakVolumeNote   = "the readings suggest a leak: every volume here is an upper bound, not what the patient gets; the patient may get less"
	ReliefVolumeNote = "the peak is at the relief valve: the breath is pressure-limited, and every volume here is an upper bound, not what the patient gets; the patient may get less"
)

// VolumeBoundNote says why the check's volumes are upper bounds (the fit
// suggests a leak, or the peak sat at the relief valve), or is "" when
// they are what the patient gets.
func (ck Check) VolumeBoundNote() string {
	for _, c := range ck.Current.Cautions {
		if c.ID == CautionReadingsSuggestLeak {
			return LeakVolumeNote
		}
	}
	if ck.Fitted != nil && ck.Fitted.EndOnly {
		return ReliefVolumeNote
	}
	return ""
}

// AtMost is "at most " before a recorded volume that is an upper bound
// (CheckJSON.VolumeUpperBound), or "".
func AtMost(j CheckJSON) string {
	if j.VolumeUpperBound {
		return "at most "
	}
	return ""
}

// leakShareCautions judge the share of the piston's stroke that the
// modelled leak takes (the profile's leak at this setting's pressures).
func leakShareCautions(f Figures) []Caution {
	stroke := f.Hole.EffectiveSweptML
	if stroke <= 0 || f.LeakedML <= 0 {
		return nil
	}
	share := f.LeakedML / stroke
	r, l, ok := judged(CautionLeakShareOfStroke, share)
	if !ok {
		return nil
	}
	c := r.caution(l, 100*share, fmt.Sprintf("the modelled leak takes %.0f mL of the %.0f mL stroke (%.0f %%), above %.0f %%: every volume shown rests on the leak's figure, and if the real leak is smaller the patient gets more",
		f.LeakedML, stroke, 100*share, 100*l.Value),
		"find and fix the leak (cuff, connections, PEEP valve, piston seal) and measure it on the bench before trusting any volume")
	c.Limit, c.Unit = 100*l.Value, "% of the stroke"
	return []Caution{c}
}
