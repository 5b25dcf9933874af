package setup_test

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/logbook"
	"crankside/report"
	"crankside/setup"
)

// proposedRecord is a check of hole 8 at 21 rpm with a proposal that
// changes what prop changes, recorded for bed B4 by JK.
func proposedRecord(t *testing.T, prop setup.Proposal) setup.Record {
	t.Helper()
	req := checkReq("8", 21, 1.4)
	req.Proposal = prop
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B4", "jk", today)
	require.NoError(t, err)
	return rec
}

func TestSecondSignatureLineOnlyForHoleOrPEEP(t *testing.T) {
	hole, peep, rpm := "7", 8.0, 24.0
	for _, tc := range []struct {
		name string
		prop setup.Proposal
		want bool
	}{
		{"hole changes", setup.Proposal{Hole: &hole}, true},
		{"PEEP changes", setup.Proposal{PEEPCmH2O: &peep}, true},
		{"only the speed changes", setup.Proposal{RPM: &rpm}, false},
		{"no proposal", setup.Proposal{}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := proposedRecord(t, tc.prop)
			require.Equal(t, tc.want, setup.NeedsSecondSignature(rec))
			var b bytes.Buffer
			require.NoError(t, report.WriteCard(&b, rec))
			require.Equal(t, tc.want, strings.Contains(b.String(), "second checker ______"), b.String())
			for _, line := range strings.Split(b.String(), "\n") {
				require.LessOrEqual(t, len(line), report.CardWidth, line)
			}
		})
	}
}

func TestSecondInitialsOnCardHistoryAndLog(t *testing.T) {
	hole := "7"
	rec, err := proposedRecord(t, setup.Proposal{Hole: &hole}).WithSecondInitials("ab")
	require.NoError(t, err)
	require.Equal(t, "AB", rec.SecondInitials)
	var b bytes.Buffer
	require.NoError(t, report.WriteCard(&b, rec))
	require.Contains(t, b.String(), "checked by JK, second check AB")
	require.Contains(t, b.String(), "second check by AB  signature ____")
	require.Contains(t, report.HistoryLine(rec), "JK+AB")

	// Round trip through the log: the reader gives back what was written.
	path := filepath.Join(t.TempDir(), "log.jsonl")
	require.NoError(t, logbook.AppendRecord(path, rec))
	h, sum, err := logbook.ReadBedHistory([]string{path}, "B4", 0)
	require.NoError(t, err)
	require.Empty(t, sum.Lines())
	require.Len(t, h.Entries, 1)
	require.Equal(t, "AB", h.Entries[0].Record.SecondInitials)

	// Without a second checker the key is not written at all.
	line, err := json.Marshal(proposedRecord(t, setup.Proposal{}))
	require.NoError(t, err)
	require.NotContains(t, string(line), "second_initials")
}

func TestSecondInitialsRefused(t *testing.T) {
	rec := proposedRecord(t, setup.Proposal{})
	for _, bad := range []string{"A1", "ABCDE", "a b"} {
		_, err := rec.WithSecondInitials(bad)
		var ie *setup.InputError
		require.ErrorAs(t, err, &ie, bad)
		require.Equal(t, "second-initials", ie.Field)
		require.Contains(t, ie.Reason, bad)
	}
	_, err := rec.WithSecondInitials("ABCD") // four letters: just inside
	require.NoError(t, err)
	rec.Initials = ""
	_, err = rec.WithSecondInitials("AB")
	require.ErrorContains(t, err, "goes with the first's initials")
}

// A log line with second initials the writer would refuse is damaged, not
// a bed's check.
func TestReaderRefusesSecondInitialsTheWriterRefuses(t *testing.T) {
	rec, err := proposedRecord(t, setup.Proposal{}).WithSecondInitials("AB")
	require.NoError(t, err)
	good, err := json.Marshal(rec)
	require.NoError(t, err)
	for name, bad := range map[string]string{
		"digit":           strings.Replace(string(good), `"second_initials":"AB"`, `"second_initials":"A1"`, 1),
		"five letters":    strings.Replace(string(good), `"second_initials":"AB"`, `"second_initials":"ABCDE"`, 1),
		"without a first": strings.Replace(string(good), `"initials":"JK"`, `"initials":""`, 1),
	} {
		t.Run(name, func(t *testing.T) {
			require.NotEqual(t, string(good), bad)
			path := filepath.Join(t.TempDir(), "log.jsonl")
			require.NoError(t, os.WriteFile(path, []byte(bad+"\n"), 0o600))
			h, sum, err := logbook.ReadBedHistory([]string{path}, "B4", 0)
			require.NoError(t, err)
			require.Empty(t, h.Entries)
			require.NotEmpty(t, sum.Lines())
		})
	}
}
