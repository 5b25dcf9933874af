package setup

import (
	"errors"
	"fmt"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"crankside/physiology"
	"crankside/profiles"
)

// TestCoarseFirstFitIsTheFullStepFit holds the check's fit (fitted first
// at ScanStepS, then from that lung at the model's own step) to the fit
// from the physical start at the model's step alone, as a check fitted its
// readings before: a round trip between two solves of one model (named as
// such). Readings come from the version 2 model itself at a sample of
// lungs, settings and both demo units, plus pairs that no lung explains:
// the same lung within 1e-6 (both solves stop at a residual of 1e-9
// cmH2O, far below that), and the same refusal, naming the same reading.
func TestCoarseFirstFitIsTheFullStepFit(t *testing.T) {
	type setting struct {
		profile, hole string
		rpm, dwell    float64
		peep          float64
	}
	settings := []setting{{"demo-a", "8", 21, 1.4, 5}, {"demo-a", "16", 15, 1.5, 12}, {"demo-b", "D", 20, 1.3, 8}}
	lungs := [][2]float64{{12, 35}, {30, 12}, {55, 20}, {120, 6}}
	compared, refused := 0, 0
	for _, s := range settings {
		p, _, err := profiles.Open(s.profile, "")
		require.NoError(t, err)
		u, err := newUnit(p, time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC))
		require.NoError(t, err)
		set := Setting{Hole: s.hole, RPM: s.rpm, DwellS: s.dwell, PEEPCmH2O: s.peep}
		rf := newReadingsFit(u, set, 70, CheckRequest{}, 10)
		full := rf.model()
		var readings []physiology.Readings
		for _, l := range lungs {
			pk, end, err := full(l[0], l[1])
			require.NoError(t, err)
			if pk >= p.Circuit.ReliefCmH2O-0.5 {
				continue // the relief's own fit, which does not start coarse
			}
			readings = append(readings, physiology.Readings{PeakCmH2O: pk, EndCmH2O: end})
		}
		// Pairs that may have no lung: an end pressure barely above PEEP
		// with a wide gap, and a gap as wide as the relief valve allows.
		readings = append(readings, physiology.Readings{PeakCmH2O: s.peep + 6, EndCmH2O: s.peep + 0.2},
			physiology.Readings{PeakCmH2O: p.Circuit.ReliefCmH2O - 1, EndCmH2O: s.peep + 1})
		for _, rd := range readings {
			name := fmt.Sprintf("%s hole %s, readings %+v", s.profile, s.hole, rd)
			got, gotErr := rf.fit(rd, nil)
			want, wantErr := physiology.FitMechanics(rd, s.peep, full)
			if wantErr != nil {
				var a, b *physiology.ReadingError
				require.True(t, errors.As(wantErr, &b), name)
				require.True(t, errors.As(gotErr, &a), "%s: %v", name, gotErr)
				require.Equal(t, b.Error(), a.Error(), name)
				refused++
				continue
			}
			require.NoError(t, gotErr, name)
			require.InEpsilon(t, want.ComplianceMLPerCmH2O, got.ComplianceMLPerCmH2O, 1e-6, name)
			require.InEpsilon(t, want.ResistanceCmH2OPerLS, got.ResistanceCmH2OPerLS, 1e-6, name)
			compared++
		}
	}
	require.GreaterOrEqual(t, compared, 10, "lungs fitted both ways")
	require.Positive(t, refused, "refusals compared")
	t.Logf("%d fitted both ways, %d refused both ways", compared, refused)
}
