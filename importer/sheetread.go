package importer

import "github.com/fluecell/fluecell/importer/bookio"

// sheetReader streams the rows of one worksheet part (bookio.SheetReader)
// as the importer's cells. Unlike excelize's Rows iterator it keeps what
// each cell is (number, text, formula, formula without a cached value),
// which the checks need.
type sheetReader struct {
	rd    *bookio.SheetReader
	cells []cell
	err   error // set when next returns false

	// When recording (book.layouts), the rightmost occupied column of
	// each row, by row number, stored under the sheet's name on close.
	layouts *sheetLayouts
	sheet   string
	right   []uint16
}

func (b *book) openSheet(s sheetRef) (*sheetReader, error) {
	rd, err := b.OpenSheet(s)
	if err != nil {
		return nil, err
	}
	return &sheetReader{rd: rd, layouts: b.layouts, sheet: s.Name}, nil
}

func (s *sheetReader) close() {
	s.rd.Close()
	if s.layouts != nil && s.err == nil {
		s.layouts.right[s.sheet] = s.right
	}
}

// next returns the next row that has at least one cell element; the cells
// slice is reused by the following call.
func (s *sheetReader) next() (row, bool) {
	r, ok := s.rd.Next()
	if !ok {
		s.err = s.rd.Err()
		return row{}, false
	}
	s.cells = s.cells[:0]
	right := 0
	for i := range r.Cells {
		c := &r.Cells[i]
		s.cells = append(s.cells, cell{col: c.Col, kind: cellKind(c.Kind), num: c.Num, text: c.Text, formula: c.Formula, noCache: c.NoCache})
		right = c.Col // every cell the reader returns holds a value or a formula
	}
	if s.layouts != nil && right > 0 {
		for len(s.right) <= r.Num {
			s.right = append(s.right, 0)
		}
		s.right[r.Num] = uint16(right)
	}
	return row{num: r.Num, cells: s.cells}, true
}
