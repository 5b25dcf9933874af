// Package setup is the job itself. Plan takes a patient, targets and a
// machine profile and returns the crank hole to pin, the motor speed and
// dwell the controller can really be set to, every predicted figure, and the
// cautions that apply. Cautions are computed here, in one place, from the
// figures; nothing that shows a plan computes one.
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
