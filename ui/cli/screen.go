package cli

import (
	"fmt"
	"os"
	"time"

	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"crankside/logbook"
	"crankside/profiles"
	"crankside/setup"
	"crankside/ui"
)

// RunScreen opens the full-screen UI, prefilled from any plan flags given:
// the entries go to the screen's fields as typed, and the screen shows
// what the entry builder makes of them.
func RunScreen(env Env) int {
	f, profile, dir := planFlagSet("", TopUsage()+"\nFlags of the screen:\n")
	logPath := f.text("log", logbook.DefaultLogPath(), "the handover log the screen records checks in")
	every := f.text("every", "", "hours between checks, for the bed's next check due on the status line (default 4, common practice)")
	asJSON := f.boolean("json", "(for sub-commands only)")
	if status, done := f.parse(env, env.Args, "", false); done {
		return status
	}
	if asJSON() {
		return UsageError(env.Stderr, "", "--json goes with a sub-command, such as 'crankside plan --json'")
	}
	if _, ie := setup.CheckInterval(every()); ie != nil {
		return UsageError(env.Stderr, "", "--every: "+ie.Reason)
	}
	prefill := map[string]string{}
	for _, name := range f.order {
		if v, ok := f.entries[name]; ok {
			prefill[name] = v
		}
	}
	if _, problems := setup.BuildRequest(prefill, time.Time{}); len(problems) > 0 {
		for _, p := range problems {
			if !p.Missing {
				return problemsError(env.Stderr, "", setup.Problems{p})
			}
		}
	}
	if v, ok := prefill["height-in"]; ok {
		// The screen's height field takes inches with their unit.
		prefill["height-cm"] = v + "in"
		delete(prefill, "height-in")
	}
	p, src, err := profiles.Open(profile(), dir())
	if err != nil {
		return UsageError(env.Stderr, "", "--profile: "+err.Error())
	}
	if os.Getenv("TERM") == "dumb" {
		// A terminal that cannot move the cursor gets what a missing one
		// gets: one plain line, and the commands that work there.
		return screenRefused(env, "TERM=dumb: this terminal cannot draw it")
	}
	noColor := os.Getenv("NO_COLOR") != ""
	if noColor {
		// NO_COLOR takes the colours away, not the terminal's other
		// attributes: the text cursor is inverse (reversed) colours, the levels bold.
		lipgloss.SetColorProfile(termenv.ANSI)
	}
	opts := ui.Options{Profile: p, Source: src, ProfilesDir: dir(), Prefill: prefill, LogPath: logPath(), NoColor: noColor, Every: everyEntered(every())}
	opts.PreferencesPath = setup.DefaultPreferencesPath()
	if opts.PreferencesPath != "" {
		prefs, err := setup.ReadPreferences(opts.PreferencesPath)
		opts.Preferences = prefs
		if err != nil {
			opts.PreferencesNote = err.Error() + "; mmHg until a unit is chosen"
		}
	}
	err = ui.Run(opts)
	if err != nil {
		return screenRefused(env, err.Error())
	}
	return ExitOK
}

// screenRefused says in one plain line why the screen did not start and
// which sub-commands do the same work without it.
func screenRefused(env Env, why string) int {
	fmt.Fprintf(env.Stderr, "crankside: the bedside screen could not start (%s); use the sub-commands instead: 'crankside plan', 'crankside check', 'crankside log' ('crankside --help' lists them)\n", why)
	return ExitFailure
}
