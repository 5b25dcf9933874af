// Package logbook is the handover log store: the rules a log file is
// opened by, its lock, the append of a record, the streamed read of one or
// several logs (or folders of them), a bed's history and the ward's rows
// (each bed's last check).
//
// The handover log is one JSON line per check (crankside-check/1, the
// setup.Record of a check). It is opened only as the user's own regular
// file: never through a symbolic link, never a pipe or device (opened
// without blocking, then checked), never one others may read or write
// (CheckLogPath says why and how to fix it). AppendRecord writes a record
// with one write under an exclusive lock, then syncs; an append that fails
// is cut back to the file's length before it.
//
// One set of rules for a record serves the writer and the reader
// (recordrules.go, recordkeys.go): a line the writer could not have written
// is damaged, never a bed's check. The level of a record is recomputed from
// its figures with package setup's limits, so logbook imports setup and
// never the reverse.
//
// Reading is a stream in bounded memory: a line over MaxRecordBytes is
// dropped as it is read, damaged lines are counted with the first
// MaxProblemsKept kept (LogSummary), and ReadBedHistory, ReadHistories and
// WardRows read several logs or folders of logs, merged by time, a copied
// record counted once, decoding only the lines that may be shown. Times
// are UTC (RFC 3339) in the log; a record more than FutureSkew ahead of
// now is kept apart, and checks of one bed from two logs within
// ConflictWindow are a conflict. Bad files return an error naming the
// path and what to do; nothing here panics on data.
package logbook
