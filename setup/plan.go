package setup

import (
	"fmt"
	"math"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// Change is one way the machine's steps made the setting differ from what
// was asked for.
type Change struct {
	What   string  `json:"what"`
	Wanted float64 `json:"wanted"`
	Got    float64 `json:"got"`
	Unit   string  `json:"unit"`
}

// Plan is a new patient's setting on one machine.
type Plan struct {
	Patient Patient

	ProfileID    string
	ProfileLabel string
	Calibration  CalibrationStatus

	Lung       physiology.Lung
	MLPerKg    physiology.Value
	Rate       physiology.Value
	IE         physiology.Value
	PEEP       physiology.Value
	FiO2       physiology.Value
	Compliance physiology.Value
	Resistance physiology.Value
	PEEPTable  physiology.TablePEEP
	// CylinderReserve is where the cylinder's time runs to, bar.
	CylinderReserve physiology.Value

	PBWKg      float64
	TargetVtML float64

	Timing machine.TimingPlan
	Figures
	// Below and Above are the neighbouring holes by delivered volume, nil
	// at either end.
	Below, Above *HoleFigure
	Holes        []HoleFigure // every hole at the planned speed, in profile order
	OffTargetPct float64      // percent: 100 x (delivered - target) / target, negative below the target

	Changes  []Change
	Cautions []Caution

	// Gas is the version 2 breath's room (with the BTPS factor), cylinder
	// head, leak and relief valve, as used in every stroke of the plan.
	Gas GasModel

	// Watch is what the manometer should show on this setting and the
	// alarm limits (on the assumed lung, read to the default manometer
	// step); TimingCheck is what to time to confirm the setting.
	Watch       Watch
	TimingCheck TimingCheck
	// Converted are the entries typed in the ward's units.
	Converted []Conversion
}

// MakePlan turns a request into a setting on the machine described by p:
// PBW from the patient, the targets with their defaults and sources, the
// motor speed and dwell rounded to what the motor and controller can be set
// to (PlanTiming), every hole simulated from rest at that speed and the one
// whose delivered volume is nearest the target chosen (a tie goes to the
// smaller volume), its neighbours, the O2 flow for the wanted FiO2, the
// figures at the steady state of trapped gas, what rounding changed, and the
// cautions. Bad entries and a profile the model cannot run return an
// *InputError naming the field; a setting that cannot be reached is not an
// error but a stop caution.
func MakePlan(req Request, p profiles.Profile) (Plan, error) {
	now := orNow(req.Now)
	pbw, err := pbwOf(req.Patient)
	if err != nil {
		return Plan{}, err
	}
	r, err := resolveTargets(req.Targets)
	if err != nil {
		return Plan{}, err
	}
	room, err := resolveRoom(req.Room)
	if err != nil {
		return Plan{}, err
	}
	u, err := newUnitV(p, now, req.v1Gas)
	if err != nil {
		return Plan{}, err
	}
	u.gas = withRoom(u.gas, room, req.v1Gas)
	u.cylinderReserveBar = r.reserve.Value
	targetML, err := physiology.TidalVolumeML(r.mlPerKg.Value, pbw)
	if err != nil {
		return Plan{}, inputErr("ml-per-kg", err)
	}
	pl := Plan{Gas: u.gas,
		Patient: req.Patient, ProfileID: p.ID, ProfileLabel: p.Label, Calibration: u.cal,
		Lung: r.lung, MLPerKg: r.mlPerKg, Rate: r.rate, IE: r.ie, PEEP: r.peep, FiO2: r.fio2,
		Compliance: r.compliance, Resistance: r.resistance, PEEPTable: r.table, CylinderReserve: r.reserve,
		PBWKg: pbw, TargetVtML: targetML, Converted: req.Converted,
	}
	ls := lungState{
		lung:  machine.Lung{ComplianceMLPerCmH2O: r.compliance.Value, ResistanceCmH2OPerLS: r.resistance.Value},
		peep:  r.peep.Value,
		pbwKg: pbw,
	}

	chosen, err := settleTimingAndHole(&pl, u, p, r, ls)
	if err != nil {
		return Plan{}, err
	}
	pl.Below, pl.Above = neighbours(pl.Holes, chosen)

	// The piston draws its whole effective swept volume from the reservoir
	// every turn, so the oxygen is mixed into that (DESIGN version 2).
	o2 := physiology.O2FlowForFiO2AtPistonIntake(r.fio2.Value, pl.Holes[chosen].EffectiveSweptML, pl.Timing.RateBPM)
	pl.Figures, err = evaluateFrom(u, p.Crank.Holes[chosen], pl.Timing.Timing, ls, o2, req.Targets.CylinderWaterL, req.Targets.CylinderBar, pl.Holes[chosen])
	if err != nil {
		return Plan{}, &InputError{Field: "rate", Reason: err.Error()}
	}
	// The chosen hole's entry is the breath the plan shows (1 ms, at the
	// steady state), not the scan's.
	pl.Holes[chosen] = pl.Hole
	pl.OffTargetPct = 100 * (pl.Hole.DeliveredML - pl.TargetVtML) / pl.TargetVtML
	pl.Changes = timingChanges(pl.Timing)
	pl.Cautions = assess(newAssessment(u, req.Patient, pbw, pl.Figures, &pl.Timing,
		&holeTarget{mlPerKg: r.mlPerKg.Value, offTargetPct: pl.OffTargetPct}, planHazards(p, pl, r)))
	pl.Watch = watchOf(pl.Figures, p.Circuit.ReliefCmH2O, physiology.Value{Value: DefaultManometerStepCmH2O, Source: srcManometerStep}, false)
	pl.TimingCheck = timingCheckOf(pl.Figures)
	if err := finite(pl); err != nil {
		return Plan{}, err
	}
	return pl, nil
}

// settleTimingAndHole finds the timing and the hole together and returns
// the chosen hole's index: the delivery angle, and so the speed for a
// wanted Ti, depends on the hole when the crank is offset; the hole
// depends a little on the speed.
func settleTimingAndHole(pl *Plan, u unit, p profiles.Profile, r resolved, ls lungState) (int, error) {
	// The delivery angle, and so the speed for a wanted Ti, depends on the
	// hole when the crank is offset; the hole depends a little on the speed.
	// Settle both together: in-line cranks settle at once.
	hole := p.Crank.Holes[len(p.Crank.Holes)/2]
	chosen, err := 0, error(nil)
	prevAngle := math.NaN()
	for pass := 0; pass < 4; pass++ {
		angle := u.crank(hole).DeliveryAngle()
		if angle == prevAngle {
			break // same timing as the last pass, so the same holes
		}
		prevAngle = angle
		pl.Timing, err = machine.PlanTiming(u.motor, u.controller, angle, r.rate.Value, r.ie.Value)
		if err != nil {
			return 0, &InputError{Field: "rate", Reason: err.Error()}
		}
		if pl.Holes, chosen, err = scanHoles(u, pl.Holes[:0], pl.Timing.RPM, ls, pl.TargetVtML); err != nil {
			return 0, &InputError{Field: "profile " + p.ID, Reason: err.Error()}
		}
		if p.Crank.Holes[chosen].Label == hole.Label {
			break
		}
		hole = p.Crank.Holes[chosen]
	}
	return chosen, nil
}

// ScanStepS is the time step at which MakePlan simulates every hole to
// find the nearest: 10 ms. Against the model's default 1 ms the delivered
// volumes agree within 1e-4 (TestScanStepAgreesWithFineStep, over a sweep
// of patients, lungs and both demo machines), and the delivered volume
// of the chosen hole is then simulated again at 1 ms, from the trapped gas
// (evaluateFrom). When the two nearest holes are within CloseChoicePct of
// the target of each other, both are simulated again at 1 ms and the
// choice made on those, so the choice is the one a scan at 1 ms makes
// (TestHoleChoiceMatchesFineStep).
const ScanStepS = 0.010

// CloseChoicePct is how close, in percent of the target, the two nearest
// holes' distances to it must be for the choice to be re-made at 1 ms: 0.1%,
// ten times the scan's largest disagreement with 1 ms.
const CloseChoicePct = 0.1

// scanHoles simulates every hole from rest at ScanStepS and returns them
// (in profile order) and the index of the nearest to targetML; a close
// choice between two is re-made at the default step.
func scanHoles(u unit, holes []HoleFigure, rpm float64, ls lungState, targetML float64) ([]HoleFigure, int, error) {
	for _, h := range u.p.Crank.Holes {
		hf, err := deliveredFromRestAt(u, h, rpm, ls, ScanStepS)
		if err != nil {
			return nil, 0, err
		}
		holes = append(holes, hf)
	}
	chosen := nearestHole(holes, targetML)
	b, a := neighbourIndex(holes, chosen)
	d := math.Abs(holes[chosen].DeliveredML - targetML)
	for _, i := range [2]int{b, a} {
		if i < 0 || math.Abs(math.Abs(holes[i].DeliveredML-targetML)-d) > CloseChoicePct/100*targetML {
			continue
		}
		for _, j := range [2]int{chosen, i} {
			hf, err := deliveredFromRest(u, u.p.Crank.Holes[j], rpm, ls)
			if err != nil {
				return nil, 0, err
			}
			holes[j] = hf
		}
	}
	return holes, leastVenting(holes, nearestHole(holes, targetML)), nil
}

// SameVolumePct is how close, in percent, a smaller hole's delivered
// volume must be to a pressure-limited choice's to be taken instead.
const SameVolumePct = 0.5

// leastVenting moves a pressure-limited choice to the smallest hole that
// delivers within SameVolumePct of it: past the relief valve a larger hole
// adds little but vented gas, torque and wear, so the smaller one is the
// conservative setting (the plan stays a stop either way).
func leastVenting(holes []HoleFigure, chosen int) int {
	if !holes[chosen].PressureLimited {
		return chosen
	}
	best, floor := chosen, holes[chosen].DeliveredML*(1-SameVolumePct/100)
	for i, h := range holes {
		if h.DeliveredML >= floor && h.DeliveredML < holes[best].DeliveredML {
			best = i
		}
	}
	return best
}

// neighbourIndex is the index of the holes delivering next less and next
// more than holes[chosen], -1 when there is none.
func neighbourIndex(holes []HoleFigure, chosen int) (below, above int) {
	below, above = -1, -1
	v := holes[chosen].DeliveredML
	for i, h := range holes {
		if i == chosen {
			continue
		}
		if h.DeliveredML < v && (below < 0 || h.DeliveredML > holes[below].DeliveredML) {
			below = i
		}
		if h.DeliveredML > v && (above < 0 || h.DeliveredML < holes[above].DeliveredML) {
			above = i
		}
	}
	return below, above
}

// nearestHole picks the hole whose delivered volume is nearest the target;
// a tie goes to the smaller volume.
func nearestHole(holes []HoleFigure, targetML float64) int {
	best := 0
	for i, h := range holes {
		d, bd := math.Abs(h.DeliveredML-targetML), math.Abs(holes[best].DeliveredML-targetML)
		if d < bd-1e-9 || (math.Abs(d-bd) <= 1e-9 && h.DeliveredML < holes[best].DeliveredML) {
			best = i
		}
	}
	return best
}

// neighbours are the holes delivering next less and next more than chosen.
func neighbours(holes []HoleFigure, chosen int) (below, above *HoleFigure) {
	v := holes[chosen].DeliveredML
	for i := range holes {
		h := holes[i]
		if i == chosen {
			continue
		}
		if h.DeliveredML < v && (below == nil || h.DeliveredML > below.DeliveredML) {
			below = &holes[i]
		}
		if h.DeliveredML > v && (above == nil || h.DeliveredML < above.DeliveredML) {
			above = &holes[i]
		}
	}
	if below != nil {
		b := *below
		below = &b
	}
	if above != nil {
		a := *above
		above = &a
	}
	return below, above
}

// timingChanges lists what the motor's and controller's steps changed.
func timingChanges(tp machine.TimingPlan) []Change {
	var out []Change
	add := func(what string, wanted, got float64, unit string, tol float64) {
		if math.Abs(wanted-got) > tol {
			out = append(out, Change{What: what, Wanted: wanted, Got: got, Unit: unit})
		}
	}
	add("motor speed", tp.WantedRPM, tp.RPM, "rpm", 0.005)
	add("dwell", tp.WantedDwellS, tp.DwellS, "s", 0.0005)
	add("rate", tp.WantedRateBPM, tp.RateBPM, "/min", 0.05)
	add("Ti", tp.WantedTiS, tp.TiS, "s", 0.005)
	add("I:E (E of 1:E)", tp.WantedIE, tp.IE, "", 0.05)
	return out
}

// finite refuses to hand out a plan with a NaN or Inf in a figure shown to
// people; it would mean a bug or an input this check missed.
func finite(pl Plan) error {
	vals := []float64{pl.PBWKg, pl.TargetVtML, pl.Hole.DeliveredML, pl.Hole.MLPerKg, pl.PeakCmH2O, pl.EndInspCmH2O,
		pl.PlateauCmH2O, pl.DrivingCmH2O, pl.IntrinsicPEEPCmH2O, pl.TrappedML, pl.PeakFlowLPerMin, pl.MinuteVentLPerMin,
		pl.PeakTorqueNm, pl.Timing.RPM, pl.Timing.DwellS, pl.Timing.RateBPM, pl.Timing.TiS, pl.Timing.TeS, pl.Timing.IE,
		pl.FiO2.Value, pl.O2FlowLPerMin, pl.OffTargetPct}
	for i, v := range vals {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("setup: figure %d of the plan is not finite (%v); the inputs are outside what the model handles", i, v)
		}
	}
	return nil
}
