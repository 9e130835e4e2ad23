package importer

import "math"

// BiogenicColumn is the computed column of a row's biogenic CO2 (t): a memo
// item, kept out of tCO2 and tCO2e, which are fossil.
const BiogenicColumn = "tCO2_biogenic"

// outCount is the number of computed value columns of t: one per rule, and
// BiogenicColumn when a row has biogenic CO2 (the source column follows).
func (t *table) outCount() int {
	if t.hasBio {
		return len(t.rules) + 1
	}
	return len(t.rules)
}

// outName is the header of computed column j.
func (t *table) outName(j int) string {
	if j < len(t.rules) {
		return t.rules[j].column
	}
	return BiogenicColumn
}

// outValue is computed column j of row i; NaN when there is none.
func (t *table) outValue(j, i int) float64 {
	if j < len(t.rules) {
		return t.res[j].at(i)
	}
	if t.bio == nil {
		return math.NaN()
	}
	return t.bio.at(i)
}
