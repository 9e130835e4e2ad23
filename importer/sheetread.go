package importer

import (
	"fmt"
	"sync/atomic"

	"github.com/fluecell/fluecell/importer/bookio"
)

// sheetReader streams the rows of one worksheet part (bookio.SheetReader)
// as the importer's cells. Unlike excelize's Rows iterator it keeps what
// each cell is (number, text, formula, formula without a cached value),
// which the checks need.
//
// The part is read in a goroutine of its own, a few batches of rows ahead
// of the tables that take them, so that reading the XML (and inflating it,
// in bookio's goroutine) runs beside the work on the rows where a core is
// free. At most readBatches batches of batchRows rows are held.
type sheetReader struct {
	rd  *bookio.SheetReader
	err error // set when next returns false

	full, free chan *rowBatch
	stop, gone chan struct{}
	cur        *rowBatch
	pos        int
	// While the caller waits for something else (the merged ranges: see
	// scanSheet), the goroutine may read further ahead into batches of
	// their own, up to aheadCells cells in aheadBatches batches; settle
	// ends that.
	aheadCells   atomic.Int64
	aheadBatches atomic.Int32

	// When recording (book.layouts), the rightmost occupied column of
	// each row, by row number, stored under the sheet's name on close.
	layouts *sheetLayouts
	sheet   string
	right   []uint16
}

const (
	batchRows   = 256
	readBatches = 4
	// maxAheadBatches bounds the batches read ahead while the caller waits
	// (openSheetAhead).
	maxAheadBatches = 64
)

// rowBatch is rows read ahead: row k's cells are cells[ends[k-1]:ends[k]].
type rowBatch struct {
	nums  []int
	ends  []int
	cells []cell
	last  bool  // the part has no rows after these
	err   error // with last: why the reading stopped, nil at the end of the part
	ahead bool  // read ahead while the caller waited: dropped once read
}

func (b *book) openSheet(s sheetRef) (*sheetReader, error) { return b.openSheetAhead(s, 0) }

// openSheetAhead is openSheet whose goroutine may read up to cells cells
// further ahead than usual until settle is called.
func (b *book) openSheetAhead(s sheetRef, cells int64) (*sheetReader, error) {
	rd, err := b.OpenSheet(s)
	if err != nil {
		return nil, err
	}
	sr := &sheetReader{rd: rd, layouts: b.layouts, sheet: s.Name,
		full: make(chan *rowBatch, readBatches+maxAheadBatches), free: make(chan *rowBatch, readBatches), stop: make(chan struct{}), gone: make(chan struct{})}
	for range readBatches {
		sr.free <- &rowBatch{}
	}
	if cells > 0 {
		sr.aheadCells.Store(cells)
		sr.aheadBatches.Store(maxAheadBatches)
	}
	go sr.readAhead()
	return sr, nil
}

// settle ends reading further ahead than usual (openSheetAhead).
func (s *sheetReader) settle() { s.aheadCells.Store(0) }

// freeBatch is a batch to fill: a free one, or one of its own while the
// caller lets it read ahead; false when close stops the goroutine.
func (s *sheetReader) freeBatch() (*rowBatch, bool) {
	select {
	case b := <-s.free:
		return b, true
	default:
	}
	if s.aheadCells.Load() > 0 && s.aheadBatches.Add(-1) >= 0 {
		return &rowBatch{ahead: true}, true
	}
	select {
	case b := <-s.free:
		return b, true
	case <-s.stop:
		return nil, false
	}
}

// readAhead fills batches until the part ends or close stops it. A panic
// of the reader becomes the batch's error, so that it reaches the caller
// as an error, not a crash.
func (s *sheetReader) readAhead() {
	defer close(s.gone)
	for {
		b, ok := s.freeBatch()
		if !ok {
			return
		}
		s.fill(b)
		if b.ahead {
			s.aheadCells.Add(-int64(len(b.cells)))
		}
		select {
		case s.full <- b:
		case <-s.stop:
			return
		}
		if b.last {
			return
		}
	}
}

func (s *sheetReader) fill(b *rowBatch) {
	defer func() {
		if r := recover(); r != nil {
			b.last, b.err = true, fmt.Errorf("%s: internal error reading the sheet: %v", s.sheet, r)
		}
	}()
	b.nums, b.ends, b.cells = b.nums[:0], b.ends[:0], b.cells[:0]
	for len(b.nums) < batchRows {
		r, ok := s.rd.Next()
		if !ok {
			b.last, b.err = true, s.rd.Err()
			return
		}
		right := 0
		for i := range r.Cells {
			c := &r.Cells[i]
			b.cells = append(b.cells, cell{col: c.Col, kind: cellKind(c.Kind), num: c.Num, text: c.Text, formula: c.Formula, noCache: c.NoCache})
			right = c.Col // every cell the reader returns holds a value or a formula
		}
		b.nums, b.ends = append(b.nums, r.Num), append(b.ends, len(b.cells))
		if s.layouts != nil && right > 0 {
			for len(s.right) <= r.Num {
				s.right = append(s.right, 0)
			}
			s.right[r.Num] = uint16(right)
		}
	}
}

// close stops the reading goroutine and waits for it before the part is
// closed.
func (s *sheetReader) close() {
	select {
	case <-s.stop:
	default:
		close(s.stop)
	}
	<-s.gone
	s.rd.Close()
	if s.layouts != nil && s.err == nil {
		s.layouts.right[s.sheet] = s.right
	}
}

// next returns the next row that has at least one cell element; its cells
// may be reused by the following call.
func (s *sheetReader) next() (row, bool) {
	for s.cur == nil || s.pos >= len(s.cur.nums) {
		if s.cur != nil {
			if s.cur.last {
				s.err = s.cur.err
				return row{}, false
			}
			if !s.cur.ahead {
				s.free <- s.cur
			}
			s.cur = nil
		}
		s.cur, s.pos = <-s.full, 0
	}
	b, k := s.cur, s.pos
	s.pos++
	start := 0
	if k > 0 {
		start = b.ends[k-1]
	}
	return row{num: b.nums[k], cells: b.cells[start:b.ends[k]:b.ends[k]]}, true
}
