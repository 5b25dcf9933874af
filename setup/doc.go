// Package setup is the job itself. MakePlan takes a patient, targets and a
// machine profile and returns the crank hole to pin, the motor speed and
// dwell the controller can really be set to, every predicted figure, and the
// cautions that apply. RunCheck is the handover check: what the machine is
// set to and, when given, the manometer's peak and end-inspiratory readings
// (the lung is fitted to them, or FitProblem says which to re-take), with an
// optional proposed change evaluated beside it. Calibrate refits a profile's
// calibration from bench points; DescribeProfile and BreathTrace serve the
// machine and chart views. NewRecord makes the record of a check that
// package logbook keeps in the handover log; package report prints plans,
// checks and their handover cards from what this package returns.
// Cautions are computed here, in one place, from the figures; nothing that
// shows a plan or a check computes one.
//
// A handover check judges the manometer's readings on their own first
// (ReadingCautions: a measured peak above 40 cmH2O or the relief valve, an
// end reading at or below PEEP, a peak below the end reading are stops,
// whatever a lung model makes of them). When no lung explains the readings
// the check carries a readings-unexplained stop, its JSON and record print
// the current setting's lung figures as null (LungFiguresJSON withheld), and
// the reports have no lung figure to print and say so in their place; a proposal is still
// evaluated, on the assumed lung, and labelled so.
//
// The blood gas and the oximeter are judged the same way (GasCautions:
// oxygenation-low, oxygenation-high, ph-low, ph-high, and
// gas-readings-disagree, a stop for readings that cannot all be true,
// which the protocol step then does not read); they join the current
// setting's cautions, and the check carries P/F, S/F and the Berlin band
// with the FiO2 estimated from the oxygen bleed (OxygenationJSON).
//
// Units follow the names: cm, kg, mL, s, cmH2O, mL/cmH2O, cmH2O/(L/s), L/min
// for flows shown to people, rpm, N m. The ranges a person may enter are in
// package physiology (heights 130-230 cm, 4-10 mL/kg PBW, I:E 1:1 to 1:4,
// and so on).
//
// Bad input (a height out of range, an unknown sex, an invalid profile)
// returns an *InputError naming the field, the value and the accepted
// range; nothing here panics on data.
package setup
