package importer

import (
	"archive/zip"
	"context"
	"fmt"
	"os"

	"github.com/fluecell/fluecell/funcs"
)

// recalcCopy is a workbook recalculated by LibreOffice: a converted copy
// whose formula cells all hold a stored result, read one sheet at a time.
// It belongs to one goroutine.
type recalcCopy struct {
	conv  *converted
	zf    *os.File
	book  *book
	lim   limits
	cells int                          // formula results held, over all sheets
	vals  map[string]map[string]string // sheet -> cell ("B7") -> result; a sheet read once
	err   error                        // why a sheet could not be read
}

// maxRecalcCells bounds the formula results a recalcCopy holds in memory
// (about 100 bytes each): past it, further sheets are not read and their
// formulas stay unevaluated (reported as such by the caller).
const maxRecalcCells = 2_000_000

// newRecalcCopy has LibreOffice recalculate a copy of the workbook at path
// (see office.toXLSX) and opens the copy. Errors: LibreOffice failed or
// timed out, ctx ended, or the copy cannot be read (over the limits).
func newRecalcCopy(ctx context.Context, o office, path string, lim limits) (*recalcCopy, error) {
	conv, err := o.toXLSX(ctx, path)
	if err != nil {
		return nil, err
	}
	r := &recalcCopy{conv: conv, lim: lim, vals: map[string]map[string]string{}}
	f, err := os.Open(conv.Path)
	if err != nil {
		conv.remove()
		return nil, err
	}
	r.zf = f
	st, err := f.Stat()
	if err == nil {
		var zr *zip.Reader
		if zr, err = openZip(conv.Path, f, st.Size(), lim); err == nil {
			r.book, err = openBook(zr, lim.maxUnzipped)
		}
	}
	if err != nil {
		r.close()
		return nil, fmt.Errorf("reading LibreOffice's recalculated copy: %w", err)
	}
	return r, nil
}

// value is the result LibreOffice stored for the formula in cell ref of
// sheet, as text (numbers in shortest decimal form, booleans TRUE/FALSE);
// ok is false for an error value, a cell that is not a formula, or a sheet
// that cannot be read.
func (r *recalcCopy) value(sheet, ref string) (string, bool) {
	m, read := r.vals[sheet]
	if !read {
		m = r.readSheet(sheet)
		r.vals[sheet] = m
	}
	v, ok := m[ref]
	return v, ok
}

// readSheet streams one sheet of the copy and keeps its formula results.
// A sheet that cannot be read gives an empty map (and r.err says why).
func (r *recalcCopy) readSheet(sheet string) map[string]string {
	out := map[string]string{}
	s, ok := r.book.sheet(sheet)
	if !ok || r.cells >= maxRecalcCells {
		return out
	}
	rd, err := r.book.openSheet(s)
	if err != nil {
		r.err = err
		return out
	}
	defer rd.close()
	for {
		row, ok := rd.next()
		if !ok {
			break
		}
		for _, c := range row.cells {
			if !c.formula {
				continue
			}
			var v string
			switch c.kind {
			case kNumber:
				v = funcs.FormatNumber(c.num)
			case kText, kBool:
				v = c.text
			default:
				continue
			}
			out[cellRef(c.col, row.num)] = v
			if r.cells++; r.cells >= maxRecalcCells {
				return out
			}
		}
	}
	if rd.err != nil {
		r.err = rd.err
	}
	return out
}

// close removes the copy and its folder.
func (r *recalcCopy) close() {
	if r == nil {
		return
	}
	if r.zf != nil {
		r.zf.Close()
	}
	r.conv.remove()
}
