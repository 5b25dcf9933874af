package machine

// motion is what a stroke's piston does on its time grid, whatever the lung:
// dx/dtheta, the piston's position and its flow at every grid point, the
// displacement over the stroke and the highest piston flow. A fit runs
// the same stroke for many trial lungs; the Simulator keeps the last
// stroke's motion (motionCache) so that none of it is computed again.
type motion struct {
	dx, x, flows []float64
	// pistonML is the trapezoidal sum of flows over the grid: the piston's
	// effective displacement (version 2's GasOutcome.PistonML).
	pistonML float64
	// peakFlow is the highest of 0 and every flow on the grid (what
	// torqueTrack reported as the peak piston flow, grid point by grid point).
	peakFlow float64
}

// motionCache is the last stroke's motion, keyed on everything it depends
// on: the stroke (crank, bore, speed, calibration scale) and the number of
// steps (the step is the stroke's duration over that number, so the two
// fix it).
type motionCache struct {
	ok     bool
	stroke Stroke
	n      int
	m      motion
}

// get returns the motion of stroke s (kinematics k) on n steps of h,
// computing it only when the stroke or the grid changed. The motion's
// slices belong to the cache: they are valid until the next get.
func (mc *motionCache) get(s Stroke, k *kinematics, n int, h float64) *motion {
	if mc.ok && mc.stroke == s && mc.n == n {
		return &mc.m
	}
	m := &mc.m
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
	mc.ok, mc.stroke, mc.n = true, s, n
	return m
}
