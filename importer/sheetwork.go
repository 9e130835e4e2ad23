package importer

import (
	"errors"
	"fmt"
	"io"
	"math"
	"sort"

	"github.com/fluecell/fluecell/importer/bookio"
)

// sheetWork is what the annotation changes in one worksheet: the computed
// columns of its tables, appended to their rows, and the marks and notes
// of findings (cellnotes.go). plan turns it into a streaming rewrite.
type sheetWork struct {
	sheet   string
	tables  []*inlineCols
	ext     bookio.Range
	cols    []bookio.ColWidth
	marks   []bookio.Mark
	restyle func(style int, code uint8) int
	notes   []bookio.Note
	// maxStyle is the number of cell formats of the workbook's own styles.
	maxStyle int
}

// inlineCols are the computed columns of one table, from column col on.
type inlineCols struct {
	t         *table
	col       int
	head, num int // styles of the header cells and of the computed cells
	reason    func(i int) string
	cancelled func() error
	// sst is the index in the workbook's shared strings of t.srcText[0]
	// (the texts follow in order), or -1: the source texts are written as
	// inline strings.
	sst int
}

func (w *sheetWork) extent(r bookio.Range) {
	if w.ext.C1 == 0 {
		w.ext = r
		return
	}
	w.ext = bookio.Range{C1: min(w.ext.C1, r.C1), R1: min(w.ext.R1, r.R1), C2: max(w.ext.C2, r.C2), R2: max(w.ext.R2, r.R2)}
}

// plan adds the sheet's rewrite (and its comments) to the edit.
func (w *sheetWork) plan(b *bookio.Book, ed *bookio.Edit) error {
	s, ok := b.Sheet(w.sheet)
	if !ok || s.Part == "" {
		return fmt.Errorf("no sheet %q", w.sheet)
	}
	edit := &bookio.SheetEdit{Marks: w.marks, Restyle: w.restyle, Extent: w.ext, Cols: w.cols, MaxStyle: w.maxStyle}
	if len(w.notes) > 0 {
		id, err := ed.AddComments(s.Part, noteAuthor, w.notes, 1000+sheetIndex(b, w.sheet))
		if err != nil {
			return err
		}
		edit.LegacyDrawing = id // "" when the sheet has its own drawing, which holds them
	}
	for _, m := range w.marks {
		w.extent(bookio.Range{C1: m.Col, R1: m.Row, C2: m.Col, R2: m.Row})
	}
	edit.Extent = w.ext
	sheet := w.sheet
	ed.Rewrite(s.Part, func(out io.Writer, in io.Reader) error {
		edit.Rows = newRowMerge(w.tables)
		err := bookio.RewriteSheet(out, in, edit)
		if errors.Is(err, bookio.ErrOccupied) {
			return fmt.Errorf("sheet %q: %v: a computed column would cover it (it holds something the placement did not see)", sheet, err)
		}
		if err != nil {
			return fmt.Errorf("sheet %q: %v", sheet, err)
		}
		return nil
	})
	return nil
}

func sheetIndex(b *bookio.Book, name string) int {
	for i, s := range b.Sheets {
		if s.Name == name {
			return i
		}
	}
	return 0
}

// rowMerge gives the appended cells of all the tables of a sheet, row by
// row (bookio.RowSource).
type rowMerge struct {
	cur   []*tableCursor
	cells []bookio.NewCell
	err   error
}

// tableCursor walks the rows of one table: its header row, then its data
// rows (row index i into t.rowNums).
type tableCursor struct {
	c *inlineCols
	i int // -1: the header row
}

func newRowMerge(tables []*inlineCols) *rowMerge {
	m := &rowMerge{}
	for _, c := range tables {
		m.cur = append(m.cur, &tableCursor{c: c, i: -1})
	}
	return m
}

func (tc *tableCursor) row() (int, bool) {
	t := tc.c.t
	if tc.i < 0 {
		return t.spec.headerRow, true
	}
	if tc.i >= t.n() {
		return 0, false
	}
	return t.rowNum(tc.i), true
}

// Next returns the next row with cells of any table.
func (m *rowMerge) Next() (int, []bookio.NewCell, bool) {
	n, ok := math.MaxInt, false
	for _, tc := range m.cur {
		if r, more := tc.row(); more && r < n {
			n, ok = r, true
		}
	}
	if !ok {
		return 0, nil, false
	}
	m.cells = m.cells[:0]
	for _, tc := range m.cur {
		for {
			r, more := tc.row()
			if !more || r != n {
				break
			}
			m.cells = tc.appendCells(m.cells)
			tc.i++
		}
	}
	if len(m.cur) > 1 {
		sort.Slice(m.cells, func(i, j int) bool { return m.cells[i].Col < m.cells[j].Col })
	}
	return n, m.cells, true
}

// appendCells appends the cells of the cursor's current row.
func (tc *tableCursor) appendCells(out []bookio.NewCell) []bookio.NewCell {
	c, t := tc.c, tc.c.t
	k := t.outCount() + 1
	if tc.i < 0 {
		for j := range t.outCount() {
			out = append(out, bookio.NewCell{Col: c.col + j, Kind: bookio.NewInline, Text: t.outName(j), Style: c.head, StyleFrom: t.spec.lastCol})
		}
		return append(out, bookio.NewCell{Col: c.col + k - 1, Kind: bookio.NewInline, Text: "source", Style: c.head, StyleFrom: t.spec.lastCol})
	}
	i := tc.i
	why := c.reason(i)
	for j := range t.outCount() {
		if v := t.outValue(j, i); !math.IsNaN(v) {
			out = append(out, bookio.NewCell{Col: c.col + j, Kind: bookio.NewNumber, Num: v, Style: c.num})
		} else if why != "" {
			out = append(out, bookio.NewCell{Col: c.col + j, Kind: bookio.NewInline, Text: why, Style: c.num})
		}
	}
	if s := t.src.at(i); s >= 0 && c.sst >= 0 {
		out = append(out, bookio.NewCell{Col: c.col + k - 1, Kind: bookio.NewShared, SST: c.sst + int(s)})
	} else if s >= 0 {
		out = append(out, bookio.NewCell{Col: c.col + k - 1, Kind: bookio.NewInline, Text: t.srcText[s]})
	}
	return out
}
