package setup

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
	"time"

	"crankside/physiology"
)

// Entries are what a person typed, keyed by the flag's name ("height-cm",
// "propose-rpm"): the command line's flag values and the screen's fields
// both arrive here as text. A name that is absent or blank means "not
// given". BuildRequest and BuildCheckRequest are the one place where such
// text becomes numbers, defaults are applied and the rules that join two
// entries (a cylinder needs both its capacity and its pressure) are kept.
type Entries map[string]string

// Problems are every entry that cannot be used, each naming its field, in
// the order of the form. Missing required entries carry Missing.
type Problems []*InputError

// Err is the first problem as an error, or nil when there is none.
func (ps Problems) Err() error {
	if len(ps) == 0 {
		return nil
	}
	return ps[0]
}

// Field returns the problem of one field, or nil.
func (ps Problems) Field(name string) *InputError {
	for _, p := range ps {
		if p.Field == name {
			return p
		}
	}
	return nil
}

// entryKind says how a field's text is read.
type entryKind int

const (
	kindNumber entryKind = iota // a decimal number; a comma is a decimal mark
	kindText                    // text taken as it is (a hole label)
	kindChoice                  // one of a few words (sex, lung)
	kindRatio                   // an I:E like 1:2
)

// EntrySpec describes one entry: its flag name, what it holds, its unit,
// and the hint shown beside an empty field (the default and its source,
// or "required").
type EntrySpec struct {
	Name     string
	Label    string
	Unit     string
	Kind     entryKind
	Required bool
	// ZeroIsDefault marks entries whose blank means a default: typing 0
	// there is refused instead of silently meaning "default".
	ZeroIsDefault bool
}

var planSpecs = []EntrySpec{
	{Name: "height-cm", Label: "Height", Unit: "cm", Required: true},
	{Name: "height-in", Label: "Height", Unit: "in"},
	{Name: "sex", Label: "Sex", Kind: kindChoice, Required: true},
	{Name: "lung", Label: "Lung", Kind: kindChoice},
	{Name: "ml-per-kg", Label: "Tidal volume", Unit: "mL/kg", ZeroIsDefault: true},
	{Name: "rate", Label: "Rate", Unit: "/min", ZeroIsDefault: true},
	{Name: "ie", Label: "I:E", Kind: kindRatio},
	{Name: "peep", Label: "PEEP", Unit: "cmH2O"},
	{Name: "fio2", Label: "FiO2", ZeroIsDefault: true},
	{Name: "compliance", Label: "Compliance", Unit: "mL/cmH2O", ZeroIsDefault: true},
	{Name: "resistance", Label: "Resistance", Unit: "cmH2O/(L/s)", ZeroIsDefault: true},
	{Name: "cylinder-l", Label: "Cylinder", Unit: "L", ZeroIsDefault: true},
	{Name: "cylinder-bar", Label: "Cylinder", Unit: "bar"},
	{Name: "cylinder-reserve-bar", Label: "Cylinder reserve", Unit: "bar", ZeroIsDefault: true},
	{Name: "room-c", Label: "Room temperature", Unit: "C"},
	{Name: "room-rh", Label: "Room humidity", Unit: "%"},
	{Name: "barometric-mmhg", Label: "Barometer", Unit: "mmHg"},
	{Name: "barometric-hpa", Label: "Barometer", Unit: "hPa"},
	{Name: "pressure-unit", Label: "Pressure unit", Kind: kindChoice},
}

var checkSpecs = []EntrySpec{
	{Name: "height-cm", Label: "Height", Unit: "cm", Required: true},
	{Name: "height-in", Label: "Height", Unit: "in"},
	{Name: "sex", Label: "Sex", Kind: kindChoice, Required: true},
	{Name: "lung", Label: "Lung", Kind: kindChoice},
	{Name: "compliance", Label: "Compliance", Unit: "mL/cmH2O", ZeroIsDefault: true},
	{Name: "resistance", Label: "Resistance", Unit: "cmH2O/(L/s)", ZeroIsDefault: true},
	{Name: "hole", Label: "Hole", Kind: kindText, Required: true},
	{Name: "rpm", Label: "Motor speed", Unit: "rpm"},
	{Name: "turn-s", Label: "One turn timed", Unit: "s", ZeroIsDefault: true},
	{Name: "dwell-s", Label: "Dwell", Unit: "s"},
	{Name: "pause-s", Label: "Pause timed", Unit: "s"},
	{Name: "breaths-per-min", Label: "Breaths counted", Unit: "/min", ZeroIsDefault: true},
	{Name: "peep", Label: "PEEP valve", Unit: "cmH2O"},
	{Name: "o2-lpm", Label: "O2 flow", Unit: "L/min"},
	{Name: "peak", Label: "Peak reading", Unit: "cmH2O"},
	{Name: "end-pressure", Label: "End reading", Unit: "cmH2O"},
	{Name: "breathing-against", Label: "Breathing against the unit", Kind: kindChoice},
	{Name: "cylinder-l", Label: "Cylinder", Unit: "L", ZeroIsDefault: true},
	{Name: "cylinder-bar", Label: "Cylinder", Unit: "bar"},
	{Name: "cylinder-reserve-bar", Label: "Cylinder reserve", Unit: "bar", ZeroIsDefault: true},
	{Name: "spo2", Label: "SpO2", Unit: "%"},
	{Name: "pao2", Label: "PaO2", Unit: "mmHg"},
	{Name: "ph", Label: "pH"},
	{Name: "paco2", Label: "PaCO2", Unit: "mmHg"},
	{Name: "dead-space-ml", Label: "Apparatus dead space", Unit: "mL"},
	{Name: "hold-alveolar-ventilation", Label: "Hold alveolar ventilation", Kind: kindChoice},
	{Name: "propose-hole", Label: "Proposed hole", Kind: kindText},
	{Name: "propose-rpm", Label: "Proposed speed", Unit: "rpm"},
	{Name: "propose-dwell-s", Label: "Proposed dwell", Unit: "s"},
	{Name: "propose-peep", Label: "Proposed PEEP", Unit: "cmH2O"},
	{Name: "propose-o2-lpm", Label: "Proposed O2 flow", Unit: "L/min"},
	{Name: "room-c", Label: "Room temperature", Unit: "C"},
	{Name: "room-rh", Label: "Room humidity", Unit: "%"},
	{Name: "barometric-mmhg", Label: "Barometer", Unit: "mmHg"},
	{Name: "barometric-hpa", Label: "Barometer", Unit: "hPa"},
	{Name: "manometer-step", Label: "Manometer step", Unit: "cmH2O", ZeroIsDefault: true},
	{Name: "pressure-unit", Label: "Pressure unit", Kind: kindChoice},
	{Name: "gas-unit", Label: "Gas unit", Kind: kindChoice},
}

// Spec returns the entry of that flag name, from the plan's or the
// check's list.
func Spec(name string) (EntrySpec, bool) {
	for _, list := range [][]EntrySpec{planSpecs, checkSpecs} {
		for _, s := range list {
			if s.Name == name {
				return s, true
			}
		}
	}
	return EntrySpec{}, false
}

// entryReader reads Entries field by field and gathers every problem.
type entryReader struct {
	e        Entries
	problems Problems
}

func (r *entryReader) text(name string) string { return strings.TrimSpace(r.e[name]) }

func (r *entryReader) given(name string) bool { return r.text(name) != "" }

func (r *entryReader) fail(name, reason string) {
	if r.problems.Field(name) == nil {
		r.problems = append(r.problems, &InputError{Field: name, Reason: reason})
	}
}

func (r *entryReader) missing(name, reason string) {
	if r.problems.Field(name) == nil {
		r.problems = append(r.problems, &InputError{Field: name, Reason: reason, Missing: true})
	}
}

// number reads a number entry; ok is false when it is blank or bad (a bad
// one is a problem). A typed 0 where blank means the default is refused.
func (r *entryReader) number(name string) (v float64, ok bool) {
	spec, _ := Spec(name)
	text := r.text(name)
	if text == "" {
		if spec.Required {
			r.missing(name, "required"+unitHint(spec.Unit))
		}
		return 0, false
	}
	v, err := physiology.ParseNumber(text)
	if err != nil {
		r.fail(name, err.Error()+unitHint(spec.Unit))
		return 0, false
	}
	if v == 0 && spec.ZeroIsDefault {
		r.fail(name, "0 is not allowed; leave it blank for the default")
		return 0, false
	}
	return v, true
}

func unitHint(unit string) string {
	if unit == "" {
		return ""
	}
	return " (" + unit + ")"
}

// patient reads height and sex; the height's range is checked here so
// that it is reported with the other entries.
func (r *entryReader) patient() Patient {
	var p Patient
	if h, ok := r.number("height-cm"); ok {
		if err := checkRange("height-cm", "height", h, physiology.HeightMinCm, physiology.HeightMaxCm, "cm"); err != nil {
			r.problems = append(r.problems, err.(*InputError))
		}
		p.HeightCm = h
	}
	switch {
	case !r.given("sex"):
		r.missing("sex", "required: male or female")
	default:
		sex, err := physiology.ParseSex(r.text("sex"))
		if err != nil {
			r.fail("sex", err.Error())
		}
		p.Sex = sex
	}
	return p
}

func (r *entryReader) lung() physiology.Lung {
	if !r.given("lung") {
		return physiology.Normal
	}
	l, err := physiology.ParseLung(r.text("lung"))
	if err != nil {
		r.fail("lung", err.Error())
		return physiology.Normal
	}
	return l
}

// cylinder reads the oxygen cylinder: both entries or neither.
func (r *entryReader) cylinder() (waterL, bar float64) {
	l, hasL := r.number("cylinder-l")
	b, hasB := r.number("cylinder-bar")
	switch {
	case r.given("cylinder-l") && !r.given("cylinder-bar"):
		r.fail("cylinder-bar", "needed with the cylinder's capacity (cylinder-l): give both or neither")
	case r.given("cylinder-bar") && !r.given("cylinder-l"):
		r.fail("cylinder-l", "needed with the cylinder's pressure (cylinder-bar): give both or neither")
	case hasL && hasB:
		return l, b
	}
	return 0, 0
}

// BuildRequest turns a plan's entries into a Request, with every problem
// at once. The request is only for MakePlan when Problems is empty.
func BuildRequest(e Entries, now time.Time) (Request, Problems) {
	e, converted, unitProblems := convertUnits(e, planSpecs)
	r := &entryReader{e: e}
	req := Request{Patient: r.patient(), Now: now, Converted: converted}
	t := Targets{Lung: r.lung()}
	t.MLPerKg, _ = r.number("ml-per-kg")
	t.RateBPM, _ = r.number("rate")
	t.FiO2, _ = r.number("fio2")
	t.ComplianceMLPerCmH2O, _ = r.number("compliance")
	t.ResistanceCmH2OPerLS, _ = r.number("resistance")
	if v, ok := r.number("peep"); ok {
		t.PEEPCmH2O = &v
	}
	if r.given("ie") {
		ie, err := physiology.ParseIE(r.text("ie"))
		if err != nil {
			r.fail("ie", strings.TrimPrefix(err.Error(), "I:E "))
		}
		t.IE = ie
	}
	t.CylinderWaterL, t.CylinderBar = r.cylinder()
	t.CylinderReserveBar = r.cylinderReserve()
	req.Targets = t
	req.Room = r.room()
	r.rangeProblems(req.Targets)
	r.unitProblems(converted, unitProblems)
	return req, r.sorted(planSpecs)
}

// rangeProblems checks each target on its own against its range, so that
// all of them are marked at once.
func (r *entryReader) rangeProblems(t Targets) {
	for _, one := range []Targets{
		{MLPerKg: t.MLPerKg}, {RateBPM: t.RateBPM}, {IE: t.IE}, {PEEPCmH2O: t.PEEPCmH2O}, {FiO2: t.FiO2},
		{ComplianceMLPerCmH2O: t.ComplianceMLPerCmH2O}, {ResistanceCmH2OPerLS: t.ResistanceCmH2OPerLS},
		{CylinderWaterL: t.CylinderWaterL, CylinderBar: t.CylinderBar},
	} {
		if _, err := resolveTargets(one); err != nil {
			if ie, ok := err.(*InputError); ok && r.problems.Field(ie.Field) == nil {
				r.problems = append(r.problems, ie)
			}
		}
	}
}

// room reads the room's air for the BTPS factor; each entry's range is
// checked here so that all are marked at once.
func (r *entryReader) room() Room {
	var out Room
	for _, e := range []struct {
		name string
		dst  **float64
	}{{"room-c", &out.TemperatureC}, {"room-rh", &out.HumidityPct}, {"barometric-mmhg", &out.BarometricMmHg}} {
		if v, ok := r.number(e.name); ok {
			*e.dst = &v
			if _, err := resolveRoom(roomOne(e.name, v)); err != nil {
				if ie, ok := err.(*InputError); ok && r.problems.Field(e.name) == nil {
					r.problems = append(r.problems, ie)
				}
			}
		}
	}
	return out
}

// roomOne is a Room with one entry set.
func roomOne(name string, v float64) Room {
	switch name {
	case "room-c":
		return Room{TemperatureC: &v}
	case "room-rh":
		return Room{HumidityPct: &v}
	}
	return Room{BarometricMmHg: &v}
}

// sorted puts the problems in the order of the form.
func (r *entryReader) sorted(specs []EntrySpec) Problems {
	rank := map[string]int{}
	for i, s := range specs {
		rank[s.Name] = i
	}
	sort.SliceStable(r.problems, func(i, j int) bool { return rank[r.problems[i].Field] < rank[r.problems[j].Field] })
	return r.problems
}

// DefaultPEEPCmH2O is the PEEP valve assumed at a check when none is
// entered (ARDS Network 2000 protocol: PEEP at least 5).
const DefaultPEEPCmH2O = 5

// BuildCheckRequest turns a check's entries into a CheckRequest, with every
// problem at once. Whether the hole, speed and dwell suit this machine is
// RunCheck's to say, since it needs the profile.
func BuildCheckRequest(e Entries, now time.Time) (CheckRequest, Problems) {
	e, converted, unitProblems := convertUnits(e, checkSpecs)
	r := &entryReader{e: e}
	req := CheckRequest{Patient: r.patient(), Lung: r.lung(), Now: now, Converted: converted}
	if !r.given("lung") {
		// Not stated: the assumed mechanics are a normal lung's, and the
		// protocol step says it applies the ARDS rules (physiology).
		req.Lung = 0
	}
	req.NoAlveolarHold = !r.yesNo("hold-alveolar-ventilation", true)
	req.ComplianceMLPerCmH2O, _ = r.number("compliance")
	req.ResistanceCmH2OPerLS, _ = r.number("resistance")
	req.Setting.Hole = r.text("hole")
	if req.Setting.Hole == "" {
		r.missing("hole", "required: the hole the pin is in")
	}
	r.timing(&req.Setting)
	req.Setting.PEEPCmH2O = DefaultPEEPCmH2O
	if v, ok := r.number("peep"); ok {
		req.Setting.PEEPCmH2O = v
	}
	req.Setting.O2LPerMin, _ = r.number("o2-lpm")
	peak, hasPeak := r.number("peak")
	end, hasEnd := r.number("end-pressure")
	switch {
	case hasPeak && hasEnd:
		req.Readings = &physiology.Readings{PeakCmH2O: peak, EndCmH2O: end}
		r.problems = append(r.problems, CheckReadings(*req.Readings)...)
	case r.given("peak") && !r.given("end-pressure"):
		r.fail("end-pressure", "peak and end-pressure go together: give both manometer readings or neither")
	case r.given("end-pressure") && !r.given("peak"):
		r.fail("peak", "peak and end-pressure go together: give both manometer readings or neither")
	}
	req.CylinderWaterL, req.CylinderBar = r.cylinder()
	req.CylinderReserveBar = r.cylinderReserve()
	req.BreathingAgainst = r.yesNo("breathing-against", false)
	req.Room = r.room()
	if v, ok := r.number("manometer-step"); ok {
		if err := checkRange("manometer-step", "manometer step", v, ManometerStepMinCmH2O, ManometerStepMaxCmH2O, "cmH2O"); err != nil {
			r.problems = append(r.problems, err.(*InputError))
		}
		req.ManometerStepCmH2O = v
	}
	if h := r.text("propose-hole"); h != "" {
		req.Proposal.Hole = &h
	}
	for _, pr := range []struct {
		name string
		dst  **float64
	}{{"propose-rpm", &req.Proposal.RPM}, {"propose-dwell-s", &req.Proposal.DwellS}, {"propose-peep", &req.Proposal.PEEPCmH2O}, {"propose-o2-lpm", &req.Proposal.O2LPerMin}} {
		if v, ok := r.number(pr.name); ok {
			*pr.dst = &v
		}
	}
	req.Gas = r.gas()
	r.rangeProblems(Targets{ComplianceMLPerCmH2O: req.ComplianceMLPerCmH2O, ResistanceCmH2OPerLS: req.ResistanceCmH2OPerLS,
		CylinderWaterL: req.CylinderWaterL, CylinderBar: req.CylinderBar})
	r.unitProblems(converted, unitProblems)
	return req, r.sorted(checkSpecs)
}

// Hint is what an empty entry means, shown beside its field: the default
// with its source for this lung condition, or that it is required.
func Hint(name string, lung physiology.Lung) string {
	d := physiology.DefaultsFor(lung)
	def := func(v physiology.Value, format string) string {
		return "blank: " + fmt.Sprintf(format, v.Value) + " (" + v.Source + ")"
	}
	switch name {
	case "height-cm":
		return fmt.Sprintf("required, %g-%g cm, or 70in, 5'10\"", physiology.HeightMinCm, physiology.HeightMaxCm)
	case "height-in":
		return "instead of height-cm; 1 in = 2.54 cm"
	case "gas-unit":
		return "blank: mmHg; kpa for PaO2 and PaCO2 in kPa (1 kPa = 7.50062 mmHg, NIST SP 811)"
	case "pressure-unit":
		return "blank: cmH2O; hpa or mbar (1 hPa = 1 mbar = 1.01972 cmH2O)"
	case "barometric-hpa":
		return "instead of barometric-mmhg; 1013.25 hPa = 760 mmHg"
	case "sex":
		return "required: m or f"
	case "ml-per-kg":
		return def(d.MLPerKg, "%g mL/kg")
	case "rate":
		return def(d.RateBPM, "%g /min")
	case "ie":
		return def(d.IE, "1:%g")
	case "peep":
		if lung == physiology.ARDS {
			return "blank: lowest PEEP for the FiO2 (" + d.PEEPCmH2O.Source + ")"
		}
		return def(d.PEEPCmH2O, "%g cmH2O")
	case "fio2":
		return def(d.FiO2, "%.2f")
	case "compliance":
		return def(d.Compliance, "%g mL/cmH2O")
	case "resistance":
		return def(d.Resistance, "%g cmH2O/(L/s)")
	case "hole":
		return "required: as set on the machine"
	case "rpm":
		return "required: as set, or time one turn (turn-s)"
	case "dwell-s":
		return "required: as set, or time the pause (pause-s) or count breaths (breaths-per-min)"
	case "turn-s":
		return "seconds for one turn, timed: in place of rpm"
	case "pause-s":
		return "seconds of the pause after a turn, timed: in place of dwell-s"
	case "breaths-per-min":
		return "breaths counted in one minute, with the turn: in place of dwell-s"
	case "peak", "end-pressure":
		return "optional: both readings, or neither"
	case "o2-lpm":
		return "blank: none"
	case "room-c", "room-rh", "barometric-mmhg":
		room := physiology.DefaultRoom()
		v := map[string]physiology.Value{"room-c": room.TemperatureC, "room-rh": room.HumidityPct, "barometric-mmhg": room.BarometricMmHg}[name]
		return def(v, "%g")
	case "manometer-step":
		return def(physiology.Value{Value: DefaultManometerStepCmH2O, Source: srcManometerStep}, "%g cmH2O")
	case "cylinder-reserve-bar":
		return def(physiology.Value{Value: DefaultCylinderReserveBar, Source: srcDefaultReserve}, "%g bar")
	case "breathing-against":
		return BreathingAgainstQuestion + " y or n; blank: no"
	case "hold-alveolar-ventilation":
		return "when the protocol moves Vt, scale the rate to hold rate x (Vt - dead space): this tool's choice, not the card's; y or n; blank: yes"
	}
	if strings.HasPrefix(name, "propose-") {
		return "blank: as now"
	}
	if h := gasHint(name); h != "" {
		return h
	}
	if strings.HasPrefix(name, "cylinder-") {
		return "optional: capacity and pressure together"
	}
	return ""
}

// Understood is how a number entry is read, as a plain decimal, so that a
// form can echo it beside the field ("0,9" is read as "0.9"); ok is false
// when the text is not a number.
func Understood(text string) (string, bool) {
	v, err := physiology.ParseNumber(text)
	if err != nil {
		return "", false
	}
	return strconv.FormatFloat(v, 'f', -1, 64), true
}

// RecordEntries are the check entries a recorded check implies: the
// patient's height and sex, the bed, and the setting found then. The next
// check of the bed starts from them.
func RecordEntries(r Record) Entries {
	num := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	e := Entries{
		"height-cm": num(r.HeightCm), "sex": r.Sex, "bed": r.Bed,
		"hole": r.Setting.Hole, "rpm": num(r.Setting.RPM), "dwell-s": num(r.Setting.DwellS),
		"peep": num(r.Setting.PEEPCmH2O),
	}
	// A timed setting starts the next check from what was timed, not from
	// a speed no dial shows.
	if m := r.Setting.Measured; m != nil {
		for name, v := range map[string]*float64{"turn-s": m.TurnS, "pause-s": m.PauseS, "breaths-per-min": m.BreathsPerMin} {
			if v != nil {
				e[name] = num(*v)
			}
		}
		if m.TurnS != nil {
			delete(e, "rpm")
		}
		if m.PauseS != nil || m.BreathsPerMin != nil {
			delete(e, "dwell-s")
		}
	}
	if r.Setting.O2LPerMin != 0 {
		e["o2-lpm"] = num(r.Setting.O2LPerMin)
	}
	return e
}

// ChangedEntries lists, as "name: was -> now", the entries of from that
// now holds otherwise (numbers compared as numbers, so 21 and 21,0 agree).
func ChangedEntries(from, now Entries) []string {
	var out []string
	for _, s := range checkSpecs {
		was, ok := from[s.Name]
		if !ok {
			continue
		}
		is := strings.TrimSpace(now[s.Name])
		same := was == is
		if s.Kind == kindNumber {
			a, errA := physiology.ParseNumber(was)
			b, errB := physiology.ParseNumber(is)
			same = same || (errA == nil && errB == nil && a == b)
		}
		if !same {
			out = append(out, fmt.Sprintf("%s: %s -> %s", s.Label, was, orBlank(is)))
		}
	}
	return out
}

func orBlank(s string) string {
	if s == "" {
		return "(blank)"
	}
	return s
}
