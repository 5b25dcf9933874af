package physiology

import (
	"fmt"
	"math"
)

// PEEPFiO2Pair is one column of the lower-PEEP/FiO2 table.
type PEEPFiO2Pair struct {
	FiO2      float64
	PEEPCmH2O float64
}

// lowerPEEPTable is the ARDS Network (2000) lower-PEEP/FiO2 table. The
// card's last column, "1.0 / 18-24", is walked in steps of 2 cmH2O (18, 20,
// 22, 24): the step between the card's own columns at FiO2 0.7 and 0.9
// (10-12-14, 14-16-18), so that the protocol never moves PEEP by 6 cmH2O
// at once.
var lowerPEEPTable = [...]PEEPFiO2Pair{
	{0.3, 5}, {0.4, 5}, {0.4, 8}, {0.5, 8}, {0.5, 10}, {0.6, 10}, {0.7, 10},
	{0.7, 12}, {0.7, 14}, {0.8, 14}, {0.9, 14}, {0.9, 16}, {0.9, 18},
	{1.0, 18}, {1.0, 20}, {1.0, 22}, {1.0, 24},
}

// TablePEEP is what the table suggests for one FiO2.
type TablePEEP struct {
	FiO2Step     float64 // the table's FiO2 step the entry was rounded up to
	LowestCmH2O  float64
	HighestCmH2O float64
}

// PEEPForFiO2 rounds fio2 up to the table's next step and returns the PEEP
// range paired with it; the default is the lowest.
func PEEPForFiO2(fio2 float64) (TablePEEP, error) {
	if err := CheckRange("FiO2 (a fraction: 40% is 0.4)", fio2, FiO2Min, FiO2Max, ""); err != nil {
		return TablePEEP{}, err
	}
	// Compare on hundredths so 0.7 typed in is 0.7 in the table.
	f := math.Round(fio2*100) / 100
	out := TablePEEP{FiO2Step: -1}
	for _, p := range lowerPEEPTable {
		if out.FiO2Step < 0 && p.FiO2 >= f-1e-9 {
			out = TablePEEP{FiO2Step: p.FiO2, LowestCmH2O: p.PEEPCmH2O, HighestCmH2O: p.PEEPCmH2O}
			continue
		}
		if out.FiO2Step >= 0 && p.FiO2 == out.FiO2Step {
			out.HighestCmH2O = p.PEEPCmH2O
		}
	}
	if out.FiO2Step < 0 {
		return TablePEEP{}, fmt.Errorf("FiO2 %g is beyond the table", fio2)
	}
	return out, nil
}
