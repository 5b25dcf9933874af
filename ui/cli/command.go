// Package cli holds crankside's sub-commands, one file each, behind a small
// command table in the manner of the Go command's own source: each Command
// has its usage lines, its help and its run function; the run function
// declares the command's flags afresh on each run (a flags value, from
// newFlags), and the help it prints is built from the same usage lines as
// the top-level help, so the two cannot drift. The
// commands only collect what was typed, as text keyed by the flag's name,
// and hand it to setup's one entry builder (setup.BuildRequest,
// setup.BuildCheckRequest); every number, default and rule comes from
// there, and every figure printed comes from setup's reports.
//
// Bad input (a flag, a number, a profile file) gets one line on stderr
// naming the flag, the value and the accepted range, and exit status 2;
// a failure of the job itself exits 1. Nothing here panics on input.
package cli

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"

	"crankside/physiology"
	"crankside/profiles/safetext"
	"crankside/setup"
)

// Exit statuses. ExitStop is a plan or check that ran and whose highest
// caution is a STOP (its setting's or its proposal's): a script learns of
// it without reading the text.
const (
	ExitOK       = 0
	ExitFailure  = 1
	ExitUsage    = 2
	ExitStop     = 3
	ExitInternal = 70
)

// Release is the program's release, for --version.
const Release = setup.ProgramRelease

// exitStatusHelp is the paragraph plan's and check's help give.
const exitStatusHelp = `Exit status: 0 done, no STOP; 3 done, and a caution is a STOP (the
setting's, or the proposal's for a check; the output is complete, and for a
check with --log it is 3 even if the record failed: stderr says so); 2 a
bad flag or entry; 1 any other failure.
`

// Env is what a command runs with: its arguments and its two outputs.
type Env struct {
	Args           []string
	Stdout, Stderr io.Writer
}

// Command is one sub-command.
type Command struct {
	Name  string            // as typed: "plan"
	Usage []string          // each form, after "crankside": "plan --height-cm N --sex male|female [flags]"
	Short string            // one line for the top-level help
	Run   func(env Env) int // prints help(usage, its long text) for --help
}

// help is a command's help before its flags: its usage lines, the one
// source of both this and the top-level help, then its long text.
func help(usage []string, long string) string {
	var b strings.Builder
	b.WriteString("Usage:\n")
	for _, u := range usage {
		fmt.Fprintf(&b, "  crankside %s\n", u)
	}
	b.WriteString("\n" + long)
	return b.String()
}

// Commands is the table main dispatches on, in the order of the help.
func Commands() []*Command {
	return []*Command{planCommand, checkCommand, logCommand, profilesCommand, calibrateCommand}
}

// Lookup finds a command by name.
func Lookup(name string) *Command {
	for _, c := range Commands() {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// TopUsage is the help for crankside as a whole.
func TopUsage() string {
	var b strings.Builder
	b.WriteString("crankside: set and check a motor-driven piston ventilator.\n\nUsage:\n")
	b.WriteString("  crankside [plan flags] [--profile ID|PATH] [--profiles DIR] [--log FILE]\n")
	b.WriteString("                                    the bedside screen, on the demo profile unless\n")
	b.WriteString("                                    --profile names another; plan flags prefill it\n")
	for _, c := range Commands() {
		for _, u := range c.Usage {
			fmt.Fprintf(&b, "  crankside %s\n", u)
		}
		fmt.Fprintf(&b, "%36s%s\n", "", c.Short)
	}
	b.WriteString("  crankside --version\n\nRun 'crankside COMMAND --help' for a command's flags.\n\n")
	b.WriteString(setup.ClinicalCaution + "\n")
	return b.String()
}

// UsageError prints one line naming the command and what is wrong, and
// returns ExitUsage.
func UsageError(stderr io.Writer, cmd, msg string) int {
	name := "crankside"
	if cmd != "" {
		name += " " + cmd
	}
	fmt.Fprintf(stderr, "%s: %s (run '%s --help')\n", name, safetext.Escape(msg), name)
	return ExitUsage
}

// problemsError prints the first problem of an entry builder on one line,
// with the names of any others, and returns ExitUsage.
func problemsError(stderr io.Writer, cmd string, ps setup.Problems) int {
	first := ps[0]
	msg := "--" + first.Field + ": " + first.Reason
	if first.Missing {
		msg = "--" + first.Field + " is " + first.Reason
	}
	if len(ps) > 1 {
		var more []string
		for _, p := range ps[1:] {
			more = append(more, "--"+p.Field)
		}
		msg += "; also check " + strings.Join(more, ", ")
	}
	return UsageError(stderr, cmd, msg)
}

// jobError reports an error from setup: bad input names its flag and exits
// 2; anything else exits 1.
func jobError(stderr io.Writer, cmd string, err error) int {
	var ie *setup.InputError
	if errors.As(err, &ie) {
		return UsageError(stderr, cmd, "--"+ie.Field+": "+ie.Reason)
	}
	fmt.Fprintf(stderr, "crankside %s: %s\n", cmd, safetext.Escape(err.Error()))
	return ExitFailure
}

// writeJSON prints v, a JSON object, with its format and the model and
// program versions as its first keys (setup.VersionedJSON).
func writeJSON(env Env, format string, v any) int {
	b, err := setup.VersionedJSON(format, v)
	if err == nil {
		_, err = env.Stdout.Write(b)
	}
	if err != nil {
		fmt.Fprintf(env.Stderr, "crankside: %v\n", err)
		return ExitFailure
	}
	return ExitOK
}

// writeText sends a report through the terminal-safe writer: no control
// character or bidi override from a file or an entry reaches the terminal.
func writeText(env Env, cmd string, write func(io.Writer) error) int {
	sw := safetext.NewWriter(env.Stdout)
	err := write(sw)
	if err == nil {
		err = sw.Flush()
	}
	if err != nil {
		fmt.Fprintf(env.Stderr, "crankside %s: %v\n", cmd, err)
		return ExitFailure
	}
	return ExitOK
}

// flags is a command's flag set that keeps every value as typed, refuses a
// flag given twice, and prints its own help.
type flags struct {
	fs      *flag.FlagSet
	entries setup.Entries
	order   []string
	usage   string
}

func newFlags(name, usage string) *flags {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	return &flags{fs: fs, entries: setup.Entries{}, usage: usage}
}

// once is a flag value that may be given only once.
type once struct {
	name  string
	dst   setup.Entries
	multi *[]string // for flags that may repeat
}

func (o *once) String() string {
	if o == nil || o.dst == nil {
		return ""
	}
	return o.dst[o.name]
}

func (o *once) Set(s string) error {
	if strings.TrimSpace(s) == "" {
		return fmt.Errorf("empty: give a value, or leave the flag out for the default")
	}
	if o.multi != nil {
		*o.multi = append(*o.multi, s)
		return nil
	}
	if _, dup := o.dst[o.name]; dup {
		return fmt.Errorf("given twice (%s and %s): give it once", physiology.Quote(o.dst[o.name]), physiology.Quote(s))
	}
	o.dst[o.name] = s
	return nil
}

// onceBool is a boolean flag that may be given only once.
type onceBool struct {
	once
}

func (o *onceBool) IsBoolFlag() bool { return true }

func (o *onceBool) Set(s string) error {
	if s != "true" && s != "false" {
		return fmt.Errorf("%s is not true or false", physiology.Quote(s))
	}
	return o.once.Set(s)
}

// entry declares a flag whose text goes to the entry builder.
func (f *flags) entry(name, usage string) {
	f.fs.Var(&once{name: name, dst: f.entries}, name, usage)
	f.order = append(f.order, name)
}

// entryBool declares a yes/no flag (--name, or --name=false) whose "true"
// or "false" goes to the entry builder.
func (f *flags) entryBool(name, usage string) { f.entryBoolDefault(name, "false", usage) }

// entryBoolDefault is entryBool with the default the help shows; the entry
// builder applies the same default to a blank entry.
func (f *flags) entryBoolDefault(name, def, usage string) {
	f.fs.Var(&onceBool{once{name: name, dst: f.entries}}, name, usage)
	f.fs.Lookup(name).DefValue = def
	f.order = append(f.order, name)
}

// text declares a flag read by the command itself, with a default shown in
// the help.
func (f *flags) text(name, def, usage string) func() string {
	f.fs.Var(&once{name: name, dst: f.entries}, name, usage)
	f.fs.Lookup(name).DefValue = def
	return func() string {
		if v, ok := f.entries[name]; ok {
			return v
		}
		return def
	}
}

// repeated declares a flag that may be given more than once.
func (f *flags) repeated(name, usage string) *[]string {
	var vals []string
	f.fs.Var(&once{name: name, multi: &vals}, name, usage)
	return &vals
}

func (f *flags) boolean(name, usage string) func() bool {
	f.fs.Var(&onceBool{once{name: name, dst: f.entries}}, name, usage)
	f.fs.Lookup(name).DefValue = "false"
	return func() bool { return f.entries[name] == "true" }
}

// parse parses the arguments. done is true, with the status to exit with,
// when the command should go no further: help was asked for, a flag was
// bad, or an argument was given where none is taken.
func (f *flags) parse(env Env, args []string, cmd string, positional bool) (status int, done bool) {
	if err := f.fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			f.printHelp(env.Stdout)
			return ExitOK, true
		}
		return UsageError(env.Stderr, cmd, flagError(err)), true
	}
	if !positional && f.fs.NArg() > 0 {
		return UsageError(env.Stderr, cmd, fmt.Sprintf("unexpected argument %s", physiology.Quote(f.fs.Arg(0)))), true
	}
	return ExitOK, false
}

func (f *flags) printHelp(w io.Writer) {
	fmt.Fprint(w, f.usage)
	f.fs.VisitAll(func(fl *flag.Flag) {
		def := ""
		if fl.DefValue != "" && fl.DefValue != "false" {
			def = fmt.Sprintf(" (default %q)", fl.DefValue)
		}
		fmt.Fprintf(w, "  --%-16s %s%s\n", fl.Name, fl.Usage, def)
	})
	fmt.Fprintf(w, "\n%s\n", setup.ClinicalCaution)
}

// flagError turns the flag package's wording into one line naming the flag.
func flagError(err error) string {
	msg := err.Error()
	if strings.HasPrefix(msg, "invalid value ") {
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

// interspersed moves flags after positional arguments to the front, so
// "show demo-a --json" works as people type it.
func interspersed(args []string, fs *flag.FlagSet) []string {
	var fl, pos []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			pos = append(pos, args[i+1:]...)
			break
		}
		if strings.HasPrefix(a, "-") && len(a) > 1 {
			fl = append(fl, a)
			name := strings.TrimLeft(a, "-")
			if f := fs.Lookup(name); f != nil && !strings.Contains(name, "=") && f.DefValue != "false" && i+1 < len(args) {
				fl = append(fl, args[i+1])
				i++
			}
			continue
		}
		pos = append(pos, a)
	}
	return append(fl, pos...)
}

// sharedEntries declares the entries plan and check (and the screen) take
// with one meaning: the patient's height and sex, the oxygen cylinder and
// the room. Their help is written here once, with the ranges the entry
// builder holds them to; what differs between the commands (a PEEP wanted
// or set, a lung planned for or assumed) each command writes itself.
func (f *flags) sharedEntries() {
	f.entry("height-cm", fmt.Sprintf("patient's height in cm (%g-%g), or with its unit: 70in, 5'10\" (required, or --height-in)",
		physiology.HeightMinCm, physiology.HeightMaxCm))
	f.entry("height-in", fmt.Sprintf("patient's height in inches (%.1f-%.1f), instead of --height-cm",
		physiology.HeightMinCm/2.54, physiology.HeightMaxCm/2.54))
	f.entry("sex", "male or female (required)")
	f.entry("cylinder-l", "oxygen cylinder water capacity in L (optional, with --cylinder-bar)")
	f.entry("cylinder-bar", "oxygen cylinder pressure in bar (with --cylinder-l)")
	f.entry("cylinder-reserve-bar", "change the cylinder at this pressure, bar (1-150; default 40: about a fifth of a full cylinder, common practice)")
	f.entry("room-c", "room temperature in C for the BTPS factor (0-45; default 22, common practice)")
	f.entry("room-rh", "room relative humidity in % (0-100; default 50, common practice)")
	f.entry("barometric-mmhg", "barometric pressure in mmHg (450-800; default 760, sea level: enter the local barometer)")
	f.entry("barometric-hpa", "barometric pressure in hPa, instead of --barometric-mmhg (1 hPa = 0.750062 mmHg)")
}
