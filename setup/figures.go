package setup

import (
	"fmt"
	"math"

	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// HoleFigure is what one crank hole delivers at the planned speed.
type HoleFigure struct {
	Label            string
	RadiusCm         float64
	SweptML          float64 // geometric: bore area x stroke
	EffectiveSweptML float64 // after the bench calibration
	DeliveredML      float64 // into the lung, after the circuit's compliance
	MLPerKg          float64 // per kg PBW
}

// Figures are the predictions for one setting on one lung.
type Figures struct {
	Hole   HoleFigure
	Timing machine.Timing

	PEEPCmH2O            float64
	ComplianceMLPerCmH2O float64
	ResistanceCmH2OPerLS float64

	TauS                float64 // exhalation: (R + expiratory valve) x C
	TrappedML           float64 // left in the lung at the end of expiration, steady state
	IntrinsicPEEPCmH2O  float64 // TrappedML / C
	PeakCmH2O           float64 // highest circuit pressure during delivery
	EndInspCmH2O        float64 // circuit pressure when the piston stops
	PlateauCmH2O        float64 // static: PEEP + (trapped + delivered) / C
	DrivingCmH2O        float64 // delivered / C
	PeakFlowLPerMin     float64 // into the patient
	PeakPistonLPerMin   float64 // out of the cylinder
	MinuteVentLPerMin   float64 // delivered x rate
	PeakTorqueNm        float64
	TorqueShareOfRating float64 // peak torque / the motor's rating

	FiO2            float64 // estimate from the oxygen bled in
	O2FlowLPerMin   float64
	CylinderMinutes float64 // +Inf when no cylinder was entered or no oxygen flows
	CylinderGiven   bool
}

// lungState is the patient side of an evaluation.
type lungState struct {
	lung  machine.Lung
	peep  float64
	pbwKg float64
}

// deliveredFromRest simulates one hole's delivery from the relaxed lung. The
// model is linear, so the volume delivered does not depend on the volume
// the lung starts from; only the pressures shift, by start volume / C.
func deliveredFromRest(u unit, h profiles.Hole, rpm float64, ls lungState) (HoleFigure, error) {
	s := u.stroke(h, rpm, u.cal.Calibration)
	r, err := machine.SimulateStroke(machine.StrokeInput{
		Stroke: s, Lung: ls.lung, CircuitMLPerCmH2O: u.p.Circuit.ComplianceMLPerCmH2O, PEEPCmH2O: ls.peep,
	})
	if err != nil {
		return HoleFigure{}, err
	}
	swept := s.SweptML()
	return HoleFigure{
		Label: h.Label, RadiusCm: h.RadiusCm, SweptML: swept, EffectiveSweptML: swept * s.Scale,
		DeliveredML: r.DeliveredML, MLPerKg: r.DeliveredML / ls.pbwKg,
	}, nil
}

// evaluate predicts everything for one hole and one timing: the delivery is
// repeated to the steady state where each breath starts from the gas the
// last one trapped.
func evaluate(u unit, h profiles.Hole, t machine.Timing, ls lungState, o2LPerMin float64, cylL, cylBar float64) (Figures, error) {
	rest, err := deliveredFromRest(u, h, t.RPM, ls)
	if err != nil {
		return Figures{}, err
	}
	c := ls.lung.ComplianceMLPerCmH2O
	f := Figures{
		Hole: rest, Timing: t, PEEPCmH2O: ls.peep,
		ComplianceMLPerCmH2O: c, ResistanceCmH2OPerLS: ls.lung.ResistanceCmH2OPerLS,
	}
	f.TauS = physiology.TimeConstantS(ls.lung.ResistanceCmH2OPerLS+u.p.Circuit.ExpiratoryResistanceCmH2OPerLS, c)
	f.TrappedML = physiology.TrappedVolumeML(rest.DeliveredML, t.TeS, f.TauS)
	if math.IsInf(f.TrappedML, 0) || math.IsNaN(f.TrappedML) {
		return Figures{}, fmt.Errorf("setup: no time to exhale (Te %s s)", physiology.PlainNumber(t.TeS))
	}
	r, err := machine.SimulateStroke(machine.StrokeInput{
		Stroke: u.stroke(h, t.RPM, u.cal.Calibration), Lung: ls.lung,
		CircuitMLPerCmH2O: u.p.Circuit.ComplianceMLPerCmH2O, PEEPCmH2O: ls.peep,
		StartVolumeML: f.TrappedML, RingFrictionN: u.p.Cylinder.RingFrictionN,
	})
	if err != nil {
		return Figures{}, err
	}
	f.IntrinsicPEEPCmH2O = f.TrappedML / c
	f.PeakCmH2O = r.PeakCmH2O
	f.EndInspCmH2O = r.EndCmH2O
	f.PlateauCmH2O = ls.peep + (f.TrappedML+r.DeliveredML)/c
	f.DrivingCmH2O = r.DeliveredML / c
	f.PeakFlowLPerMin = r.PeakPatientFlowMLPerS * 60 / 1000
	f.PeakPistonLPerMin = r.PeakPistonFlowMLPerS * 60 / 1000
	f.MinuteVentLPerMin = r.DeliveredML * t.RateBPM / 1000
	f.PeakTorqueNm = r.PeakTorqueNm
	f.TorqueShareOfRating = r.PeakTorqueNm / u.p.Motor.RatedTorqueNm
	f.O2FlowLPerMin = o2LPerMin
	f.FiO2 = physiology.FiO2FromBleed(o2LPerMin, f.MinuteVentLPerMin)
	f.CylinderMinutes = math.Inf(1)
	if cylL > 0 {
		f.CylinderGiven = true
		f.CylinderMinutes = physiology.CylinderMinutesLeft(cylL, cylBar, o2LPerMin)
	}
	return f, nil
}
