package setup

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
