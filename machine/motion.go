package machine

// motion is what a stroke's piston does on its time grid, whatever the lung:
// dx/dtheta, the piston's position and its flow at every grid point, the
// displacement over the stroke and the highest piston flow. A fit runs
// the same stroke for many trial lungs; the Simulator keeps the motion of
// its last strokes (motionCache) so that none of it is computed again.
type motion struct {
	dx, x, flows []float64
	// pistonML is the trapezoidal sum of flows over the grid: the piston's
	// effective displacement (version 2's GasOutcome.PistonML).
	pistonML float64
	// peakFlow is the highest of 0 and every flow on the grid (what the
	// stroke reports as the peak piston flow).
	peakFlow float64
}

// motionEntry is one stroke's motion, keyed on everything it depends on:
// the stroke (crank, bore, speed, calibration scale) and the number of
// steps (the step is the stroke's duration over that number, so the two
// fix it). The zero entry matches no stroke the Simulator runs (a stroke's
// bore and speed are positive).
type motionEntry struct {
	stroke Stroke
	n      int
	m      motion
}

// motionCache keeps the motion of the two strokes run last: a check
// fits its readings at the model's step and the corners of the
// manometer's step at a coarser one, on the same stroke.
type motionCache struct {
	e    [2]motionEntry
	last int // the entry used last
}

// get returns the motion of stroke s (kinematics k) on n steps of h,
// computing it only when neither entry holds it (then in place of the one
// used less recently). The motion's slices belong to the cache: they are
// valid until a later get computes into the same entry.
func (mc *motionCache) get(s Stroke, k *kinematics, n int, h float64) *motion {
	for i := range mc.e {
		if e := &mc.e[i]; e.stroke == s && e.n == n {
			mc.last = i
			return &e.m
		}
	}
	mc.last = 1 - mc.last
	e := &mc.e[mc.last]
	m := &e.m
	if cap(m.dx) < n+1 {
		m.dx, m.x, m.flows = make([]float64, n+1), make([]float64, n+1), make([]float64, n+1)
	}
	m.dx, m.x, m.flows = m.dx[:n+1], m.x[:n+1], m.flows[:n+1]
	k.fillMotion(m.dx, m.x, h)
	m.peakFlow = 0
	for i, d := range m.dx {
		q := k.flowPerDxDTheta * d
		m.flows[i] = q
		if q > m.peakFlow {
			m.peakFlow = q
		}
	}
	m.pistonML = 0
	for i := 1; i <= n; i++ {
		m.pistonML += (m.flows[i-1] + m.flows[i]) / 2 * h
	}
	e.stroke, e.n = s, n
	return m
}
