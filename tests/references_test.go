package tests

import (
	"fmt"
	"math"
	"testing"

	"crankside/machine"
	"crankside/physiology"
)

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > tol {
		t.Errorf("%s: got %.6g, want %.6g (tolerance %g)", what, got, want, tol)
	}
}

func TestPredictedBodyWeight(t *testing.T) {
	cases := []struct {
		source   string
		heightCm float64
		sex      physiology.Sex
		wantKg   float64
		tolKg    float64
	}{
		// Source: ARDS Network, NEJM 2000;342:1301-1308, formula after Devine 1974 (derived).
		{"ARDSNet 2000, derived", 152.4, physiology.Male, 50.0, 1e-9},
		{"ARDSNet 2000, derived", 152.4, physiology.Female, 45.5, 1e-9},
		// ARDSNet protocol card row: 70 in male -> 73 kg. The card uses the inch
		// form 50 + 2.3 (in - 60); the cm form's 0.91 differs by up to ~0.17 kg.
		// 70 in: 50 + 2.3 x (70 - 60) = 73.0 kg.
		{"ARDSNet 2000 protocol card (inch form), tolerance 0.2 kg", 177.8, physiology.Male, 73.0, 0.2},
		{"ARDSNet 2000, derived: 73.1 kg", 177.8, physiology.Male, 73.1, 0.02},
		{"ARDSNet 2000, derived", 160, physiology.Female, 52.4, 0.02},
		{"ARDSNet 2000, derived", 170, physiology.Male, 66.0, 0.02},
	}
	for _, c := range cases {
		got, err := physiology.PredictedBodyWeightKg(c.heightCm, c.sex)
		if err != nil {
			t.Fatalf("%s: %v", c.source, err)
		}
		near(t, fmt.Sprintf("PBW %v cm %v (%s)", c.heightCm, c.sex, c.source), got, c.wantKg, c.tolKg)
	}
}

func TestTidalVolumeRows(t *testing.T) {
	cases := []struct {
		source   string
		heightCm float64
		sex      physiology.Sex
		mlPerKg  float64
		wantML   float64
	}{
		// ARDSNet 2000 protocol card: 73 kg, 6 mL/kg -> 438 mL (card rounds PBW to 73).
		{"ARDSNet 2000 protocol card", 177.8, physiology.Male, 6, 438},
		// Derived from the ARDSNet formula.
		{"derived", 160, physiology.Female, 6, 314},
		{"derived", 170, physiology.Male, 4, 264},
		{"derived", 170, physiology.Male, 6, 396},
		{"derived", 170, physiology.Male, 8, 528},
	}
	for _, c := range cases {
		pbw, err := physiology.PredictedBodyWeightKg(c.heightCm, c.sex)
		if err != nil {
			t.Fatal(err)
		}
		vt, err := physiology.TidalVolumeML(c.mlPerKg, pbw)
		if err != nil {
			t.Fatal(err)
		}
		// The card's rows are whole mL from a rounded PBW: 1.5 mL covers both.
		near(t, fmt.Sprintf("Vt %v cm %v %v mL/kg (%s)", c.heightCm, c.sex, c.mlPerKg, c.source), vt, c.wantML, 1.5)
	}
}

func TestHeightOutsideRangeIsRefused(t *testing.T) {
	// Heights outside 130-230 cm are refused (this program's entry range;
	// common practice: the adult range).
	for _, h := range []float64{129.9, 230.1, math.NaN(), math.Inf(1), -170} {
		if _, err := physiology.PredictedBodyWeightKg(h, physiology.Male); err == nil {
			t.Errorf("height %v: want an error", h)
		}
	}
	for _, h := range []float64{130, 230} {
		if _, err := physiology.PredictedBodyWeightKg(h, physiology.Female); err != nil {
			t.Errorf("height %v at the edge: %v", h, err)
		}
	}
}

func TestEquationOfMotion(t *testing.T) {
	// Chatburn, Respir Care 2014;59(4): PEEP 5, V 0.5 L, C 0.05 L/cmH2O,
	// R 10 cmH2O/(L/s), flow 1 L/s -> 25 cmH2O; plateau 15; driving 10.
	near(t, "Paw (Chatburn 2014)", physiology.AirwayPressureCmH2O(5, 500, 50, 10, 1), 25, 1e-12)
	near(t, "plateau (Chatburn 2014)", physiology.AirwayPressureCmH2O(5, 500, 50, 10, 0), 15, 1e-12)
	// Driving pressure is plateau minus PEEP: 15 - 5 = 10 cmH2O (Chatburn 2014).
	near(t, "driving (Chatburn 2014)", physiology.AirwayPressureCmH2O(5, 500, 50, 10, 0)-5, 10, 1e-12)
	near(t, "driving at zero PEEP (Chatburn 2014)", physiology.AirwayPressureCmH2O(0, 500, 50, 10, 0), 10, 1e-12)
}

func TestPassiveExhalation(t *testing.T) {
	cases := []struct {
		source                    string
		vt, c, tau, te            float64
		wantTrapped, wantPEEPi    float64
		tolTrapped, tolPEEPiCmH2O float64
	}{
		// Derived: Vt k/(1-k), k = e^(-Te/tau).
		{"derived", 500, 50, 0.5, 1.0, 78.3, 1.57, 0.05, 0.005},
		{"derived", 500, 60, 1.5, 2.0, 179, 2.98, 0.5, 0.005},
	}
	for _, c := range cases {
		trapped := physiology.TrappedVolumeML(c.vt, c.te, c.tau)
		near(t, fmt.Sprintf("trapped Vt %v tau %v Te %v (%s)", c.vt, c.tau, c.te, c.source), trapped, c.wantTrapped, c.tolTrapped)
		near(t, fmt.Sprintf("PEEPi Vt %v C %v (%s)", c.vt, c.c, c.source), trapped/c.c, c.wantPEEPi, c.tolPEEPiCmH2O)
		// The steady state is a fixed point of Vee = (Vee + Vt) k.
		k := math.Exp(-c.te / c.tau)
		near(t, "fixed point of Vee = (Vee + Vt) k (derived)", (trapped+c.vt)*k, trapped, 1e-9)
	}
}

func TestSliderCrankKinematics(t *testing.T) {
	// Cornell KMODDL "Mathematics of the slider crank"; Norton, Design of
	// Machinery (from memory). r = 10, L = 20, omega = 1 rad/s.
	c := machine.Crank{RadiusCm: 10, RodCm: 20}
	deg := math.Pi / 180
	cases := []struct {
		thetaDeg       float64
		x, absV, a     float64
		checkV, checkA bool
	}{
		{45, 25.7794, 9.7437, -7.4529, true, true},
		{90, 17.3205, 10.000, 5.7735, true, true},
		{0, 30, 0, -15, false, true},
		{180, 10, 0, 5, false, true},
	}
	// x and dx/dtheta come from Crank.Motion, the simulation's own; the
	// acceleration from a central difference of its dx/dtheta (h 1e-5 rad:
	// error about h^2 x |d4x| ~ 1e-9 cm, derived).
	motion := func(c machine.Crank, th float64) (float64, float64) { return c.Motion(math.Sincos(th)) }
	for _, k := range cases {
		th := k.thetaDeg * deg
		x, dx := motion(c, th)
		near(t, fmt.Sprintf("x(%v deg) (KMODDL)", k.thetaDeg), x, k.x, 5e-5)
		if k.checkV {
			near(t, fmt.Sprintf("|v|(%v deg) (KMODDL)", k.thetaDeg), math.Abs(dx*1), k.absV, 5e-5)
		}
		if k.checkA {
			const h = 1e-5
			_, up := motion(c, th+h)
			_, down := motion(c, th-h)
			near(t, fmt.Sprintf("a(%v deg) (KMODDL)", k.thetaDeg), (up-down)/(2*h), k.a, 5e-5)
		}
	}
	// Offset e 20 mm, r 50 mm, L 200 mm -> stroke 100.54 mm (derived from the
	// KMODDL position formula: sqrt(250^2 - 20^2) - sqrt(150^2 - 20^2)
	// = 249.199 - 148.661 = 100.538 mm).
	off := machine.Crank{RadiusCm: 5, RodCm: 20, OffsetCm: 2}
	near(t, "offset stroke (derived)", off.StrokeCm()*10, 100.54, 0.005)
	// The stroke is also x at the top dead centre minus x at the bottom one:
	// the same 100.54 mm (derived above), found through DeadCentres and Motion.
	b, top := off.DeadCentres()
	xb, dxb := motion(off, b)
	xt, dxt := motion(off, top)
	near(t, "stroke from the dead centres (derived: 100.54 mm)", (xt-xb)*10, 100.54, 0.005)
	near(t, "velocity zero at bottom dead centre (derived)", dxb, 0, 1e-9)
	near(t, "velocity zero at top dead centre (derived)", dxt, 0, 1e-9)
	// In-line: stroke is 2r (derived).
	near(t, "in-line stroke 2r (derived)", c.StrokeCm(), 20, 1e-12)
	// Bore 100 mm, r 25 mm -> 392.70 mL swept (pi r^2 h, common practice).
	near(t, "swept volume (pi r^2 h)", machine.SweptVolumeML(10, machine.Crank{RadiusCm: 2.5, RodCm: 20}), 392.70, 0.005)
}

func TestSliderCrankDerivativesMatchFiniteDifferences(t *testing.T) {
	// Motion's dx/dtheta against a central difference of its x (derived).
	c := machine.Crank{RadiusCm: 4.2, RodCm: 22, OffsetCm: 1.3}
	const h = 1e-5
	for th := 0.0; th < 2*math.Pi; th += 0.37 {
		up, _ := c.Motion(math.Sincos(th + h))
		down, _ := c.Motion(math.Sincos(th - h))
		_, dx := c.Motion(math.Sincos(th))
		near(t, fmt.Sprintf("dx/dtheta at %.2f", th), dx, (up-down)/(2*h), 1e-6)
	}
}

func TestCrankTorque(t *testing.T) {
	// Norton, Design of Machinery (from memory): F 100 N, r 0.05 m, L 0.2 m:
	// 30 deg 3.0455 N m; 60 deg 4.8845; 90 deg 5.000 (derived from
	// T = F r sin(theta+phi)/cos(phi); e.g. 30 deg: sin(phi) = 0.125,
	// phi = 7.181 deg, 100 x 0.05 x sin(37.181 deg) / cos(7.181 deg) = 3.0455).
	c := machine.Crank{RadiusCm: 5, RodCm: 20}
	for _, k := range []struct{ deg, want float64 }{{30, 3.0455}, {60, 4.8845}, {90, 5.000}} {
		th := k.deg * math.Pi / 180
		// The simulation's torque: -F dx/dtheta (virtual work), which must
		// equal the rod-angle form above at Norton's angles.
		_, dx := c.Motion(math.Sincos(th))
		got := machine.TorqueNm(100, dx)
		near(t, fmt.Sprintf("torque %v deg (derived)", k.deg), got, k.want, 5e-5)
	}
}

func TestUnitsAndGas(t *testing.T) {
	// NIST SP 811 appendix B.8: 1 cmH2O (conventional) = 98.0665 Pa exactly.
	if physiology.PascalPerCmH2O != 98.0665 {
		t.Errorf("cmH2O = %v Pa, want 98.0665 (NIST SP 811)", physiology.PascalPerCmH2O)
	}
	// 1 atm = 101325 Pa (NIST SP 811); 101325 / 98.0665 = 1033.2275 cmH2O
	// (derived, by hand: 98.0665 x 1033 = 101302.69, remainder 22.31 / 98.0665 = 0.2275).
	near(t, "atm in cmH2O (NIST SP 811, derived 1033.2275)", physiology.CmH2OPerAtm, 1033.2275, 5e-5)
	// Boyle's law, isothermal: 500 mL at 1 atm raised by 30 cmH2O -> 485.89 mL (derived).
}

func TestOxygen(t *testing.T) {
	// FiO2 = 0.21 + 0.79 Q/VE capped at 1 (derived).
	for _, k := range []struct{ q, ve, want float64 }{{2, 8, 0.4075}, {5, 10, 0.605}, {10, 8, 1.0}} {
		near(t, fmt.Sprintf("FiO2 %v/%v L/min (derived)", k.q, k.ve), physiology.FiO2FromBleed(k.q, k.ve), k.want, 1e-9)
	}
	// The inverse gives the flow back (derived).
	near(t, "O2 flow for FiO2 0.4075 at 8 L/min (derived)", physiology.O2FlowForFiO2(0.4075, 8), 2, 1e-9)
	// Cylinder: 10 L at 137 bar ~= 1370 L; at 10 L/min -> 137 min (common practice).
	near(t, "cylinder gas (common practice)", physiology.CylinderGasL(10, 137), 1370, 1e-9)
	near(t, "cylinder minutes (common practice)", physiology.CylinderMinutesLeft(10, 137, 10), 137, 1e-9)
}

func TestLowerPEEPTable(t *testing.T) {
	// ARDS Network 2000 lower-PEEP/FiO2 table. Check: FiO2 0.7 -> PEEP 10-14.
	cases := []struct {
		fio2, step, lo, hi float64
	}{
		{0.7, 0.7, 10, 14},
		{0.3, 0.3, 5, 5},
		{0.21, 0.3, 5, 5}, // room air rounds up to the first step
		{0.45, 0.5, 8, 10},
		{0.4, 0.4, 5, 8},
		{0.9, 0.9, 14, 18},
		{1.0, 1.0, 18, 24},
	}
	for _, c := range cases {
		got, err := physiology.PEEPForFiO2(c.fio2)
		if err != nil {
			t.Fatal(err)
		}
		if got.FiO2Step != c.step || got.LowestCmH2O != c.lo || got.HighestCmH2O != c.hi {
			t.Errorf("FiO2 %v (ARDSNet 2000 table): got step %v PEEP %v-%v, want %v, %v-%v",
				c.fio2, got.FiO2Step, got.LowestCmH2O, got.HighestCmH2O, c.step, c.lo, c.hi)
		}
	}
}
