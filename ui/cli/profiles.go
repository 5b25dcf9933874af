package cli

import (
	"errors"
	"fmt"
	"io"
	"sort"
	"time"

	"crankside/physiology"
	"crankside/profiles"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

var profilesUsage = []string{
	"profiles list [--profiles DIR] [--json]",
	"profiles show ID|PATH [--profiles DIR] [--json]",
	"profiles validate FILE [--json]",
	"profiles new --from ID|PATH --id NEW [--label TEXT]",
}

const profilesLong = `list shows the embedded demo profiles and every .json file in the profiles
directory (a bad file is listed with its error). show --json prints the
profile file itself, so it can be saved and edited. validate checks a file
and names every problem with its field. new prints a profile to edit by
hand for a unit being measured: a copy of another with a new id, without
its calibration.

list --json and validate --json print one object whose first keys are
"format" (crankside-profile-list/1, crankside-profile-validation/1),
"model_version" and "program_version"; show --json is the profile file, whose
"format" is the profile's. Exit status: list 1 when a file is bad;
validate 2 when the file is not a valid profile.
`

var profilesCommand = &Command{
	Name:  "profiles",
	Usage: profilesUsage,
	Short: "the machine profiles",
	Run:   runProfiles,
}

func runProfiles(env Env) int {
	if len(env.Args) == 0 {
		return UsageError(env.Stderr, "profiles", "name a sub-command: list, show or validate")
	}
	sub, rest := env.Args[0], env.Args[1:]
	switch sub {
	case "--help", "-h", "help":
		fmt.Fprint(env.Stdout, help(profilesUsage, profilesLong))
		return ExitOK
	case "new":
		return profilesNew(env, rest)
	case "list", "show", "validate":
	default:
		return UsageError(env.Stderr, "profiles", fmt.Sprintf("unknown sub-command %s; use list, show, validate or new", physiology.Quote(sub)))
	}
	f := newFlags("profiles "+sub, help(profilesUsage, profilesLong))
	dir := f.text("profiles", profiles.DefaultDir(), "directory of profile files")
	asJSON := f.boolean("json", "show: print the profile file itself; list, validate: print one JSON object")
	if status, done := f.parse(env, interspersed(rest, f.fs), "profiles "+sub, true); done {
		return status
	}
	if sub == "list" {
		return profilesList(env, dir(), asJSON())
	}
	if f.fs.NArg() != 1 {
		return UsageError(env.Stderr, "profiles "+sub, "name one profile")
	}
	if sub == "show" {
		return profilesShow(env, f.fs.Arg(0), dir(), asJSON())
	}
	if asJSON() {
		return profilesValidateJSON(env, f.fs.Arg(0))
	}
	return profilesValidate(env, f.fs.Arg(0))
}

func profilesList(env Env, dir string, asJSON bool) int {
	entries, err := profiles.List(dir)
	if err != nil {
		fmt.Fprintf(env.Stderr, "crankside profiles list: %s\n", safetext.Escape(err.Error()))
		return ExitFailure
	}
	if asJSON {
		return profilesListJSON(env, dir, entries)
	}
	bad := 0
	for _, e := range entries {
		if e.Err != nil {
			bad++
			fmt.Fprintf(env.Stdout, "%-16s BAD   %s\n", safetext.Escape(e.ID), safetext.Escape(e.Err.Error()))
			continue
		}
		fmt.Fprintf(env.Stdout, "%-16s %-44s %s\n", safetext.Escape(e.ID), safetext.Escape(e.Label), safetext.Escape(e.Source.String()))
	}
	if dir != "" {
		fmt.Fprintf(env.Stdout, "(profiles directory: %s)\n", safetext.Escape(dir))
	}
	if bad > 0 {
		return ExitFailure
	}
	return ExitOK
}

func profilesShow(env Env, ref, dir string, asJSON bool) int {
	p, src, err := profiles.Open(ref, dir)
	if err != nil {
		return UsageError(env.Stderr, "profiles show", err.Error())
	}
	if asJSON {
		data, err := profiles.Marshal(p)
		if err != nil {
			fmt.Fprintf(env.Stderr, "crankside profiles show: %v\n", err)
			return ExitFailure
		}
		env.Stdout.Write(data)
		return ExitOK
	}
	s, err := setup.DescribeProfile(p, time.Now())
	if err != nil {
		fmt.Fprintf(env.Stderr, "crankside profiles show: %s\n", safetext.Escape(err.Error()))
		return ExitFailure
	}
	fmt.Fprintf(env.Stdout, "%s (%s)\n", safetext.Escape(p.ID), safetext.Escape(src.String()))
	return writeText(env, "profiles show", func(w io.Writer) error { return report.ProfileText(w, s) })
}

func profilesValidate(env Env, path string) int {
	p, err := profiles.ReadFile(path)
	if err == nil {
		return validProfile(env, path, p)
	}
	var pe *profiles.Error
	if errors.As(err, &pe) {
		lines := make([]string, 0, len(pe.Problems))
		for _, p := range pe.Problems {
			lines = append(lines, p.Error())
		}
		sort.Strings(lines)
		for _, l := range lines {
			fmt.Fprintf(env.Stderr, "%s: %s\n", safetext.Escape(path), safetext.Escape(l))
		}
		return ExitUsage
	}
	fmt.Fprintf(env.Stderr, "crankside profiles validate: %s\n", safetext.Escape(err.Error()))
	return ExitUsage
}

// validProfile prints the "valid" line and, under it, every warning the
// profile's own checks give, each with its level word: the defaults used,
// look-alike hole labels, and the machine's cautions (relief valve,
// calibration) as profiles show gives them.
func validProfile(env Env, path string, p profiles.Profile) int {
	name := safetext.Escape(path)
	fmt.Fprintf(env.Stdout, "%s: valid %s profile\n", name, safetext.Escape(p.Format))
	for _, d := range p.Defaults {
		fmt.Fprintf(env.Stdout, "%s: %s %s not in the file: the default is used\n", name, setup.LevelWord(setup.Note), safetext.Escape(d))
	}
	for _, w := range profiles.Warnings(p) {
		fmt.Fprintf(env.Stdout, "%s: %s %s\n", name, setup.LevelWord(setup.Warn), safetext.Escape(w.Error()))
	}
	s, err := setup.DescribeProfile(p, time.Now())
	if err != nil {
		fmt.Fprintf(env.Stderr, "crankside profiles validate: %s: %s\n", name, safetext.Escape(err.Error()))
		return ExitFailure
	}
	for _, c := range s.Cautions {
		fmt.Fprintf(env.Stdout, "%s: %s %s: %s; %s [%s]\n", name, setup.LevelWord(c.Level), c.ID,
			safetext.Escape(c.Message), safetext.Escape(c.Advice), c.Source)
	}
	return ExitOK
}

func profilesNew(env Env, args []string) int {
	f := newFlags("profiles new", help(profilesUsage, profilesLong))
	from := f.text("from", profiles.DefaultID, "the profile to start from")
	id := f.text("id", "", "the new profile's id (lower-case letters, digits, - and _)")
	label := f.text("label", "", "the new profile's label")
	dir := f.text("profiles", profiles.DefaultDir(), "directory of profile files")
	if status, done := f.parse(env, args, "profiles new", false); done {
		return status
	}
	if id() == "" {
		return UsageError(env.Stderr, "profiles new", "--id is required")
	}
	if builtin, err := profiles.Embedded(); err == nil {
		for _, e := range builtin {
			if e.ID == id() {
				return UsageError(env.Stderr, "profiles new", fmt.Sprintf("--id %s is a built-in demo's id, and that id opens the built-in one; give the new unit its own id", physiology.Quote(id())))
			}
		}
	}
	p, _, err := profiles.Open(from(), dir())
	if err != nil {
		return UsageError(env.Stderr, "profiles new", "--from: "+err.Error())
	}
	p.ID, p.Calibration = id(), nil
	p.Label = "New unit (edit me): measure every field"
	if label() != "" {
		p.Label = label()
	}
	data, err := profiles.Marshal(p)
	if err == nil {
		_, err = profiles.Parse(data, "the new profile")
	}
	if err != nil {
		return UsageError(env.Stderr, "profiles new", err.Error())
	}
	env.Stdout.Write(data)
	return ExitOK
}

// profileListJSON is `profiles list --json`: every profile found, a bad
// file with its problem in place of a label.
type profileListJSON struct {
	Profiles []profileEntryJSON `json:"profiles"`
	Dir      string             `json:"profiles_dir"`
}

type profileEntryJSON struct {
	ID      string `json:"id"`
	Label   string `json:"label,omitempty"`
	Source  string `json:"source"`
	Problem string `json:"problem,omitempty"`
}

func profilesListJSON(env Env, dir string, entries []profiles.Entry) int {
	out := profileListJSON{Profiles: []profileEntryJSON{}, Dir: dir}
	bad := 0
	for _, e := range entries {
		j := profileEntryJSON{ID: e.ID, Label: e.Label, Source: e.Source.String()}
		if e.Err != nil {
			bad++
			j.Label, j.Problem = "", e.Err.Error()
		}
		out.Profiles = append(out.Profiles, j)
	}
	if status := writeJSON(env, setup.FormatProfileListJSON, out); status != ExitOK || bad == 0 {
		return status
	}
	return ExitFailure
}

// validationJSON is `profiles validate --json`: whether the file is a
// valid profile, every problem with its field path, and for a valid one
// the defaults used, the warnings and the machine's cautions.
type validationJSON struct {
	File          string          `json:"file"`
	Valid         bool            `json:"valid"`
	ProfileFormat string          `json:"profile_format,omitempty"`
	Problems      []fieldJSON     `json:"problems"`
	Defaults      []string        `json:"defaults"`
	Warnings      []fieldJSON     `json:"warnings"`
	Cautions      []setup.Caution `json:"cautions"`
}

type fieldJSON struct {
	Path    string `json:"path"`
	Problem string `json:"problem"`
}

func profilesValidateJSON(env Env, path string) int {
	out := validationJSON{File: path, Problems: []fieldJSON{}, Defaults: []string{}, Warnings: []fieldJSON{}, Cautions: []setup.Caution{}}
	p, err := profiles.ReadFile(path)
	var pe *profiles.Error
	switch {
	case errors.As(err, &pe):
		for _, fe := range pe.Problems {
			out.Problems = append(out.Problems, fieldJSON{Path: fe.Path, Problem: fe.Problem})
		}
	case err != nil:
		out.Problems = append(out.Problems, fieldJSON{Problem: err.Error()})
	default:
		s, derr := setup.DescribeProfile(p, time.Now())
		if derr != nil {
			out.Problems = append(out.Problems, fieldJSON{Problem: derr.Error()})
			break
		}
		out.Valid, out.ProfileFormat = true, p.Format
		out.Defaults = append(out.Defaults, p.Defaults...)
		for _, w := range profiles.Warnings(p) {
			out.Warnings = append(out.Warnings, fieldJSON{Path: w.Path, Problem: w.Problem})
		}
		out.Cautions = append(out.Cautions, s.Cautions...)
	}
	status := writeJSON(env, setup.FormatValidationJSON, out)
	if status == ExitOK && !out.Valid {
		return ExitUsage // as the text: a file that is not a valid profile
	}
	return status
}
