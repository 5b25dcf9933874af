package cli

import (
	"fmt"
	"io"
	"strings"

	"crankside/physiology"
	"crankside/profiles/safetext"
	"crankside/setup"
)

const logLong = `Usage: crankside log show --log FILE [--bed LABEL] [--json]

Lists the handover checks in a log, by bed and in time order, with what
changed from one check to the next. A torn last line (the program stopped
while writing it) or junk is skipped and reported; earlier records stay.

Flags:
`

var logCommand = &Command{
	Name:      "log",
	UsageLine: "log show --log FILE [--bed LABEL]",
	Short:     "earlier checks and what changed",
	Long:      logLong,
	Run:       runLog,
}

func runLog(env Env) int {
	args := env.Args
	if len(args) == 0 {
		return UsageError(env.Stderr, "log", "name a sub-command: show")
	}
	switch args[0] {
	case "--help", "-h", "help":
		fmt.Fprint(env.Stdout, logLong)
		return ExitOK
	case "show":
		return runLogShow(env, args[1:])
	}
	return UsageError(env.Stderr, "log", fmt.Sprintf("unknown sub-command %s; use show", physiology.Quote(args[0])))
}

func runLogShow(env Env, args []string) int {
	f := newFlags("log show", logLong)
	path := f.text("log", "", "the log file")
	bed := f.text("bed", "", "only this bed")
	asJSON := f.boolean("json", "print JSON")
	if status, done := f.parse(env, args, "log show", false); done {
		return status
	}
	if path() == "" {
		return UsageError(env.Stderr, "log show", "--log FILE is required")
	}
	recs, problems, err := setup.ReadLog(path())
	if err != nil {
		return UsageError(env.Stderr, "log show", err.Error())
	}
	for _, pr := range problems {
		fmt.Fprintf(env.Stderr, "crankside log show: %s: %s\n", safetext.Escape(path()), safetext.Escape(pr.String()))
	}
	hist := setup.History(recs, bed())
	if asJSON() {
		return writeJSON(env, logJSON(hist, problems))
	}
	status := writeText(env, "log show", func(w io.Writer) error { return writeHistory(w, hist) })
	if status == ExitOK && len(problems) > 0 {
		return ExitFailure
	}
	return status
}

func logJSON(hist []setup.BedHistory, problems []setup.LogProblem) any {
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
	return out
}

func writeHistory(w io.Writer, hist []setup.BedHistory) error {
	var b strings.Builder
	if len(hist) == 0 {
		b.WriteString("No checks recorded for that bed.\n")
	}
	for _, h := range hist {
		fmt.Fprintf(&b, "Bed %s: %d check(s)\n", h.Bed, len(h.Entries))
		for _, e := range h.Entries {
			fmt.Fprintf(&b, "  %s\n", setup.HistoryLine(e.Record))
			if len(e.Changes) > 0 {
				fmt.Fprintf(&b, "      changed: %s\n", strings.Join(e.Changes, "; "))
			}
		}
	}
	_, err := fmt.Fprint(w, b.String())
	return err
}
