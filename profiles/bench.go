package profiles

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"crankside/profiles/safetext"
)

// BenchHeader is the first line of a bench file, column by column.
var benchHeader = [...]string{"hole", "test_lung_compliance_ml_per_cmh2o", "test_lung_resistance_cmh2o_per_l_s", "rpm", "measured_ml"}

// BenchHeader returns the bench file's header line.
func BenchHeader() string { return strings.Join(benchHeader[:], ",") }

// RowProblem is one bad line of a bench file.
type RowProblem struct {
	Line   int
	Reason string
}

func (r RowProblem) String() string { return fmt.Sprintf("line %d: %s", r.Line, r.Reason) }

// BenchError lists every bad line of a bench file.
type BenchError struct {
	Source   string
	Problems []RowProblem
}

// Error is the first bad line and a count of the rest, made safe to print
// with safetext.Escape (the file name and the row's text are from outside).
func (e *BenchError) Error() string {
	if len(e.Problems) == 0 {
		return "bench file " + safetext.Escape(e.Source) + ": invalid"
	}
	msg := "bench file " + e.Source + ": " + e.Problems[0].String()
	if n := len(e.Problems) - 1; n > 0 {
		msg += fmt.Sprintf(" (and %d more bad line%s)", n, plural(n))
	}
	return safetext.Escape(msg)
}

// ErrBench is matched by errors.Is for every *BenchError.
var ErrBench = errors.New("bench file")

func (e *BenchError) Is(target error) bool { return target == ErrBench }

// ReadBenchNumbers reads a bench CSV for profile p: one row per bench
// breath into a test lung, delivered from rest. Every bad row is reported
// with its line number and reason; any bad row refuses the whole file.
// Each number cell is read by parse (nil: a decimal point only). This package imports no number parser of its own;
// setup hands it physiology.ParseNumber, so that "480,5" is 480.5 as
// everywhere else. A file whose header line is separated by semicolons, as
// spreadsheets write CSV where the comma is the decimal mark, is read with
// semicolons between the cells.
func ReadBenchNumbers(r io.Reader, source string, p Profile, parse func(string) (float64, error)) ([]BenchPoint, error) {
	fail := func(ps ...RowProblem) ([]BenchPoint, error) { return nil, &BenchError{Source: source, Problems: ps} }
	data, err := io.ReadAll(io.LimitReader(r, MaxFileBytes+1))
	if err != nil {
		return fail(RowProblem{1, err.Error()})
	}
	cr := csv.NewReader(bytes.NewReader(data))
	if semicolonHeader(data) {
		cr.Comma = ';'
	}
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = false
	head, err := cr.Read()
	if err != nil {
		return fail(RowProblem{1, "no header line; the first line must be " + BenchHeader()})
	}
	if len(head) > 0 {
		head[0] = strings.TrimPrefix(head[0], "\ufeff")
	}
	if got := strings.Join(trimAll(head), ","); got != BenchHeader() {
		return fail(RowProblem{1, fmt.Sprintf("header %s; it must be %s", quote(got), BenchHeader())})
	}
	var points []BenchPoint
	var problems []RowProblem
	for {
		line, _ := cr.FieldPos(0)
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				problems = append(problems, RowProblem{pe.Line, pe.Err.Error()})
				if !errors.Is(pe.Err, csv.ErrFieldCount) {
					break
				}
				continue
			}
			return fail(RowProblem{line, err.Error()})
		}
		line, _ = cr.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		if len(problems) >= 50 {
			problems = append(problems, RowProblem{line, "more bad lines not listed"})
			break
		}
		pt, why := benchRow(trimAll(rec), p, parse)
		if why != "" {
			problems = append(problems, RowProblem{line, why})
			continue
		}
		points = append(points, pt)
		if len(points) > MaxBenchPoints {
			return fail(RowProblem{line, fmt.Sprintf("more than %d bench points", MaxBenchPoints)})
		}
	}
	if len(problems) > 0 {
		return fail(problems...)
	}
	if len(points) == 0 {
		return fail(RowProblem{2, "no bench rows after the header"})
	}
	return points, nil
}

// semicolonHeader says whether the first line is the header with
// semicolons between its names.
func semicolonHeader(data []byte) bool {
	first, _, _ := bytes.Cut(data, []byte("\n"))
	first = bytes.TrimPrefix(bytes.TrimRight(first, "\r"), []byte("\ufeff"))
	names := strings.Split(string(first), ";")
	return len(names) == len(benchHeader) && strings.Join(trimAll(names), ",") == BenchHeader()
}

func trimAll(rec []string) []string {
	out := make([]string, len(rec))
	for i, f := range rec {
		out[i] = strings.TrimSpace(f)
	}
	return out
}

// benchRow checks one row; the reason is empty when it is good.
func benchRow(rec []string, p Profile, parse func(string) (float64, error)) (BenchPoint, string) {
	if parse == nil {
		parse = func(t string) (float64, error) { return strconv.ParseFloat(t, 64) }
	}
	if len(rec) != len(benchHeader) {
		return BenchPoint{}, fmt.Sprintf("%d columns; a row has %d (%s)", len(rec), len(benchHeader), BenchHeader())
	}
	var bad []string
	num := func(i int, lo, hi float64, unit string) float64 {
		v, err := parse(rec[i])
		switch {
		case err != nil || math.IsNaN(v) || math.IsInf(v, 0):
			bad = append(bad, fmt.Sprintf("%s %s is not a number", benchHeader[i], quote(rec[i])))
		case v <= lo || v > hi:
			bad = append(bad, fmt.Sprintf("%s %s %s must be above %g and at most %g", benchHeader[i], rec[i], unit, lo, hi))
		}
		return v
	}
	pt := BenchPoint{Hole: rec[0]}
	if _, ok := p.HoleByLabel(pt.Hole); !ok {
		bad = append(bad, fmt.Sprintf("hole %s is not a hole of %s (holes: %s)", quote(pt.Hole), p.ID, holeList(p)))
	}
	pt.TestLungComplianceMLPerCmH2O = num(1, 0, 500, "mL/cmH2O")
	pt.TestLungResistanceCmH2OPerLS = num(2, 0, 500, "cmH2O/(L/s)")
	pt.RPM = num(3, 0, 200, "rpm")
	pt.MeasuredML = num(4, 0, 5000, "mL")
	if why := benchSpeed(pt.RPM, p.Motor); why != "" && len(bad) == 0 {
		bad = append(bad, why)
	}
	if len(bad) > 0 {
		return BenchPoint{}, strings.Join(bad, "; ")
	}
	return pt, ""
}

// benchSpeed says why a bench speed cannot be this machine's, or "". A
// fixed motor is allowed half an rpm either side, as a tachometer reads it.
func benchSpeed(rpm float64, m Motor) string {
	switch {
	case m.Fixed() && math.Abs(rpm-m.RPM) > 0.5:
		return fmt.Sprintf("rpm %g: this machine's motor runs only at %g rpm", rpm, m.RPM)
	case !m.Fixed() && (rpm < m.MinRPM || rpm > m.MaxRPM):
		return fmt.Sprintf("rpm %g is outside this motor's %g-%g rpm", rpm, m.MinRPM, m.MaxRPM)
	}
	return ""
}
