package cli

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"time"

	"crankside/logbook"
	"crankside/physiology"
	"crankside/profiles/safetext"
	"crankside/report"
	"crankside/setup"
)

var logUsage = []string{
	"log show --log FILE|DIR [--log ...] [--bed LABEL] [--limit N | --all] [--max-files N] [--json]",
	"log beds --log FILE|DIR [--log ...] [--every HOURS] [--max-files N] [--json]",
}

const logLong = `show lists the handover checks, bed by bed, newest first, with what
changed since the check before and which log (terminal) each came from: the
newest 100 of each bed (--limit N for another number, --all for every one;
memory then grows with the history), and a line counting the earlier ones.
beds shows one row per bed: its last check, how long ago, the setting found,
mL/kg, the highest caution, whether a change was proposed, and OVERDUE when
the last check is older than --every hours (default 4: common practice; use
your local interval); the most urgent first (stop, overdue, warn).

--log may be given more than once, and may name a folder of *.jsonl logs
(each bedside terminal keeps its own): records are merged by time, and a
record found in two logs (a copied file) is counted once. Damaged or torn
lines are skipped, and summarised on stderr; earlier records stay. A log
found in a folder that fails the log checks (readable by others, a link,
another user's) is skipped and said on stderr, with exit 1 after the rest;
a log named directly with --log is refused. A read of more than a second
says how far it has got on stderr ("reading 12 000 of 100 000 files...").
At most --max-files log files are read (default 10 000: a ward's folder holds
a log per terminal, or per terminal and month, far fewer; a folder of more is
more likely the wrong one, and takes a while): with more, nothing is read and
the one line on stderr says how many were found (exit 2).

A line the writer could not have written (a key twice or in another case, a
bed label or initials it refuses, figures out of range or that disagree, a
STOP its figures call for that is missing) is damaged, never a bed. A record
dated more than 5 min ahead of this clock never stands for a bed's last
check: it is named beside it, with its year. Checks of one bed from two logs
within 5 min are shown with a conflict note; the ward row is the one with the
louder caution, whatever the order of --log.

--json prints one object: "format" (crankside-history/3 for show,
crankside-ward/3 for beds), "model_version", "program_version", then
"beds" and "problems" (the damaged lines, as on stderr); each bed of show
has "checks" (the newest shown), "checks_total" and "checks_not_shown".

Exit status: 0 read; 1 a damaged line or a skipped log (stderr says which);
2 a bad flag, or a log that cannot be opened.
`

var logCommand = &Command{
	Name:  "log",
	Usage: logUsage,
	Short: "earlier checks, and every bed's last check",
	Run:   runLog,
}

func runLog(env Env) int {
	args := env.Args
	if len(args) == 0 {
		return UsageError(env.Stderr, "log", "name a sub-command: show or beds")
	}
	switch args[0] {
	case "--help", "-h", "help":
		fmt.Fprint(env.Stdout, help(logUsage, logLong))
		fmt.Fprint(env.Stdout, "\nRun 'crankside log show --help' or 'crankside log beds --help' for their flags.\n")
		return ExitOK
	case "show":
		return runLogShow(env, args[1:])
	case "beds":
		return runLogBeds(env, args[1:])
	}
	return UsageError(env.Stderr, "log", fmt.Sprintf("unknown sub-command %s; use show or beds", physiology.Quote(args[0])))
}

// summarise prints a few damaged lines and a count on stderr; it says
// whether there were any.
func summarise(env Env, cmd string, sum logbook.LogSummary) bool {
	for _, l := range sum.Lines() {
		fmt.Fprintf(env.Stderr, "crankside %s: %s\n", cmd, safetext.Escape(l))
	}
	return sum.Damaged > 0
}

// expandLogs turns the --log files and folders into files, saying on
// stderr of each log found in a folder that it was skipped because it
// fails the log checks (its beds are missing from what follows). skipped
// tells the caller to exit 1 once the rest is printed; done means stop
// now with status. More files than --max-files is one line, exit 2.
func expandLogs(env Env, cmd string, logs []string, opts []logbook.ReadOption) (files []string, skipped bool, status int, done bool) {
	files, skips, err := logbook.ExpandLogFolders(logs, opts...)
	var tooMany *logbook.TooManyFilesError
	if errors.As(err, &tooMany) {
		return nil, false, UsageError(env.Stderr, cmd, fmt.Sprintf("--max-files: %s; to read them all, give --max-files %d", err, tooMany.Files)), true
	}
	if err != nil {
		return nil, false, UsageError(env.Stderr, cmd, err.Error()), true
	}
	for _, s := range skips {
		fmt.Fprintf(env.Stderr, "crankside %s: %s\n", cmd, safetext.Escape(s.String()))
	}
	if len(files) == 0 {
		fmt.Fprintf(env.Stderr, "crankside %s: no log could be read: every log found was skipped\n", cmd)
		return nil, true, ExitFailure, true
	}
	return files, len(skips) > 0, ExitOK, false
}

// logFlags are the flags both log sub-commands take: the logs, how many
// files they may be, and JSON.
func logFlags(cmd string) (f *flags, logs *[]string, maxFiles func() string, asJSON func() bool) {
	f = newFlags(cmd, help(logUsage, logLong)+"\nFlags:\n")
	logs = f.repeated("log", "a log file or a folder of logs (may be repeated)")
	maxFiles = f.text("max-files", "", "read at most N log files (default 10 000: more than a ward's folder holds)")
	asJSON = f.boolean("json", "print JSON")
	return f, logs, maxFiles, asJSON
}

// readOptions are the log reads' options from --max-files, with a note of
// progress on stderr; done means stop now with status.
func readOptions(env Env, cmd, maxFiles string) (opts []logbook.ReadOption, status int, done bool) {
	n, ie := logbook.MaxFilesEntry(maxFiles)
	if ie != nil {
		return nil, UsageError(env.Stderr, cmd, "--max-files: "+ie.Reason), true
	}
	note := func(s string) { fmt.Fprintf(env.Stderr, "crankside %s: %s\n", cmd, s) }
	return []logbook.ReadOption{logbook.MaxFiles(n), logbook.WithProgress(logbook.NewProgress(note, 0, nil))}, ExitOK, false
}

// parseLogFlags parses them and refuses a command with no log.
func parseLogFlags(env Env, f *flags, logs *[]string, args []string, cmd string) (status int, done bool) {
	if status, done := f.parse(env, args, cmd, false); done {
		return status, true
	}
	if len(*logs) == 0 {
		return UsageError(env.Stderr, cmd, "--log FILE is required"), true
	}
	return ExitOK, false
}

func runLogShow(env Env, args []string) int {
	f, logs, maxFiles, asJSON := logFlags("log show")
	bed := f.text("bed", "", "only this bed")
	limitText := f.text("limit", "", fmt.Sprintf("show each bed's newest N checks (default %d; the rest are counted)", logbook.HistoryShown))
	all := f.boolean("all", "show every check (memory grows with the history)")
	if status, done := parseLogFlags(env, f, logs, args, "log show"); done {
		return status
	}
	limit, ie := logbook.HistoryLimit(limitText())
	switch {
	case ie != nil:
		return UsageError(env.Stderr, "log show", "--limit: "+ie.Reason)
	case all() && limitText() != "":
		return UsageError(env.Stderr, "log show", "give --limit N or --all, not both")
	case all():
		limit = 0
	}
	opts, status, done := readOptions(env, "log show", maxFiles())
	if done {
		return status
	}
	files, skipped, status, done := expandLogs(env, "log show", *logs, opts)
	if done {
		return status
	}
	hist, sum, err := logbook.ReadHistories(files, bed(), limit, opts...)
	if err != nil {
		return UsageError(env.Stderr, "log show", err.Error())
	}
	damaged := summarise(env, "log show", sum) || skipped
	if asJSON() {
		status = writeJSON(env, setup.FormatHistoryJSON, logJSON(hist, sum))
	} else {
		status = writeText(env, "log show", func(w io.Writer) error { return writeHistory(w, hist, bed(), len(sum.Logs) > 1) })
	}
	if status == ExitOK && damaged {
		return ExitFailure
	}
	return status
}

func logJSON(hist []logbook.BedHistory, sum logbook.LogSummary) any {
	type bedJSON struct {
		Bed    string                 `json:"bed"`
		Checks []logbook.HistoryEntry `json:"checks"`
		Total  int                    `json:"checks_total"`
		Hidden int                    `json:"checks_not_shown"`
	}
	out := struct {
		Beds     []bedJSON `json:"beds"`
		Problems []string  `json:"problems"`
	}{Beds: []bedJSON{}, Problems: []string{}}
	for _, h := range hist {
		out.Beds = append(out.Beds, bedJSON{Bed: h.Bed, Checks: h.Entries, Total: h.Total, Hidden: h.Total - len(h.Entries)})
	}
	out.Problems = append(out.Problems, sum.Lines()...)
	return out
}

func writeHistory(w io.Writer, hist []logbook.BedHistory, bed string, manyLogs bool) error {
	var b strings.Builder
	switch {
	case len(hist) == 0 && bed == "":
		b.WriteString("No checks recorded.\n")
	case len(hist) == 0:
		fmt.Fprintf(&b, "No checks recorded for bed %s.\n", safetext.Escape(bed))
	}
	for _, h := range hist {
		if n := len(h.Entries); n < h.Total {
			fmt.Fprintf(&b, "Bed %s: %d checks, the newest %d first\n", h.Bed, h.Total, n)
		} else {
			fmt.Fprintf(&b, "Bed %s: %d check(s), newest first\n", h.Bed, n)
		}
		for _, e := range h.Entries {
			fmt.Fprintf(&b, "  %s\n", report.HistoryLine(e.Record))
			if p := report.ProposalLine(e.Record); p != "" {
				fmt.Fprintf(&b, "      proposed: %s\n", p)
			}
			if len(e.Changes) > 0 {
				fmt.Fprintf(&b, "      changed: %s\n", strings.Join(e.Changes, "; "))
			}
			if manyLogs && e.Log != "" {
				fmt.Fprintf(&b, "      from %s\n", e.Log)
			}
			if e.Conflict != "" {
				fmt.Fprintf(&b, "      %s\n", e.Conflict)
			}
		}
		if more := h.NotShown("--limit N or --all to see them"); more != "" {
			fmt.Fprintf(&b, "  %s\n", more)
		}
	}
	_, err := io.WriteString(w, b.String())
	return err
}

func runLogBeds(env Env, args []string) int {
	f, logs, maxFiles, asJSON := logFlags("log beds")
	every := f.text("every", "", "hours between checks before a bed is OVERDUE (default 4, common practice)")
	if status, done := parseLogFlags(env, f, logs, args, "log beds"); done {
		return status
	}
	interval, ie := setup.CheckInterval(every())
	if ie != nil {
		return UsageError(env.Stderr, "log beds", "--every: "+ie.Reason)
	}
	opts, status, done := readOptions(env, "log beds", maxFiles())
	if done {
		return status
	}
	files, skipped, status, done := expandLogs(env, "log beds", *logs, opts)
	if done {
		return status
	}
	rows, sum, err := logbook.WardRows(files, time.Now(), interval, opts...)
	if err != nil {
		return UsageError(env.Stderr, "log beds", err.Error())
	}
	damaged := summarise(env, "log beds", sum) || skipped
	if asJSON() {
		if rows == nil {
			rows = []logbook.WardRow{}
		}
		status = writeJSON(env, setup.FormatWardJSON, struct {
			Beds     []logbook.WardRow `json:"beds"`
			Problems []string          `json:"problems"`
		}{rows, append([]string{}, sum.Lines()...)})
	} else {
		status = writeText(env, "log beds", func(w io.Writer) error { return writeBeds(w, rows, interval, len(sum.Logs) > 1) })
	}
	if status == ExitOK && damaged {
		return ExitFailure
	}
	return status
}

func writeBeds(w io.Writer, rows []logbook.WardRow, every time.Duration, manyLogs bool) error {
	var b strings.Builder
	fmt.Fprintf(&b, "%d bed(s), most urgent first; OVERDUE after %g h (%s)\n", len(rows), every.Hours(), setup.CheckEverySource)
	for _, r := range rows {
		b.WriteString(report.WardLine(r))
		if manyLogs {
			b.WriteString("  [" + r.Source + "]")
		}
		b.WriteString("\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}
