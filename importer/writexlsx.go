package importer

import (
	"math"
	"strconv"

	"github.com/xuri/excelize/v2"
)

// styles are the cell styles fluecell adds to a workbook.
type styles struct {
	num, int, head, title, note int
	count                       int // the workbook's cell formats before fluecell's were added
}

func newStyles(f *excelize.File) (*styles, error) {
	numFmt := "#,##0.000"
	st := &styles{}
	var err error
	if st.num, err = f.NewStyle(&excelize.Style{CustomNumFmt: &numFmt}); err != nil {
		return nil, err
	}
	st.count = st.num // NewStyle appends: the first new id is the number of existing formats
	if st.num, err = f.NewStyle(&excelize.Style{CustomNumFmt: &numFmt}); err != nil {
		return nil, err
	}
	if st.int, err = f.NewStyle(&excelize.Style{NumFmt: 1}); err != nil {
		return nil, err
	}
	if st.head, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true},
		Fill:   excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"E7EEF3"}},
		Border: []excelize.Border{{Type: "bottom", Color: "7F8C8D", Style: 1}}}); err != nil {
		return nil, err
	}
	if st.title, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Size: 14}}); err != nil {
		return nil, err
	}
	if st.note, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Italic: true, Color: "555555"}}); err != nil {
		return nil, err
	}
	return st, nil
}

// writeWorkbook adds the computed columns and fluecell's sheets to f, which
// holds the original workbook read from readPath (the input, or the
// converted copy of a legacy .xls).
func (res *ScanResult) writeWorkbook(f *excelize.File, readPath string) error {
	st, err := newStyles(f)
	if err != nil {
		return excelErr(res.Path, "styles", err)
	}
	side := 0
	occs := map[string]*sheetOccupancy{} // per sheet, read once for all its tables
	for i, t := range res.sc.tables {
		if len(t.rules) == 0 || len(t.rowNums) == 0 {
			continue
		}
		if i%4 == 0 {
			if err := res.sc.cancelled(); err != nil {
				return err
			}
		}
		k := t.outCount() + 1
		col := 0
		if t.layout == LayoutInline {
			occ, err := res.occupancy(occs, readPath, t.spec.sheet)
			if err != nil {
				return bookError(res.Path, err) // an *Error (cancelled) passes as it is
			}
			var why string
			var ok bool
			if col, why, ok = placeInline(occ, t, k); ok {
				why, ok = rewritable(f, t.spec.sheet)
			}
			if ok {
				occ.take(t, col+k-1) // a table beside this one, in the same rows, goes further right
			}
			if !ok {
				res.moveToSide(i, t, why, sideSheetName(side+1))
			}
		}
		if t.layout == LayoutInline {
			err = res.writeInline(f, t, st, col)
		} else {
			side++
			err = res.writeSide(f, t, sideSheetName(side), st)
		}
		if err != nil {
			return err
		}
		first := t.outCol
		last := first + k - 1
		if t.layout == LayoutSideSheet {
			last = first + k
		}
		res.Report.Tables[i].Output = t.outSheet + "!" + rangeRef{first, t.spec.headerRow, last, max(t.lastRow, t.spec.headerRow)}.String()
	}
	if err := res.markFindings(f); err != nil { // notes and fills at the data cells: cellnotes.go
		return err
	}
	if err := res.writeSummary(f, st); err != nil {
		return err
	}
	if err := res.writeWarnings(f, st); err != nil {
		return err
	}
	return res.writeSources(f, st)
}

// sideSheetName is the name of the n-th side sheet (1-based).
func sideSheetName(n int) string {
	if n > 1 {
		return SheetColumns + " " + strconv.Itoa(n)
	}
	return SheetColumns
}

// writeInline writes the computed columns beside the table, in its sheet,
// from column col on (see placeInline).
func (res *ScanResult) writeInline(f *excelize.File, t *table, st *styles, col int) error {
	sheet := t.spec.sheet
	k := t.outCount() + 1
	t.outSheet, t.outCol = sheet, col
	hr := t.spec.headerRow
	head := st.head
	if id, err := f.GetCellStyle(sheet, cellRef(t.spec.lastCol, hr)); err == nil && id > 0 && id < st.count {
		head = id // the header's own style, when the workbook defines it
	}
	for j := range t.outCount() {
		if err := f.SetCellStr(sheet, cellRef(col+j, hr), t.outName(j)); err != nil {
			return excelErr(res.Path, "sheet "+sheet, err)
		}
	}
	if err := f.SetCellStr(sheet, cellRef(col+k-1, hr), "source"); err != nil {
		return excelErr(res.Path, "sheet "+sheet, err)
	}
	if err := f.SetCellStyle(sheet, cellRef(col, hr), cellRef(col+k-1, hr), head); err != nil {
		return excelErr(res.Path, "sheet "+sheet, err)
	}
	reason := res.rowReasons(t) // a row with no number says why (cellnotes.go)
	for i, rn := range t.rowNums {
		if i&4095 == 0 {
			if err := res.sc.cancelled(); err != nil {
				return err
			}
		}
		r := int(rn)
		for j := range t.outCount() {
			if v := t.outValue(j, i); !math.IsNaN(v) {
				if err := f.SetCellFloat(sheet, cellRef(col+j, r), v, -1, 64); err != nil {
					return excelErr(res.Path, "sheet "+sheet, err)
				}
			}
		}
		if err := writeReason(f, sheet, col, k-1, r, reason(i)); err != nil {
			return excelErr(res.Path, "sheet "+sheet, err)
		}
		if s := t.src[i]; s >= 0 {
			if err := f.SetCellStr(sheet, cellRef(col+k-1, r), t.srcText[s]); err != nil {
				return excelErr(res.Path, "sheet "+sheet, err)
			}
		}
	}
	first, last := int(t.rowNums[0]), int(t.rowNums[len(t.rowNums)-1])
	if err := f.SetCellStyle(sheet, cellRef(col, first), cellRef(col+k-2, last), st.num); err != nil {
		return excelErr(res.Path, "sheet "+sheet, err)
	}
	_ = f.SetColWidth(sheet, colName(col), colName(col+k-2), 12)
	_ = f.SetColWidth(sheet, colName(col+k-1), colName(col+k-1), 48)
	return nil
}

// writeSide streams the computed columns into a new sheet, row for row
// aligned with the table (column A repeats the row number); the table's own
// sheet is not touched.
func (res *ScanResult) writeSide(f *excelize.File, t *table, name string, st *styles) error {
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	sw, err := f.NewStreamWriter(name)
	if err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	k := t.outCount() + 1
	t.outSheet, t.outCol = name, 1
	_ = sw.SetColWidth(1, 1, 8)
	_ = sw.SetColWidth(2, k, 14)
	_ = sw.SetColWidth(k+1, k+1, 60)
	hr := t.spec.headerRow
	_ = sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: hr, TopLeftCell: cellRef(1, hr+1), ActivePane: "bottomLeft"})
	if hr > 1 {
		note := "Computed columns of the table at " + t.spec.sheet + "!" + rangeRef{t.spec.firstCol, hr, t.spec.lastCol, max(t.lastRow, hr)}.String() +
			": each row here is the same row of that sheet (too large to rewrite in place, so the sheet is left untouched)"
		if err := sw.SetRow("A1", []any{excelize.Cell{StyleID: st.note, Value: note}}); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	vals := make([]any, k+1)
	vals[0] = excelize.Cell{StyleID: st.head, Value: "row"}
	for j := range t.outCount() {
		vals[1+j] = excelize.Cell{StyleID: st.head, Value: t.outName(j)}
	}
	vals[k] = excelize.Cell{StyleID: st.head, Value: "source"}
	if err := sw.SetRow(cellRef(1, hr), vals); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	reason := res.rowReasons(t) // a row with no number says why (cellnotes.go)
	for i, rn := range t.rowNums {
		if i&4095 == 0 {
			if err := res.sc.cancelled(); err != nil {
				return err
			}
		}
		vals[0] = int(rn)
		for j := range t.outCount() {
			if v := t.outValue(j, i); !math.IsNaN(v) {
				vals[1+j] = excelize.Cell{StyleID: st.num, Value: v}
			} else {
				vals[1+j] = nil
			}
		}
		fillReasons(vals[1:k], reason(i))
		vals[k] = nil
		if s := t.src[i]; s >= 0 {
			vals[k] = t.srcText[s]
		}
		if err := sw.SetRow(cellRef(1, int(rn)), vals); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	if err := sw.Flush(); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	return nil
}
