package cli

import (
	"fmt"
	"io"
	"strings"
	"time"

	"crankside/logbook"
	"crankside/profiles"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

var checkUsage = []string{
	"check --height-cm N --sex male|female --hole LABEL --rpm N --dwell-s N [flags]",
	"check --height-cm N --sex male|female --hole LABEL --turn-s N --pause-s N [flags]",
}

const checkLong = `Shift handover: what the machine is set to and what the manometer reads ->
the readings judged, what the patient really gets, the lung mechanics the
readings imply, a proposed change side by side, and a record appended to
the log. With a blood gas or oximeter reading (--spo2, --pao2, --ph,
--paco2) the check also gives the ARDS Network protocol's next step on this
machine and, unless a --propose-* is given (which is then evaluated
instead, and said so), evaluates it as the proposal. No patient name or other identifier is ever stored: only a bed
label. A decimal comma is read as a decimal point (0,9 is 0.9).

A unit with no speed display is checked by stopwatch: --turn-s (one turn
timed) in place of --rpm, and --pause-s (the pause timed) or
--breaths-per-min (counted over a minute) in place of --dwell-s. The check
runs at the speed and dwell these imply, rounds nothing measured, and says
what it inferred and the nearest dial steps.

` + exitStatusHelp + `
Flags:
`

var checkCommand = &Command{
	Name:  "check",
	Usage: checkUsage,
	Short: "shift handover: what the patient gets now",
	Run:   runCheck,
}

// checkOptions are the flags a check reads itself: where to record, and
// how to print.
type checkOptions struct {
	profile, dir, bed, initials, second, logPath func() string
	asJSON, card, sheet                          func() bool
	every                                        func() string
}

func checkFlagSet() (*flags, checkOptions) {
	f := newFlags("check", help(checkUsage, checkLong))
	f.sharedEntries()
	f.entry("hole", "the hole the pin is in (required)")
	f.entry("rpm", "the motor speed set (required, or --turn-s)")
	f.entry("dwell-s", "the dwell set, in s: the motor's stop after each turn (required, or --pause-s or --breaths-per-min)")
	f.entry("turn-s", "a unit with no speed display: one turn of the wheel timed with a stopwatch, s (0.5-30), in place of --rpm")
	f.entry("pause-s", "the pause after each turn timed, s (0-30), in place of --dwell-s")
	f.entry("breaths-per-min", "breaths counted in one minute (4-60), with the turn: in place of --dwell-s")
	f.entry("peep", "the PEEP valve, cmH2O (default 5)")
	f.entry("o2-lpm", "oxygen bled into the intake, L/min (default 0)")
	f.entry("peak", "manometer peak during delivery, cmH2O, 0-150 (with --end-pressure)")
	f.entry("end-pressure", "manometer reading when the piston stops, cmH2O, 0-150 (with --peak)")
	f.entry("lung", "lung condition for the assumed mechanics: normal, ards or obstructive")
	f.entry("compliance", "assumed compliance when no readings are given (not used when the readings give the lung)")
	f.entry("resistance", "assumed resistance when no readings are given (not used when the readings give the lung)")
	f.entryBool("breathing-against", "the patient is breathing against the unit (a stop: this unit cannot follow the patient's breaths)")
	f.entry("pressure-unit", "the manometer's unit for --peak, --end-pressure, --manometer-step, --peep, --propose-peep: cmh2o (default), hpa or mbar (1 hPa = 1 mbar = 1.01972 cmH2O)")
	f.entry("gas-unit", "the unit of --pao2 and --paco2: mmhg (default) or kpa (1 kPa = 7.50062 mmHg)")
	f.entry("manometer-step", "the manometer's resolution in cmH2O (0.1-5; default 1, common practice): readings are +/- half a step")
	f.entry("propose-hole", "a proposed hole")
	f.entry("propose-rpm", "a proposed motor speed")
	f.entry("propose-dwell-s", "a proposed dwell")
	f.entry("propose-peep", "a proposed PEEP")
	f.entry("propose-o2-lpm", "a proposed oxygen flow, L/min")
	f.entry("spo2", "SpO2 %, for the protocol's oxygenation goal 88-95 % (ARDS Network)")
	f.entry("pao2", "PaO2 in mmHg (or --gas-unit kpa), for the oxygenation goal 55-80 mmHg; decides over SpO2")
	f.entry("ph", "arterial pH, for the pH goal 7.30-7.45 (with --paco2)")
	f.entry("paco2", "PaCO2 in mmHg (or --gas-unit kpa), with --ph: the new rate holds the bicarbonate")
	f.entry("dead-space-ml", "apparatus dead space (tube, filter, connectors), mL (default 0)")
	f.entryBoolDefault("hold-alveolar-ventilation", "true", "when the protocol moves Vt, scale the rate to hold rate x (Vt - dead space): this tool's own rule, not the card's; =false switches it off")
	var o checkOptions
	o.profile = f.text("profile", profiles.DefaultID, "machine profile: an id or a path to a .json file")
	o.dir = f.text("profiles", profiles.DefaultDir(), "directory of profile files")
	o.bed = f.text("bed", "", "bed label for the record, like B4 (never a patient's name)")
	o.initials = f.text("initials", "", "the checking operator's initials, for the record (recommended)")
	o.second = f.text("second-initials", "", "a second checker's initials, for a change checked by two (with --initials)")
	o.logPath = f.text("log", "", "append the check to this log file (one JSON line; with --bed)")
	o.card = f.boolean("card", "print a handover card (plain text, 80 columns; not with --json)")
	o.sheet = f.boolean("sheet", "print the bedside sheet (one page, 80 columns): the setting, what to time, the watch band, the alarm limits, the power-cut rhythm, the checklist; with --bed and --log, the next check due")
	o.every = f.text("every", "", "hours between checks, for the sheet's next check due (default 4, common practice)")
	o.asJSON = f.boolean("json", "print one JSON object")
	return f, o
}

// recordProblem is what is wrong with the record's own flags, or "".
func (o checkOptions) recordProblem() string {
	bed, initials, logPath, card := o.bed(), o.initials(), o.logPath(), o.card()
	switch {
	case (initials != "" || o.second() != "") && logPath == "" && !card:
		return "--initials and --second-initials are for the record: add --log FILE or --card"
	case bed != "" && logPath == "" && !card && !o.sheet():
		return "--bed is for the record or the sheet: add --log FILE, --card or --sheet"
	case o.second() != "" && initials == "":
		return "--second-initials goes with --initials (the first checker's)"
	case logPath != "" && bed == "":
		return "--log needs --bed (a bed label such as B4; never a patient's name)"
	case card && bed == "":
		return "--card needs --bed (a bed label such as B4; never a patient's name)"
	}
	if logPath == "" && !card && bed == "" {
		return ""
	}
	if err := setup.CheckBedLabel(bed); err != nil {
		return "--bed: " + err.(*setup.InputError).Reason
	}
	if err := setup.CheckInitials(initials); err != nil {
		return "--initials: " + err.(*setup.InputError).Reason
	}
	if err := setup.CheckSecondInitials(o.second()); err != nil {
		return "--second-initials: " + err.(*setup.InputError).Reason
	}
	return ""
}

func runCheck(env Env) int {
	f, o := checkFlagSet()
	if status, done := f.parse(env, env.Args, "check", false); done {
		return status
	}
	req, problems := setup.BuildCheckRequest(f.entries, time.Now())
	if len(problems) > 0 {
		return problemsError(env.Stderr, "check", problems)
	}
	if msg := o.outputProblem(); msg != "" {
		return UsageError(env.Stderr, "check", msg)
	}
	// Refuse a bad bed label or initials before anything is computed or shown.
	if msg := o.recordProblem(); msg != "" {
		return UsageError(env.Stderr, "check", msg)
	}
	p, _, err := profiles.Open(o.profile(), o.dir())
	if err != nil {
		return UsageError(env.Stderr, "check", "--profile: "+err.Error())
	}
	ck, err := setup.RunCheck(req, p)
	if err != nil {
		return jobError(env.Stderr, "check", err)
	}
	// An assumed lung beside readings that gave the lung is said, not
	// dropped silently.
	if ck.Fitted != nil {
		for _, name := range []string{"compliance", "resistance", "lung"} {
			if v, ok := f.entries[name]; ok && (name == "compliance" || !ck.Fitted.EndOnly) {
				fmt.Fprintf(env.Stderr, "crankside check: note: --%s %s is not used: the readings give the lung\n", name, safetext.Escape(v))
			}
		}
	}
	var rec setup.Record
	if o.logPath() != "" || o.card() {
		if rec, err = setup.NewRecord(ck, o.bed(), o.initials(), req.Now); err == nil {
			rec, err = rec.WithSecondInitials(o.second())
		}
		if err != nil {
			return UsageError(env.Stderr, "check", err.Error())
		}
	}
	var status int
	switch {
	case o.sheet():
		if status = checkSheet(env, ck, rec, p.Label, o); status == ExitOK && ck.HighestLevel() == setup.Stop {
			return ExitStop
		}
		return status
	case o.asJSON():
		status = writeJSON(env, setup.FormatCheckJSON, ck.JSON())
	case o.card():
		status = writeText(env, "check", func(w io.Writer) error { return report.WriteCard(w, rec) })
	default:
		status = writeText(env, "check", func(w io.Writer) error { return report.CheckText(w, ck) })
	}
	if status != ExitOK {
		return status
	}
	if o.logPath() != "" {
		status = appendRecord(env, rec, o)
	}
	if ck.HighestLevel() == setup.Stop {
		return ExitStop // louder than a failed record, which stderr names
	}
	return status
}

// outputProblem says which of --json, --card and --sheet clash, or "".
func (o checkOptions) outputProblem() string {
	if o.card() && o.asJSON() {
		return "--card and --json do not go together: the card is plain text; give one of them"
	}
	n := 0
	for _, on := range []bool{o.asJSON(), o.card(), o.sheet()} {
		if on {
			n++
		}
	}
	if n > 1 {
		return "--json, --card and --sheet do not go together: give one of them"
	}
	if _, ie := setup.CheckInterval(o.every()); ie != nil {
		return "--every: " + ie.Reason
	}
	if o.every() != "" && !o.sheet() {
		return "--every is for the sheet's next check due: add --sheet"
	}
	return ""
}

// checkSheet prints the bedside sheet; with --log the record is appended
// first, so that the sheet's last record is one that was written.
func checkSheet(env Env, ck setup.Check, rec setup.Record, unit string, o checkOptions) int {
	sheet := report.CheckSheet(ck, unit, setup.BedKey(o.bed()), time.Now())
	if o.logPath() != "" {
		if err := logbook.AppendRecord(o.logPath(), rec); err != nil {
			fmt.Fprintf(env.Stderr, "crankside check: the check was NOT recorded, so no sheet is printed: %s\n", safetext.Escape(err.Error()))
			return ExitFailure
		}
		sheet.Schedule = setup.RecordedSchedule(o.logPath(), rec, everyEntered(o.every()))
		fmt.Fprintf(env.Stderr, "Recorded for bed %s in %s.\n", safetext.Escape(rec.Bed), safetext.Escape(o.logPath()))
	}
	return writeText(env, "check", sheet.Write)
}

// everyEntered is the interval typed, or 0 for the default (already
// checked by outputProblem).
func everyEntered(text string) time.Duration {
	if strings.TrimSpace(text) == "" {
		return 0
	}
	every, _ := setup.CheckInterval(text)
	return every
}

func appendRecord(env Env, rec setup.Record, o checkOptions) int {
	path := o.logPath()
	if err := logbook.AppendRecord(path, rec); err != nil {
		fmt.Fprintf(env.Stderr, "crankside check: the check above was NOT recorded: %s\n", safetext.Escape(err.Error()))
		return ExitFailure
	}
	note := fmt.Sprintf("Recorded for bed %s in %s.\n", safetext.Escape(rec.Bed), safetext.Escape(path))
	switch {
	case o.card():
		// The card is the whole of stdout, ready to print.
		fmt.Fprint(env.Stderr, note)
	case !o.asJSON():
		fmt.Fprint(env.Stdout, note)
	}
	return ExitOK
}
