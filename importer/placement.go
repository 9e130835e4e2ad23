package importer

import (
	"archive/zip"
	"fmt"

	"github.com/fluecell/fluecell/importer/bookio"
)

// CodeColumnsMoved is the finding of a table whose computed columns could
// not be written beside it: its rows reach the last columns of the sheet,
// so the columns would cover occupied cells. They are in a side sheet
// instead, and the table's sheet is left untouched.
const CodeColumnsMoved = "columns-moved"

// lastColumn is the last column of a worksheet (XFD).
const lastColumn = 16384

// sheetOccupancy is what a sheet holds where computed columns might go: the
// rightmost occupied column (a value or a formula) of each row, by row
// number, and the sheet's merged ranges.
type sheetOccupancy struct {
	right  []uint16
	merges []rangeRef
}

// rightOf is the rightmost occupied column of row r (0 for none).
func (occ *sheetOccupancy) rightOf(r int) int {
	if r < len(occ.right) {
		return int(occ.right[r])
	}
	return 0
}

// readOccupancy streams the sheet named sheet of the workbook at path with
// the package reader and records the rightmost cell with a value or a
// formula of each row, and the merged ranges: for a sheet the scan did not
// record (sheetLayouts). It honours sc's context.
func readOccupancy(sc *scanCtx, path string, sheet string) (*sheetOccupancy, error) {
	lim := sc.lim
	zr, err := zip.OpenReader(path)
	if err != nil {
		return nil, err
	}
	defer zr.Close()
	b, _, err := bookio.OpenPackage(&zr.Reader, lim.maxUnzipped)
	if err != nil {
		return nil, err
	}
	s, ok := b.Sheet(sheet)
	if !ok {
		return nil, fmt.Errorf("no sheet %q", sheet)
	}
	occ := &sheetOccupancy{}
	ms, err := b.ReadMerges(s)
	if err != nil {
		return nil, err
	}
	for _, m := range ms {
		occ.merges = append(occ.merges, rangeRef{m.C1, m.R1, m.C2, m.R2})
	}
	rd, err := b.OpenSheet(s)
	if err != nil {
		return nil, err
	}
	defer rd.Close()
	rd.NoText = true
	for n := 1; ; n++ {
		if n&4095 == 0 {
			if err := sc.cancelled(); err != nil {
				return nil, err
			}
		}
		r, ok := rd.Next()
		if !ok {
			break
		}
		if k := len(r.Cells); k > 0 {
			occ.setRight(r.Num, r.Cells[k-1].Col)
		}
	}
	return occ, rd.Err()
}

// setRight records column c as occupied in row r.
func (occ *sheetOccupancy) setRight(r, c int) {
	for len(occ.right) <= r {
		occ.right = append(occ.right, 0)
	}
	occ.right[r] = uint16(max(int(occ.right[r]), c))
}

// placeInline chooses the first of the k computed columns of t in its own
// sheet: right of the table, or right of whatever else the header row and
// the computed rows hold, clear of merged cells. ok is false, with the
// reason, when no such place exists: the columns would run past the last
// column of the sheet (they are never written over an occupied cell).
func placeInline(occ *sheetOccupancy, t *table, k int) (col int, why string, ok bool) {
	used := max(t.maxUsed, t.spec.lastCol, occ.rightOf(t.spec.headerRow))
	for i := range t.n() {
		used = max(used, occ.rightOf(t.rowNum(i)))
	}
	col = t.spec.lastCol + 1
	if used > t.spec.lastCol {
		col = used + 2
	}
	top, bottom := t.spec.headerRow, max(t.lastRow, t.spec.headerRow)
	for moved := true; moved && col+k-1 <= lastColumn; {
		moved = false
		for _, m := range occ.merges {
			if m.r2 < top || m.r1 > bottom || m.c2 < col || m.c1 > col+k-1 {
				continue
			}
			col, moved = m.c2+2, true
		}
	}
	if col+k-1 > lastColumn {
		return 0, fmt.Sprintf("its rows reach column %s, leaving no room for %d columns before the sheet's last column %s", colName(min(col, lastColumn+1)-1), k, colName(lastColumn)), false
	}
	return col, "", true
}

// take records columns up to last as occupied in the rows of t.
func (occ *sheetOccupancy) take(t *table, last int) {
	occ.setRight(t.spec.headerRow, last)
	for i := range t.n() {
		occ.setRight(t.rowNum(i), last)
	}
}

// occupancy is the occupancy of sheet, as the scan recorded it (read
// again for a sheet it did not record), kept in occs.
func (res *ScanResult) occupancy(occs map[string]*sheetOccupancy, readPath, sheet string) (*sheetOccupancy, error) {
	if occ, ok := occs[sheet]; ok {
		return occ, nil
	}
	var occ *sheetOccupancy
	if l := res.layouts; l != nil {
		if right, ok := l.right[sheet]; ok {
			occ = &sheetOccupancy{right: right, merges: l.merges[sheet]}
		}
	}
	if occ == nil {
		var err error
		if occ, err = readOccupancy(res.sc, readPath, sheet); err != nil {
			return nil, err
		}
	}
	occs[sheet] = occ
	return occ, nil
}

// moveToSide records that table i's computed columns go to a side sheet
// because they cannot go beside it (why), with a finding at its header.
func (res *ScanResult) moveToSide(i int, t *table, why, sideName string) {
	t.layout = LayoutSideSheet
	info := &res.Report.Tables[i]
	info.Layout = LayoutSideSheet
	res.Report.Layout = LayoutSideSheet
	msg := "the computed columns of the table " + info.Range + " are in the sheet \"" + sideName + "\", row for row, not beside it: " + why +
		"; computed columns are never written over the workbook's cells, and this sheet is left untouched"
	res.Report.Warnings = append(res.Report.Warnings, Warning{Sheet: t.spec.sheet, Cell: cellRef(t.spec.firstCol, t.spec.headerRow),
		Severity: SevInfo, Code: CodeColumnsMoved, Message: msg})
}
