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
	Iterations           int
}

// FitMechanics finds the compliance and resistance for which model gives
// both readings: two equations in two unknowns, solved by Newton's method
// on log C and log R (so both stay positive) from C 50 mL/cmH2O and R 10
// cmH2O/(L/s), with a finite-difference Jacobian and step halving; at most
// 60 steps. A fit outside FitCMin-FitCMax or FitRMin-FitRMax is refused as
// a *ReadingError. The end pressure mostly sets C (it is near the
// plateau), the gap between peak and end mostly sets R.
func FitMechanics(rd Readings, peepCmH2O float64, model PressureModel) (Mechanics, error) {
	for _, v := range []float64{rd.PeakCmH2O, rd.EndCmH2O, peepCmH2O} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Mechanics{}, &ReadingError{Retake: "both readings", Reason: fmt.Sprintf("reading %v is not a number", v)}
		}
	}
	switch {
	case rd.EndCmH2O <= peepCmH2O:
		return Mechanics{}, &ReadingError{Retake: "end pressure",
			Reason: fmt.Sprintf("end-inspiratory pressure %.1f cmH2O is not above PEEP %.1f: no lung takes the breath that way (leak or disconnection?)", rd.EndCmH2O, peepCmH2O)}
	case rd.PeakCmH2O < rd.EndCmH2O:
		return Mechanics{}, &ReadingError{Retake: "both readings",
			Reason: fmt.Sprintf("peak %.1f cmH2O is below the end pressure %.1f: the peak is the highest reading of the breath", rd.PeakCmH2O, rd.EndCmH2O)}
	}
	residual := func(lc, lr float64) (float64, float64, error) {
		p, e, err := model(math.Exp(lc), math.Exp(lr))
		if err != nil {
			return 0, 0, err
		}
		return p - rd.PeakCmH2O, e - rd.EndCmH2O, nil
	}
	// Start from a typical intubated adult lung, C 50 mL/cmH2O and R 10
	// cmH2O/(L/s) (from memory), whatever the readings are.
	lc, lr := math.Log(50), math.Log(10)
	f1, f2, err := residual(lc, lr)
	if err != nil {
		return Mechanics{}, err
	}
	const h = 1e-4
	for it := 1; it <= 60; it++ {
		norm := math.Hypot(f1, f2)
		if norm < 1e-6 {
			return checkFitted(Mechanics{math.Exp(lc), math.Exp(lr), it})
		}
		a1, a2, err := residual(lc+h, lr)
		if err != nil {
			return Mechanics{}, err
		}
		b1, b2, err := residual(lc, lr+h)
		if err != nil {
			return Mechanics{}, err
		}
		j11, j21 := (a1-f1)/h, (a2-f2)/h
		j12, j22 := (b1-f1)/h, (b2-f2)/h
		det := j11*j22 - j12*j21
		if det == 0 || math.IsNaN(det) {
			break
		}
		dc := -(j22*f1 - j12*f2) / det
		dr := -(-j21*f1 + j11*f2) / det
		// Damp: never move more than a factor e in one step, and halve the
		// step until the residual falls.
		if m := math.Max(math.Abs(dc), math.Abs(dr)); m > 1 {
			dc, dr = dc/m, dr/m
		}
		improved := false
		for k := 0; k < 20; k++ {
			nc, nr := lc+dc, lr+dr
			if nc < math.Log(0.5) || nc > math.Log(2000) || nr < math.Log(0.05) || nr > math.Log(2000) {
				dc, dr = dc/2, dr/2
				continue
			}
			g1, g2, err := residual(nc, nr)
			if err == nil && math.Hypot(g1, g2) < norm {
				lc, lr, f1, f2, improved = nc, nr, g1, g2, true
				break
			}
			dc, dr = dc/2, dr/2
		}
		if !improved {
			break
		}
	}
	return Mechanics{}, &ReadingError{Retake: "peak",
		Reason: fmt.Sprintf("no compliance and resistance reproduce peak %.1f and end %.1f cmH2O at this setting (closest C %.0f mL/cmH2O, R %.0f cmH2O/(L/s))",
			rd.PeakCmH2O, rd.EndCmH2O, math.Exp(lc), math.Exp(lr))}
}

// Plausible fitted mechanics are the ranges a person may enter (CMin-CMax,
// RMin-RMax): outside them the readings are more likely wrong than the lung.
const (
	FitCMin = CMin
	FitCMax = CMax
	FitRMin = RMin
	FitRMax = RMax
)

func checkFitted(m Mechanics) (Mechanics, error) {
	c, r := m.ComplianceMLPerCmH2O, m.ResistanceCmH2OPerLS
	switch {
	case c < FitCMin || c > FitCMax:
		return Mechanics{}, &ReadingError{Retake: "end pressure",
			Reason: fmt.Sprintf("the readings need a compliance of %.1f mL/cmH2O, outside %g-%g", c, FitCMin, FitCMax)}
	case r < FitRMin || r > FitRMax:
		return Mechanics{}, &ReadingError{Retake: "peak",
			Reason: fmt.Sprintf("the readings need a resistance of %.1f cmH2O/(L/s), outside %g-%g", r, FitRMin, FitRMax)}
	}
	return m, nil
}
