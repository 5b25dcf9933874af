// Package report turns what package setup computed into what people read:
// the text of a plan and of a check (PlanText, CheckText), the handover
// card of a record (WriteCard, at most CardWidth columns), the bedside
// sheet (PlanSheet, CheckSheet), the calibration and profile summaries,
// one line per recorded check (HistoryLine, ProposalLine) and per bed of
// the ward (WardLine), and the rows every screen draws its figures from
// (FigureRows, SettingRows): a figure is formatted, and a difference
// computed, in one place only.
//
// Nothing here computes a clinical figure: every number comes from setup's
// results or from a record's JSON body (setup.CheckJSON), so the card of a
// check just made and of the same check read back from the log are one
// text. The figures that depend on the lung are read only from
// setup.LungFiguresJSON; when no lung explains a check's readings that
// struct is nil and the reports say so in place of the figures. Every
// number carries its unit; a setting with a stop is never under a heading
// that says to set it (SettingHeading); levels are words (STOP, WARN,
// NOTE). The JSON objects of --json stay in setup (PlanJSON, CheckJSON),
// since a log record is a check's JSON body and package logbook, below
// this one, reads it.
//
// Times a person reads are local with their zone (setup.LocalDateTime).
// Writers return the io.Writer's error; nothing here panics on data.
package report
