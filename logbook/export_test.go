package logbook

import "crankside/setup"

// EncodeRecordLine is a record's line as AppendRecord writes it (the
// writer of RecordVersion), for tests that write logs directly.
func EncodeRecordLine(rec setup.Record) ([]byte, error) { return encodeRecordLine(rec) }
