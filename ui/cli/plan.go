package cli

import (
	"io"
	"time"

	"crankside/logbook"
	"crankside/profiles"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

var planUsage = []string{"plan --height-cm N --sex male|female [flags]"}

const planLong = `A new patient's setting on one machine: PBW, target volume, the hole to pin,
the motor speed and dwell the controller can be set to, the predictions and
the cautions. A decimal comma is read as a decimal point (0,9 is 0.9).

` + exitStatusHelp + `

Flags:
`

var planCommand = &Command{
	Name:  "plan",
	Usage: planUsage,
	Short: "a new patient's setting on one machine",
	Run:   runPlan,
}

// planFlagSet declares the plan's entries; the screen takes the same ones.
func planFlagSet(name, usage string) (f *flags, profile, dir func() string) {
	f = newFlags(name, usage)
	f.sharedEntries()
	f.entry("ml-per-kg", "tidal volume in mL per kg PBW (4-10; default 6, ARDS Network 2000)")
	f.entry("rate", "breaths per minute (default by lung: normal 14, ards 18, obstructive 10)")
	f.entry("ie", "I:E as 1:N (1:1 to 1:4; default 1:2, obstructive 1:3)")
	f.entry("peep", "PEEP in cmH2O (0-25; default 5, ARDS from the lower-PEEP/FiO2 table)")
	f.entry("fio2", "wanted FiO2 as a fraction (0.21-1; default 0.21, no oxygen)")
	f.entry("lung", "lung condition: normal, ards or obstructive (default normal)")
	f.entry("compliance", "lung compliance in mL/cmH2O (default by lung)")
	f.entry("resistance", "airway resistance with tube in cmH2O/(L/s) (default by lung)")
	f.entry("pressure-unit", "the unit of --peep: cmh2o (default), hpa or mbar (1 hPa = 1 mbar = 1.01972 cmH2O)")
	profile = f.text("profile", profiles.DefaultID, "machine profile: an id or a path to a .json file")
	dir = f.text("profiles", profiles.DefaultDir(), "directory of profile files")
	return f, profile, dir
}

func runPlan(env Env) int {
	f, profile, dir := planFlagSet("plan", help(planUsage, planLong))
	asJSON := f.boolean("json", "print one JSON object")
	sheet := f.boolean("sheet", "print the bedside sheet (one page, 80 columns): the setting, what to time, the watch band, the alarm limits, the power-cut rhythm, the checklist")
	bed := f.text("bed", "", "with --sheet: the bed's label, like B4 (never a patient's name)")
	logPath := f.text("log", "", "with --sheet and --bed: read the bed's last check from this log, for the next check due")
	every := f.text("every", "", "with --sheet: hours between checks, for the next check due (default 4, common practice)")
	if status, done := f.parse(env, env.Args, "plan", false); done {
		return status
	}
	req, problems := setup.BuildRequest(f.entries, time.Now())
	if len(problems) > 0 {
		return problemsError(env.Stderr, "plan", problems)
	}
	if msg := planSheetProblem(asJSON(), sheet(), bed(), logPath(), every()); msg != "" {
		return UsageError(env.Stderr, "plan", msg)
	}
	p, _, err := profiles.Open(profile(), dir())
	if err != nil {
		return UsageError(env.Stderr, "plan", "--profile: "+err.Error())
	}
	pl, err := setup.MakePlan(req, p)
	if err != nil {
		return jobError(env.Stderr, "plan", err)
	}
	var status int
	switch {
	case asJSON():
		status = writeJSON(env, setup.FormatPlanJSON, pl.JSON())
	case sheet():
		status = planSheet(env, pl, bed(), logPath(), every())
	default:
		status = writeText(env, "plan", func(w io.Writer) error { return report.PlanText(w, pl) })
	}
	if status == ExitOK && pl.HighestLevel() == setup.Stop {
		return ExitStop
	}
	return status
}

// planSheetProblem says what is wrong with the sheet's flags, or "".
func planSheetProblem(asJSON, sheet bool, bed, logPath, every string) string {
	switch {
	case asJSON && sheet:
		return "--json and --sheet do not go together: give one of them"
	case !sheet && (bed != "" || logPath != "" || every != ""):
		return "--bed, --log and --every are for the bedside sheet: add --sheet"
	case logPath != "" && bed == "":
		return "--log needs --bed (a bed label such as B4; never a patient's name)"
	}
	if bed != "" {
		if err := setup.CheckBedLabel(bed); err != nil {
			return "--bed: " + err.(*setup.InputError).Reason
		}
	}
	if _, ie := setup.CheckInterval(every); ie != nil {
		return "--every: " + ie.Reason
	}
	return ""
}

// planSheet prints the plan's bedside sheet; with --log, the bed's last
// recorded check and the next due.
func planSheet(env Env, pl setup.Plan, bed, logPath, every string) int {
	sh := report.PlanSheet(pl, time.Now())
	sh.Bed = setup.BedKey(bed)
	if logPath != "" {
		sc, err := logbook.BedSchedule(logPath, bed, everyEntered(every))
		if err != nil {
			return UsageError(env.Stderr, "plan", "--log: "+safetext.Escape(err.Error()))
		}
		sh.Schedule = sc
	}
	return writeText(env, "plan", sh.Write)
}
