package machine

import (
	"fmt"
	"math"
)

// Crank is a slider-crank: the pin at RadiusCm from the wheel's centre, a
// connecting rod of RodCm, and the piston's line OffsetCm from the centre
// (0 for an in-line crank). Angle theta is measured from the line of the
// piston, increasing in the direction the wheel turns.
type Crank struct {
	RadiusCm float64
	RodCm    float64
	OffsetCm float64
}

// Validate reports why a crank cannot turn: the rod must be longer than the
// radius plus the offset, or the rod would have to stretch.
func (c Crank) Validate() error {
	for _, v := range []float64{c.RadiusCm, c.RodCm, c.OffsetCm} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("machine: crank dimension %v is not finite", v)
		}
	}
	if c.RadiusCm <= 0 || c.RodCm <= 0 {
		return fmt.Errorf("machine: crank radius %g cm and rod %g cm must be positive", c.RadiusCm, c.RodCm)
	}
	if c.RodCm <= c.RadiusCm+math.Abs(c.OffsetCm) {
		return fmt.Errorf("machine: rod %g cm must be longer than radius %g cm + |offset| %g cm", c.RodCm, c.RadiusCm, math.Abs(c.OffsetCm))
	}
	return nil
}

// Motion is the piston pin's distance from the wheel's centre along the
// piston's line, x = r cos(theta) + sqrt(L^2 - (r sin(theta) - e)^2) in cm,
// and its rate dx/dtheta in cm/rad, from the sine and cosine of the crank
// angle: the one place the simulation gets the piston's motion from (it
// carries sin and cos forward by rotation rather than recomputing them).
func (c Crank) Motion(sin, cos float64) (xCm, dxDThetaCm float64) {
	s := c.RadiusCm*sin - c.OffsetCm
	w := math.Sqrt(c.RodCm*c.RodCm - s*s)
	return c.RadiusCm*cos + w, -c.RadiusCm*sin - s*c.RadiusCm*cos/w
}

// DeadCentres returns the crank angles of the bottom dead centre (piston
// nearest the wheel) and of the next top dead centre (farthest), with
// bottom in [0, 2 pi) and top in (bottom, bottom + 2 pi). At the dead
// centres crank and rod are in line.
func (c Crank) DeadCentres() (bottom, top float64) {
	r, l, e := c.RadiusCm, c.RodCm, c.OffsetCm
	top = math.Asin(e / (l + r))
	bottom = math.Pi + math.Asin(e/(l-r))
	for top <= bottom {
		top += 2 * math.Pi
	}
	return bottom, top
}

// DeliveryAngle is the crank angle the piston turns through from the bottom
// to the top dead centre: pi for an in-line crank, less or more with an offset.
func (c Crank) DeliveryAngle() float64 {
	b, t := c.DeadCentres()
	return t - b
}

// topCm is the piston's position at the top dead centre, x_max.
func (c Crank) topCm() float64 {
	r, l, e := c.RadiusCm, c.RodCm, c.OffsetCm
	return math.Sqrt((l+r)*(l+r) - e*e)
}

// StrokeCm is x_max - x_min: 2r for an in-line crank.
func (c Crank) StrokeCm() float64 {
	r, l, e := c.RadiusCm, c.RodCm, c.OffsetCm
	return math.Sqrt((l+r)*(l+r)-e*e) - math.Sqrt((l-r)*(l-r)-e*e)
}

// TorqueNm is the crank torque needed to push the piston with forceN
// where the piston moves dxDThetaCm per radian of crank: -F dx/dtheta, with
// dx/dtheta in m/rad. By virtual work this equals F r sin(theta + phi) /
// cos(phi) (Norton, Design of Machinery); the stroke simulation uses it for
// every step.
func TorqueNm(forceN, dxDThetaCm float64) float64 {
	return -forceN * dxDThetaCm / 100
}

// BoreAreaCm2 is the piston's area for a bore diameter in cm.
func BoreAreaCm2(boreCm float64) float64 { return math.Pi * boreCm * boreCm / 4 }

// SweptVolumeML is bore area times stroke (1 cm^3 = 1 mL).
func SweptVolumeML(boreCm float64, c Crank) float64 {
	return BoreAreaCm2(boreCm) * c.StrokeCm()
}
