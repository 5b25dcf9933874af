package profiles

import (
	"fmt"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestUnsafeTextIsRefusedNamingFieldAndPosition(t *testing.T) {
	// Code points from Unicode: U+200B zero width space, U+202E right-to-left
	// override, U+009B the C1 CSI, U+00AD soft hyphen, U+001B ESC (ECMA-48).
	cases := []struct {
		name, value, want string
		edit              func(m map[string]any, v string)
	}{
		{"zero-width in a hole label", "8\u200b", "crank.holes[3].label: contains an invisible character U+200B at position 2",
			func(m map[string]any, v string) { obj(m, "crank")["holes"].([]any)[3].(map[string]any)["label"] = v }},
		{"bidi override in the label", "Unit \u202eB", "label: contains a bidirectional control U+202E at position 6",
			func(m map[string]any, v string) { m["label"] = v }},
		{"C1 CSI in the label", "a\u009b2J", "label: contains a control character U+009B at position 2",
			func(m map[string]any, v string) { m["label"] = v }},
		{"ESC in a hole label", "\x1b[2J", "crank.holes[0].label: contains a control character U+001B at position 1",
			func(m map[string]any, v string) { obj(m, "crank")["holes"].([]any)[0].(map[string]any)["label"] = v }},
		{"soft hyphen in the id", "demo\u00adb", "id: contains an invisible character U+00AD at position 5",
			func(m map[string]any, v string) { m["id"] = v }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := demoJSON(t)
			c.edit(m, c.value)
			_, err := Parse(mustJSON(t, m), "t.json")
			require.ErrorIs(t, err, ErrProfile)
			require.Contains(t, err.Error(), c.want)
			requireNoRawControls(t, err.Error())
		})
	}
}

// requireNoRawControls asserts the bytes of ESC, C1 CSI in UTF-8 (C2 9B) and
// U+202E in UTF-8 (E2 80 AE, RFC 3629) are absent.
func requireNoRawControls(t *testing.T, s string) {
	t.Helper()
	for _, bad := range []string{"\x1b", "\xc2\x9b", "\xe2\x80\xae", "\u200b"} {
		require.NotContains(t, s, bad, "message %q holds raw % x", s, bad)
	}
}

func TestMessagesQuotingFileTextAreEscaped(t *testing.T) {
	// An unknown key and a source name holding escape sequences reach the
	// message only escaped.
	m := demoJSON(t)
	m["\x1b]52;c;aGk=\x07"] = 1
	_, err := Parse(mustJSON(t, m), "evil\x1b[2J\u202e.json")
	require.Error(t, err)
	requireNoRawControls(t, err.Error())
	require.Contains(t, err.Error(), `evil\x1b[2J\u202e.json`)
	require.Contains(t, err.Error(), `\x1b]52;c;aGk=\x07`)
}

func TestFileThatIsNotUTF8IsRefused(t *testing.T) {
	good, err := Marshal(demo(t, "demo-a"))
	require.NoError(t, err)
	bad := strings.Replace(string(good), `"label": "1"`, "\"label\": \"1\xff\"", 1)
	_, err = Parse([]byte(bad), "t.json")
	require.ErrorContains(t, err, "byte 0xff at line 15")
	require.ErrorContains(t, err, "not UTF-8")
}

func TestByteOrderMarkIsSkipped(t *testing.T) {
	// EF BB BF is U+FEFF in UTF-8 (RFC 3629), as Windows editors write it.
	good, err := Marshal(demo(t, "demo-b"))
	require.NoError(t, err)
	p, err := Parse(append([]byte("\xef\xbb\xbf"), good...), "bom.json")
	require.NoError(t, err)
	require.Equal(t, demo(t, "demo-b"), p)
	// Only at the start: a mark inside is a syntax error, as JSON has it.
	_, err = Parse(append([]byte("\xef\xbb\xbf\xef\xbb\xbf"), good...), "bom2.json")
	require.ErrorContains(t, err, "syntax error")
}

func TestConfusableHoleLabelsWarn(t *testing.T) {
	p := demo(t, "demo-b")
	require.Empty(t, Warnings(p), "demo-b skips I so that no label looks like another")
	require.Empty(t, Warnings(demo(t, "demo-a")))
	cases := []struct {
		a, b, want string
	}{
		{"1", "I", "easy to confuse"}, // common practice: I and 1
		{"1", "l", "easy to confuse"}, // l and 1
		{"O", "0", "easy to confuse"}, // O and 0
		{"1O", "10", "easy to confuse"},
		{"a", "A", "differs only in case"},
		{"b4", "B4", "differs only in case"},
	}
	for _, c := range cases {
		p := demo(t, "demo-b")
		p.Crank.Holes[0].Label, p.Crank.Holes[5].Label = c.a, c.b
		w := Warnings(p)
		require.Len(t, w, 1, "%q and %q", c.a, c.b)
		require.Equal(t, "crank.holes[5].label", w[0].Path)
		require.Contains(t, w[0].Problem, c.want)
		require.Contains(t, w[0].Problem, "crank.holes[0].label")
	}
	p = demo(t, "demo-b")
	p.Crank.Holes[2].Label = "C "
	w := Warnings(p)
	require.Len(t, w, 1)
	require.Contains(t, w[0].Error(), "crank.holes[2].label")
	require.Contains(t, w[0].Error(), "space")
}

func TestHoleByLabelFold(t *testing.T) {
	p := demo(t, "demo-b")
	h, found, ambiguous := p.HoleByLabelFold("c")
	require.True(t, found)
	require.False(t, ambiguous)
	require.Equal(t, "C", h.Label)
	require.Equal(t, 3.0, h.RadiusCm) // DESIGN.md: C is the third hole, 2.0 + 2 x 0.5 cm
	_, found, _ = p.HoleByLabelFold("I")
	require.False(t, found, "demo-b has no I")
	// An exact match wins over a case-insensitive one; two case-insensitive
	// matches are ambiguous.
	p.Crank.Holes[1].Label = "a"
	h, found, ambiguous = p.HoleByLabelFold("a")
	require.True(t, found)
	require.False(t, ambiguous)
	require.Equal(t, 2.5, h.RadiusCm) // the second hole
	_, found, ambiguous = p.HoleByLabelFold("A")
	require.True(t, found, "exact A")
	require.False(t, ambiguous)
	_, found, ambiguous = p.HoleByLabelFold("\u0041\u200b")
	require.False(t, found)
	require.False(t, ambiguous)
	p.Crank.Holes[0].Label = "x"
	p.Crank.Holes[1].Label = "X"
	_, found, ambiguous = p.HoleByLabelFold("x")
	require.True(t, found, "exact x")
	require.False(t, ambiguous)
	p.Crank.Holes[0].Label = "Xy"
	p.Crank.Holes[1].Label = "xY"
	_, found, ambiguous = p.HoleByLabelFold("XY")
	require.False(t, found)
	require.True(t, ambiguous)
}

func TestImplausibleGeometryIsRefusedWithTheRange(t *testing.T) {
	// Ranges are engineering judgement for a home-built adult unit (see
	// validate.go); the two values of issue 12 (bore 1e-300 cm, circuit
	// compliance 1e-20 mL/cmH2O) must be refused, and each message must give
	// the accepted range.
	set := func(section, key string, v float64) func(m map[string]any) {
		return func(m map[string]any) { obj(m, section)[key] = v }
	}
	hole := func(v float64) func(m map[string]any) {
		return func(m map[string]any) { obj(m, "crank")["holes"].([]any)[0].(map[string]any)["radius_cm"] = v }
	}
	cases := []struct {
		name  string
		edit  func(m map[string]any)
		field string
		rng   string
	}{
		{"bore 1e-300", set("cylinder", "bore_cm", 1e-300), "cylinder.bore_cm", "3 to 30 cm"},
		{"bore in mm", set("cylinder", "bore_cm", 90), "cylinder.bore_cm", "3 to 30 cm"},
		{"ring friction", set("cylinder", "ring_friction_n", 5000), "cylinder.ring_friction_n", "0 to 500 N"},
		{"clearance zero", set("cylinder", "clearance_cm", 0), "cylinder.clearance_cm", "0.1 to 10 cm"},
		{"clearance in mm", set("cylinder", "clearance_cm", 15), "cylinder.clearance_cm", "0.1 to 10 cm"},
		{"rod", set("crank", "rod_cm", 250), "crank.rod_cm", "2 to 100 cm"},
		{"offset", set("crank", "offset_cm", -25), "crank.offset_cm", "-20 to 20 cm"},
		{"hole radius tiny", hole(1e-9), "crank.holes[0].radius_cm", "0.2 to 20 cm"},
		{"circuit compliance 1e-20", set("circuit", "compliance_ml_per_cmh2o", 1e-20), "circuit.compliance_ml_per_cmh2o", "0.1 to 10 mL/cmH2O"},
		{"expiratory resistance", set("circuit", "expiratory_resistance_cmh2o_per_l_s", 80), "circuit.expiratory_resistance_cmh2o_per_l_s", "0 to 50 cmH2O/(L/s)"},
		{"relief too low", set("circuit", "relief_cmh2o", 2), "circuit.relief_cmh2o", "10 to 80 cmH2O"},
		{"leak negative", set("circuit", "leak_l_min_at_20_cmh2o", -1), "circuit.leak_l_min_at_20_cmh2o", "0 to 30 L/min"},
		{"leak huge", set("circuit", "leak_l_min_at_20_cmh2o", 300), "circuit.leak_l_min_at_20_cmh2o", "0 to 30 L/min"},
		// 1-70 L/min: a bleed is set in whole litres and more; 70 is a
		// high-flow meter (engineering judgement, validate.go).
		{"flowmeter zero", set("oxygen", "max_flow_l_min", 0), "oxygen.max_flow_l_min", "1 to 70 L/min"},
		{"flowmeter just under 1", set("oxygen", "max_flow_l_min", 0.99), "oxygen.max_flow_l_min", "1 to 70 L/min"},
		{"flowmeter just over 70", set("oxygen", "max_flow_l_min", 70.01), "oxygen.max_flow_l_min", "1 to 70 L/min"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := demoJSON(t)
			c.edit(m)
			_, err := Parse(mustJSON(t, m), "t.json")
			require.ErrorIs(t, err, ErrProfile)
			require.Contains(t, err.Error(), c.field)
			require.Contains(t, err.Error(), c.rng)
		})
	}
}

func TestFormatVersions(t *testing.T) {
	// A version 1 file (no clearance, no leak) still reads, with the defaults
	// of DESIGN.md (clearance 1.0 cm, leak 0) and a record that they were
	// applied.
	m := demoJSON(t)
	m["format"] = FormatV1
	delete(obj(m, "cylinder"), "clearance_cm")
	delete(obj(m, "circuit"), "leak_l_min_at_20_cmh2o")
	delete(m, "oxygen")
	p, err := Parse(mustJSON(t, m), "v1.json")
	require.NoError(t, err)
	require.Equal(t, 1.0, p.Cylinder.ClearanceCm)
	require.Equal(t, 0.0, p.Circuit.LeakLMinAt20CmH2O)
	require.Equal(t, 15.0, p.Oxygen.MaxFlowLMin, "common practice: flowmeters top out at 15 L/min")
	require.Equal(t, []string{"cylinder.clearance_cm", "circuit.leak_l_min_at_20_cmh2o", "oxygen.max_flow_l_min"}, p.Defaults)
	require.True(t, p.Defaulted("cylinder.clearance_cm"))
	// Written again it is version 3 with every field, and no default is left.
	out, err := Marshal(p)
	require.NoError(t, err)
	require.Contains(t, string(out), `"format": "crankside-profile/3"`)
	require.Contains(t, string(out), `"max_flow_l_min": 15`)
	require.Contains(t, string(out), `"clearance_cm": 1`)
	require.Contains(t, string(out), `"leak_l_min_at_20_cmh2o": 0`)
	again, err := Parse(out, "v2.json")
	require.NoError(t, err)
	require.Empty(t, again.Defaults)
	// A /3 file may leave any optional field out too.
	m = demoJSON(t)
	delete(obj(m, "cylinder"), "clearance_cm")
	p, err = Parse(mustJSON(t, m), "v3.json")
	require.NoError(t, err)
	require.Equal(t, []string{"cylinder.clearance_cm"}, p.Defaults)
	// A /2 file reads, without the oxygen section, which is then defaulted.
	m = demoJSON(t)
	m["format"] = FormatV2
	delete(m, "oxygen")
	p, err = Parse(mustJSON(t, m), "v2.json")
	require.NoError(t, err)
	require.Equal(t, []string{"oxygen.max_flow_l_min"}, p.Defaults)
	// A /1 file with a /2 field is refused, saying which format has it.
	fields := []struct{ section, key string }{{"cylinder", "clearance_cm"}, {"circuit", "leak_l_min_at_20_cmh2o"}}
	for i, f := range fields {
		m = demoJSON(t)
		m["format"] = FormatV1
		delete(m, "oxygen")
		other := fields[1-i]
		delete(obj(m, other.section), other.key)
		_, err = Parse(mustJSON(t, m), "mixed.json")
		require.ErrorContains(t, err, fmt.Sprintf("%s.%s: is a field of crankside-profile/2", f.section, f.key))
	}
	// A /1 or /2 file with the /3 oxygen section is refused the same way,
	// whether the section holds its field or is empty.
	for _, format := range []string{FormatV1, FormatV2} {
		m = demoJSON(t)
		m["format"] = format
		delete(obj(m, "cylinder"), "clearance_cm")
		delete(obj(m, "circuit"), "leak_l_min_at_20_cmh2o")
		_, err = Parse(mustJSON(t, m), "old.json")
		require.ErrorContains(t, err, "oxygen.max_flow_l_min: is a field of crankside-profile/3, but this file says \""+format)
		m["oxygen"] = map[string]any{}
		_, err = Parse(mustJSON(t, m), "old.json")
		require.ErrorContains(t, err, "oxygen: is a field of crankside-profile/3")
	}
}

func TestFlowmeterLimitsAreAccepted(t *testing.T) {
	// The ends of the accepted range 1-70 L/min (validate.go) read.
	for _, v := range []float64{1, 70} {
		m := demoJSON(t)
		obj(m, "oxygen")["max_flow_l_min"] = v
		p, err := Parse(mustJSON(t, m), "t.json")
		require.NoError(t, err)
		require.Equal(t, v, p.Oxygen.MaxFlowLMin)
	}
}
