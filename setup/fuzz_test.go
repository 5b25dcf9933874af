package setup_test

import (
	"errors"
	"math"
	"testing"

	"crankside/physiology"
	"crankside/setup"
)

func FuzzPlan(f *testing.F) {
	f.Add(170.0, 2, 6.0, 14.0, 2.0, 5.0, 0.21, 60.0, 10.0, 1, true)
	f.Add(230.0, 1, 10.0, 60.0, 1.0, 25.0, 1.0, 5.0, 100.0, 2, false)
	f.Add(130.0, 2, 4.0, 4.0, 4.0, 0.0, 0.5, 200.0, 1.0, 3, true)
	f.Add(math.NaN(), 0, -1.0, math.Inf(1), 0.3, -2.0, 7.0, 0.0, 0.0, 9, true)
	pa, pb := profile(f, "demo-a"), profile(f, "demo-b")
	f.Fuzz(func(t *testing.T, height float64, sex int, mlkg, rate, ie, peep, fio2, c, r float64, lung int, useA bool) {
		peepV := peep
		req := setup.Request{
			Patient: setup.Patient{HeightCm: height, Sex: physiology.Sex(sex)},
			Targets: setup.Targets{Lung: physiology.Lung(lung), MLPerKg: mlkg, RateBPM: rate, IE: ie, PEEPCmH2O: &peepV,
				FiO2: fio2, ComplianceMLPerCmH2O: c, ResistanceCmH2OPerLS: r},
			Now: today,
		}
		p := pb
		if useA {
			p = pa
		}
		pl, err := setup.MakePlan(req, p)
		if err != nil {
			if !errors.Is(err, setup.ErrInput) {
				t.Fatalf("refusal is not an input error: %v", err)
			}
			return
		}
		j := pl.JSON()
		for name, v := range map[string]float64{
			"pbw": j.PBWKg, "vt": j.DeliveredVtML, "mlkg": j.MLPerKg, "rate": j.RateBPM, "rpm": j.MotorRPM,
			"dwell": j.DwellS, "ti": j.TiS, "te": j.TeS, "ie": j.IERatio, "mv": j.MinuteVentilationLMin,
			"flow": j.PeakFlowLMin, "peak": j.PeakPressureCmH2O, "end": j.EndInspiratoryPressureCmH2O,
			"plateau": j.PlateauPressureCmH2O, "driving": j.DrivingPressureCmH2O, "peepi": j.IntrinsicPEEPCmH2O,
			"torque": j.PeakTorqueNm, "fio2": j.FiO2, "o2": j.O2FlowLMin,
		} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%s is %v for %+v", name, v, req)
			}
		}
		if j.IERatio < 1-1e-9 || j.DwellS < 0 {
			t.Fatalf("inverse I:E or negative dwell: %+v", j)
		}
		for _, c := range pl.Cautions {
			if math.IsNaN(c.Value) || math.IsInf(c.Value, 0) {
				t.Fatalf("caution %s has value %v", c.ID, c.Value)
			}
		}
	})
}
