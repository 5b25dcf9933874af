package cli

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"time"

	"crankside/profiles"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

var calibrateUsage = []string{"calibrate --profile ID|PATH --bench FILE.csv [--date YYYY-MM-DD] [--write] [--json]"}

const calibrateLong = `Refits a machine's bench calibration. The bench file is CSV with the header
  hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml
and one row per bench breath into a test lung, delivered from rest. A
decimal comma is a decimal mark ("480,5", quoted in a comma-separated
file); a file whose header is separated by semicolons, as spreadsheets
write it where the comma is the decimal mark, is read that way. Each
point's residual is shown with whether it is within +/-(4 mL + 15%).
--write stores the new calibration and date in the profile file (the old
file is kept as FILE.bak); without it nothing is written. --write refuses
(exit 1) a fit whose k is implausible or that gives any hole more than its
geometric swept volume.

Flags:
`

var calibrateCommand = &Command{
	Name:  "calibrate",
	Usage: calibrateUsage,
	Short: "refit a machine's bench calibration",
	Run:   runCalibrate,
}

func runCalibrate(env Env) int {
	f := newFlags("calibrate", help(calibrateUsage, calibrateLong))
	ref := f.text("profile", "", "the machine profile: an id in the profiles directory, or a path")
	dir := f.text("profiles", profiles.DefaultDir(), "directory of profile files")
	bench := f.text("bench", "", "the bench measurements, CSV (required)")
	date := f.text("date", "", "the calibration's date, YYYY-MM-DD (default today)")
	write := f.boolean("write", "store the new calibration in the profile file")
	asJSON := f.boolean("json", "print one JSON object")
	if status, done := f.parse(env, env.Args, "calibrate", false); done {
		return status
	}
	if ref() == "" || bench() == "" {
		return UsageError(env.Stderr, "calibrate", "--profile and --bench are required")
	}
	p, src, err := profiles.Open(ref(), dir())
	if err != nil {
		return UsageError(env.Stderr, "calibrate", "--profile: "+err.Error())
	}
	if write() && src.Embedded {
		return UsageError(env.Stderr, "calibrate", fmt.Sprintf("--write: %s is an embedded demo and cannot be written; save a copy with 'crankside profiles show %s --json > FILE' and calibrate that", p.ID, p.ID))
	}
	points, status := readBench(env, bench(), p)
	if status != ExitOK {
		return status
	}
	res, err := setup.Calibrate(p, points, date(), time.Now())
	if err != nil {
		return jobError(env.Stderr, "calibrate", err)
	}
	if write() {
		// A line the preview itself calls implausible is not stored: a plan
		// would use it for every patient on this machine.
		if bad := res.Unwritable(); len(bad) > 0 {
			ids := make([]string, len(bad))
			for i, c := range bad {
				ids[i] = setup.LevelWord(c.Level) + " " + string(c.ID)
			}
			fmt.Fprintf(env.Stderr, "crankside calibrate: nothing written: the fit is implausible (%s: %s); re-measure on the bench, or run without --write to see the whole fit\n",
				strings.Join(ids, ", "), safetext.Escape(bad[0].Message))
			return ExitFailure
		}
		// Refuse to write over a file that changed since it was read here:
		// two refits at once must not lose one silently.
		if err := profiles.SaveWithBackupIfUnchanged(src.Path, res.Profile, src.Stamp); err != nil {
			fmt.Fprintf(env.Stderr, "crankside calibrate: nothing written: %s\n", safetext.Escape(err.Error()))
			return ExitFailure
		}
	}
	if asJSON() {
		return writeJSON(env, setup.FormatCalibrationJSON, res.JSON(write()))
	}
	if status := writeText(env, "calibrate", func(w io.Writer) error { return report.CalibrationText(w, res) }); status != ExitOK {
		return status
	}
	if write() {
		fmt.Fprintf(env.Stdout, "Written to %s (the previous file is %s.bak).\n", safetext.Escape(src.Path), safetext.Escape(src.Path))
	} else {
		fmt.Fprintln(env.Stdout, "Nothing written: add --write to store this calibration in the profile file.")
	}
	return ExitOK
}

func readBench(env Env, path string, p profiles.Profile) ([]profiles.BenchPoint, int) {
	bf, err := os.Open(path)
	if err != nil {
		return nil, UsageError(env.Stderr, "calibrate", "--bench: "+err.Error())
	}
	defer bf.Close()
	points, err := setup.ReadBench(bf, path, p)
	var be *profiles.BenchError
	switch {
	case errors.As(err, &be):
		for _, pr := range be.Problems {
			fmt.Fprintf(env.Stderr, "%s: %s\n", safetext.Escape(path), safetext.Escape(pr.String()))
		}
		fmt.Fprintf(env.Stderr, "crankside calibrate: nothing written\n")
		return nil, ExitUsage
	case err != nil:
		return nil, UsageError(env.Stderr, "calibrate", err.Error())
	}
	return points, ExitOK
}
