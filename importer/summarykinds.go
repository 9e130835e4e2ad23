package importer

import (
	"strings"

	"github.com/xuri/excelize/v2"
)

// kindColumns are the headers of the summary's totals by kind.
func kindColumns() []string {
	return []string{"total (kind)", "tCO2 (fossil)", "tCO2e", "tCO2e 95 % low", "tCO2e 95 % high", "tCO2 biogenic (memo)", "rows computed", "rows found", "completeness", "first rows left out"}
}

// writeKindBlock writes the summary's totals, one line per kind and never a
// sum across kinds, each with its completeness and links to the first rows
// it leaves out; it returns the next free row.
func (res *ScanResult) writeKindBlock(f *excelize.File, name string, set func(string, any, int), st *styles, row int) (int, error) {
	rep := res.Report
	set(cellRef(1, row), "Totals by kind: kinds are never added together (Scope 1, Scope 2 and embodied emissions answer different questions)", st.head)
	row++
	for i, h := range kindColumns() {
		set(cellRef(1+i, row), h, st.headWrap)
	}
	row++
	line := func(label string, k KindTotal) error {
		tot := &Totals{TCO2: k.TCO2, TCO2e: k.TCO2e, NotComputable: k.NotComputable}
		set(cellRef(1, row), label, 0)
		set(cellRef(2, row), summaryValue(k.TCO2, tot), st.num)
		set(cellRef(3, row), summaryValue(k.TCO2e, tot), st.num)
		switch iv := k.TotalInterval; {
		case tot.NotComputable != "":
		case iv.HasInterval():
			set(cellRef(4, row), iv.Low, st.num)
			set(cellRef(5, row), iv.High, st.num)
		default:
			set(cellRef(4, row), "none: "+strings.TrimPrefix(iv.IntervalNote, "no 95 % interval: "), 0)
		}
		set(cellRef(6, row), summaryValue(k.Biogenic, tot), st.num)
		set(cellRef(7, row), k.Computed, st.int)
		set(cellRef(8, row), k.Rows, st.int)
		status := "complete"
		if k.Incomplete {
			status = "incomplete: " + plural(k.Rows-k.Computed, "row") + " left out"
		}
		set(cellRef(9, row), status, 0)
		col := 10
		for _, ref := range k.LeftOut {
			set(cellRef(col, row), ref, 0)
			if err := f.SetCellHyperLink(name, cellRef(col, row), linkTarget(ref), "Location"); err != nil {
				return err
			}
			col++
		}
		if k.Incomplete {
			set(cellRef(col, row), "all findings: "+SheetWarnings, 0)
			if err := f.SetCellHyperLink(name, cellRef(col, row), quoteSheet(SheetWarnings)+"!A1", "Location"); err != nil {
				return err
			}
		}
		row++
		return nil
	}
	var s1 KindTotal
	n1 := 0
	for _, k := range rep.ByKind {
		if err := line(KindLabel(k.Kind), k); err != nil {
			return row, err
		}
		if scope1(k.Kind) {
			n1++
			s1.TCO2, s1.TCO2e, s1.Biogenic = s1.TCO2+k.TCO2, s1.TCO2e+k.TCO2e, s1.Biogenic+k.Biogenic
			s1.Rows, s1.Computed = s1.Rows+k.Rows, s1.Computed+k.Computed
			s1.Incomplete = s1.Incomplete || k.Incomplete
			s1.LeftOut = append(s1.LeftOut, k.LeftOut...)
			if k.NotComputable != "" {
				s1.NotComputable = k.NotComputable
			}
		}
	}
	if n1 > 1 {
		// Scope 1's kinds add up: the one sum the report's totals hold.
		s1.TCO2, s1.TCO2e, s1.NotComputable = rep.Totals.TCO2, rep.Totals.TCO2e, rep.Totals.NotComputable
		s1.TotalInterval = rep.Totals.TotalInterval
		s1.LeftOut = s1.LeftOut[:min(len(s1.LeftOut), maxLeftOut)]
		if err := line("Scope 1 (stationary + mobile + fugitive)", s1); err != nil {
			return row, err
		}
	}
	if len(rep.ByKind) == 0 {
		set(cellRef(1, row), "no total: no row was computed", st.note)
		row++
	}
	set(cellRef(1, row), "tCO2 and tCO2e are fossil; biogenic CO2 (wood, biogas, the bio share of a blend) is a memo item in the column "+
		BiogenicColumn+", in no total. A total with rows left out is marked incomplete: its rows are in "+SheetWarnings+".", st.note)
	if u := rep.Uncertainty; u != nil {
		row++
		set(cellRef(1, row), intervalCaption(u), st.note)
	}
	return row + 2, nil
}

// linkTarget is the hyperlink location of "Sheet!A11": the sheet name quoted.
func linkTarget(ref string) string {
	i := strings.LastIndexByte(ref, '!')
	if i < 0 {
		return ref
	}
	return quoteSheet(ref[:i]) + ref[i:]
}
