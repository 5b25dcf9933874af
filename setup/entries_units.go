package setup

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"crankside/physiology"
)

// The ward's units. A blood gas may be typed in mmHg or kPa (gas-unit), an
// airway pressure in cmH2O, hPa or mbar (pressure-unit), a height in cm or
// inches (height-in, or feet and inches in the height-cm entry), the
// barometer in mmHg or hPa (barometric-hpa). Before anything else reads
// them, convertUnits turns each into the tool's own unit with the published
// factors of physiology/units.go and keeps a Conversion, so that every
// report echoes what was typed beside what it was read as.

// Conversion is one entry typed in another unit than the tool's, and what
// it was read as.
type Conversion struct {
	Entry       string  `json:"entry"` // the flag or field as typed: "paco2", "height-in"
	Quantity    string  `json:"quantity"`
	Entered     float64 `json:"entered"`
	EnteredUnit string  `json:"entered_unit"`
	Value       float64 `json:"value"`
	Unit        string  `json:"unit"`
	Text        string  `json:"text"` // "PaCO2 10.5 kPa = 78.8 mmHg"
}

// Units a person may choose, as typed in --gas-unit and --pressure-unit.
const (
	GasUnitMmHg       = "mmhg"
	GasUnitKPa        = "kpa"
	PressureUnitCmH2O = "cmh2o"
	PressureUnitHPa   = "hpa"
	PressureUnitMbar  = "mbar"
)

// A gas value far more plausible in the other unit is refused, with the
// conversion in the message, rather than read. The limits are the edges of
// the plausible adult ranges (from memory): PaO2 30-600 mmHg (4-80 kPa),
// PaCO2 15-150 mmHg (2-20 kPa).
const (
	PaO2LooksKPaBelowMmHg  = 30.0 // a PaO2 "in mmHg" under 30 is a kPa value
	PaCO2LooksKPaBelowMmHg = 15.0 // a PaCO2 "in mmHg" under 15 is a kPa value
	PaO2LooksMmHgAboveKPa  = 80.0 // a PaO2 "in kPa" above 80 is an mmHg value
	PaCO2LooksMmHgAboveKPa = 20.0 // a PaCO2 "in kPa" above 20 is an mmHg value
)

// pressureEntries are the airway pressures a manometer's unit applies to.
var pressureEntries = []struct{ name, quantity string }{
	{"peep", "PEEP"}, {"peak", "peak reading"}, {"end-pressure", "end reading"},
	{"manometer-step", "manometer step"}, {"propose-peep", "proposed PEEP"},
}

// unitReader converts a copy of the entries into the tool's units.
type unitReader struct {
	in, out   Entries
	specs     []EntrySpec
	converted []Conversion
	problems  Problems
}

// convertUnits returns the entries in the tool's own units, what was
// converted, and the problems of the unit entries themselves (a bad unit,
// a gas value in the other unit, two heights). A value that is not a
// number is left as it is for the entry reader to report.
func convertUnits(e Entries, specs []EntrySpec) (Entries, []Conversion, Problems) {
	u := &unitReader{in: e, out: Entries{}, specs: specs}
	for k, v := range e {
		u.out[k] = v
	}
	u.height()
	u.barometer()
	if u.has("pressure-unit") {
		u.pressures()
	}
	if u.has("gas-unit") {
		u.gases()
	}
	return u.out, u.converted, u.problems
}

func (u *unitReader) has(name string) bool {
	for _, s := range u.specs {
		if s.Name == name {
			return true
		}
	}
	return false
}

func (u *unitReader) text(name string) string { return strings.TrimSpace(u.in[name]) }

func (u *unitReader) fail(name, reason string) {
	if u.problems.Field(name) == nil {
		u.problems = append(u.problems, &InputError{Field: name, Reason: reason})
	}
	delete(u.out, name)
}

// convert replaces entry `to` with value in the tool's unit and keeps the
// conversion under the entry as typed.
func (u *unitReader) convert(from, to, quantity string, entered float64, enteredUnit string, value float64, unit string, digits int) {
	u.out[to] = strconv.FormatFloat(value, 'g', -1, 64)
	if from != to {
		delete(u.out, from)
	}
	u.converted = append(u.converted, Conversion{
		Entry: from, Quantity: quantity, Entered: entered, EnteredUnit: enteredUnit, Value: r4(value), Unit: unit,
		Text: fmt.Sprintf("%s %s %s = %s %s", quantity, typed(entered), enteredUnit, strconv.FormatFloat(value, 'f', digits, 64), unit),
	})
}

// typed is a number as a person typed it, every digit kept (a huge or
// tiny one as PlainNumber says it).
func typed(v float64) string {
	if math.Abs(v) >= 1e9 || (v != 0 && math.Abs(v) < 1e-4) {
		return physiology.PlainNumber(v)
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// choice reads a unit entry; "" when blank or bad (a bad one is a problem).
func (u *unitReader) choice(name string, allowed ...string) string {
	t := strings.ToLower(u.text(name))
	if t == "" {
		return ""
	}
	for _, a := range allowed {
		if t == a {
			return t
		}
	}
	u.fail(name, fmt.Sprintf("%s is not a unit here: use %s", physiology.Quote(u.text(name)), strings.Join(allowed, " or ")))
	return ""
}

func (u *unitReader) height() {
	switch {
	case u.text("height-in") != "" && u.text("height-cm") != "":
		u.fail("height-in", "give the height once: height-cm or height-in, not both")
		return
	case u.text("height-in") != "":
		v, err := physiology.ParseNumber(u.text("height-in"))
		if err != nil {
			u.fail("height-in", err.Error()+" (in)")
			return
		}
		u.convert("height-in", "height-cm", "height", v, "in", physiology.InchesToCm(v), "cm", 1)
	case u.text("height-cm") != "":
		t := u.text("height-cm")
		if _, err := physiology.ParseNumber(t); err == nil || !heightWithUnit(t) {
			return // a number, or not a number: the entry reader's to say
		}
		h, err := physiology.ParseHeight(t)
		switch {
		case err != nil:
			u.fail("height-cm", err.Error())
		case h.InInches:
			u.convert("height-cm", "height-cm", "height", h.Inches, "in", h.Cm, "cm", 1)
		default:
			u.out["height-cm"] = strconv.FormatFloat(h.Cm, 'g', -1, 64)
		}
	}
}

// heightWithUnit says whether a height entry's text tries to say its unit
// (a digit first, then a letter or a quote mark): "5'10\"", "70in".
func heightWithUnit(t string) bool {
	return t != "" && t[0] >= '0' && t[0] <= '9' && strings.ContainsFunc(t, func(r rune) bool {
		return r == '\'' || r == '"' || (r >= 'a' && r <= 'z') || (r >= 'A' && r <= 'Z')
	})
}

func (u *unitReader) barometer() {
	if !u.has("barometric-hpa") || u.text("barometric-hpa") == "" {
		return
	}
	if u.text("barometric-mmhg") != "" {
		u.fail("barometric-hpa", "give the barometer once: barometric-mmhg or barometric-hpa, not both")
		return
	}
	v, err := physiology.ParseNumber(u.text("barometric-hpa"))
	if err != nil {
		u.fail("barometric-hpa", err.Error()+" (hPa)")
		return
	}
	u.convert("barometric-hpa", "barometric-mmhg", "barometer", v, "hPa", physiology.HPaToMmHg(v), "mmHg", 1)
}

func (u *unitReader) pressures() {
	unit := u.choice("pressure-unit", PressureUnitCmH2O, PressureUnitHPa, PressureUnitMbar)
	if unit == "" || unit == PressureUnitCmH2O {
		return
	}
	word := map[string]string{PressureUnitHPa: "hPa", PressureUnitMbar: "mbar"}[unit]
	for _, p := range pressureEntries {
		if !u.has(p.name) || u.text(p.name) == "" {
			continue
		}
		v, err := physiology.ParseNumber(u.text(p.name))
		if err != nil {
			u.fail(p.name, err.Error()+" ("+word+")")
			continue
		}
		u.convert(p.name, p.name, p.quantity, v, word, physiology.HPaToCmH2O(v), "cmH2O", 2)
	}
}

func (u *unitReader) gases() {
	unit := u.choice("gas-unit", GasUnitMmHg, GasUnitKPa)
	for _, g := range []struct {
		name, quantity          string
		kPaBelowMmHg, mmHgAbove float64
	}{{"pao2", "PaO2", PaO2LooksKPaBelowMmHg, PaO2LooksMmHgAboveKPa}, {"paco2", "PaCO2", PaCO2LooksKPaBelowMmHg, PaCO2LooksMmHgAboveKPa}} {
		if u.text(g.name) == "" || (unit == "" && u.text("gas-unit") != "") {
			continue
		}
		v, err := physiology.ParseNumber(u.text(g.name))
		if err != nil {
			continue
		}
		one := func(x float64) string { return strconv.FormatFloat(x, 'f', 1, 64) }
		switch {
		case unit == GasUnitKPa && v > g.mmHgAbove:
			u.fail(g.name, fmt.Sprintf("%s looks like mmHg (= %s kPa): say the unit (gas-unit mmhg); a %s in kPa is plausible up to %s",
				physiology.PlainNumber(v), one(physiology.MmHgToKPa(v)), g.quantity, physiology.PlainNumber(g.mmHgAbove)))
		case unit == GasUnitKPa:
			u.convert(g.name, g.name, g.quantity, v, "kPa", physiology.KPaToMmHg(v), "mmHg", 1)
		case v > 0 && v < g.kPaBelowMmHg:
			u.fail(g.name, fmt.Sprintf("%s looks like kPa (= %s mmHg): say the unit (gas-unit kpa); a %s in mmHg is plausible from %s",
				physiology.PlainNumber(v), one(physiology.KPaToMmHg(v)), g.quantity, physiology.PlainNumber(g.kPaBelowMmHg)))
		}
	}
}

// unitProblems puts the unit entries' problems beside the others, and says
// what was typed in a problem of a converted entry: "peak reading 153
// cmH2O is outside 0-150 cmH2O (entered 150 hPa)".
func (r *entryReader) unitProblems(converted []Conversion, own Problems) {
	for _, c := range converted {
		to := c.Entry
		switch c.Entry {
		case "height-in":
			to = "height-cm"
		case "barometric-hpa":
			to = "barometric-mmhg"
		}
		if p := r.problems.Field(to); p != nil {
			p.Field = c.Entry
			p.Reason += " (entered " + typed(c.Entered) + " " + c.EnteredUnit + ")"
		}
	}
	for _, p := range own {
		r.dropMissing(p.Field)
		if p.Field == "height-in" {
			r.dropMissing("height-cm")
		}
		if r.problems.Field(p.Field) == nil {
			r.problems = append(r.problems, p)
		}
	}
}

// dropMissing forgets that a required entry is blank: its value was given
// in another entry, whose own problem says what is wrong.
func (r *entryReader) dropMissing(name string) {
	out := r.problems[:0]
	for _, p := range r.problems {
		if !(p.Field == name && p.Missing) {
			out = append(out, p)
		}
	}
	r.problems = out
}

// HeightEcho is how a height entry that says its unit is read, for a form
// to show beside the field ("read as 177.8 cm"), or "" for a plain number
// or text that is not a height (the entry builder says why).
func HeightEcho(text string) string {
	t := strings.TrimSpace(text)
	if _, err := physiology.ParseNumber(t); err == nil {
		if v, ok := Understood(t); ok && strings.Contains(t, ",") {
			return "read as " + v
		}
		return ""
	}
	if !heightWithUnit(t) {
		return ""
	}
	h, err := physiology.ParseHeight(t)
	if err != nil {
		return ""
	}
	return "read as " + strconv.FormatFloat(h.Cm, 'f', 1, 64) + " cm"
}

// ConversionLine is every converted entry on one line, or "".
func ConversionLine(cs []Conversion) string {
	var parts []string
	for _, c := range cs {
		parts = append(parts, c.Text)
	}
	return strings.Join(parts, "; ")
}
