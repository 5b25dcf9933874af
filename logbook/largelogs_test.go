package logbook_test

import "flag"

// largeLogs makes the log tests read the large generated files they were
// written with (50 MB of junk, six messy logs of 400 records, three of
// 700): about ten seconds of CPU. By default they read smaller files of the
// same make-up, which exercise the same paths (every kind of damaged line,
// more problems than are kept, copies across logs); run
// go test ./setup -run 'Log|Stream|History' -logs.large before changing
// the readers.
var largeLogs = flag.Bool("logs.large", false, "log tests: read the large generated files")

// logSize is small by default and large under -logs.large.
func logSize(small, large int) int {
	if *largeLogs {
		return large
	}
	return small
}
