package setup

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
)

// The most serious caution is read first, and cautions of one level keep
// the order the rules judge them in (common practice: a STOP at the top of
// the list, the rest as the card reads). The goals are the ARDS Network
// protocol card's (SpO2 88-95 %, PaO2 55-80 mmHg, pH 7.30-7.45); the
// severe bands are common practice (SpO2 below 85 %, PaO2 below 50 mmHg,
// pH below 7.15), as in TestGasCautionsAtTheirLimits.
func TestGasCautionsMostSeriousFirstThenInRuleOrder(t *testing.T) {
	ids := func(cs []Caution) []string {
		var out []string
		for _, c := range cs {
			out = append(out, c.Level.String()+" "+string(c.ID))
		}
		return out
	}
	// pH 7.10 with PaCO2 40: HCO3 0.03 x 40 x 10^1.0 = 12 mmol/L, plausible
	// (Henderson-Hasselbalch, REFERENCES.md): a STOP, judged after the WARN
	// of SpO2 86.
	cs := GasCautions(GasReadings{SpO2Pct: gp(86), PH: gp(7.10), PaCO2MmHg: gp(40)}, roomAir)
	require.Equal(t, []string{"stop ph-low", "warn oxygenation-low"}, ids(cs))
	// pH 7.25 with PaCO2 50: HCO3 0.03 x 50 x 10^1.15 = 21.2: two WARNs, in
	// the rules' order.
	cs = GasCautions(GasReadings{SpO2Pct: gp(86), PH: gp(7.25), PaCO2MmHg: gp(50)}, roomAir)
	require.Equal(t, []string{"warn oxygenation-low", "warn ph-low"}, ids(cs))

	// Both oxygen readings low: the worse speaks first and sets the level,
	// the value, the limit and the advice; at one level PaO2 is said first.
	cs = GasCautions(GasReadings{PaO2MmHg: gp(52), SpO2Pct: gp(84)}, roomAir)
	require.Len(t, cs, 1)
	c := cs[0]
	require.Equal(t, Stop, c.Level)
	require.Equal(t, 84.0, c.Value)
	require.Equal(t, 85.0, c.Limit)
	require.True(t, strings.HasPrefix(c.Message, "SpO2 84 % is below 85 %: severe hypoxaemia; PaO2 52 mmHg is below the goal's 55 mmHg"), c.Message)
	require.Contains(t, c.Advice, "act now")
	cs = GasCautions(GasReadings{PaO2MmHg: gp(52), SpO2Pct: gp(86)}, roomAir)
	require.Len(t, cs, 1)
	c = cs[0]
	require.Equal(t, Warn, c.Level)
	require.Equal(t, 52.0, c.Value)
	require.True(t, strings.HasPrefix(c.Message, "PaO2 52 mmHg is below the goal's 55 mmHg; SpO2 86 % is below the goal's 88 %"), c.Message)
	require.NotContains(t, c.Advice, "act now")
	require.Contains(t, c.Advice, "the next PEEP/FiO2 pair up")
}

// A check puts its gas cautions among the machine's, most serious first,
// the gas first at one level; a check whose gas is all in goal says so in
// its gas words.
func TestCheckOrdersItsGasCautionsAmongTheMachines(t *testing.T) {
	ck := Check{}
	ck.Current.Cautions = []Caution{{ID: CautionCalibrationMissing, Level: Warn}}
	ck.judgeGas(GasReadings{SpO2Pct: gp(86), PH: gp(7.10), PaCO2MmHg: gp(40)})
	var got []CautionID
	for _, c := range ck.Current.Cautions {
		got = append(got, c.ID)
	}
	require.Equal(t, []CautionID{CautionPHLow, CautionOxygenationLow, CautionCalibrationMissing}, got)

	j := CheckJSON{GasReadings: &GasReadings{SpO2Pct: gp(92)}}
	require.Equal(t, "gas: no gas caution", GasCheckText(j))
}

// The log's reader widens each plausible range by a margin (a record keeps
// the readings to four decimals): a bicarbonate or an SpO2 inside the
// margin is not a disagreement there, outside it is, and with no margin
// both are. pH 7.41 with PaCO2 100 implies 0.03 x 100 x 10^1.31 = 61.25
// mmol/L, above 60; pH 7.14 with PaCO2 15, 0.03 x 15 x 10^1.04 = 4.93,
// below 5 (Henderson-Hasselbalch, REFERENCES.md; derived).
func TestDisagreementMargins(t *testing.T) {
	high := GasReadings{PH: gp(7.41), PaCO2MmHg: gp(100)}
	require.True(t, disagreementBeyond(high, 0).acidBase)
	require.False(t, disagreementBeyond(high, 2).acidBase)
	require.True(t, disagreementBeyond(high, 1).acidBase)
	low := GasReadings{PH: gp(7.14), PaCO2MmHg: gp(15)}
	require.True(t, disagreementBeyond(low, 0).acidBase)
	require.False(t, disagreementBeyond(low, 0.1).acidBase)
	require.True(t, disagreementBeyond(low, 0.05).acidBase)

	lo, hi := physiology.SpO2RangeForPaO2(60)
	under := GasReadings{PaO2MmHg: gp(60), SpO2Pct: gp(lo - 0.5)}
	require.True(t, disagreementBeyond(under, 0).oximetry)
	require.False(t, disagreementBeyond(under, 1).oximetry)
	require.True(t, disagreementBeyond(under, 0.25).oximetry)
	if hi < 100-1 {
		over := GasReadings{PaO2MmHg: gp(60), SpO2Pct: gp(hi + 0.5)}
		require.True(t, disagreementBeyond(over, 0).oximetry)
		require.False(t, disagreementBeyond(over, 1).oximetry)
	}
}
