package setup

import (
	"go/ast"
	"go/parser"
	"go/token"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// cautionIDConstants are the CautionID constants declared in this
// package's code, read from its source, so that an id added without an
// entry in the table fails TestEveryCautionHasOneEntry.
func cautionIDConstants(t *testing.T) []CautionID {
	t.Helper()
	fset := token.NewFileSet()
	files, err := filepath.Glob("*.go")
	require.NoError(t, err)
	var out []CautionID
	for _, name := range files {
		if strings.HasSuffix(name, "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, name, nil, 0)
		require.NoError(t, err)
		for _, d := range f.Decls {
			g, ok := d.(*ast.GenDecl)
			if !ok || g.Tok != token.CONST {
				continue
			}
			for _, spec := range g.Specs {
				vs := spec.(*ast.ValueSpec)
				if id, ok := vs.Type.(*ast.Ident); !ok || id.Name != "CautionID" {
					continue
				}
				for _, v := range vs.Values {
					lit := v.(*ast.BasicLit)
					s, err := strconv.Unquote(lit.Value)
					require.NoError(t, err)
					out = append(out, CautionID(s))
				}
			}
		}
	}
	return out
}

// Every caution id has one entry in the table: its level rule in words,
// its source, its ward words, and limits that are sound and that the
// words name, so that a limit changed in the table and not in the words
// (or the other way) fails here.
func TestEveryCautionHasOneEntry(t *testing.T) {
	ids := cautionIDConstants(t)
	require.GreaterOrEqual(t, len(ids), 53, "the table had 53 ids when it was made")
	seen := map[CautionID]bool{}
	for _, id := range ids {
		require.False(t, seen[id], "%s declared twice", id)
		seen[id] = true
		r, ok := CautionRuleOf(id)
		require.True(t, ok, "%s has no entry in the table", id)
		require.Equal(t, id, r.ID)
		require.NotEmpty(t, r.Levels, id)
		require.NotEmpty(t, r.Source, id)
		require.NotNil(t, r.Ward, id)
		require.NotEmpty(t, r.Ward(Caution{ID: id, Level: Warn, Value: 1, Limit: 2, Unit: "%"}), id)
		for _, l := range r.Limits {
			require.Contains(t, []Level{Note, Warn, Stop}, l.Level, id)
			require.NotEmpty(t, l.Unit, id)
			require.NotEmpty(t, l.Source, id)
			require.Contains(t, r.Levels, plain(l.Value), "%s: its words do not name its limit %v", id, l.Value)
			require.Contains(t, r.Levels, l.Level.String(), "%s: its words do not name its level %s", id, l.Level)
		}
		kebab := string(id) == strings.ToLower(string(id)) && !strings.ContainsAny(string(id), " _") && !strings.HasPrefix(string(id), "-")
		require.True(t, kebab, "%s is not kebab-case", id)
	}
	_, ok := CautionRuleOf("no-such-caution")
	require.False(t, ok)
	_, ok = CautionRuleOf("")
	require.False(t, ok)
	require.Panics(t, func() { cautionRule("no-such-caution") }, "a programmer's mistake")
}

// The judgement of the assumed lung is the table's: the ten cautions that
// judge a figure the lung model predicts (DESIGN version 2: readings no
// lung explains leave them out), and none other.
func TestAssumedLungCautionsAreTheTablesTen(t *testing.T) {
	var got []CautionID
	for _, id := range cautionIDConstants(t) {
		if cautionRule(id).AssumedLung {
			got = append(got, id)
		}
	}
	require.ElementsMatch(t, []CautionID{CautionTidalVolumeHigh, CautionTidalVolumeLow, CautionPlateauHigh, CautionDrivingPressureHigh,
		CautionPeakAboveRelief, CautionPeakHigh, CautionIntrinsicPEEP, CautionMinuteVentilationLow, CautionAlveolarVentilationLow,
		CautionTorqueHigh}, got)
}

// A limit is crossed beyond it, at it only when AtLimit is set, and never
// by NaN. Inputs one part in a million either side of a limit of 10.
func TestLimitCrossed(t *testing.T) {
	const v, d = 10.0, 1e-5
	for _, c := range []struct {
		name             string
		l                Limit
		below, at, above bool
	}{
		{"above", over(Warn, v, "u", "s"), false, false, true},
		{"at or above", atOrOver(Warn, v, "u", "s"), false, true, true},
		{"below", under(Warn, v, "u", "s"), true, false, false},
		{"at or below", atOrUnder(Warn, v, "u", "s"), true, true, false},
	} {
		require.Equal(t, c.below, c.l.crossed(v-d), c.name+": just below")
		require.Equal(t, c.at, c.l.crossed(v), c.name+": at")
		require.Equal(t, c.above, c.l.crossed(v+d), c.name+": just above")
		require.False(t, c.l.crossed(math.NaN()), c.name+": NaN")
	}
}

// Judge gives the most serious limit crossed, the first listed among
// equals; JudgeCalm moves the value tol towards the calm side of each
// limit (down for an upper limit, up for a lower one).
func TestJudgeAndJudgeCalm(t *testing.T) {
	r := CautionRule{ID: "x", Limits: []Limit{over(Warn, 8, "u", "s"), atOrOver(Stop, 10, "u", "s"), under(Note, 4, "u", "s"), under(Note, 2, "u", "s")}}
	for _, c := range []struct {
		v, tol float64
		ok     bool
		level  Level
		limit  float64
	}{
		{8, 0, false, 0, 0},
		{8.0001, 0, true, Warn, 8},
		{9.9999, 0, true, Warn, 8},
		{10, 0, true, Stop, 10},
		{10.0005, 0.001, true, Warn, 8}, // 9.9995 after the tolerance
		{10.0015, 0.001, true, Stop, 10},
		{8.0005, 0.001, false, 0, 0},
		{1.9995, 0.001, true, Note, 4}, // 2.0005: below 4, not below 2
		{1.5, 0, true, Note, 4},        // both notes: the first listed
		{3.9985, 0.001, true, Note, 4},
		{3.9995, 0.001, false, 0, 0},
	} {
		l, ok := r.JudgeCalm(c.v, c.tol)
		require.Equal(t, c.ok, ok, "%v tol %v", c.v, c.tol)
		require.Equal(t, c.level, l.Level, "%v tol %v", c.v, c.tol)
		require.Equal(t, c.limit, l.Value, "%v tol %v", c.v, c.tol)
		if c.tol == 0 {
			l2, ok2 := r.Judge(c.v)
			require.Equal(t, ok, ok2)
			require.Equal(t, l, l2)
		}
	}
}

// The ward words of the readings' stops are those the ward has shown
// since version 2 ("peak 52 cmH2O above 40"), with the level word first;
// an id the table does not know (a record of a later version) stands for
// its words.
func TestWardWords(t *testing.T) {
	for _, c := range []struct {
		c    Caution
		want string
	}{
		{Caution{ID: CautionMeasuredPeakHigh, Level: Stop, Value: 52, Limit: 40}, "STOP peak 52 cmH2O above 40"},
		{Caution{ID: CautionMeasuredPeakAboveRelief, Level: Stop, Value: 38, Limit: 35}, "STOP peak 38 cmH2O above relief 35"},
		{Caution{ID: CautionMeasuredEndAtOrBelowPEEP, Level: Stop, Value: 5, Limit: 5}, "STOP end 5 cmH2O at or below PEEP"},
		{Caution{ID: CautionMeasuredPeakBelowEnd, Level: Stop, Value: 12, Limit: 15}, "STOP peak 12 below end 15 cmH2O"},
		{Caution{ID: CautionReadingsNotNumbers, Level: Stop}, "STOP a reading is not a number"},
		{Caution{ID: CautionPHLow, Level: Warn, Value: 7.244}, "WARN pH 7.24 low"},
		{Caution{ID: CautionOxygenationLow, Level: Warn, Value: 87, Unit: "%"}, "WARN low O2 (SpO2 87 %)"},
		{Caution{ID: CautionOxygenationLow, Level: Stop, Value: 48, Unit: "mmHg"}, "STOP low O2 (PaO2 48 mmHg)"},
		{Caution{ID: CautionTidalVolumeHigh, Level: Warn, Value: 9.1, Limit: 8}, "WARN Vt 9.1 mL/kg above 8"},
		{Caution{ID: "from-a-later-version", Level: Note}, "NOTE from-a-later-version"},
	} {
		require.Equal(t, c.want, WardWords(c.c))
	}
}

// No caution id is typed as a bare string in the code: every Caution
// literal, comparison and switch on an id uses the constants, so that the
// table is the one place an id is spelled. Walks setup and the packages
// that read its cautions for a string literal that is a caution's id.
func TestNoBareCautionIDs(t *testing.T) {
	ids := map[string]bool{}
	for _, id := range cautionIDConstants(t) {
		ids[string(id)] = true
	}
	fset := token.NewFileSet()
	var bad []string
	for _, dir := range []string{".", "../logbook", "../report", "../ui", "../ui/cli", ".."} {
		files, _ := filepath.Glob(filepath.Join(dir, "*.go"))
		for _, name := range files {
			if strings.HasSuffix(name, "_test.go") {
				continue
			}
			f, err := parser.ParseFile(fset, name, nil, 0)
			require.NoError(t, err)
			ast.Inspect(f, func(n ast.Node) bool {
				if vs, ok := n.(*ast.ValueSpec); ok {
					if id, ok := vs.Type.(*ast.Ident); ok && id.Name == "CautionID" {
						return false // the constants themselves
					}
				}
				if lit, ok := n.(*ast.BasicLit); ok && lit.Kind == token.STRING {
					if s, err := strconv.Unquote(lit.Value); err == nil && ids[s] {
						bad = append(bad, fset.Position(lit.Pos()).String()+" "+lit.Value)
					}
				}
				return true
			})
		}
	}
	require.Empty(t, bad, "bare caution ids: use the CautionID constants")
}

// The caution inputs are built in one place (newAssessment in
// cautioninputs.go): a second hand-built assessment could leave a field at
// zero and silently switch a caution off.
func TestCautionInputsHaveOneConstructor(t *testing.T) {
	fset := token.NewFileSet()
	files, err := filepath.Glob("*.go")
	require.NoError(t, err)
	var built []string
	for _, name := range files {
		if strings.HasSuffix(name, "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, name, nil, 0)
		require.NoError(t, err)
		ast.Inspect(f, func(n ast.Node) bool {
			if cl, ok := n.(*ast.CompositeLit); ok {
				if id, ok := cl.Type.(*ast.Ident); ok && id.Name == "assessment" {
					built = append(built, fset.Position(cl.Pos()).String())
				}
			}
			return true
		})
	}
	require.Len(t, built, 1, "assessment literals: %v", built)
	require.True(t, strings.HasPrefix(built[0], "cautioninputs.go:"), built[0])
}
