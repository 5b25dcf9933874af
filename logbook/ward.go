package logbook

import (
	"encoding/json"
	"fmt"
	"math"
	"sort"
	"time"

	"crankside/setup"
)

// WardRow is one bed's last check, as the ward view and `log beds` show it.
type WardRow struct {
	Bed        string
	CheckedAt  time.Time // the last check's time (UTC, to the second)
	AgeMinutes float64   // now - CheckedAt, to 0.1 min; negative for a record in the future
	ProfileID  string
	Hole       string  // the setting found on the machine at that check
	MotorRPM   float64 // rpm
	DwellS     float64 // s
	PEEPCmH2O  float64 // cmH2O, the PEEP valve

	// MLPerKg is the delivered mL per kg PBW at that setting; nil when the
	// lung's figures are withheld (no lung explains the readings).
	MLPerKg *float64
	// HighestLevel is the highest caution level of the setting found (0
	// when it had none).
	HighestLevel setup.Level
	Proposed     bool         // a change was proposed at that check
	Overdue      bool         // age strictly greater than the interval
	Source       string       // the log the record came from
	Record       setup.Record // the whole record, to start the next check from
	// Conflict is set when other logs hold a check of the bed within
	// ConflictWindow of this one (see wardRowOf): "conflict: two checks at
	// 14:05 UTC from a.jsonl and b.jsonl".
	Conflict string
	// FutureAt is the time of the bed's newest record dated more than
	// FutureSkew after now, from FutureLog; zero when there is none. It
	// never stands in place of the bed's newest real check.
	FutureAt  time.Time
	FutureLog string
}

type wardRowJSON struct {
	Bed          string  `json:"bed"`
	CheckedAt    string  `json:"checked_at"`
	AgeMinutes   float64 `json:"age_minutes"`
	ProfileID    string  `json:"profile_id"`
	Hole         string  `json:"hole"`
	MotorRPM     float64 `json:"motor_rpm"`
	DwellS       float64 `json:"dwell_s"`
	PEEPCmH2O    float64 `json:"peep_cmh2o"`
	HighestLevel string  `json:"highest_level"`
	Overdue      bool    `json:"overdue"`
	ProposalMade bool    `json:"proposal_made"`
	Log          string  `json:"log"`
	Conflict     string  `json:"conflict,omitempty"`
	FutureAt     string  `json:"future_record_at,omitempty"`
	FutureLog    string  `json:"future_record_log,omitempty"`

	MLPerKg *float64 `json:"ml_per_kg"` // null when the lung's figures are withheld

	// The patient's own numbers at that check: the gas and oximeter
	// readings, their cautions, and the oxygenation indices (null, and
	// an empty list, when none was entered).
	GasReadings  *setup.GasReadings `json:"gas_readings"`
	GasCautions  []setup.Caution    `json:"gas_cautions"`
	PFRatio      *float64           `json:"pf_ratio"`
	SFRatio      *float64           `json:"sf_ratio"`
	ARDSSeverity *string            `json:"ards_severity"`
}

// MarshalJSON writes the row with snake_case keys; checked_at is RFC 3339
// UTC and highest_level is "stop", "warn", "note" or "none".
func (r WardRow) MarshalJSON() ([]byte, error) {
	level := "none"
	if r.HighestLevel != 0 {
		level = r.HighestLevel.String()
	}
	future := ""
	if !r.FutureAt.IsZero() {
		future = r.FutureAt.UTC().Format(time.RFC3339)
	}
	j := wardRowJSON{Conflict: r.Conflict, FutureAt: future, FutureLog: r.FutureLog,
		Bed: r.Bed, CheckedAt: r.CheckedAt.UTC().Format(time.RFC3339), AgeMinutes: r.AgeMinutes,
		ProfileID: r.ProfileID, Hole: r.Hole, MotorRPM: r.MotorRPM, DwellS: r.DwellS, PEEPCmH2O: r.PEEPCmH2O,
		MLPerKg: r.MLPerKg, HighestLevel: level, Overdue: r.Overdue, ProposalMade: r.Proposed, Log: r.Source,
	}
	r.gasJSON(&j)
	return json.Marshal(j)
}

// urgency ranks a row for the ward view: stop, then overdue, then warn,
// then the rest.
func (r WardRow) urgency() int {
	switch {
	case r.HighestLevel == setup.Stop:
		return 0
	case r.Overdue:
		return 1
	case r.HighestLevel == setup.Warn:
		return 2
	}
	return 3
}

// NewWardRow makes a bed's row from its last record, under the bed's
// upper-case label (setup.BedKey). A check is overdue
// when its age is strictly greater than every: at exactly every it is
// due, not yet overdue.
func NewWardRow(rec setup.Record, source string, now time.Time, every time.Duration) WardRow {
	age := now.Sub(rec.Time)
	return WardRow{
		Bed: setup.BedKey(rec.Bed), CheckedAt: rec.Time.UTC(), AgeMinutes: math.Round(age.Minutes()*10) / 10,
		ProfileID: rec.ProfileID, Hole: rec.Setting.Hole, MotorRPM: rec.Setting.RPM, DwellS: rec.Setting.DwellS,
		PEEPCmH2O: rec.Setting.PEEPCmH2O, MLPerKg: wardMLPerKg(rec), HighestLevel: setup.Highest(rec.Cautions),
		Proposed: rec.Proposed != nil, Overdue: age > every, Source: source, Record: rec,
	}
}

// wardMLPerKg is the record's mL/kg PBW, nil when its lung figures are
// withheld.
func wardMLPerKg(rec setup.Record) *float64 {
	if rec.LungFiguresJSON == nil {
		return nil
	}
	v := rec.MLPerKg
	return &v
}

// SortWardRows puts the most urgent first (stop, overdue, warn, the
// rest); among beds of equal urgency, those whose blood gas or oximeter
// raised the more serious caution first (a WARN for a low SpO2 before a
// WARN every uncalibrated unit shows), then ward order (B2 before B10).
func SortWardRows(rows []WardRow) {
	sort.SliceStable(rows, func(i, j int) bool {
		if ui, uj := rows[i].urgency(), rows[j].urgency(); ui != uj {
			return ui < uj
		}
		if gi, gj := rows[i].gasLevel(), rows[j].gasLevel(); gi != gj {
			return gi > gj
		}
		return bedLess(rows[i].Bed, rows[j].Bed)
	})
}

// WardRows reads logs (files or folders of *.jsonl, see ExpandLogFolders)
// as a stream and returns one row per bed, from its newest record in any
// of them, most urgent first (see SortWardRows). every is the interval
// between checks: 0 means setup.DefaultCheckEvery; a negative one is refused.
//
// Each line's format, bed and time are read off its first keys without
// decoding it (lineHeader); only the lines that can decide a row are
// decoded and held to the writer's rules (see wardscan.go): each bed's
// newest lines, those within ConflictWindow of its newest good one, and
// its newest from the future. A damaged line is therefore counted in the
// summary when it is one of those (or has no record shape), not when it
// lies further back behind a good newer record of its bed (the bed its
// first "bed" key names). When the lines held cannot tell a row, the
// whole read is done again decoding every line. summary.Records counts
// the lines that look like records; a copy of a record is counted once
// only among the lines decoded. More files than the limit
// (DefaultMaxFiles, or MaxFiles) is a *TooManyFilesError before any is
// read; WithProgress notes how far the read has got.
func WardRows(paths []string, now time.Time, every time.Duration, opts ...ReadOption) ([]WardRow, LogSummary, error) {
	if every < 0 {
		return nil, LogSummary{}, &setup.InputError{Field: "every", Reason: fmt.Sprintf("%v: the interval between checks must be positive", every)}
	}
	if every == 0 {
		every = setup.DefaultCheckEvery
	}
	c := configOf(opts)
	files, _, err := expandLogPaths(paths, false, c)
	if err != nil {
		return nil, LogSummary{}, err
	}
	rows, sum, exact, err := wardRowsScan(files, now, every, c.progress)
	if err != nil {
		return nil, sum, err
	}
	if !exact {
		return wardRowsDecodingAll(files, now, every, c.progress)
	}
	SortWardRows(rows)
	return rows, sum, nil
}

// wardRowsDecodingAll is the slow, exact way: every line decoded.
func wardRowsDecodingAll(files []string, now time.Time, every time.Duration, p *Progress) ([]WardRow, LogSummary, error) {
	var sum LogSummary
	h := newHistoryReader("", wardKeep, &sum)
	h.progress = p
	h.ahead, h.window = now.Add(FutureSkew), ConflictWindow
	if err := h.readFiles(files); err != nil {
		return nil, sum, err
	}
	beds := map[string]bool{}
	for b := range h.byBed {
		beds[b] = true
	}
	for b := range h.future {
		beds[b] = true
	}
	rows := make([]WardRow, 0, len(beds))
	for b := range beds {
		items := newestWithin(h.byBed[b], h.keep, ConflictWindow)
		var good []wardItem
		for i := len(items) - 1; i >= 0; i-- {
			good = append(good, wardItem{rec: items[i].rec, log: items[i].log, line: items[i].line, key: items[i].key})
		}
		var fut *wardItem
		if f, ok := h.future[b]; ok {
			fut = &wardItem{rec: f.rec, log: f.log, line: f.line, key: f.key}
		}
		rows = append(rows, wardRowOf(good, fut, now, every))
	}
	SortWardRows(rows)
	return rows, sum, nil
}

// wardKeep is how many of a bed's newest lines are held, in case the
// newest turns out damaged.
const wardKeep = 3

type wardCandidate struct {
	at     time.Time
	log    string
	logIdx int
	line   int
	text   []byte
}

func (a wardCandidate) before(b wardCandidate) bool {
	return orderBefore(a.at, a.log, a.line, b.at, b.log, b.line)
}

// decodedHeader decodes only a record's format, time and bed.
func decodedHeader(text []byte) (bed string, at time.Time, ok bool) {
	var h struct {
		Format string    `json:"format"`
		Time   time.Time `json:"time"`
		Bed    string    `json:"bed"`
	}
	if err := json.Unmarshal(text, &h); err != nil || h.Format != setup.RecordFormat {
		return "", time.Time{}, false
	}
	return h.Bed, h.Time, true
}
