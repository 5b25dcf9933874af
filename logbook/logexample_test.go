package logbook_test

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"crankside/logbook"
	"crankside/setup"
)

// A log with eight damaged lines among no records: five are named with
// their line numbers, the rest only counted.
func ExampleLogSummary_Lines() {
	dir, err := os.MkdirTemp("", "crankside-example")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "ward.jsonl")
	junk := strings.Repeat("not a record\n", 7) + `{"format":"crankside-check/1","bed":"B4"`
	if err := os.WriteFile(path, []byte(junk), 0o600); err != nil {
		fmt.Println(err)
		return
	}
	_, sum, err := logbook.WardRows([]string{path}, setup.Record{}.Time, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range sum.Lines() {
		fmt.Println(strings.TrimPrefix(l, path+" "))
	}
	// Output:
	// line 1: not a whole check record; skipped
	// line 2: not a whole check record; skipped
	// line 3: not a whole check record; skipped
	// line 4: not a whole check record; skipped
	// line 5: not a whole check record; skipped
	// and 3 more damaged lines
}
