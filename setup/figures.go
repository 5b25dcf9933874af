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
	PressureLimited  bool    // the relief valve opened on this hole's breath from rest
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

	FiO2          float64 // estimate from the oxygen bled in, at the piston's intake (effective swept x rate)
	O2FlowLPerMin float64
	// CylinderMinutes is the time to the cylinder's reserve
	// (CylinderReserveBar), CylinderEmptyMinutes to empty; +Inf when no
	// cylinder was entered or no oxygen flows.
	CylinderMinutes      float64
	CylinderEmptyMinutes float64
	CylinderReserveBar   float64
	CylinderGiven        bool

	// Version 2: the delivered volume, mL/kg, trapped volume and plateau
	// are at body conditions (BTPS); DeliveredRoomML is the room air that
	// entered the lung (Hole.DeliveredML / BTPSFactor). The rest say where
	// the piston's volume went on the steady-state breath.
	BTPSFactor        float64
	DeliveredRoomML   float64
	CompressionLossML float64 // spent compressing the cylinder's own gas
	LeakedML          float64 // through the machine's and circuit's leak
	ReliefVentedML    float64 // out of the relief valve
	PressureLimited   bool    // the relief valve opened: the breath is the vented one
}

// lungState is the patient side of an evaluation.
type lungState struct {
	lung  machine.Lung
	peep  float64
	pbwKg float64
}

// deliveredFromRest simulates one hole's delivery from the relaxed lung at
// the model's default step (1 ms).
func deliveredFromRest(u unit, h profiles.Hole, rpm float64, ls lungState) (HoleFigure, error) {
	return deliveredFromRestAt(u, h, rpm, ls, u.stepS)
}

// deliveredFromRestAt is deliveredFromRest at a time step of stepS seconds
// (0: the default). In version 1 the volume delivered did not depend on the
// volume the lung starts from; with the cylinder's gas, the leak and the
// relief valve it does a little, so evaluate settles the steady state.
func deliveredFromRestAt(u unit, h profiles.Hole, rpm float64, ls lungState, stepS float64) (HoleFigure, error) {
	s := u.stroke(h, rpm, u.cal.Calibration)
	r, err := u.simulator().SimulateStroke(machine.StrokeInput{
		Stroke: s, Lung: ls.lung, CircuitMLPerCmH2O: u.p.Circuit.ComplianceMLPerCmH2O, PEEPCmH2O: ls.peep,
		StepS: stepS, Gas: u.gas.patientPath(), NoTorque: true, // a hole's figure from rest has no torque
	})
	if err != nil {
		return HoleFigure{}, err
	}
	swept := s.SweptML()
	return HoleFigure{
		Label: h.Label, RadiusCm: h.RadiusCm, SweptML: swept, EffectiveSweptML: swept * s.Scale,
		DeliveredML: r.DeliveredML, MLPerKg: r.DeliveredML / ls.pbwKg, PressureLimited: r.Gas.PressureLimited,
	}, nil
}

// simulator is the unit's Simulator, or a fresh one for a unit built
// without (a zero unit in a caller outside newUnit).
func (u unit) simulator() *machine.Simulator {
	if u.sim == nil {
		return &machine.Simulator{}
	}
	return u.sim
}

// steadyIterations bounds the settling of trapped gas and delivered volume.
const steadyIterations = 4

// evaluate predicts everything for one hole and one timing: the delivery is
// repeated to the steady state where each breath starts from the gas the
// last one trapped (settled by fixed-point iteration: the trapped volume
// from the delivered one, the delivery from that start, until the delivered
// volume moves by less than 0.01 mL).
func evaluate(u unit, h profiles.Hole, t machine.Timing, ls lungState, o2LPerMin float64, cylL, cylBar float64) (Figures, error) {
	rest, err := deliveredFromRest(u, h, t.RPM, ls)
	if err != nil {
		return Figures{}, err
	}
	return evaluateFrom(u, h, t, ls, o2LPerMin, cylL, cylBar, rest)
}

// evaluateFrom is evaluate with the hole's delivery from rest already
// simulated at this speed (MakePlan has it from its scan).
func evaluateFrom(u unit, h profiles.Hole, t machine.Timing, ls lungState, o2LPerMin float64, cylL, cylBar float64, rest HoleFigure) (Figures, error) {
	var err error
	c := ls.lung.ComplianceMLPerCmH2O
	f := Figures{
		Hole: rest, Timing: t, PEEPCmH2O: ls.peep,
		ComplianceMLPerCmH2O: c, ResistanceCmH2OPerLS: ls.lung.ResistanceCmH2OPerLS,
	}
	f.TauS = physiology.TimeConstantS(ls.lung.ResistanceCmH2OPerLS+u.p.Circuit.ExpiratoryResistanceCmH2OPerLS, c)
	var r machine.StrokeResult
	f.TrappedML = physiology.TrappedVolumeML(rest.DeliveredML, t.TeS, f.TauS)
	for it := 0; it < steadyIterations; it++ {
		if math.IsInf(f.TrappedML, 0) || math.IsNaN(f.TrappedML) {
			return Figures{}, fmt.Errorf("setup: no time to exhale (Te %s s)", physiology.PlainNumber(t.TeS))
		}
		r, err = u.simulator().SimulateStroke(machine.StrokeInput{
			Stroke: u.stroke(h, t.RPM, u.cal.Calibration), Lung: ls.lung,
			CircuitMLPerCmH2O: u.p.Circuit.ComplianceMLPerCmH2O, PEEPCmH2O: ls.peep,
			StartVolumeML: f.TrappedML, RingFrictionN: u.p.Cylinder.RingFrictionN, Gas: u.gas.patientPath(), StepS: u.stepS,
			NoTorque: u.pressuresOnly,
		})
		if err != nil {
			return Figures{}, err
		}
		// Settled when this breath would trap what it started from, to
		// 0.01 mL (the trapped gas is a few % of the delivered volume, so
		// the delivery then moves by far less).
		next := physiology.TrappedVolumeML(r.DeliveredML, t.TeS, f.TauS)
		if math.Abs(next-f.TrappedML) < 0.01 {
			break
		}
		f.TrappedML = next
	}
	f.Hole.DeliveredML, f.Hole.MLPerKg = r.DeliveredML, r.DeliveredML/ls.pbwKg
	fillFigures(&f, u, r, ls, o2LPerMin, cylL, cylBar)
	return f, nil
}

// fillFigures sets the figures of the steady-state stroke r.
func fillFigures(f *Figures, u unit, r machine.StrokeResult, ls lungState, o2LPerMin float64, cylL, cylBar float64) {
	c, t := ls.lung.ComplianceMLPerCmH2O, f.Timing
	f.IntrinsicPEEPCmH2O = f.TrappedML / c
	f.PeakCmH2O = r.PeakCmH2O
	f.EndInspCmH2O = r.EndCmH2O
	// Plateau: the equation of motion with no flow (Chatburn 2014).
	f.PlateauCmH2O = physiology.AirwayPressureCmH2O(ls.peep, f.TrappedML+r.DeliveredML, c, ls.lung.ResistanceCmH2OPerLS, 0)
	f.DrivingCmH2O = r.DeliveredML / c
	f.PeakFlowLPerMin = r.PeakPatientFlowMLPerS * 60 / 1000
	f.PeakPistonLPerMin = r.PeakPistonFlowMLPerS * 60 / 1000
	f.MinuteVentLPerMin = r.DeliveredML * t.RateBPM / 1000
	f.PeakTorqueNm = r.PeakTorqueNm
	f.TorqueShareOfRating = r.PeakTorqueNm / u.p.Motor.RatedTorqueNm
	f.O2FlowLPerMin = o2LPerMin
	f.FiO2 = physiology.FiO2FromPistonIntake(o2LPerMin, f.Hole.EffectiveSweptML, t.RateBPM)
	f.CylinderMinutes = math.Inf(1)
	if cylL > 0 {
		f.CylinderGiven = true
		f.CylinderMinutes = physiology.CylinderMinutesLeft(cylL, cylBar, o2LPerMin)
	}
	applyCylinderReserve(f, cylL, cylBar, u.cylinderReserveBar)
	f.BTPSFactor, f.DeliveredRoomML = r.Gas.BTPSFactor, r.Gas.DeliveredRoomML
	if f.BTPSFactor == 0 { // a zero gas path: the version 1 model, room at body conditions
		f.BTPSFactor, f.DeliveredRoomML = 1, r.DeliveredML
	}
	f.CompressionLossML = r.Gas.CompressionLossML
	f.LeakedML = r.Gas.LeakedML
	f.ReliefVentedML = r.Gas.ReliefVentedML
	f.PressureLimited = r.Gas.PressureLimited
}
