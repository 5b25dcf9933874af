// Package profiles owns the machine profile file: the version 1 JSON format
// ("crankside-profile/1"), its strict parsing and validation, atomic saving,
// the demo profiles embedded in the binary, and where profiles are looked
// for.
//
// Units are those the field names carry: cm, N, N m, rpm, s, mL/cmH2O,
// cmH2O/(L/s), cmH2O, mL.
//
// Parsing refuses, with the field's path, the value and what is allowed:
// files over 1 MiB, JSON syntax errors (with line and column), unknown
// fields, duplicate keys, nesting deeper than the format has, missing
// required fields, wrong types, non-positive or implausible sizes, duplicate
// hole labels, a rod not longer than the largest radius plus the offset,
// min_rpm above max_rpm, and calibration points naming no hole. No function
// here panics on file contents.
package profiles
