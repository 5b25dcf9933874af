package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

// Issue rule: a bench file written where the comma is the decimal mark is
// read: a quoted "480,5" in a comma-separated file, and a semicolon-
// separated file with bare decimal commas. Both must give the same fit as
// the file written with decimal points (a round trip over the reader: the
// same numbers in three spellings).
func TestCalibrateReadsDecimalCommasAndSemicolons(t *testing.T) {
	dir := t.TempDir()
	files := map[string]string{
		"points.csv": benchHeader + "5,50,5,20,318.5\n8,50,5,20,408\n12,50,5,20,528\n16,50,5,20,647.25\n",
		"commas.csv": benchHeader + "5,50,5,20,\"318,5\"\n8,50,5,20,408\n12,50,5,20,528\n16,50,5,20,\"647,25\"\n",
		"semis.csv": "hole;test_lung_compliance_ml_per_cmh2o;test_lung_resistance_cmh2o_per_l_s;rpm;measured_ml\n" +
			"5;50;5;20;318,5\n8;50;5;20;408\n12;50;5;20;528\n16;50;5;20;647,25\n",
	}
	fits := map[string][2]any{}
	for name, text := range files {
		path := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(path, []byte(text), 0o600))
		r := crankside(t, "calibrate", "--profile", "demo-a", "--bench", path, "--date", "2026-11-30", "--json")
		require.Equal(t, 0, r.status, "%s: %s", name, r.stderr)
		var cal map[string]any
		require.NoError(t, json.Unmarshal([]byte(r.stdout), &cal))
		pts := cal["points"].([]any)
		require.Equal(t, 318.5, pts[0].(map[string]any)["measured_ml"], name)
		require.Equal(t, 647.25, pts[3].(map[string]any)["measured_ml"], name)
		fits[name] = [2]any{cal["k"], cal["b_ml"]}
	}
	require.Equal(t, fits["points.csv"], fits["commas.csv"])
	require.Equal(t, fits["points.csv"], fits["semis.csv"])
}
