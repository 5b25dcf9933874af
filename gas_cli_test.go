package main

import (
	"encoding/json"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

// A check with a blood gas that cannot be true (pH 7.60 with PaCO2 100
// mmHg: HCO3 94.9 mmol/L, derived from Henderson-Hasselbalch, outside the
// plausible 5-60; REFERENCES.md version 3), recorded, and read back by
// `log show` and `log beds`, text and JSON, beside a quiet bed: the bad
// gas is a STOP everywhere and its bed comes first.
func TestABadGasReadsBackFromTheLog(t *testing.T) {
	logPath := filepath.Join(t.TempDir(), "gas.jsonl")
	base := []string{"check", "--height-cm", "175", "--sex", "male", "--hole", "8", "--rpm", "21", "--dwell-s", "1.4", "--log", logPath}
	r := crankside(t, append(base, "--bed", "B2")...)
	require.Contains(t, r.stdout, "Recorded for bed B2", r.stderr)
	r = crankside(t, append(base, "--bed", "B4", "--ph", "7.60", "--paco2", "100", "--spo2", "93")...)
	require.Contains(t, r.stdout, "Recorded for bed B4", r.stderr)
	require.Contains(t, r.stdout, "STOP gas-readings-disagree: pH 7.60 and PaCO2 100 mmHg imply a bicarbonate of 94.9 mmol/L, outside 5-60")
	// derived: 93 / 0.21 = 442.9; above Rice et al.'s 315: none.
	require.Contains(t, r.stdout, "OXYGENATION  S/F 443 (FiO2 0.21, estimated from the O2 bleed): ARDS band none")

	r = crankside(t, "log", "show", "--log", logPath, "--bed", "B4")
	require.Equal(t, 0, r.status, r.stderr)
	require.Contains(t, r.stdout, "highest STOP; gas: STOP gas readings disagree, WARN pH 7.60 high; S/F 443 none")

	r = crankside(t, "log", "show", "--log", logPath, "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var show struct {
		Beds []struct {
			Bed    string `json:"bed"`
			Checks []struct {
				Record struct {
					Cautions []struct {
						ID    string `json:"id"`
						Level string `json:"level"`
					} `json:"cautions"`
					SFRatio *float64 `json:"sf_ratio"`
				} `json:"record"`
			} `json:"checks"`
		} `json:"beds"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &show))
	for _, b := range show.Beds {
		if b.Bed == "B4" {
			rec := b.Checks[0].Record
			require.Equal(t, "gas-readings-disagree", rec.Cautions[0].ID)
			require.Equal(t, "stop", rec.Cautions[0].Level)
			require.Equal(t, 443.0, *rec.SFRatio)
		}
	}

	r = crankside(t, "log", "beds", "--log", logPath)
	require.Equal(t, 0, r.status, r.stderr)
	// The card's Vt step towards 6 mL/kg PBW is proposed (plateau in goal).
	require.Regexp(t, `(?s)\nB4 .*STOP, change proposed; gas: STOP gas readings disagree.*\nB2 .*WARN`, r.stdout)

	r = crankside(t, "log", "beds", "--log", logPath, "--json")
	require.Equal(t, 0, r.status, r.stderr)
	var ward struct {
		Format string           `json:"format"`
		Beds   []map[string]any `json:"beds"`
	}
	require.NoError(t, json.Unmarshal([]byte(r.stdout), &ward))
	require.Equal(t, "crankside-ward/3", ward.Format)
	beds := ward.Beds
	require.Len(t, beds, 2)
	require.Equal(t, "B4", beds[0]["bed"], "the stop first")
	require.Equal(t, "stop", beds[0]["highest_level"])
	gas := beds[0]["gas_readings"].(map[string]any)
	require.Equal(t, 7.6, gas["ph"])
	require.Equal(t, 100.0, gas["paco2_mmhg"])
	require.Equal(t, "gas-readings-disagree", beds[0]["gas_cautions"].([]any)[0].(map[string]any)["id"])
	require.Equal(t, "none", beds[0]["ards_severity"])
	require.Nil(t, beds[1]["gas_readings"], "B2 had no gas")
}
