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
// is wrong). Lung compliance and resistance, circuit compliance and the
// duration must be positive and finite, PEEP and the start volume finite;
// Simulate and SimulateStroke return an error wrapping ErrBadBreath otherwise
// and never panic on data. Passing neither a flow function nor flow samples,
// or a number of samples that does not match StepGrid, is a programmer's
// mistake and panics. FitCalibration returns an error wrapping
// ErrCalibration for no points or a point it cannot use.
//
// The package imports the standard library and gonum only.
package machine
