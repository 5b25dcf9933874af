package setup

import (
	"crankside/machine"
	"crankside/physiology"
	"crankside/profiles"
)

// V1Request is req in the version 1 limit, for tests: the room at body
// conditions (37 C, saturated), the BTPS factor exactly 1 (Buck's 47.07
// mmHg at 37 C against the convention's 47 would leave 1.4e-4), and the
// cylinder's gas left out. With a profile without leak and a relief
// valve above the peak, every figure is the version 1 model's.
func V1Request(req Request) Request {
	t, rh := 37.0, 100.0
	req.Room = Room{TemperatureC: &t, HumidityPct: &rh}
	req.v1Gas = true
	return req
}

// V1CheckRequest is V1Request for a check.
func V1CheckRequest(req CheckRequest) CheckRequest {
	t, rh := 37.0, 100.0
	req.Room = Room{TemperatureC: &t, HumidityPct: &rh}
	req.v1Gas = true
	return req
}

// BenchGains runs the breath model for each bench point (test lung, speed,
// this circuit, from rest, PEEP 0, geometric piston; room air into a
// room-temperature test lung, so F = 1, through the profile's cylinder,
// leak and relief valve) and returns the points with the model's
// delivered-per-swept gain.
func BenchGains(p profiles.Profile, points []profiles.BenchPoint) ([]machine.BenchPoint, error) {
	return benchGains(unit{p: p, gas: gasModelOf(p), sim: &machine.Simulator{}}, points)
}

// FitCheckReadings is the check's fit alone (fitReadings on the unit that
// RunCheck builds), for the round-trip grid: it skips the figures, the
// ranges and the cautions that a whole check adds.
func FitCheckReadings(req CheckRequest, p profiles.Profile, rd physiology.Readings) (physiology.Mechanics, error) {
	pbw, err := pbwOf(req.Patient)
	if err != nil {
		return physiology.Mechanics{}, err
	}
	room, err := resolveRoom(req.Room)
	if err != nil {
		return physiology.Mechanics{}, err
	}
	u, err := newUnitV(p, orNow(req.Now), req.v1Gas)
	if err != nil {
		return physiology.Mechanics{}, err
	}
	u.gas = withRoom(u.gas, room, req.v1Gas)
	return newReadingsFit(u, req.Setting, pbw, req, 10).fit(rd, nil)
}

// ProtocolProposal is the protocol's next step alone, for tests: the
// check of req's setting (any proposal in req left out) and the step from
// readings, as a check with gas readings computes it (protocolStep): the
// hole nearest the new volume, the speed and dwell for the new rate at
// the same I:E, the PEEP valve, and the O2 flow for the new FiO2 (held
// FiO2 when only the minute ventilation changes), evaluated with the same
// lung as the current setting (fitted to the readings when they fit) and
// with its cautions, the machine's reach included.
func ProtocolProposal(req CheckRequest, readings GasReadings, p profiles.Profile) (ProtocolStepResult, error) {
	if bad := CheckGasEntries(readings); len(bad) > 0 {
		return ProtocolStepResult{}, bad[0]
	}
	req.Proposal = Proposal{}
	ck, err := RunCheck(req, p)
	if err != nil {
		return ProtocolStepResult{}, err
	}
	return protocolStep(ck, req, readings, p)
}
