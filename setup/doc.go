// Package setup is the job itself. MakePlan takes a patient, targets and a
// machine profile and returns the crank hole to pin, the motor speed and
// dwell the controller can really be set to, every predicted figure, and the
// cautions that apply. RunCheck is the handover check: what the machine is
// set to and, when given, the manometer's peak and end-inspiratory readings
// (the lung is fitted to them, or FitProblem says which to re-take), with an
// optional proposed change evaluated beside it. Calibrate refits a profile's
// calibration from bench points; DescribeProfile and BreathTrace serve the
// machine and chart views. NewRecord, AppendRecord, ReadLog and History keep
// the log of checks (one JSON line each); WriteCard prints the handover card.
// Cautions are computed here, in one place, from the figures; nothing that
// shows a plan or a check computes one.
//
// A handover check judges the manometer's readings on their own first
// (ReadingCautions: a measured peak above 40 cmH2O or the relief valve, an
// end reading at or below PEEP, a peak below the end reading are stops,
// whatever a lung model makes of them). When no lung explains the readings
// the check carries a readings-unexplained stop, its JSON and record print
// the current setting's lung figures as null (LungFiguresJSON withheld), and
// the text and the card say so in their place; a proposal is still
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
//
// The handover log is one JSON line per check (crankside-check/1). It is
// opened only as the user's own regular file: never through a symbolic
// link, never a pipe or device (opened without blocking, then checked),
// never one others may read or write (CheckLogPath says why and how to
// fix it). Reading is a stream in bounded memory: a line over
// MaxRecordBytes is dropped as it is read, damaged lines are counted with
// the first MaxProblemsKept kept (LogSummary), and ReadBedHistory and
// WardRows read several logs or folders of logs, merged by time, a copied
// record counted once, decoding only the lines that may be shown.
package setup
