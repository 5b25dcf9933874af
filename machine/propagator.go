package machine

import "math"

// prop is the exact one-step map of the version 2 model with its
// compliances frozen over the step:
//
//	Ct dp/dt = w - (p - v/Cl)/R - G p,   dv/dt = (p - v/Cl)/R,
//
// p the circuit pressure above PEEP, v the lung volume, Ct the circuit's
// (and cylinder gas's) compliance, Cl the lung's, G the leak conductance and
// w(t) = w0 + d t the piston flow less the leak's share at PEEP (G x PEEP),
// linear across the step. The 2x2 system matrix M always has two distinct
// real eigenvalues (its discriminant is (m00 - m11)^2 + 4 m01 m10 > 0), so
// exp(Mh) and the input integrals are the scalar functions at the
// eigenvalues, combined by divided differences (Sylvester's formula). It
// is the same exact step as version 1's stepper, in closed form, so that a
// new compliance costs a few exponentials rather than a matrix
// exponential.
type prop struct {
	pp, pv, pw, pd float64 // new p from p, v, w0 and the slope d
	vp, vv, vw, vd float64
	h              float64
}

func newProp(ct, rML, cl, g, h float64) prop {
	a := 1 / ct
	m00, m01 := -a*(1/rML+g), a/(rML*cl)
	m10, m11 := 1/rML, -1/(rML*cl)
	tr, det := m00+m11, m00*m11-m01*m10
	sq := math.Sqrt((m00-m11)*(m00-m11) + 4*m01*m10)
	l1 := (tr - sq) / 2 // the fast eigenvalue; tr < 0 so no cancellation
	l2 := det / l1      // the slow one, 0 when there is no leak
	// f(M) = f(l2) I + f[l1, l2] (M - l2 I) for each scalar function f:
	// the exponential, its integral over the step (h phi1) and the ramp's
	// integral (h^2 phi2).
	// Each eigenvalue needs one expm1: e^x, phi1 and phi2 all come from it.
	x1, x2, dl := l1*h, l2*h, l1-l2
	m1, m2 := math.Expm1(x1), math.Expm1(x2)
	e2, i2, r2 := m2+1, h*phi1(x2, m2), h*h*phi2(x2, m2)
	ed := (m1 - m2) / dl
	id := (h*phi1(x1, m1) - i2) / dl
	rd := (h*h*phi2(x1, m1) - r2) / dl
	// Only the first column of the input integrals matters: w enters dp/dt as a w.
	return prop{
		pp: e2 + ed*(m00-l2), pv: ed * m01, pw: a * (i2 + id*(m00-l2)), pd: a * (r2 + rd*(m00-l2)),
		vp: ed * m10, vv: e2 + ed*(m11-l2), vw: a * id * m10, vd: a * rd * m10,
		h: h,
	}
}

// phi1 is (e^x - 1)/x, 1 at x = 0, from em = e^x - 1 (math.Expm1).
func phi1(x, em float64) float64 {
	if x == 0 {
		return 1
	}
	return em / x
}

// phi2 is (e^x - 1 - x)/x^2, 1/2 at x = 0, from em = e^x - 1; a series
// near 0 where the difference would cancel (the first omitted term is
// below 1e-12).
func phi2(x, em float64) float64 {
	if math.Abs(x) < 0.05 {
		return 1.0/2 + x*(1.0/6+x*(1.0/24+x*(1.0/120+x*(1.0/720+x/5040))))
	}
	return (em - x) / (x * x)
}

func (s *prop) advance(p, v, w0, w1 float64) (float64, float64) {
	d := (w1 - w0) / s.h
	return s.pp*p + s.pv*v + s.pw*w0 + s.pd*d,
		s.vp*p + s.vv*v + s.vw*w0 + s.vd*d
}

// propCache keeps the step a version 2 stroke reuses while the lung,
// circuit, leak and step stay the same: the step with the circuit's
// compliance alone.
type propCache struct {
	ok                bool
	cc, rML, cl, g, h float64
	e                 prop
}

func (pc *propCache) get(cc, rML, cl, g, h float64) *prop {
	if !pc.ok || pc.cc != cc || pc.rML != rML || pc.cl != cl || pc.g != g || pc.h != h {
		pc.e = newProp(cc, rML, cl, g, h)
		pc.ok, pc.cc, pc.rML, pc.cl, pc.g, pc.h = true, cc, rML, cl, g, h
	}
	return &pc.e
}
