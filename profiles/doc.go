// Package profiles owns the machine profile file: the JSON format (version
// 3, "crankside-profile/3", which also reads version 1 and 2 files), its strict
// parsing and validation, guarded saving, the demo profiles embedded in the
// binary, and where profiles are looked for.
//
// Units are those the field names carry: cm, N, N m, rpm, s, mL/cmH2O,
// cmH2O/(L/s), cmH2O, mL, L/min.
//
// # Versions
//
// Version 2 adds two optional fields: cylinder.clearance_cm (default
// DefaultClearanceCm, 1.0 cm) and circuit.leak_l_min_at_20_cmh2o (default
// 0). When a file leaves one out, Parse fills the default and lists the
// field's path in Profile.Defaults, so that a summary can say a default was
// used. A file that says "crankside-profile/1" and has either field is
// refused (the field belongs to version 2; change the format line), rather
// than read as version 1 with the field dropped. Version 3 adds the
// optional oxygen.max_flow_l_min (default DefaultMaxO2FlowLMin, 15 L/min:
// ordinary flowmeters, common practice), refused the same way in a version
// 1 or 2 file. Marshal and Save always write version 3 with every field
// written out. Every earlier key keeps its meaning.
//
// # What is refused
//
// Parsing refuses, with the field's path, the value and what is allowed:
// files over 1 MiB, bytes that are not UTF-8, JSON syntax errors (with line
// and column), unknown fields, duplicate keys, nesting deeper than the
// format has, missing required fields, wrong types, duplicate hole labels,
// a rod not longer than the largest radius plus the offset, min_rpm above
// max_rpm, and calibration points naming no hole. Sizes outside what a
// home-built adult unit could plausibly have are refused with the accepted
// range (engineering judgement, see validate.go): bore 3-30 cm, rod 2-100
// cm, hole radii 0.2-20 cm, offset -20 to 20 cm, clearance 0.1-10 cm, ring
// friction 0-500 N, circuit compliance 0.1-10 mL/cmH2O, expiratory
// resistance 0-50 cmH2O/(L/s), relief 10-80 cmH2O, leak 0-30 L/min at 20
// cmH2O. The id, the label and every hole label refuse control characters,
// bidirectional controls and invisible characters (as safetext defines
// them), naming the character and its position, e.g.
// "crank.holes[3].label: contains an invisible character U+200B at
// position 2".
//
// A UTF-8 byte order mark (EF BB BF) at the very start of a file is
// accepted and skipped, as Windows editors write one; anywhere else it is
// a JSON syntax error.
//
// Warnings lists what is valid but deserves a second look: hole labels that
// are easy to confuse (I, l and 1; O and 0; labels differing only in case)
// and labels with spaces at either end. HoleByLabelFold finds a hole as a
// person types it: the exact label, else the one label equal ignoring case.
//
// # Saving
//
// Save, SaveWithBackup and their IfUnchanged forms validate first, write a
// temporary file in the same folder, sync it and rename it over the old
// file, so a crash leaves the old file or the new one. They refuse a path
// that is a symbolic link (naming the real file to use instead) or not a
// regular file; keep the old file's mode for the new file and for the .bak;
// hold an exclusive flock on path + ".lock" (created 0600; no lock where
// flock does not exist); and remove temporary files of their own naming
// older than 10 minutes. SaveIfUnchanged and SaveWithBackupIfUnchanged take
// the Stamp (size, modification time, SHA-256) that ReadFileStamped
// returned and refuse, writing nothing, when the file is no longer those
// bytes; the error wraps ErrChanged.
//
// # Finding profiles
//
// Open opens a path directly, or a built-in demo's id without reading the
// profiles folder at all (so a built-in id always opens the built-in), or
// another id as dir/ID.json first and only then by reading every *.json
// file in dir. List reads and parses each file once; a broken file, a
// FIFO, a device or an oversized file is listed with its error after at
// most MaxFileBytes read, without blocking and without hiding the others.
//
// # Text from files in messages
//
// Every Error() string of this package, Source.String and
// Entry.DisplayName pass text from files (paths, keys, values) through
// safetext.Escape, so a file name or a key holding an escape sequence is
// shown escaped and never acts on the terminal. Entry.ID, Entry.FileName and
// Source.Path stay raw for opening files; print them through safetext.
//
// No function here panics on file contents.
package profiles
