// Command crankside helps respiratory therapists set and check a locally
// built, motor-driven piston ventilator: from a patient's height and sex to
// the crank hole, motor speed and dwell of one particular machine, with the
// predicted pressures and the cautions that apply.
//
// With no arguments it opens the full-screen UI on the embedded demo
// profile. Sub-commands (ui/cli, one file each) print the same
// computations, as text or --json.
package main

import (
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"strings"

	"crankside/physiology"
	"crankside/ui/cli"
)

// version is the release, kept in setup (setup.ProgramRelease) so that
// every --json output names the same one.
const version = cli.Release

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// run is the whole program but the process exit, so it can be tested. A
// panic is a bug: it is recovered into one line, never a trace on the
// bedside terminal.
func run(args []string, stdout, stderr io.Writer) (status int) {
	defer func() {
		if r := recover(); r != nil {
			fmt.Fprintf(stderr, "crankside: internal error: %v (please report it with the command you ran)\n", r)
			status = cli.ExitInternal
		}
	}()
	env := cli.Env{Args: args, Stdout: stdout, Stderr: stderr}
	if len(args) == 0 {
		return cli.RunScreen(env)
	}
	name := args[0]
	if c := cli.Lookup(name); c != nil {
		env.Args = args[1:]
		return c.Run(env)
	}
	switch name {
	case "--version", "-version", "version":
		info, _ := debug.ReadBuildInfo()
		fmt.Fprintln(stdout, versionLine(info))
		return cli.ExitOK
	case "--help", "-help", "-h", "help":
		fmt.Fprint(stdout, cli.TopUsage())
		return cli.ExitOK
	}
	if strings.HasPrefix(name, "-") {
		return cli.RunScreen(env)
	}
	return cli.UsageError(stderr, "", fmt.Sprintf("unknown command %s", physiology.Quote(name)))
}

// versionLine is the version and the source it was built from: the VCS
// revision the go command stamps into a build made in a checkout, with
// its commit time and whether the tree had uncommitted changes. go run,
// go test and a build outside a checkout (or with -buildvcs=false) stamp
// none: then it says the revision is unknown rather than guess.
func versionLine(info *debug.BuildInfo) string {
	var rev, when string
	modified := false
	if info != nil {
		for _, s := range info.Settings {
			switch s.Key {
			case "vcs.revision":
				rev = s.Value
			case "vcs.time":
				when = s.Value
			case "vcs.modified":
				modified = s.Value == "true"
			}
		}
	}
	if rev == "" {
		return fmt.Sprintf("crankside %s (revision unknown: this build carries no VCS stamp)", version)
	}
	detail := "revision " + rev
	if when != "" {
		detail += ", committed " + when
	}
	if modified {
		detail += ", with uncommitted changes"
	}
	return fmt.Sprintf("crankside %s (%s)", version, detail)
}
