package physiology

import (
	"math"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestParseIE(t *testing.T) {
	for text, want := range map[string]float64{"1:2": 2, "1:2.5": 2.5, " 1 : 3 ": 3, "2": 2, "1:1": 1, "2:4": 2, "1:4": 4} {
		got, err := ParseIE(text)
		require.NoError(t, err, text)
		require.InDelta(t, want, got, 1e-12, text)
	}
	for _, text := range []string{"2:1", "1:0.5", "1:5", "1:", ":2", "a:b", "1:NaN", "1:Inf", "", "1:-2", "0:2"} {
		_, err := ParseIE(text)
		require.Error(t, err, text)
	}
	_, err := ParseIE("2:1")
	require.ErrorContains(t, err, "inverse")
	// A zero on either side is no ratio at all, not an inverse or an
	// endless one.
	for _, text := range []string{"0:2", "1:0", "0"} {
		_, err := ParseIE(text)
		require.ErrorContains(t, err, "is not a ratio like 1:2", text)
	}
}

func TestParseNumberRefusesWhatIsNotAPlainDecimal(t *testing.T) {
	for _, text := range []string{"NaN", "nan", "Inf", "-Inf", "+inf", "0x10", "1_000", "", " ", "12cm", "١٧٠", "1e999"} {
		_, err := ParseNumber(text)
		require.Error(t, err, "%q", text)
	}
	for text, want := range map[string]float64{"170": 170, " 170.5 ": 170.5, "-0": 0, "1e2": 100, "+5": 5} {
		got, err := ParseNumber(text)
		require.NoError(t, err, text)
		require.Equal(t, want, got)
	}
}

func TestParseSexAndLung(t *testing.T) {
	for text, want := range map[string]Sex{"male": Male, "M": Male, "Female": Female, "f": Female} {
		got, err := ParseSex(text)
		require.NoError(t, err)
		require.Equal(t, want, got)
	}
	_, err := ParseSex("x")
	require.Error(t, err)
	for text, want := range map[string]Lung{"normal": Normal, "ARDS": ARDS, "obstructive": Obstructive} {
		got, err := ParseLung(text)
		require.NoError(t, err)
		require.Equal(t, want, got)
	}
	_, err = ParseLung("wet")
	require.Error(t, err)
}

func TestDefaultsSaySource(t *testing.T) {
	// The program's stated defaults: rate normal 14, ARDS 18, obstructive 10
	// and I:E 1:2 (obstructive 1:3) (common practice); 6 mL/kg PBW (ARDSNet
	// 2000); mechanics normal C 60 R 10, ARDS C 30 R 12, obstructive C 60
	// R 25, inside the typical ranges (from memory): normal C 50-60 R 10-15,
	// ARDS C 20-40 R 10-15, obstructive C 50-70 R 15-30.
	cases := []struct {
		lung                   Lung
		rate, ie, c, r         float64
		cLo, cHi, rLo, rHi     float64
		rateSource, peepSource string
	}{
		{Normal, 14, 2, 60, 10, 50, 60, 10, 15, "common practice", "ARDS Network 2000"},
		{ARDS, 18, 2, 30, 12, 20, 40, 10, 15, "common practice", "lower-PEEP/FiO2 table"},
		{Obstructive, 10, 3, 60, 25, 50, 70, 15, 30, "common practice", "ARDS Network 2000"},
	}
	for _, c := range cases {
		d := DefaultsFor(c.lung)
		require.Equal(t, c.rate, d.RateBPM.Value, c.lung.String())
		require.Equal(t, c.ie, d.IE.Value)
		require.Equal(t, c.c, d.Compliance.Value)
		require.Equal(t, c.r, d.Resistance.Value)
		require.Equal(t, 6.0, d.MLPerKg.Value)
		require.True(t, c.cLo <= d.Compliance.Value && d.Compliance.Value <= c.cHi,
			"%v: C %v outside the typical %v-%v (from memory)", c.lung, d.Compliance.Value, c.cLo, c.cHi)
		require.True(t, c.rLo <= d.Resistance.Value && d.Resistance.Value <= c.rHi,
			"%v: R %v outside the typical %v-%v (from memory)", c.lung, d.Resistance.Value, c.rLo, c.rHi)
		// Each default names the source it was taken from, not just any text.
		require.Contains(t, d.MLPerKg.Source, "ARDS Network 2000", c.lung.String())
		require.Contains(t, d.RateBPM.Source, c.rateSource, c.lung.String())
		require.Contains(t, d.IE.Source, "common practice", c.lung.String())
		require.Contains(t, d.PEEPCmH2O.Source, c.peepSource, c.lung.String())
		require.Contains(t, d.FiO2.Source, "room air", c.lung.String())
		require.Contains(t, d.Compliance.Source, "from memory", c.lung.String())
		require.Contains(t, d.Resistance.Source, "from memory", c.lung.String())
	}
}

func TestTrappedVolumeEdges(t *testing.T) {
	require.Zero(t, TrappedVolumeML(0, 2, 1))
	require.True(t, math.IsInf(TrappedVolumeML(500, 0, 1), 1))
	require.InDelta(t, 0, TrappedVolumeML(500, 100, 0.5), 1e-12)
	// A lung with no time constant empties at once: nothing is trapped,
	// even with no expiratory time (a passive exhalation's decay, common
	// practice; tau 0 is tested before Te).
	require.Zero(t, TrappedVolumeML(500, 0, 0))
	require.Zero(t, TrappedVolumeML(500, 1, -0.5))
}

// The trapped volume at steady state is Vt k / (1 - k), k = e^(-Te/tau)
// (REFERENCES.md, derived from the exponential passive exhalation), in
// the package's own tests so that its arithmetic is checked where it is
// written: Te = tau gives k = e^-1 = 0.367879, so 500 x 0.367879 /
// 0.632121 = 290.99 mL; Te = 2 s, tau 0.5 s gives k = e^-4 = 0.0183156,
// 500 x 0.0183156 / 0.9816844 = 9.329 mL (derived). The time constant is
// R x C: 10 cmH2O/(L/s) x 50 mL/cmH2O = 0.5 s (common practice).
func TestTrappedVolumeWorked(t *testing.T) {
	require.InDelta(t, 290.99, TrappedVolumeML(500, 1, 1), 0.01)
	require.InDelta(t, 9.329, TrappedVolumeML(500, 2, 0.5), 0.001)
	require.InDelta(t, 18.658, TrappedVolumeML(1000, 2, 0.5), 0.001, "linear in Vt")
	require.InDelta(t, 0.5, TimeConstantS(10, 50), 1e-12)
}
