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
	"strings"

	"crankside/physiology"
	"crankside/ui/cli"
)

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
		fmt.Fprintf(stdout, "crankside %s\n", cli.Release)
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
