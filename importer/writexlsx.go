package importer

import (
	"archive/zip"
	"bytes"
	"math"
	"strconv"

	"github.com/fluecell/fluecell/importer/bookio"
	"github.com/xuri/excelize/v2"
)

// styles are the cell styles fluecell adds to a workbook.
type styles struct {
	num, int, head, title, note int
	headWrap                    int // head, wrapped at the top: the column headings of the summary's narrow columns
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
	if st.headWrap, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true},
		Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"E7EEF3"}},
		Border:    []excelize.Border{{Type: "bottom", Color: "7F8C8D", Style: 1}},
		Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}}); err != nil {
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

// writeWorkbook plans the annotated copy of the workbook b (read from
// readPath: the input, or the converted copy of a legacy .xls) as an edit
// of its package: the computed columns appended to their tables' rows by
// a streaming rewrite of each sheet (inlineSheet), the findings marked at
// their cells (cellnotes.go), and fluecell's sheets written with excelize
// into a small book of their own (addedBook) and spliced in. The edit
// writes the package with Write; no sheet of the workbook is ever held in
// memory.
func (res *ScanResult) writeWorkbook(b *bookio.Book, readPath string) (ed *bookio.Edit, g *excelize.File, err error) {
	g, stylesPart, err := addedBook(b)
	if err != nil {
		return nil, nil, excelErr(res.Path, "styles", err)
	}
	defer func() {
		if err != nil {
			g.Close()
		}
	}()
	st, err := newStyles(g)
	if err != nil {
		return nil, nil, excelErr(res.Path, "styles", err)
	}
	ed = bookio.NewEdit(b)
	work := map[string]*sheetWork{} // by sheet name
	side := 0
	occs := map[string]*sheetOccupancy{} // per sheet, read once for all its tables
	var inl []*inlineCols                // the inline tables, in table order
	for i, t := range res.sc.tables {
		if len(t.rules) == 0 || t.n() == 0 {
			continue
		}
		if i%4 == 0 {
			if err := res.sc.cancelled(); err != nil {
				return nil, nil, err
			}
		}
		k := t.outCount() + 1
		col := 0
		var occ *sheetOccupancy
		if t.layout == LayoutInline {
			occ, err = res.occupancy(occs, readPath, t.spec.sheet)
			if err != nil {
				return nil, nil, bookError(res.Path, err) // an *Error (cancelled) passes as it is
			}
			var why string
			var ok bool
			if col, why, ok = placeInline(occ, t, k); ok {
				occ.take(t, col+k-1) // a table beside this one, in the same rows, goes further right
			} else {
				res.moveToSide(i, t, why, sideSheetName(side+1))
			}
		}
		if t.layout == LayoutInline {
			inl = append(inl, res.planInline(work, t, st, col))
		} else {
			side++
			if err := res.writeSide(g, t, sideSheetName(side), st); err != nil {
				return nil, nil, err
			}
		}
		first := t.outCol
		last := first + k - 1
		if t.layout == LayoutSideSheet {
			last = first + k
		}
		res.Report.Tables[i].Output = t.outSheet + "!" + rangeRef{first, t.spec.headerRow, last, max(t.lastRow, t.spec.headerRow)}.String()
	}
	if err := res.markFindings(g, ed, work, occs); err != nil { // notes and fills at the data cells: cellnotes.go
		return nil, nil, err
	}
	if err := res.writeSummary(g, st); err != nil {
		return nil, nil, err
	}
	if err := res.writeWarnings(g, st); err != nil {
		return nil, nil, err
	}
	if err := res.writeSources(g, st); err != nil {
		return nil, nil, err
	}
	if err := sharedSources(ed, inl); err != nil {
		return nil, nil, bookError(res.Path, err)
	}
	// In the workbook's sheet order, so that the same input always gives
	// the same parts (comments1.xml is the first sheet's with comments).
	for _, s := range b.Sheets {
		w := work[s.Name]
		if w == nil {
			continue
		}
		if err := w.plan(b, ed); err != nil {
			return nil, nil, bookError(res.Path, err)
		}
	}
	buf, err := g.WriteToBuffer()
	if err != nil {
		return nil, nil, excelErr(res.Path, "fluecell's sheets", err)
	}
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		return nil, nil, excelErr(res.Path, "fluecell's sheets", err)
	}
	if err := ed.Splice(zr, map[string]bool{placeholderSheet: true}); err != nil {
		return nil, nil, excelErr(res.Path, "fluecell's sheets", err)
	}
	// The styles last: the rewrites make the fills of marked cells in g
	// as they meet the cells' own styles.
	ed.ReplaceLate(stylesPart, func() ([]byte, error) { return addedStyles(g) })
	return ed, g, nil
}

// sideSheetName is the name of the n-th side sheet (1-based).
func sideSheetName(n int) string {
	if n > 1 {
		return SheetColumns + " " + strconv.Itoa(n)
	}
	return SheetColumns
}

// planInline records the computed columns of t beside the table, in its
// sheet, from column col on (see placeInline), for the sheet's rewrite.
func (res *ScanResult) planInline(work map[string]*sheetWork, t *table, st *styles, col int) *inlineCols {
	sheet := t.spec.sheet
	k := t.outCount() + 1
	t.outSheet, t.outCol = sheet, col
	w := work[sheet]
	if w == nil {
		w = &sheetWork{sheet: sheet, maxStyle: st.count}
		work[sheet] = w
	}
	// The header cells take the style of the header's last cell when it
	// has one (StyleFrom), else fluecell's.
	c := &inlineCols{t: t, col: col, head: st.head, num: st.num, reason: res.rowReasons(t), cancelled: res.sc.cancelled, sst: -1}
	w.tables = append(w.tables, c)
	last := max(t.lastRow, t.spec.headerRow, t.rowNum(t.n()-1))
	w.extent(bookio.Range{C1: col, R1: t.spec.headerRow, C2: col + k - 1, R2: last})
	w.cols = append(w.cols, bookio.ColWidth{Min: col, Max: col + k - 2, Width: 12}, bookio.ColWidth{Min: col + k - 1, Max: col + k - 1, Width: 48})
	return c
}

// sharedSources appends the source texts of the inline tables to the
// workbook's shared strings (they repeat down the rows: a few texts for
// many cells), so that each source cell holds an index, not its text.
// When the workbook's strings cannot take them the cells stay inline.
func sharedSources(ed *bookio.Edit, inl []*inlineCols) error {
	var texts []string
	refs := 0
	for _, c := range inl {
		t := c.t
		if len(t.srcText) == 0 {
			continue
		}
		c.sst = len(texts)
		texts = append(texts, t.srcText...)
		for i := range t.src.len() {
			if t.src.at(i) >= 0 {
				refs++
			}
		}
	}
	first, ok, err := ed.AppendShared(texts, refs)
	if err != nil {
		return err
	}
	for _, c := range inl {
		switch {
		case len(c.t.srcText) == 0:
			c.sst = -1
		case ok:
			c.sst += first
		default:
			c.sst = -1
		}
	}
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
	for i := range t.n() {
		rn := t.rowNums.at(i)
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
		if s := t.src.at(i); s >= 0 {
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
