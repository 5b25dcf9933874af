package report

import (
	"crankside/setup"
	"fmt"
	"io"
	"strings"
)

// CalibrationText prints the refit: the line, each point's residual, the
// volumes before and after, and the cautions.
func CalibrationText(w io.Writer, r setup.CalibrationResult) error {
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("Calibration of %s dated %s: effective swept = %.4f x swept %+.1f mL", r.Profile.ID, r.Date, r.K, r.BML)
	if r.ThroughOrigin {
		p(" (one hole measured: a ratio, b = 0)")
	}
	p("\n(before: k %.4f, b %.1f mL)\n", r.Before.K, r.Before.BML)
	if r.LeakNote != "" {
		p("%s (before: %.2f L/min at 20 cmH2O)\n", r.LeakNote, r.LeakBefore)
	}
	p("\n")
	p("  %-6s %6s %10s %10s %10s %9s  %s\n", "hole", "rpm", "measured", "predicted", "residual", "resid. %", "within +/-(4 mL + 15%)")
	for _, pt := range r.Points {
		ok := "yes"
		if !pt.Within {
			ok = "NO"
		}
		p("  %-6s %6.1f %8.1f mL %8.1f mL %+8.1f mL %+8.1f%%  %s\n", pt.Hole, pt.RPM, pt.MeasuredML, pt.PredictedML, pt.ResidualML, pt.ResidualPct, ok)
	}
	p("\n  %-6s %10s %12s %12s\n", "hole", "swept mL", "before mL", "after mL")
	for _, v := range r.Volumes {
		p("  %-6s %10.1f %12.1f %12.1f\n", v.Hole, v.SweptML, v.BeforeML, v.AfterML)
	}
	writeCautions(&b, r.Cautions)
	_, err := io.WriteString(w, b.String())
	return err
}
