package report

import (
	"crankside/setup"
	"fmt"
	"io"
	"strings"
)

// PlanText prints the plan for a person: units on every number, the
// cautions with their level words, and the clinical caution line.
func PlanText(w io.Writer, pl setup.Plan) error {
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("crankside plan on %s (%s)\n", pl.ProfileID, pl.ProfileLabel)
	p("Patient   %.1f cm %s, lung %s: PBW %.1f kg\n", pl.Patient.HeightCm, pl.Patient.Sex, pl.Lung, pl.PBWKg)
	p("Target    %.1f mL/kg PBW = %.0f mL, rate %.0f /min, I:E 1:%.1f, PEEP %.0f cmH2O, FiO2 %.2f\n",
		pl.MLPerKg.Value, pl.TargetVtML, pl.Rate.Value, pl.IE.Value, pl.PEEP.Value, pl.FiO2.Value)
	p("Lung      C %.0f mL/cmH2O (%s), R %.0f cmH2O/(L/s) (%s)\n", pl.Compliance.Value, pl.Compliance.Source, pl.Resistance.Value, pl.Resistance.Source)
	if line := setup.ConversionLine(pl.Converted); line != "" {
		p("Entered   %s\n", line)
	}
	writeGas(&b, pl.Gas)
	if line := StopLine(pl.Cautions); line != "" {
		p("\n%s", line)
	}
	p("\n%s\n", SettingHeading(pl.Cautions, "SET THE MACHINE"))
	set := setup.Setting{Hole: pl.Hole.Label, RPM: pl.Timing.RPM, DwellS: pl.Timing.DwellS, PEEPCmH2O: pl.PEEPCmH2O, O2LPerMin: pl.O2FlowLPerMin}
	for _, r := range SettingRows(set, nil) {
		text := strings.TrimSpace(r.Now + " " + r.Unit)
		switch {
		case r.ID == "hole":
			text += fmt.Sprintf("  (swept %.0f mL, calibrated %.0f mL)", pl.Hole.SweptML, pl.Hole.EffectiveSweptML)
		case r.ID == "o2_flow_l_min" && pl.O2FlowLPerMin <= 0:
			text = "none (room air)"
		}
		p("  %-13s %s\n", r.Label, text)
	}
	p("\nTHE PATIENT GETS (predicted)\n")
	p("  Target        %.0f mL = %.1f mL/kg PBW; this hole is %+.0f%% off it\n", pl.TargetVtML, pl.MLPerKg.Value, pl.OffTargetPct)
	if pl.Below != nil {
		p("  Hole below    %s: %.0f mL = %.1f mL/kg\n", pl.Below.Label, pl.Below.DeliveredML, pl.Below.MLPerKg)
	}
	if pl.Above != nil {
		p("  Hole above    %s: %.0f mL = %.1f mL/kg\n", pl.Above.Label, pl.Above.DeliveredML, pl.Above.MLPerKg)
	}
	fj := pl.FiguresJSON()
	for _, r := range FigureRows(fj, nil) {
		p("  %-26s %10s\n", r.Label+unitSuffix(r.Unit), r.Text)
	}
	p("  %s\n", DrivingNote)
	writeGasOutcome(&b, pl.Figures)
	p("  Exhalation tau %.2f s; torque %.0f%% of the motor's rating\n", pl.TauS, 100*pl.TorqueShareOfRating)
	rw := &reportWriter{}
	rw.watchSection(pl.WatchToSet(), pl.TimingCheck.JSON(), WhyNoWatch(false))
	b.WriteString("\n" + rw.b.String())
	if len(pl.Changes) > 0 {
		p("\nWHAT THE MACHINE'S STEPS CHANGED\n")
		for _, c := range pl.Changes {
			p("  %-15s wanted %.2f, set %.2f %s\n", c.What, c.Wanted, c.Got, c.Unit)
		}
	}
	writeCautions(&b, pl.Cautions)
	_, err := io.WriteString(w, b.String())
	return err
}

func writeCautions(b *strings.Builder, cs []setup.Caution) {
	if len(cs) == 0 {
		fmt.Fprintf(b, "\nCAUTIONS: none\n")
	} else {
		fmt.Fprintf(b, "\nCAUTIONS (%d, highest %s)\n", len(cs), setup.LevelWord(setup.Highest(cs)))
		for _, c := range cs {
			fmt.Fprintf(b, "  %-4s %s: %s; %s [%s]\n", setup.LevelWord(c.Level), c.ID, c.Message, c.Advice, c.Source)
		}
	}
	fmt.Fprintf(b, "\n%s\n", setup.ClinicalCaution)
}

// writeGas prints the room and the machine's gas path, with sources.
func writeGas(b *strings.Builder, g setup.GasModel) {
	r := g.Room
	fmt.Fprintf(b, "Room      %.1f C (%s), %.0f %% RH (%s), %.0f mmHg (%s): BTPS factor %.3f\n",
		r.TemperatureC.Value, r.TemperatureC.Source, r.HumidityPct.Value, r.HumidityPct.Source,
		r.BarometricMmHg.Value, r.BarometricMmHg.Source, r.BTPSFactor)
	fmt.Fprintf(b, "Machine   cylinder clearance %.1f cm", g.ClearanceCm)
	if g.ClearanceDefaulted {
		fmt.Fprintf(b, " (DEFAULT: not in the profile)")
	}
	fmt.Fprintf(b, ", leak %.2g L/min at 20 cmH2O, relief valve %.0f cmH2O\n", g.LeakLPerMinAt20, g.ReliefCmH2O)
	fmt.Fprintf(b, "          %s\n", setup.BTPSNote)
}

// writeGasOutcome says where the piston's volume went on this breath.
func writeGasOutcome(b *strings.Builder, f setup.Figures) {
	fmt.Fprintf(b, "  Room air into the lung %.0f mL (x %.3f = %.0f mL at BTPS); cylinder gas took %.1f mL, leak %.1f mL",
		f.DeliveredRoomML, f.BTPSFactor, f.Hole.DeliveredML, f.CompressionLossML, f.LeakedML)
	if f.PressureLimited {
		fmt.Fprintf(b, "; RELIEF VALVE OPEN: %.0f mL vented, the breath is pressure-limited", f.ReliefVentedML)
	}
	fmt.Fprintf(b, "\n")
}
