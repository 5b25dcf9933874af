// Package machine computes the mechanical side of a motor-driven piston
// ventilator: exact slider-crank kinematics (in-line and offset), swept
// volume per crank hole, the delivery-stroke simulation (piston flow through
// the circuit's compliance into a resistance-compliance lung), motor timing
// with the controller's rounding, crank torque, and the bench calibration
// fit.
//
// Units at every exported boundary: lengths in cm, volumes in mL, time in s,
// angles in radians, pressure in cmH2O, flow in mL/s, compliance in
// mL/cmH2O, resistance in cmH2O/(L/s), force in N, torque in N m, motor speed
// in rpm.
//
// Valid ranges: a crank is usable only when rod > radius + |offset| and all
// three are finite with radius and rod positive (Crank.Validate says which
// is wrong). Simulation inputs must be positive and finite; Simulate returns
// an error otherwise and never panics on data. Passing a nil flow function is
// a programmer's mistake and panics.
//
// The package imports the standard library and gonum only.
package machine
