// Package machine computes the mechanical side of a motor-driven piston
// ventilator: exact slider-crank kinematics (in-line and offset), swept
// volume per crank hole, the delivery-stroke simulation (piston flow through
// the circuit's compliance into a resistance-compliance lung), motor timing
// with the controller's rounding, crank torque, and the bench calibration
// fit.
//
// Version 2 (StrokeInput.Gas, a GasPath; its zero value is version 1
// exactly): the lung seen from the room side at C / F for a BTPS factor F,
// with volumes reported at body conditions; the cylinder's own gas, first
// compressed from the room's pressure to the circuit's before the outlet
// valve opens, then a Boyle compliance Cg(t) = bore area x (head - x) /
// barometric in parallel with the circuit's; a leak linear in the circuit
// pressure; and a relief valve that holds the circuit at its pressure and
// vents the excess. FitCalibrationWithLeak fits the leak with k and b when
// the bench spans test lungs a factor 2 apart in compliance.
//
// A Simulator keeps the last exact step and its buffers between strokes;
// it is for one goroutine at a time.
//
// Units at every exported boundary: lengths in cm, volumes in mL, time in s,
// angles in radians, pressure in cmH2O, flow in mL/s, compliance in
// mL/cmH2O, resistance in cmH2O/(L/s), force in N, torque in N m, motor speed
// in rpm; leaks in L/min at 20 cmH2O (as on a profile).
//
// Valid ranges: a crank is usable only when rod > radius + |offset| and all
// three are finite with radius and rod positive (Crank.Validate says which
// is wrong). Simulation inputs must be positive and finite; the GasPath's
// fields zero or positive and finite, the head beyond the hole's top dead
// centre and the relief above PEEP. SimulateStroke and Simulator's
// SimulateStroke return an error wrapping ErrBadBreath otherwise and never
// panic on data. Crank.Motion is the one source of the piston's position and
// dx/dtheta, and TorqueNm of the crank torque, for the simulation and the
// tests alike. FitCalibration
// returns an error wrapping ErrCalibration for no points or a point it
// cannot use.
//
// The package imports the standard library and gonum only.
package machine
