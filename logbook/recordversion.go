package logbook

import (
	"fmt"
	"strings"

	"crankside/physiology"
	"crankside/setup"
)

// A record names the version of the record rules its writer kept (the
// "record" key), and the reader holds a line to that writer's rules and
// no further: a genuine record of an earlier program reads as it was
// written, and a line that claims a writer must hold what that writer
// always wrote. Everything that differs between versions is here: a new
// writer version adds a constant, a case to writerOf, and what it always
// writes to writerLacks and writerCautions.

const (
	// RecordV1 is every writer before the "record" key: lines without
	// it, from the first log on (commit f64a79f). Not every one of them
	// wrote the measured readings' cautions (measured-*), nor the STOP
	// level of tidal-volume-low, plateau-high and intrinsic-peep (both
	// from d080c21: before it a reading of 120 cmH2O was recorded without
	// measured-peak-high nor readings-unexplained, and those three were a
	// WARN at most), nor the
	// gas cautions (from e2df064; the gas readings were written from
	// 61369fa, a few commits before their cautions), nor the gas path
	// ("gas") and the timing check ("timing_check"). Its reader requires
	// the other cautions its figures call for (tidal volume, plateau,
	// predicted peak, intrinsic PEEP, rate), which every one of them
	// wrote, and the reader adds what it left out (withRecomputed).
	RecordV1 = 1
	// RecordV2 is the first writer to state its version: it writes every
	// caution its figures call for, the gas path, the timing check and,
	// when a lung explains the readings, the watch band.
	RecordV2 = 2
	// RecordV3 is the compact record (recordcompact.go): it leaves out
	// what the reader recomputes (the clinical caution, the withheld
	// figures' sentence, the setting's values repeated among its
	// figures), the watch band and the timing check (reproducible from
	// the entries on the profile; neither the ward nor a history shows
	// them) and every null; its rules are otherwise RecordV2's.
	RecordV3 = 3
	// RecordVersion is the version AppendRecord writes.
	RecordVersion = RecordV3
)

// writerOf is the writer version a record names (no key: RecordV1), or
// why no writer of this program's line could have written it.
func writerOf(r *setup.Record) (int, string) {
	switch v := r.WriterVersion; {
	case v == 0:
		return RecordV1, ""
	case v == RecordV2 || v == RecordV3:
		return v, ""
	case v > RecordVersion:
		return 0, fmt.Sprintf("record version %d is newer than this program reads (up to %d): read it with the crankside that wrote it, or a newer one", v, RecordVersion)
	default:
		return 0, fmt.Sprintf("record version %d was never written (the first writers wrote no \"record\" key; version %d is the first that did)", v, RecordV2)
	}
}

// writerLacks names what a record lacks of what its writer always wrote,
// beyond its cautions (cautionsProblem), or is "".
func writerLacks(r *setup.Record, version int) string {
	if version < RecordV2 {
		return ""
	}
	var lacks []string
	if r.Gas == nil {
		lacks = append(lacks, "gas")
	}
	if r.TimingCheck == nil && version == RecordV2 {
		lacks = append(lacks, "timing_check")
	}
	if r.Watch == nil && !r.Unexplained() && version == RecordV2 {
		lacks = append(lacks, "watch")
	}
	if len(lacks) == 0 {
		return ""
	}
	return fmt.Sprintf("%s, which a record version %d always has", strings.Join(lacks, ", "), version)
}

// writerCautions are the cautions of want (those the record's figures
// call for, figureCautions) that its writer always wrote, each at the
// least level it always wrote it at.
func writerCautions(version int, want []setup.Caution) []setup.Caution {
	if version >= RecordV2 {
		return want
	}
	var out []setup.Caution
	for _, c := range want {
		switch {
		case strings.HasPrefix(string(c.ID), "measured-") || setup.IsGasCaution(c.ID) || c.ID == setup.CautionReadingsUnexplained:
			continue
		case c.ID == setup.CautionTidalVolumeLow || c.ID == setup.CautionPlateauHigh || c.ID == setup.CautionIntrinsicPEEP:
			c.Level = min(c.Level, setup.Warn)
		}
		out = append(out, c)
	}
	return out
}

// withRecomputed adds to a record of an earlier writer the cautions its
// figures call for under this program's rules that its writer did not
// always write (writerCautions left them out) and it lacks, each saying
// so: a genuine old record reads, and one whose "record" key and STOP
// were both taken out still reads no calmer than its figures. The
// measured readings' cautions are the check's own (ReadingCautions), with
// their numbers; the others name the rule and the level.
func withRecomputed(r *setup.Record, version int) {
	if version >= RecordV2 {
		return
	}
	var measured []setup.Caution
	if rd := r.Readings; rd != nil {
		measured = setup.ReadingCautions(physiology.Readings{PeakCmH2O: rd.PeakCmH2O, EndCmH2O: rd.EndCmH2O}, r.Setting.PEEPCmH2O, 0)
	}
	var added []setup.Caution
	for _, want := range figureCautions(r) {
		if recordLevelOf(r.Cautions, want.ID) >= want.Level || recordLevelOf(added, want.ID) >= want.Level {
			continue
		}
		c := setup.Caution{ID: want.ID, Level: want.Level,
			Message: fmt.Sprintf("%s at %s: the record's figures call for it under this program's rules; its writer (before record version %d) did not write it", want.ID, want.Level, RecordV2),
			Advice:  "re-check the bed: this record is older than these rules",
			Source:  "recomputed on reading from the record's figures"}
		for _, m := range measured {
			if m.ID == want.ID && m.Level >= want.Level {
				c = m
				c.Source += "; recomputed on reading (the record's writer did not write it)"
			}
		}
		added = append(added, c)
	}
	r.Cautions = append(r.Cautions, added...)
}
