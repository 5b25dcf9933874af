// Package profiles owns the machine profile file: the version 1 JSON format
// ("crankside-profile/1"), its strict parsing and validation, atomic saving
// (Save, and SaveWithBackup, which keeps the old file as .bak), reading a
// bench CSV of calibration measurements (ReadBench, every bad line reported
// with its number), the invented demo profiles embedded in the binary, and
// where profiles are looked for (Open by id or path, List of a directory).
//
// Units are those the field names carry: cm, N, N m, rpm, s, mL/cmH2O,
// cmH2O/(L/s), cmH2O, mL.
//
// Parsing refuses, with the field's path, the value and what is allowed:
// files over 1 MiB, JSON syntax errors (with line and column), unknown
// fields, duplicate keys, nesting deeper than the format has, missing
// required fields, wrong types, non-positive or implausible sizes, duplicate
// hole labels, a rod not longer than the largest radius plus the offset,
// min_rpm above max_rpm, more than MaxHoles holes or MaxBenchPoints bench
// points, and calibration points naming no hole or a speed the motor cannot
// run. No function here panics on file contents.
package profiles
