package physiology

import (
	"errors"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestSaturatedVapourPressure(t *testing.T) {
	for _, c := range []struct {
		tempC, wantMmHg, tol float64
		source               string
	}{
		{22, 19.83, 0.01, "Buck 1981: 2.644 kPa = 19.83 mmHg (derived)"},
		{37, 47.1, 0.05, "Buck 1981: 6.28 kPa = 47.1 mmHg"},
		{0, 4.58, 0.01, "Buck 1981: 0.6112 kPa at 0 C = 4.584 mmHg (the formula's constant A)"},
	} {
		got := SaturatedVapourPressureMmHg(c.tempC)
		require.InDelta(t, c.wantMmHg, got, c.tol, "%s: Psat(%v C) got %v want %v", c.source, c.tempC, got, c.wantMmHg)
	}
}

func TestBTPSFactor(t *testing.T) {
	for _, c := range []struct {
		roomC, rh, pb, want float64
		source              string
	}{
		{22, 100, 760, 1.091, "spirometry BTPS tables, 1.091 at 22 C (from memory; derived in REFERENCES)"},
		{22, 50, 760, 1.105, "derived: (310.15/295.15) x (760 - 9.92) / 713"},
		{37, 100, 760, 1.000, "derived: room already at body conditions"},
	} {
		got, err := BTPSFactor(c.roomC, c.rh, c.pb)
		require.NoError(t, err)
		require.InDelta(t, c.want, got, 0.0006, "%s: F(%v C, %v %%, %v mmHg) got %v", c.source, c.roomC, c.rh, c.pb, got)
	}
}

func TestBTPSFactorRefusesImplausibleRooms(t *testing.T) {
	for _, c := range []struct {
		roomC, rh, pb float64
		quantity      string
	}{
		{-1, 50, 760, "room temperature"},
		{46, 50, 760, "room temperature"},
		{22, -0.1, 760, "room relative humidity"},
		{22, 101, 760, "room relative humidity"},
		{22, 50, 449, "barometric pressure"},
		{22, 50, 801, "barometric pressure"},
		{22, 50, 0, "barometric pressure"},
	} {
		_, err := BTPSFactor(c.roomC, c.rh, c.pb)
		var re *RangeError
		require.True(t, errors.As(err, &re), "%+v: want a RangeError, got %v", c, err)
		require.Equal(t, c.quantity, re.Quantity)
	}
}

func TestDefaultRoomHasSources(t *testing.T) {
	// DESIGN version 2: 22 C, 50 %, 760 mmHg.
	d := DefaultRoom()
	require.Equal(t, 22.0, d.TemperatureC.Value)
	require.Equal(t, 50.0, d.HumidityPct.Value)
	require.Equal(t, 760.0, d.BarometricMmHg.Value)
	for _, v := range []Value{d.TemperatureC, d.HumidityPct, d.BarometricMmHg} {
		require.NotEmpty(t, v.Source)
	}
}

func TestGasCompliance(t *testing.T) {
	// (Boyle's compliance itself is machine.GasComplianceMLPerCmH2O, which
	// the cylinder's gas in the simulation uses; its check is there.)
	// 760 mmHg is one standard atmosphere, 1033.2 cmH2O (NIST SP 811).
	require.InDelta(t, 1033.2, BarometricCmH2O(760), 0.05)
	// NIST SP 811: 1 mmHg = 133.322 Pa = 1.35951 cmH2O.
	require.InDelta(t, 1.35951, CmH2OPerMmHg, 1e-5)
}

func TestFiO2FromPistonIntake(t *testing.T) {
	// REFERENCES checks (derived), with the intake as swept x rate:
	// 500 mL x 16/min = 8 L/min; 2 L/min of oxygen -> 0.4075; 10 -> 1.0.
	require.InDelta(t, 0.4075, FiO2FromPistonIntake(2, 500, 16), 1e-9)
	require.InDelta(t, 1.0, FiO2FromPistonIntake(10, 500, 16), 1e-12)
	// 5/10 -> 0.605: 625 mL x 16/min = 10 L/min.
	require.InDelta(t, 0.605, FiO2FromPistonIntake(5, 625, 16), 1e-9)
	// Round trip (named property): the inverse gives back the flow.
	q := O2FlowForFiO2AtPistonIntake(0.4075, 500, 16)
	require.InDelta(t, 2.0, q, 1e-9)
	require.InDelta(t, 8.0, PistonIntakeLPerMin(500, 16), 1e-12)
}
