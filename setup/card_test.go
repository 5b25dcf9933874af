package setup_test

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/report"
	"crankside/setup"
)

var update = flag.Bool("update", false, "rewrite testdata/*.golden")

func TestHandoverCardGolden(t *testing.T) {
	req := checkReq("8", 21, 1.4)
	req.Readings = &physiology.Readings{PeakCmH2O: 17, EndCmH2O: 14}
	req.Setting.O2LPerMin = 3
	req.CylinderWaterL, req.CylinderBar = 10, 40
	ck, err := setup.RunCheck(req, profile(t, "demo-a"))
	require.NoError(t, err)
	rec, err := setup.NewRecord(ck, "B4", "jk", today)
	require.NoError(t, err)
	var b bytes.Buffer
	require.NoError(t, report.WriteCard(&b, rec))
	for _, line := range strings.Split(b.String(), "\n") {
		require.LessOrEqual(t, len(line), report.CardWidth, "card line too wide: %q", line)
	}
	require.Contains(t, b.String(), setup.ClinicalCaution[:40])
	path := filepath.Join("testdata", "card.golden")
	if *update {
		require.NoError(t, os.MkdirAll("testdata", 0o755))
		require.NoError(t, os.WriteFile(path, b.Bytes(), 0o644))
	}
	want, err := os.ReadFile(path)
	require.NoError(t, err, "run go test ./setup -run Card -update")
	require.Equal(t, string(want), b.String())
}
