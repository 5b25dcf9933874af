package physiology

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
)

// The standard oxyhaemoglobin dissociation curve at the textbook points
// (from memory: P50 26.8 mmHg -> 50 %, PO2 40 -> 75 %, 60 -> 90 %, 100 ->
// 97.5 %), within 1 point of saturation; the equation is Severinghaus
// 1979's.
func TestSeveringhausAtTheTextbookPoints(t *testing.T) {
	for _, c := range []struct{ po2, want float64 }{
		{26.8, 50}, // P50 of adult blood (from memory)
		{40, 75},   // mixed venous (from memory)
		{60, 90},   // the steep part begins (from memory)
		{100, 97.5},
	} {
		got := SaturationPctSeveringhaus(c.po2)
		require.InDelta(t, c.want, got, 1.0, "PO2 %v mmHg: got %v %%, want %v %%", c.po2, got, c.want)
	}
	require.Equal(t, 0.0, SaturationPctSeveringhaus(0))
	require.True(t, math.IsNaN(SaturationPctSeveringhaus(math.NaN())))
}

// The SpO2 range a PaO2 allows, at two PaO2s, each edge derived by hand
// from Severinghaus's equation S = 100 / (23400 / (P^3 + 150 P) + 1):
//   - PaO2 30 mmHg: top = S(60) + 6; 60^3 + 150 x 60 = 225000,
//     23400 / 225000 = 0.104, S = 100 / 1.104 = 90.58, top 96.58 %.
//   - PaO2 200 mmHg: bottom = S(100) - 6; 100^3 + 150 x 100 = 1015000,
//     23400 / 1015000 = 0.023054, S = 97.747, bottom 91.75 %.
func TestSpO2RangeForPaO2AtDerivedEdges(t *testing.T) {
	_, hi := SpO2RangeForPaO2(30)
	require.InDelta(t, 96.58, hi, 0.01, "derived: S(2 x 30) + 6")
	lo, hi := SpO2RangeForPaO2(200)
	require.InDelta(t, 91.75, lo, 0.01, "derived: S(0.5 x 200) - 6")
	require.Equal(t, 100.0, hi, "capped at 100 %")
	// derived: S(0.5 x 30) = S(15): 3375 + 2250 = 5625, 23400 / 5625 =
	// 4.16, S = 19.38, minus 6 = 13.38.
	lo, _ = SpO2RangeForPaO2(30)
	require.InDelta(t, 13.38, lo, 0.01)
}

// Berlin definition of ARDS, JAMA 2012: 200 < P/F <= 300 mild, 100 <
// P/F <= 200 moderate, P/F <= 100 severe; each edge and one mmHg beyond.
func TestBerlinBandsAtTheirEdges(t *testing.T) {
	for _, c := range []struct {
		pf   float64
		want ARDSSeverity
	}{
		{301, ARDSNone}, {300, ARDSMild},
		{201, ARDSMild}, {200, ARDSModerate},
		{101, ARDSModerate}, {100, ARDSSevere},
		{40, ARDSSevere},
	} {
		require.Equal(t, c.want, BandFromPF(c.pf), "P/F %v (Berlin definition 2012)", c.pf)
	}
	require.Equal(t, ARDSSeverity(0), BandFromPF(math.NaN()))
	require.Equal(t, "not graded", ARDSSeverity(0).String())
}

// Rice et al., Chest 2007: S/F 235 stands for P/F 200 and S/F 315 for
// P/F 300, so they fall in the same Berlin bands; the severe edge is
// derived from the paper's S/F = 64 + 0.84 x P/F at P/F 100: 64 + 84 =
// 148.
func TestSFConversionAtThePublishedPoints(t *testing.T) {
	require.Equal(t, BandFromPF(200), BandFromSF(235), "Rice 2007: S/F 235 ~ P/F 200")
	require.Equal(t, BandFromPF(300), BandFromSF(315), "Rice 2007: S/F 315 ~ P/F 300")
	require.Equal(t, ARDSNone, BandFromSF(316))
	require.Equal(t, ARDSMild, BandFromSF(236))
	require.InDelta(t, 148.0, BerlinSevereMaxSF, 1e-9, "derived: 64 + 0.84 x 100")
	require.Equal(t, ARDSSevere, BandFromSF(148))
	require.Equal(t, ARDSModerate, BandFromSF(149))
	// The published relation gives the published cut points within 5
	// (derived: 64 + 0.84 x 200 = 232, 64 + 0.84 x 300 = 316).
	require.InDelta(t, 235, SFRiceIntercept+SFRiceSlope*200, 5)
	require.InDelta(t, 315, SFRiceIntercept+SFRiceSlope*300, 5)
}
