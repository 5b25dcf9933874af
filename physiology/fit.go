package physiology

import (
	"errors"
	"fmt"
	"math"
)

// Readings are what the circuit manometer shows at one setting: the peak
// during delivery and the pressure when the piston stops (end of
// inspiration), both in cmH2O above atmosphere.
type Readings struct {
	PeakCmH2O float64
	EndCmH2O  float64
}

// PressureModel predicts the two readings for a lung of compliance c
// (mL/cmH2O) and resistance r (cmH2O/(L/s)).
type PressureModel func(c, r float64) (peakCmH2O, endCmH2O float64, err error)

// ReadingError says which reading cannot be right and should be re-taken.
type ReadingError struct {
	Retake string // "end pressure", "peak", or "both readings"
	Reason string
}

func (e *ReadingError) Error() string {
	if e.Retake == "both readings" {
		return e.Reason + "; re-take both readings"
	}
	return e.Reason + "; re-take the " + e.Retake
}

// ErrNoMechanics is matched by errors.Is for every *ReadingError.
var ErrNoMechanics = errors.New("physiology: no lung mechanics reproduce the readings")

func (e *ReadingError) Is(target error) bool { return target == ErrNoMechanics }

// Mechanics is a fitted lung.
type Mechanics struct {
	ComplianceMLPerCmH2O float64
	ResistanceCmH2OPerLS float64
	// EndOnly marks a fit to the end pressure alone (FitComplianceFromEnd):
	// the resistance is the one given, not fitted, because the peak told
	// nothing (it sat at the relief pressure).
	EndOnly bool
	// RAtLeast marks, with EndOnly, a resistance that is the least for
	// which the model's peak reaches the relief pressure: the real one may
	// be higher (set by the caller that fitted at the relief pressure).
	RAtLeast bool
}

// FitTolCmH2O is how closely a fit must reproduce each reading: a
// thousandth of a 1 cmH2O manometer step (derived: far below what a
// reading is known to, yet above the model's own settling of the trapped
// gas to 0.01 mL, which moves the pressures by about 1e-3/C cmH2O).
const FitTolCmH2O = 1e-3

// FitMechanics finds the compliance and resistance for which model gives
// both readings, within the plausible ranges FitCMin-FitCMax and
// FitRMin-FitRMax (outside them the readings are more likely wrong than
// the lung). It starts from a physical estimate (start), takes bounded
// Newton steps on log C and log R, and when they stall (the relief valve
// flattens the peak, or the surface folds) solves again by bracketing:
// for each R the end pressure fixes C (it falls as C grows), and R is
// found where the peak matches. A pair the model can produce inside the
// ranges is therefore always found; a pair it cannot is refused as a
// *ReadingError naming the reading to re-take.
func FitMechanics(rd Readings, peepCmH2O float64, model PressureModel) (Mechanics, error) {
	if err := checkReadings(rd, peepCmH2O); err != nil {
		return Mechanics{}, err
	}
	s := newFitter(rd, peepCmH2O, model)
	lc, lr, err := s.start()
	if err != nil {
		return Mechanics{}, err
	}
	return s.solve(lc, lr)
}

// FitMechanicsNear is FitMechanics started from near, a lung fitted to
// nearby readings (the corners of the manometer's step start from the
// central fit): the same solve, in fewer steps, its Newton steps stopping
// at a residual of 1e-6 cmH2O rather than 1e-9.
func FitMechanicsNear(rd Readings, peepCmH2O float64, near Mechanics, model PressureModel) (Mechanics, error) {
	return fitFrom(rd, peepCmH2O, near, model, 1e-6)
}

// FitMechanicsFrom is FitMechanics started from near, a lung fitted to the
// same readings on a coarser model (a longer time step): the same solve to
// the same residual (1e-9 cmH2O), in the two or three Newton steps that
// the models' small difference needs rather than the five to ten from the
// physical start.
func FitMechanicsFrom(rd Readings, peepCmH2O float64, near Mechanics, model PressureModel) (Mechanics, error) {
	return fitFrom(rd, peepCmH2O, near, model, 1e-9)
}

// fitFrom is the solve started from near, its Newton steps stopping at a
// residual of target cmH2O; a near that is no lung (NaN, 0, infinite)
// starts from the physical estimate instead.
func fitFrom(rd Readings, peepCmH2O float64, near Mechanics, model PressureModel, target float64) (Mechanics, error) {
	if err := checkReadings(rd, peepCmH2O); err != nil {
		return Mechanics{}, err
	}
	s := newFitter(rd, peepCmH2O, model)
	s.target = target
	lc, lr := math.Log(near.ComplianceMLPerCmH2O), math.Log(near.ResistanceCmH2OPerLS)
	if math.IsNaN(lc+lr) || math.IsInf(lc+lr, 0) {
		var err error
		if lc, lr, err = s.start(); err != nil {
			return Mechanics{}, err
		}
	}
	return s.solve(clampTo(lc, s.logCMin, s.logCMax), clampTo(lr, s.logRMin, s.logRMax))
}

// solve runs Newton from (lc, lr) and, when it stalls, the bracketing solve.
func (s fitter) solve(lc, lr float64) (Mechanics, error) {
	m, ok, err := s.newton(lc, lr)
	if err != nil || ok {
		return m, err
	}
	return s.bracketed()
}

// FitComplianceFromEnd finds the compliance for which model gives the end
// reading at the resistance r (cmH2O/(L/s)): what a breath still tells
// when its peak sat at the relief pressure and says nothing of R. The
// result has EndOnly set. A compliance outside FitCMin-FitCMax is refused
// as a *ReadingError (re-take the end pressure).
func FitComplianceFromEnd(endCmH2O, peepCmH2O, r float64, model PressureModel) (Mechanics, error) {
	if err := checkReadings(Readings{PeakCmH2O: endCmH2O, EndCmH2O: endCmH2O}, peepCmH2O); err != nil {
		return Mechanics{}, err
	}
	if !(r >= FitRMin && r <= FitRMax) {
		panic(fmt.Sprintf("physiology: FitComplianceFromEnd at R %v, outside %g-%g", r, FitRMin, FitRMax))
	}
	s := newFitter(Readings{PeakCmH2O: endCmH2O, EndCmH2O: endCmH2O}, peepCmH2O, model)
	lc, side, err := s.complianceFor(math.Log(r))
	if err != nil {
		return Mechanics{}, err
	}
	if side != 0 {
		return Mechanics{}, complianceError(side)
	}
	return Mechanics{ComplianceMLPerCmH2O: math.Exp(lc), ResistanceCmH2OPerLS: r, EndOnly: true}, nil
}

// checkReadings refuses readings no lung gives whatever its mechanics.
func checkReadings(rd Readings, peepCmH2O float64) error {
	for _, v := range []float64{rd.PeakCmH2O, rd.EndCmH2O, peepCmH2O} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &ReadingError{Retake: "both readings", Reason: fmt.Sprintf("reading %v is not a number", v)}
		}
	}
	switch {
	case rd.EndCmH2O <= peepCmH2O:
		return &ReadingError{Retake: "end pressure",
			Reason: fmt.Sprintf("end-inspiratory pressure %.1f cmH2O is not above PEEP %.1f: no lung takes the breath that way (leak or disconnection?)", rd.EndCmH2O, peepCmH2O)}
	case rd.PeakCmH2O < rd.EndCmH2O:
		return &ReadingError{Retake: "both readings",
			Reason: fmt.Sprintf("peak %.1f cmH2O is below the end pressure %.1f: the peak is the highest reading of the breath", rd.PeakCmH2O, rd.EndCmH2O)}
	}
	return nil
}

// fitter holds one fit's readings and model, and the solver's box in
// log C and log R (the plausible ranges).
type fitter struct {
	rd                                 Readings
	peep                               float64
	model                              PressureModel
	logCMin, logCMax, logRMin, logRMax float64
	// target is the residual (cmH2O) at which Newton stops: 1e-9 for a
	// fit, 1e-6 for one started near another (a corner of the manometer's
	// step, whose figures are shown to 2 significant figures).
	target float64
}

func newFitter(rd Readings, peepCmH2O float64, model PressureModel) fitter {
	return fitter{rd: rd, peep: peepCmH2O, model: model,
		logCMin: math.Log(FitCMin), logCMax: math.Log(FitCMax), logRMin: math.Log(FitRMin), logRMax: math.Log(FitRMax), target: 1e-9}
}

// residual is the model's readings minus the measured ones at log C, log R.
func (s fitter) residual(lc, lr float64) (float64, float64, error) {
	p, e, err := s.model(math.Exp(lc), math.Exp(lr))
	if err != nil {
		return 0, 0, err
	}
	return p - s.rd.PeakCmH2O, e - s.rd.EndCmH2O, nil
}

// start is a physical first guess. A probe lung (C 50 mL/cmH2O, R 10
// cmH2O/(L/s), a typical intubated adult, from memory) holds about
// V = 50 x (its end pressure - PEEP) at the end of delivery (the end
// pressure is near the plateau); the hole delivers nearly the same volume
// into any lung, so the lung that reads End has C = V / (End - PEEP). The
// gap between peak and end is mostly R times the flow, so R is scaled
// from a second probe at that C and R 20 cmH2O/(L/s) by the measured gap
// over the probe's (a probe at R 20 rather than 10 or 5 left the fewest
// starts to the bracketing solve over issue 18's grid).
func (s fitter) start() (float64, float64, error) {
	const c0, r0, r1 = 50.0, 10.0, 20.0
	_, e0, err := s.model(c0, r0)
	if err != nil {
		return 0, 0, err
	}
	lc := math.Log(c0)
	if e0 > s.peep {
		lc = clampTo(math.Log(c0*(e0-s.peep)/(s.rd.EndCmH2O-s.peep)), s.logCMin, s.logCMax)
	}
	p1, e1, err := s.model(math.Exp(lc), r1)
	if err != nil {
		return 0, 0, err
	}
	lr := math.Log(r1)
	if gap := s.rd.PeakCmH2O - s.rd.EndCmH2O; p1-e1 > 0 && gap > 0 {
		lr = math.Log(r1 * gap / (p1 - e1))
	} else if gap <= 0 {
		lr = s.logRMin
	}
	return lc, clampTo(lr, s.logRMin, s.logRMax), nil
}

func clampTo(v, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, v)) }

// newton takes damped Newton steps on log C and log R, each kept inside
// the box, with a finite-difference Jacobian and step halving, to a
// residual of 1e-9 cmH2O (a figure built on the fit then reproduces the
// readings to float noise); ok when, if it stalls first, the readings are
// still reproduced to FitTolCmH2O.
func (s fitter) newton(lc, lr float64) (Mechanics, bool, error) {
	f1, f2, err := s.residual(lc, lr)
	if err != nil {
		return Mechanics{}, false, err
	}
	const h = 1e-4
	for range 30 {
		norm := math.Hypot(f1, f2)
		if norm < s.target {
			return Mechanics{ComplianceMLPerCmH2O: math.Exp(lc), ResistanceCmH2OPerLS: math.Exp(lr)}, true, nil
		}
		// Difference inward at the box's upper edges.
		hc, hr := h, h
		if lc+hc > s.logCMax {
			hc = -h
		}
		if lr+hr > s.logRMax {
			hr = -h
		}
		a1, a2, err1 := s.residual(lc+hc, lr)
		b1, b2, err2 := s.residual(lc, lr+hr)
		if err1 != nil || err2 != nil {
			break
		}
		j11, j21, j12, j22 := (a1-f1)/hc, (a2-f2)/hc, (b1-f1)/hr, (b2-f2)/hr
		det := j11*j22 - j12*j21
		if det == 0 || math.IsNaN(det) {
			break
		}
		dc, dr := -(j22*f1-j12*f2)/det, -(-j21*f1+j11*f2)/det
		// Never more than a factor e in one step; halve until the residual falls.
		if m := math.Max(math.Abs(dc), math.Abs(dr)); m > 1 {
			dc, dr = dc/m, dr/m
		}
		improved := false
		for k := 0; k < 16 && !improved; k++ {
			nc, nr := clampTo(lc+dc, s.logCMin, s.logCMax), clampTo(lr+dr, s.logRMin, s.logRMax)
			g1, g2, err := s.residual(nc, nr)
			if err == nil && math.Hypot(g1, g2) < norm {
				lc, lr, f1, f2, improved = nc, nr, g1, g2, true
			}
			dc, dr = dc/2, dr/2
		}
		if !improved {
			break
		}
	}
	if math.Abs(f1) < FitTolCmH2O && math.Abs(f2) < FitTolCmH2O {
		return Mechanics{ComplianceMLPerCmH2O: math.Exp(lc), ResistanceCmH2OPerLS: math.Exp(lr)}, true, nil
	}
	return Mechanics{}, false, nil
}

// complianceFor solves the end reading for log C at log R by bracketing
// over the box. side is -1 when even FitCMin reads too low an end (the
// readings need a stiffer lung), +1 when even FitCMax reads too high, and
// then lc is that edge.
func (s fitter) complianceFor(lr float64) (lc float64, side int, err error) {
	f := func(x float64) (float64, error) {
		_, e, err := s.residual(x, lr)
		return e, err
	}
	lo, err := f(s.logCMin)
	if err != nil {
		return 0, 0, err
	}
	if lo < 0 {
		return s.logCMin, -1, nil
	}
	hi, err := f(s.logCMax)
	if err != nil {
		return 0, 0, err
	}
	if hi > 0 {
		return s.logCMax, 1, nil
	}
	lc, err = illinois(f, s.logCMin, s.logCMax, lo, hi)
	return lc, 0, err
}

// bracketed is the solve that cannot stall: R by bracketing on the peak,
// with C at each R from the end reading (complianceFor).
func (s fitter) bracketed() (Mechanics, error) {
	var side int
	g := func(lr float64) (float64, error) {
		lc, sd, err := s.complianceFor(lr)
		if err != nil {
			return 0, err
		}
		side = sd
		p, _, err := s.residual(lc, lr)
		return p, err
	}
	lo, err := g(s.logRMin)
	if err != nil {
		return Mechanics{}, err
	}
	sideLo := side
	hi, err := g(s.logRMax)
	if err != nil {
		return Mechanics{}, err
	}
	switch {
	case lo > 0 && sideLo != 0:
		return Mechanics{}, complianceError(sideLo)
	case hi < 0 && side != 0:
		return Mechanics{}, complianceError(side)
	case lo > 0:
		return Mechanics{}, &ReadingError{Retake: "peak", Reason: fmt.Sprintf(
			"peak %.1f cmH2O is too close to the end pressure %.1f for this setting: the readings need a resistance below %g cmH2O/(L/s)", s.rd.PeakCmH2O, s.rd.EndCmH2O, FitRMin)}
	case hi < 0:
		return Mechanics{}, &ReadingError{Retake: "peak", Reason: fmt.Sprintf(
			"peak %.1f cmH2O is too far above the end pressure %.1f for this setting: the readings need a resistance above %g cmH2O/(L/s)", s.rd.PeakCmH2O, s.rd.EndCmH2O, FitRMax)}
	}
	lr, err := illinois(g, s.logRMin, s.logRMax, lo, hi)
	if err != nil {
		return Mechanics{}, err
	}
	lc, sd, err := s.complianceFor(lr)
	if err != nil {
		return Mechanics{}, err
	}
	if sd != 0 {
		return Mechanics{}, complianceError(sd)
	}
	f1, f2, err := s.residual(lc, lr)
	if err != nil {
		return Mechanics{}, err
	}
	if math.Abs(f1) > FitTolCmH2O || math.Abs(f2) > FitTolCmH2O {
		return Mechanics{}, &ReadingError{Retake: "peak", Reason: fmt.Sprintf(
			"no compliance and resistance reproduce peak %.1f and end %.1f cmH2O at this setting (closest C %.0f mL/cmH2O, R %.0f cmH2O/(L/s))",
			s.rd.PeakCmH2O, s.rd.EndCmH2O, math.Exp(lc), math.Exp(lr))}
	}
	return Mechanics{ComplianceMLPerCmH2O: math.Exp(lc), ResistanceCmH2OPerLS: math.Exp(lr)}, nil
}

// complianceError says that the readings need a compliance outside the
// plausible range, on side -1 (below) or +1 (above).
func complianceError(side int) error {
	if side < 0 {
		return &ReadingError{Retake: "end pressure", Reason: fmt.Sprintf(
			"the readings need a compliance below %g mL/cmH2O (plausible: %g-%g)", FitCMin, FitCMin, FitCMax)}
	}
	return &ReadingError{Retake: "end pressure", Reason: fmt.Sprintf(
		"the readings need a compliance above %g mL/cmH2O (plausible: %g-%g; a leak or a disconnection reads this way)", FitCMax, FitCMin, FitCMax)}
}

// illinois finds a root of f in [a, b], given fa = f(a) and fb = f(b) of
// opposite signs, by regula falsi with the Illinois halving (Dowell and
// Jarratt 1971): to |f| below 1e-10 or a bracket of 1e-12, at most 60
// evaluations of f.
func illinois(f func(float64) (float64, error), a, b, fa, fb float64) (float64, error) {
	side := 0
	x := a
	for range 60 {
		x = (a*fb - b*fa) / (fb - fa)
		if math.IsNaN(x) || x <= math.Min(a, b) || x >= math.Max(a, b) {
			x = (a + b) / 2
		}
		fx, err := f(x)
		if err != nil {
			return 0, err
		}
		if math.Abs(fx) < 1e-10 || math.Abs(b-a) < 1e-12 {
			return x, nil
		}
		if (fx > 0) == (fb > 0) {
			b, fb = x, fx
			if side == -1 {
				fa /= 2
			}
			side = -1
		} else {
			a, fa = x, fx
			if side == 1 {
				fb /= 2
			}
			side = 1
		}
	}
	return x, nil
}

// Plausible fitted mechanics are the ranges a person may enter (CMin-CMax,
// RMin-RMax): outside them the readings are more likely wrong than the lung.
const (
	FitCMin = CMin
	FitCMax = CMax
	FitRMin = RMin
	FitRMax = RMax
)
