// Command crankside helps respiratory therapists set and check a locally
// built, motor-driven piston ventilator: from a patient's height and sex to
// the crank hole, motor speed and dwell of one particular machine, with the
// predicted pressures and the cautions that apply.
//
// With no arguments it opens the full-screen UI on the embedded demo
// profile. Sub-commands print the same computations, as text or --json.
package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/setup"
	"crankside/ui"
)

const version = "0.1.0"

// exitUsage is the status for bad input: a flag, a number, a profile file.
const (
	exitOK       = 0
	exitFailure  = 1
	exitUsage    = 2
	exitInternal = 70
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// run is the whole program but the process exit, so it can be tested.
func run(args []string, stdout, stderr io.Writer) (status int) {
	defer func() {
		if r := recover(); r != nil {
			fmt.Fprintf(stderr, "crankside: internal error: %v (please report it with the command you ran)\n", r)
			status = exitInternal
		}
	}()
	cmd, rest := "", args
	if len(args) > 0 {
		cmd, rest = args[0], args[1:]
	}
	switch cmd {
	case "plan":
		return cmdPlan(rest, stdout, stderr)
	case "profiles":
		return cmdProfiles(rest, stdout, stderr)
	case "check":
		return cmdCheck(rest, stdout, stderr)
	case "log":
		return cmdLog(rest, stdout, stderr)
	case "calibrate":
		return cmdCalibrate(rest, stdout, stderr)
	case "--version", "-version", "version":
		fmt.Fprintf(stdout, "crankside %s\n", version)
		return exitOK
	case "--help", "-help", "-h", "help":
		fmt.Fprint(stdout, topUsage)
		return exitOK
	case "":
		return cmdUI(nil, stdout, stderr)
	}
	if strings.HasPrefix(cmd, "-") {
		return cmdUI(args, stdout, stderr)
	}
	return usageError(stderr, "", fmt.Sprintf("unknown command %s", physiology.Quote(cmd)))
}

const topUsage = `crankside: set and check a motor-driven piston ventilator.

Usage:
  crankside [plan flags] [--profile ID|PATH] [--profiles DIR] [--log FILE]
                                    the bedside screen, on the demo profile unless
                                    --profile names another; plan flags prefill it
  crankside plan --height-cm N --sex male|female [flags]
                                    a new patient's setting on one machine
  crankside check --height-cm N --sex S --hole L --rpm N --dwell-s N [flags]
                                    shift handover: what the patient gets now
  crankside log show --log FILE [--bed LABEL]
                                    earlier checks and what changed
  crankside profiles list|show ID|validate FILE|new --from ID --id NEW
                                    the machine profiles
  crankside calibrate --profile ID|PATH --bench FILE.csv [--write]
                                    refit a machine's bench calibration
  crankside --version

Run 'crankside COMMAND --help' for a command's flags.

` + setup.ClinicalCaution + "\n"

func usageError(stderr io.Writer, cmd, msg string) int {
	name := "crankside"
	if cmd != "" {
		name += " " + cmd
	}
	fmt.Fprintf(stderr, "%s: %s (run '%s --help')\n", name, msg, name)
	return exitUsage
}

// numberFlag is a float flag that refuses NaN, Inf and text, and says what
// it expects.
type numberFlag struct {
	value  float64
	set    bool
	expect string
}

func (f *numberFlag) String() string {
	if f == nil || !f.set {
		return ""
	}
	return fmt.Sprint(f.value)
}

func (f *numberFlag) Set(s string) error {
	v, err := physiology.ParseNumber(s)
	if err != nil {
		return fmt.Errorf("%s is not a number; expected %s", physiology.Quote(s), f.expect)
	}
	f.value, f.set = v, true
	return nil
}

// flagError turns the flag package's wording into one line naming the flag.
func flagError(err error) string {
	msg := err.Error()
	const prefix = "invalid value "
	if strings.HasPrefix(msg, prefix) {
		// invalid value "x" for flag -name: reason
		if i := strings.Index(msg, " for flag -"); i >= 0 {
			rest := msg[i+len(" for flag -"):]
			if j := strings.Index(rest, ": "); j >= 0 {
				return "--" + rest[:j] + ": " + rest[j+2:]
			}
		}
	}
	if strings.HasPrefix(msg, "flag provided but not defined: -") {
		return "unknown flag --" + strings.TrimPrefix(msg, "flag provided but not defined: -")
	}
	return strings.Replace(msg, "flag needs an argument: -", "flag needs a value: --", 1)
}

type planFlags struct {
	fs                                  *flag.FlagSet
	height, mlPerKg, rate, peep, fio2   numberFlag
	compliance, resistance, cylL, cylBr numberFlag
	sex, lung, ie, profile, profilesDir string
	asJSON                              bool
}

func newPlanFlags(stderr io.Writer) *planFlags {
	f := &planFlags{fs: flag.NewFlagSet("plan", flag.ContinueOnError)}
	f.fs.SetOutput(io.Discard)
	f.height.expect = "cm, 130-230"
	f.mlPerKg.expect = "mL/kg PBW, 4-10"
	f.rate.expect = "breaths/min, 4-60"
	f.peep.expect = "cmH2O, 0-25"
	f.fio2.expect = "a fraction, 0.21-1"
	f.compliance.expect = "mL/cmH2O, 5-200"
	f.resistance.expect = "cmH2O/(L/s), 1-100"
	f.cylL.expect = "litres of water capacity, 0.1-100"
	f.cylBr.expect = "bar, 0-300"
	f.fs.Var(&f.height, "height-cm", "patient's height in cm (130-230; required)")
	f.fs.StringVar(&f.sex, "sex", "", "male or female (required)")
	f.fs.Var(&f.mlPerKg, "ml-per-kg", "tidal volume in mL per kg PBW (4-10; default 6, ARDS Network 2000)")
	f.fs.Var(&f.rate, "rate", "breaths per minute (default by lung: normal 14, ards 18, obstructive 10)")
	f.fs.StringVar(&f.ie, "ie", "", "I:E as 1:N (1:1 to 1:4; default 1:2, obstructive 1:3)")
	f.fs.Var(&f.peep, "peep", "PEEP in cmH2O (0-25; default 5, ARDS from the lower-PEEP/FiO2 table)")
	f.fs.Var(&f.fio2, "fio2", "wanted FiO2 as a fraction (0.21-1; default 0.21, no oxygen)")
	f.fs.StringVar(&f.lung, "lung", "normal", "lung condition: normal, ards or obstructive")
	f.fs.Var(&f.compliance, "compliance", "lung compliance in mL/cmH2O (default by lung)")
	f.fs.Var(&f.resistance, "resistance", "airway resistance with tube in cmH2O/(L/s) (default by lung)")
	f.fs.Var(&f.cylL, "cylinder-l", "oxygen cylinder water capacity in L (optional)")
	f.fs.Var(&f.cylBr, "cylinder-bar", "oxygen cylinder pressure in bar (with --cylinder-l)")
	f.fs.StringVar(&f.profile, "profile", profiles.DefaultID, "machine profile: an id or a path to a .json file")
	f.fs.StringVar(&f.profilesDir, "profiles", profiles.DefaultDir(), "directory of profile files")
	f.fs.BoolVar(&f.asJSON, "json", false, "print one JSON object")
	return f
}

// parseFlags parses a command's flags. done is true, with the status to
// exit with, when the command should go no further: help was asked for, a
// flag was bad, or an argument was given where none is taken.
func parseFlags(fs *flag.FlagSet, args []string, cmd, usage string, stdout, stderr io.Writer) (status int, done bool) {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			printFlags(stdout, usage, fs)
			return exitOK, true
		}
		return usageError(stderr, cmd, flagError(err)), true
	}
	if fs.NArg() > 0 {
		return usageError(stderr, cmd, fmt.Sprintf("unexpected argument %s", physiology.Quote(fs.Arg(0)))), true
	}
	return exitOK, false
}

func printFlags(w io.Writer, usage string, fs *flag.FlagSet) {
	fmt.Fprint(w, usage)
	fs.VisitAll(func(f *flag.Flag) {
		def := ""
		if f.DefValue != "" && f.DefValue != "false" {
			def = fmt.Sprintf(" (default %q)", f.DefValue)
		}
		fmt.Fprintf(w, "  --%-14s %s%s\n", f.Name, f.Usage, def)
	})
	fmt.Fprintf(w, "\n%s\n", setup.ClinicalCaution)
}

func (f *planFlags) request() (setup.Request, error) {
	var req setup.Request
	if !f.height.set {
		return req, errors.New("--height-cm is required (cm, 130-230)")
	}
	if f.sex == "" {
		return req, errors.New("--sex is required (male or female)")
	}
	sex, err := physiology.ParseSex(f.sex)
	if err != nil {
		return req, fmt.Errorf("--sex: %v", err)
	}
	lung, err := physiology.ParseLung(f.lung)
	if err != nil {
		return req, fmt.Errorf("--lung: %v", err)
	}
	req.Patient = setup.Patient{HeightCm: f.height.value, Sex: sex}
	t := setup.Targets{Lung: lung}
	// A typed zero is not "use the default": refuse it through the range
	// check by passing a value that is out of range.
	explicit := func(nf numberFlag) (float64, error) {
		if nf.set && nf.value == 0 {
			return 0, fmt.Errorf("0 is out of range; expected %s", nf.expect)
		}
		return nf.value, nil
	}
	for _, x := range []struct {
		name string
		nf   numberFlag
		dst  *float64
	}{
		{"ml-per-kg", f.mlPerKg, &t.MLPerKg}, {"rate", f.rate, &t.RateBPM}, {"fio2", f.fio2, &t.FiO2},
		{"compliance", f.compliance, &t.ComplianceMLPerCmH2O}, {"resistance", f.resistance, &t.ResistanceCmH2OPerLS},
		{"cylinder-l", f.cylL, &t.CylinderWaterL},
	} {
		v, err := explicit(x.nf)
		if err != nil {
			return req, fmt.Errorf("--%s: %v", x.name, err)
		}
		*x.dst = v
	}
	if f.cylBr.set {
		if !f.cylL.set {
			return req, errors.New("--cylinder-bar needs --cylinder-l as well")
		}
		t.CylinderBar = f.cylBr.value
	}
	if f.cylL.set && !f.cylBr.set {
		return req, errors.New("--cylinder-l needs --cylinder-bar as well")
	}
	if f.peep.set {
		v := f.peep.value
		t.PEEPCmH2O = &v
	}
	if f.ie != "" {
		e, err := physiology.ParseIE(f.ie)
		if err != nil {
			return req, fmt.Errorf("--ie: %v", err)
		}
		t.IE = e
	}
	req.Targets = t
	req.Now = time.Now()
	return req, nil
}

const planUsage = `Usage: crankside plan --height-cm N --sex male|female [flags]

A new patient's setting on one machine: PBW, target volume, the hole to pin,
the motor speed and dwell the controller can be set to, the predictions and
the cautions.

Flags:
`

func cmdPlan(args []string, stdout, stderr io.Writer) int {
	f := newPlanFlags(stderr)
	if status, done := parseFlags(f.fs, args, "plan", planUsage, stdout, stderr); done {
		return status
	}
	req, err := f.request()
	if err != nil {
		return usageError(stderr, "plan", err.Error())
	}
	p, _, err := profiles.Open(f.profile, f.profilesDir)
	if err != nil {
		return usageError(stderr, "plan", "--profile: "+err.Error())
	}
	pl, err := setup.MakePlan(req, p)
	if err != nil {
		return jobError(stderr, "plan", err)
	}
	if f.asJSON {
		return writeJSON(stdout, stderr, pl.JSON())
	}
	if err := pl.WriteText(stdout); err != nil {
		fmt.Fprintf(stderr, "crankside plan: %v\n", err)
		return exitFailure
	}
	return exitOK
}

// jobError reports an error from setup: bad input names its flag and exits
// 2; anything else exits 1.
func jobError(stderr io.Writer, cmd string, err error) int {
	var ie *setup.InputError
	if errors.As(err, &ie) {
		return usageError(stderr, cmd, "--"+ie.Field+": "+ie.Reason)
	}
	fmt.Fprintf(stderr, "crankside %s: %v\n", cmd, err)
	return exitFailure
}

func writeJSON(stdout, stderr io.Writer, v any) int {
	enc := json.NewEncoder(stdout)
	enc.SetIndent("", "  ")
	if err := enc.Encode(v); err != nil {
		fmt.Fprintf(stderr, "crankside: %v\n", err)
		return exitFailure
	}
	return exitOK
}

const profilesUsage = `Usage:
  crankside profiles list [--profiles DIR]
  crankside profiles show ID|PATH [--profiles DIR] [--json]
  crankside profiles validate FILE
  crankside profiles new --from ID|PATH --id NEW [--label TEXT]

list shows the embedded demo profiles and every .json file in the profiles
directory (a bad file is listed with its error). show --json prints the
profile file itself, so it can be saved and edited. validate checks a file
and names every problem with its field. new prints a profile to edit by
hand for a unit being measured: a copy of another with a new id, without
its calibration.
`

func cmdProfiles(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		return usageError(stderr, "profiles", "name a sub-command: list, show or validate")
	}
	sub, rest := args[0], args[1:]
	fs := flag.NewFlagSet("profiles "+sub, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	dir := fs.String("profiles", profiles.DefaultDir(), "directory of profile files")
	asJSON := fs.Bool("json", false, "print the profile file itself")
	switch sub {
	case "--help", "-h", "help":
		fmt.Fprint(stdout, profilesUsage)
		return exitOK
	case "list", "show", "validate":
	case "new":
		return profilesNew(rest, stdout, stderr)
	default:
		return usageError(stderr, "profiles", fmt.Sprintf("unknown sub-command %s; use list, show, validate or new", physiology.Quote(sub)))
	}
	if err := fs.Parse(interspersed(rest, fs)); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			fmt.Fprint(stdout, profilesUsage)
			return exitOK
		}
		return usageError(stderr, "profiles "+sub, flagError(err))
	}
	switch sub {
	case "list":
		return profilesList(*dir, stdout, stderr)
	case "show":
		if fs.NArg() != 1 {
			return usageError(stderr, "profiles show", "name one profile id or path")
		}
		return profilesShow(fs.Arg(0), *dir, *asJSON, stdout, stderr)
	default:
		if fs.NArg() != 1 {
			return usageError(stderr, "profiles validate", "name one profile file")
		}
		return profilesValidate(fs.Arg(0), stdout, stderr)
	}
}

// interspersed moves flags after positional arguments to the front, so
// "show demo-a --json" works as people type it.
func interspersed(args []string, fs *flag.FlagSet) []string {
	var flags, pos []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			pos = append(pos, args[i+1:]...)
			break
		}
		if strings.HasPrefix(a, "-") && len(a) > 1 {
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if f := fs.Lookup(name); f != nil && !strings.Contains(name, "=") && f.DefValue != "false" && i+1 < len(args) {
				flags = append(flags, args[i+1])
				i++
			}
			continue
		}
		pos = append(pos, a)
	}
	return append(flags, pos...)
}

func profilesList(dir string, stdout, stderr io.Writer) int {
	entries, err := profiles.List(dir)
	if err != nil {
		fmt.Fprintf(stderr, "crankside profiles list: %v\n", err)
		return exitFailure
	}
	bad := 0
	for _, e := range entries {
		if e.Err != nil {
			bad++
			fmt.Fprintf(stdout, "%-16s BAD   %s\n", e.ID, e.Err)
			continue
		}
		fmt.Fprintf(stdout, "%-16s %-44s %s\n", e.ID, e.Label, e.Source)
	}
	if dir != "" {
		fmt.Fprintf(stdout, "(profiles directory: %s)\n", dir)
	}
	if bad > 0 {
		return exitFailure
	}
	return exitOK
}

func profilesShow(ref, dir string, asJSON bool, stdout, stderr io.Writer) int {
	p, src, err := profiles.Open(ref, dir)
	if err != nil {
		return usageError(stderr, "profiles show", err.Error())
	}
	if asJSON {
		data, err := profiles.Marshal(p)
		if err != nil {
			fmt.Fprintf(stderr, "crankside profiles show: %v\n", err)
			return exitFailure
		}
		stdout.Write(data)
		return exitOK
	}
	s, err := setup.DescribeProfile(p, time.Now())
	if err != nil {
		fmt.Fprintf(stderr, "crankside profiles show: %v\n", err)
		return exitFailure
	}
	fmt.Fprintf(stdout, "%s (%s)\n", p.ID, src)
	s.WriteText(stdout)
	return exitOK
}

func profilesValidate(path string, stdout, stderr io.Writer) int {
	_, err := profiles.ReadFile(path)
	if err == nil {
		fmt.Fprintf(stdout, "%s: valid %s profile\n", path, profiles.FormatV1)
		return exitOK
	}
	var pe *profiles.Error
	if errors.As(err, &pe) {
		lines := make([]string, 0, len(pe.Problems))
		for _, p := range pe.Problems {
			lines = append(lines, p.Error())
		}
		sort.Strings(lines)
		for _, l := range lines {
			fmt.Fprintf(stderr, "%s: %s\n", path, l)
		}
		return exitUsage
	}
	fmt.Fprintf(stderr, "crankside profiles validate: %v\n", err)
	return exitUsage
}

// cmdUI opens the full-screen UI, prefilled from any plan flags given.
func cmdUI(args []string, stdout, stderr io.Writer) int {
	f := newPlanFlags(stderr)
	logPath := f.fs.String("log", setup.DefaultLogPath(), "the handover log the screen records checks in")
	if status, done := parseFlags(f.fs, args, "", topUsage+"\nFlags of the screen:\n", stdout, stderr); done {
		return status
	}
	if f.asJSON {
		return usageError(stderr, "", "--json goes with a sub-command, such as 'crankside plan --json'")
	}
	prefill, err := f.prefill()
	if err != nil {
		return usageError(stderr, "", err.Error())
	}
	p, src, err := profiles.Open(f.profile, f.profilesDir)
	if err != nil {
		return usageError(stderr, "", "--profile: "+err.Error())
	}
	if os.Getenv("NO_COLOR") != "" {
		lipgloss.SetColorProfile(termenv.Ascii)
	}
	err = ui.Run(ui.Options{Profile: p, Source: src, ProfilesDir: f.profilesDir, Prefill: prefill, LogPath: *logPath})
	if err != nil {
		fmt.Fprintf(stderr, "crankside: the bedside screen could not start (%v); in scripts use 'crankside plan'\n", err)
		return exitFailure
	}
	return exitOK
}

// prefill turns the plan flags given into the UI's entries, checked the
// same way the plan command checks them.
func (f *planFlags) prefill() (map[string]string, error) {
	out := map[string]string{}
	if f.sex != "" {
		sex, err := physiology.ParseSex(f.sex)
		if err != nil {
			return nil, fmt.Errorf("--sex: %v", err)
		}
		out["sex"] = sex.String()
	}
	lung, err := physiology.ParseLung(f.lung)
	if err != nil {
		return nil, fmt.Errorf("--lung: %v", err)
	}
	out["lung"] = lung.String()
	if f.ie != "" {
		if _, err := physiology.ParseIE(f.ie); err != nil {
			return nil, fmt.Errorf("--ie: %v", err)
		}
		out["ie"] = f.ie
	}
	for name, nf := range map[string]numberFlag{"height-cm": f.height, "ml-per-kg": f.mlPerKg, "rate": f.rate,
		"peep": f.peep, "fio2": f.fio2, "compliance": f.compliance, "resistance": f.resistance} {
		if nf.set {
			out[name] = strconv.FormatFloat(nf.value, 'f', -1, 64)
		}
	}
	return out, nil
}

const checkUsage = `Usage: crankside check --height-cm N --sex male|female --hole LABEL --rpm N --dwell-s N [flags]

Shift handover: what the machine is set to and what the manometer reads ->
what the patient really gets, the lung mechanics the readings imply, a
proposed change side by side, and a record appended to the log.
No patient name or other identifier is ever stored: only a bed label.

Flags:
`

type checkFlags struct {
	fs                                              *flag.FlagSet
	height, rpm, dwell, peep, peak, end, o2         numberFlag
	compliance, resistance, cylL, cylBar            numberFlag
	propRPM, propDwell, propPEEP                    numberFlag
	sex, lung, hole, propHole, profile, profilesDir string
	bed, initials, logPath                          string
	asJSON, card                                    bool
}

func newCheckFlags() *checkFlags {
	f := &checkFlags{fs: flag.NewFlagSet("check", flag.ContinueOnError)}
	f.fs.SetOutput(io.Discard)
	num := func(nf *numberFlag, name, expect, usage string) {
		nf.expect = expect
		f.fs.Var(nf, name, usage)
	}
	num(&f.height, "height-cm", "cm, 130-230", "patient's height in cm (required)")
	f.fs.StringVar(&f.sex, "sex", "", "male or female (required)")
	f.fs.StringVar(&f.hole, "hole", "", "the hole the pin is in (required)")
	num(&f.rpm, "rpm", "rpm", "the motor speed set (required)")
	num(&f.dwell, "dwell-s", "seconds", "the dwell set, in s (required)")
	num(&f.peep, "peep", "cmH2O, 0-25", "the PEEP valve, cmH2O (default 5)")
	num(&f.o2, "o2-lpm", "L/min, 0-60", "oxygen bled into the intake, L/min (default 0)")
	num(&f.peak, "peak", "cmH2O", "manometer peak during delivery, cmH2O (with --end-pressure)")
	num(&f.end, "end-pressure", "cmH2O", "manometer reading when the piston stops, cmH2O (with --peak)")
	f.fs.StringVar(&f.lung, "lung", "normal", "lung condition for the assumed mechanics: normal, ards or obstructive")
	num(&f.compliance, "compliance", "mL/cmH2O, 5-200", "assumed compliance when no readings are given")
	num(&f.resistance, "resistance", "cmH2O/(L/s), 1-100", "assumed resistance when no readings are given")
	num(&f.cylL, "cylinder-l", "L, 0.1-100", "oxygen cylinder water capacity, L")
	num(&f.cylBar, "cylinder-bar", "bar, 0-300", "oxygen cylinder pressure, bar")
	f.fs.StringVar(&f.propHole, "propose-hole", "", "a proposed hole")
	num(&f.propRPM, "propose-rpm", "rpm", "a proposed motor speed")
	num(&f.propDwell, "propose-dwell-s", "seconds", "a proposed dwell")
	num(&f.propPEEP, "propose-peep", "cmH2O, 0-25", "a proposed PEEP")
	f.fs.StringVar(&f.profile, "profile", profiles.DefaultID, "machine profile: an id or a path to a .json file")
	f.fs.StringVar(&f.profilesDir, "profiles", profiles.DefaultDir(), "directory of profile files")
	f.fs.StringVar(&f.bed, "bed", "", "bed label for the record, like B4 (never a patient's name)")
	f.fs.StringVar(&f.initials, "initials", "", "the checking operator's initials, for the record (recommended)")
	f.fs.StringVar(&f.logPath, "log", "", "append the check to this log file (one JSON line; with --bed)")
	f.fs.BoolVar(&f.card, "card", false, "print a handover card (plain text, 80 columns)")
	f.fs.BoolVar(&f.asJSON, "json", false, "print one JSON object")
	return f
}

func (f *checkFlags) request() (setup.CheckRequest, error) {
	var req setup.CheckRequest
	for _, need := range []struct {
		set  bool
		name string
	}{{f.height.set, "--height-cm"}, {f.sex != "", "--sex"}, {f.hole != "", "--hole"}, {f.rpm.set, "--rpm"}, {f.dwell.set, "--dwell-s"}} {
		if !need.set {
			return req, fmt.Errorf("%s is required", need.name)
		}
	}
	sex, err := physiology.ParseSex(f.sex)
	if err != nil {
		return req, fmt.Errorf("--sex: %v", err)
	}
	lung, err := physiology.ParseLung(f.lung)
	if err != nil {
		return req, fmt.Errorf("--lung: %v", err)
	}
	if f.peak.set != f.end.set {
		return req, errors.New("--peak and --end-pressure go together: give both readings or neither")
	}
	if f.cylL.set != f.cylBar.set {
		return req, errors.New("--cylinder-l and --cylinder-bar go together")
	}
	if (f.bed != "" || f.initials != "") && f.logPath == "" && !f.card {
		return req, errors.New("--bed and --initials are for the record: add --log FILE or --card")
	}
	if f.logPath != "" && f.bed == "" {
		return req, errors.New("--log needs --bed (a bed label such as B4; never a patient's name)")
	}
	for _, z := range []struct {
		nf   numberFlag
		name string
	}{{f.compliance, "compliance"}, {f.resistance, "resistance"}} {
		if z.nf.set && z.nf.value == 0 {
			return req, fmt.Errorf("--%s: 0 is out of range; expected %s", z.name, z.nf.expect)
		}
	}
	peep := 5.0
	if f.peep.set {
		peep = f.peep.value
	}
	req = setup.CheckRequest{
		Patient: setup.Patient{HeightCm: f.height.value, Sex: sex}, Lung: lung,
		ComplianceMLPerCmH2O: f.compliance.value, ResistanceCmH2OPerLS: f.resistance.value,
		Setting:        setup.Setting{Hole: f.hole, RPM: f.rpm.value, DwellS: f.dwell.value, PEEPCmH2O: peep, O2LPerMin: f.o2.value},
		CylinderWaterL: f.cylL.value, CylinderBar: f.cylBar.value, Now: time.Now(),
	}
	if f.peak.set {
		req.Readings = setup.ReadingsOf(f.peak.value, f.end.value)
	}
	if f.propHole != "" {
		h := f.propHole
		req.Proposal.Hole = &h
	}
	for _, pr := range []struct {
		nf  numberFlag
		dst **float64
	}{{f.propRPM, &req.Proposal.RPM}, {f.propDwell, &req.Proposal.DwellS}, {f.propPEEP, &req.Proposal.PEEPCmH2O}} {
		if pr.nf.set {
			v := pr.nf.value
			*pr.dst = &v
		}
	}
	return req, nil
}

func cmdCheck(args []string, stdout, stderr io.Writer) int {
	f := newCheckFlags()
	if status, done := parseFlags(f.fs, args, "check", checkUsage, stdout, stderr); done {
		return status
	}
	req, err := f.request()
	if err != nil {
		return usageError(stderr, "check", err.Error())
	}
	var rec setup.Record
	if f.logPath != "" || f.card {
		// Refuse a bad bed label or initials before anything is computed or shown.
		bed, initials := f.bed, f.initials
		if f.card && f.logPath == "" && bed == "" {
			return usageError(stderr, "check", "--card needs --bed (a bed label such as B4; never a patient's name)")
		}
		if err := setup.CheckBedLabel(bed); err != nil {
			return usageError(stderr, "check", "--bed: "+err.(*setup.InputError).Reason)
		}
		if err := setup.CheckInitials(initials); err != nil {
			return usageError(stderr, "check", "--initials: "+err.(*setup.InputError).Reason)
		}
	}
	p, _, err := profiles.Open(f.profile, f.profilesDir)
	if err != nil {
		return usageError(stderr, "check", "--profile: "+err.Error())
	}
	ck, err := setup.RunCheck(req, p)
	if err != nil {
		return jobError(stderr, "check", err)
	}
	if f.logPath != "" || f.card {
		rec, err = setup.NewRecord(ck, f.bed, f.initials, req.Now)
		if err != nil {
			return usageError(stderr, "check", err.Error())
		}
	}
	switch {
	case f.asJSON:
		if code := writeJSON(stdout, stderr, ck.JSON()); code != exitOK {
			return code
		}
	case f.card:
		setup.WriteCard(stdout, rec)
	default:
		ck.WriteText(stdout)
	}
	if f.logPath != "" {
		if err := setup.AppendRecord(f.logPath, rec); err != nil {
			fmt.Fprintf(stderr, "crankside check: the check above was NOT recorded: %v\n", err)
			return exitFailure
		}
		switch {
		case f.card:
			// The card is the whole of stdout, ready to print.
			fmt.Fprintf(stderr, "Recorded for bed %s in %s.\n", rec.Bed, f.logPath)
		case !f.asJSON:
			fmt.Fprintf(stdout, "Recorded for bed %s in %s.\n", rec.Bed, f.logPath)
		}
	}
	return exitOK
}

const logUsage = `Usage: crankside log show --log FILE [--bed LABEL] [--json]

Lists the handover checks in a log, by bed and in time order, with what
changed from one check to the next. A torn last line (the program stopped
while writing it) or junk is skipped and reported; earlier records stay.
`

func cmdLog(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "--help" || args[0] == "-h" || args[0] == "help" {
		if len(args) == 0 {
			return usageError(stderr, "log", "name a sub-command: show")
		}
		fmt.Fprint(stdout, logUsage)
		return exitOK
	}
	if args[0] != "show" {
		return usageError(stderr, "log", fmt.Sprintf("unknown sub-command %s; use show", physiology.Quote(args[0])))
	}
	fs := flag.NewFlagSet("log show", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	path := fs.String("log", "", "the log file")
	bed := fs.String("bed", "", "only this bed")
	asJSON := fs.Bool("json", false, "print JSON")
	if err := fs.Parse(args[1:]); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			fmt.Fprint(stdout, logUsage)
			return exitOK
		}
		return usageError(stderr, "log show", flagError(err))
	}
	if *path == "" {
		return usageError(stderr, "log show", "--log FILE is required")
	}
	recs, problems, err := setup.ReadLog(*path)
	if err != nil {
		return usageError(stderr, "log show", err.Error())
	}
	for _, pr := range problems {
		fmt.Fprintf(stderr, "crankside log show: %s: %s\n", *path, pr)
	}
	hist := setup.History(recs, *bed)
	if *asJSON {
		type bedJSON struct {
			Bed    string               `json:"bed"`
			Checks []setup.HistoryEntry `json:"checks"`
		}
		out := struct {
			Beds     []bedJSON `json:"beds"`
			Problems []string  `json:"problems"`
		}{Beds: []bedJSON{}, Problems: []string{}}
		for _, h := range hist {
			out.Beds = append(out.Beds, bedJSON{Bed: h.Bed, Checks: h.Entries})
		}
		for _, pr := range problems {
			out.Problems = append(out.Problems, pr.String())
		}
		return writeJSON(stdout, stderr, out)
	}
	if len(hist) == 0 {
		fmt.Fprintln(stdout, "No checks recorded for that bed.")
	}
	for _, h := range hist {
		fmt.Fprintf(stdout, "Bed %s: %d check(s)\n", h.Bed, len(h.Entries))
		for _, e := range h.Entries {
			r := e.Record
			fmt.Fprintf(stdout, "  %s UTC  %-4s  hole %s, %.1f rpm, dwell %.1f s, PEEP %.0f: %.0f mL %.1f mL/kg, %d caution(s)",
				r.Time.UTC().Format("2006-01-02 15:04"), r.Initials, r.Setting.Hole, r.Setting.RPM, r.Setting.DwellS,
				r.Setting.PEEPCmH2O, r.DeliveredVtML, r.MLPerKg, len(r.Cautions))
			if len(r.Cautions) > 0 {
				fmt.Fprintf(stdout, ", highest %s", setup.LevelWord(setup.Highest(r.Cautions)))
			}
			fmt.Fprintln(stdout)
			if len(e.Changes) > 0 {
				fmt.Fprintf(stdout, "      changed: %s\n", strings.Join(e.Changes, "; "))
			}
		}
	}
	if len(problems) > 0 {
		return exitFailure
	}
	return exitOK
}

func profilesNew(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("profiles new", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	from := fs.String("from", profiles.DefaultID, "the profile to start from")
	id := fs.String("id", "", "the new profile's id (lower-case letters, digits, - and _)")
	label := fs.String("label", "", "the new profile's label")
	dir := fs.String("profiles", profiles.DefaultDir(), "directory of profile files")
	if status, done := parseFlags(fs, args, "profiles new", profilesUsage, stdout, stderr); done {
		return status
	}
	if *id == "" {
		return usageError(stderr, "profiles new", "--id is required")
	}
	p, _, err := profiles.Open(*from, *dir)
	if err != nil {
		return usageError(stderr, "profiles new", "--from: "+err.Error())
	}
	p.ID, p.Calibration = *id, nil
	p.Label = "New unit (edit me): measure every field"
	if *label != "" {
		p.Label = *label
	}
	data, err := profiles.Marshal(p)
	if err == nil {
		_, err = profiles.Parse(data, "the new profile")
	}
	if err != nil {
		return usageError(stderr, "profiles new", err.Error())
	}
	stdout.Write(data)
	return exitOK
}

const calibrateUsage = `Usage: crankside calibrate --profile ID|PATH --bench FILE.csv [--date YYYY-MM-DD] [--write] [--json]

Refits a machine's bench calibration. The bench file is CSV with the header
  hole,test_lung_compliance_ml_per_cmh2o,test_lung_resistance_cmh2o_per_l_s,rpm,measured_ml
and one row per bench breath into a test lung, delivered from rest. Each
point's residual is shown with whether it is within +/-(4 mL + 15%).
--write stores the new calibration and date in the profile file (the old
file is kept as FILE.bak); without it nothing is written.

Flags:
`

func cmdCalibrate(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("calibrate", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	ref := fs.String("profile", "", "the machine profile: an id in the profiles directory, or a path")
	dir := fs.String("profiles", profiles.DefaultDir(), "directory of profile files")
	bench := fs.String("bench", "", "the bench measurements, CSV (required)")
	date := fs.String("date", "", "the calibration's date, YYYY-MM-DD (default today)")
	write := fs.Bool("write", false, "store the new calibration in the profile file")
	asJSON := fs.Bool("json", false, "print one JSON object")
	if status, done := parseFlags(fs, args, "calibrate", calibrateUsage, stdout, stderr); done {
		return status
	}
	if *ref == "" || *bench == "" {
		return usageError(stderr, "calibrate", "--profile and --bench are required")
	}
	p, src, err := profiles.Open(*ref, *dir)
	if err != nil {
		return usageError(stderr, "calibrate", "--profile: "+err.Error())
	}
	if *write && src.Embedded {
		return usageError(stderr, "calibrate", fmt.Sprintf("--write: %s is an embedded demo and cannot be written; save a copy with 'crankside profiles show %s --json > FILE' and calibrate that", p.ID, p.ID))
	}
	bf, err := os.Open(*bench)
	if err != nil {
		return usageError(stderr, "calibrate", "--bench: "+err.Error())
	}
	points, err := profiles.ReadBench(bf, *bench, p)
	bf.Close()
	if err != nil {
		var be *profiles.BenchError
		if errors.As(err, &be) {
			for _, pr := range be.Problems {
				fmt.Fprintf(stderr, "%s: %s\n", *bench, pr)
			}
			fmt.Fprintf(stderr, "crankside calibrate: nothing written\n")
			return exitUsage
		}
		return usageError(stderr, "calibrate", err.Error())
	}
	res, err := setup.Calibrate(p, points, *date, time.Now())
	if err != nil {
		return jobError(stderr, "calibrate", err)
	}
	written := false
	if *write {
		if err := profiles.SaveWithBackup(src.Path, res.Profile); err != nil {
			fmt.Fprintf(stderr, "crankside calibrate: %v\n", err)
			return exitFailure
		}
		written = true
	}
	if *asJSON {
		return writeJSON(stdout, stderr, res.JSON(written))
	}
	res.WriteText(stdout)
	if written {
		fmt.Fprintf(stdout, "Written to %s (the previous file is %s.bak).\n", src.Path, src.Path)
	} else {
		fmt.Fprintln(stdout, "Nothing written: add --write to store this calibration in the profile file.")
	}
	return exitOK
}
