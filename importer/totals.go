package importer

import (
	"encoding/json"
	"math"
)

// CodeTotalOverflow is the finding of a table whose rows are each finite
// but whose sum exceeds the float64 range: the total is not computable.
const CodeTotalOverflow = "total-overflow"

// overflowNote is Totals.NotComputable for a sum past the float64 range.
const overflowNote = "the total exceeds the float64 range (about 1.8e308 t): it is not computable; each row keeps its own value"

// summaryOverflow is what the summary sheet shows in place of such a sum.
const summaryOverflow = "not computable: exceeds the float64 range"

// finiteTotals marks t as not computable when either sum is not a finite
// number, and reports whether it was finite.
func finiteTotals(t *Totals) bool {
	if isFinite(t.TCO2) && isFinite(t.TCO2e) {
		return true
	}
	t.TCO2, t.TCO2e, t.NotComputable, t.TotalInterval = 0, 0, overflowNote, TotalInterval{}
	return false
}

func isFinite(x float64) bool { return !math.IsInf(x, 0) && !math.IsNaN(x) }

// checkTotals replaces every sum of the report that overflowed (the grand
// total, per fuel, per table, the build plan) by a not-computable mark, with
// a finding at the header of each table whose own total overflowed or that
// feeds an overflowing total. The rows' values are left as they are.
func (res *ScanResult) checkTotals() {
	rep := res.Report
	grand := finiteTotals(&rep.Totals)
	finiteKinds(rep.ByKind)
	if !isFinite(rep.Biogenic) {
		rep.Biogenic = 0
	}
	for k, v := range rep.ByFuel {
		if !finiteTotals(&v) {
			rep.ByFuel[k] = v
		}
	}
	for i := range rep.Tables {
		tb := &rep.Tables[i]
		own := finiteTotals(&tb.Totals)
		if !finiteKinds(tb.ByKind) || !isFinite(tb.Biogenic) {
			own, tb.Biogenic = false, 0
		}
		if own && grand || tb.Computed == 0 {
			continue
		}
		msg := "the sum of the table " + tb.Range + " exceeds the float64 range (about 1.8e308 t): its total is not computable; each row keeps its own value"
		if own {
			msg = "the grand total, to which the table " + tb.Range + " adds, exceeds the float64 range (about 1.8e308 t): it is not computable; each row keeps its own value"
		}
		col, row, _ := parseRef(tb.Range[:indexByteOr(tb.Range, ':')])
		rep.Warnings = append(rep.Warnings, Warning{Sheet: tb.Sheet, Cell: cellRef(col, row), Severity: SevWarning, Code: CodeTotalOverflow, Message: msg})
	}
	if bp := rep.BuildPlan; bp != nil {
		vals := []float64{bp.TCO2e, bp.GtC, bp.PPM, bp.PPMObserved}
		if bp.Low != nil {
			vals = append(vals, *bp.Low, *bp.High)
		}
		for _, v := range vals {
			if !isFinite(v) {
				bp.TCO2e, bp.GtC, bp.PPM, bp.PPMObserved, bp.Low, bp.High = 0, 0, 0, 0, nil, nil
				bp.RangeNote = overflowNote
				break
			}
		}
	}
}

func indexByteOr(s string, c byte) int {
	for i := 0; i < len(s); i++ {
		if s[i] == c {
			return i
		}
	}
	return len(s)
}

// MarshalJSON writes a not-computable total's sums as null.
func (t Totals) MarshalJSON() ([]byte, error) {
	type plain Totals
	if t.NotComputable == "" {
		lo, hi := t.ends()
		return json.Marshal(struct {
			plain
			Low  *float64 `json:"tCO2e_low,omitempty"`
			High *float64 `json:"tCO2e_high,omitempty"`
		}{plain(t), lo, hi})
	}
	return json.Marshal(struct {
		TCO2          *float64 `json:"tCO2"`
		TCO2e         *float64 `json:"tCO2e"`
		NotComputable string   `json:"not_computable"`
	}{NotComputable: t.NotComputable})
}

// MarshalJSON writes a kind's total with its interval's ends (TotalInterval).
func (k KindTotal) MarshalJSON() ([]byte, error) {
	type plain KindTotal
	lo, hi := k.ends()
	return json.Marshal(struct {
		plain
		Low  *float64 `json:"tCO2e_low,omitempty"`
		High *float64 `json:"tCO2e_high,omitempty"`
	}{plain(k), lo, hi})
}

// summaryValue is what the summary sheet shows for the sum v: the number, or
// words when it is past the float64 range (or the totals t say so).
func summaryValue(v float64, t *Totals) any {
	if !isFinite(v) || t != nil && t.NotComputable != "" {
		return summaryOverflow
	}
	return v
}
