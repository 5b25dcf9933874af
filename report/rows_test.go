package report_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/report"
	"crankside/setup"
)

func rowIDs(rows []report.Row) []string {
	var out []string
	for _, r := range rows {
		out = append(out, r.ID)
	}
	return out
}

// TestRowsWithoutTheLung: with the lung's figures withheld, the rows are
// what the machine sets whatever the lung (the timing; the cylinder's time
// when one was entered), and nothing the lung decides; with them, the
// volume and the pressures come back. The lists are this tool's rows.
func TestRowsWithoutTheLung(t *testing.T) {
	ck := unexplainedCheck(t, true)
	j := ck.JSON()
	require.Nil(t, j.LungFiguresJSON)
	require.Equal(t, []string{"rate_bpm", "ti_s", "te_s", "ie_ratio"}, rowIDs(report.FigureRows(j.FiguresJSON, nil)))
	// Beside a proposal, a row the current setting cannot give is left
	// out, never shown with a change from nothing.
	both := report.FigureRows(j.FiguresJSON, &j.Proposed.FiguresJSON)
	require.Equal(t, []string{"rate_bpm", "ti_s", "te_s", "ie_ratio"}, rowIDs(both))
	// The proposal alone rests on the assumed lung and has its figures.
	prop := rowIDs(report.FigureRows(j.Proposed.FiguresJSON, nil))
	require.Contains(t, prop, "delivered_vt_ml")
	require.Contains(t, prop, "plateau_pressure_cmh2o")

	// The cylinder's time does not depend on the lung: 10 L at 40 bar
	// with 3 L/min flowing is entered, and its row stays.
	j.O2FlowLMin, j.CylinderEntered = 3, true
	m := 120.0
	j.CylinderMinutes = &m
	require.Equal(t, []string{"rate_bpm", "ti_s", "te_s", "ie_ratio", "cylinder_minutes"}, rowIDs(report.FigureRows(j.FiguresJSON, nil)))

	// The current setting's text: the machine's timing under its own
	// heading, no volume or pressure of the current setting, and the
	// proposal's figures labelled as resting on the assumed lung.
	var b bytes.Buffer
	require.NoError(t, report.CheckText(&b, ck))
	text := b.String()
	cut := strings.Index(text, "PROPOSED, "+report.AssumedLungLabel)
	require.Greater(t, cut, 0)
	now := text[:cut]
	require.Contains(t, now, "THE PATIENT GETS: NOT KNOWN")
	for _, label := range []string{"Tidal vol.", "Plateau", "Peak (", "Minute vent.", "FiO2 (est.)", "Crank torque"} {
		require.NotContains(t, now, label, "no %s is shown for the current setting", label)
	}
}

// TestLineReportsWithoutTheLung: a record whose readings no lung explains
// gives no volume in its history line, and the ward's line says so.
func TestLineReportsWithoutTheLung(t *testing.T) {
	rec, err := setup.NewRecord(unexplainedCheck(t, false), "B4", "jk", today)
	require.NoError(t, err)
	line := report.HistoryLine(rec)
	require.Contains(t, line, "STOP readings unexplained, volume not known")
	require.NotContains(t, line, " mL ")
}
