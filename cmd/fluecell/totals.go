package main

import (
	"fmt"
	"math"

	"github.com/fluecell/fluecell/importer"
)

// overflowText stands for a total that float64 cannot hold.
const overflowText = "exceeds the float64 range"

// totalText formats a total in tonnes with format, after rounding to
// three decimals; a total beyond the float64 range (rows that are each
// finite can add up to more than about 1.8e308) is said in words instead
// of printed as +Inf.
func totalText(v float64, format func(float64) string) string {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return overflowText
	}
	return format(round3(v))
}

// notComputableText is the total of a report whose sum the importer found
// past the float64 range (Totals.NotComputable).
const notComputableText = "not computable (the rows add up to more than the float64 range holds)"

// totalsText is the "x tCO2, y tCO2e" part of a report's total line.
func totalsText(t importer.Totals, format func(float64) string) string {
	if t.NotComputable != "" {
		return "total " + notComputableText
	}
	return totalText(t.TCO2, format) + " tCO2, " + totalText(t.TCO2e, format) + " tCO2e"
}

// totalsError says which total of t is not a finite number, or nil.
func totalsError(t importer.Totals) error {
	if t.NotComputable != "" {
		return fmt.Errorf("total %s: %s (check the amounts and units of the largest rows)", overflowText, t.NotComputable)
	}
	for _, x := range []struct {
		name string
		v    float64
	}{{"tCO2", t.TCO2}, {"tCO2e", t.TCO2e}} {
		if math.IsInf(x.v, 0) || math.IsNaN(x.v) {
			return fmt.Errorf("total %s: the computed %s rows add up to beyond ±%.3g (check the amounts and units of the largest rows)", overflowText, x.name, math.MaxFloat64)
		}
	}
	return nil
}
