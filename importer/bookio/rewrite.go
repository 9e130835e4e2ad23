package bookio

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
)

// NewKind is what an appended cell holds.
type NewKind uint8

// The kinds of appended cells.
const (
	NewNumber NewKind = iota // Num
	NewInline                // Text, as an inline string
	NewShared                // SST, an index into the shared strings
)

// NewCell is a cell RewriteSheet appends to a row.
type NewCell struct {
	Col   int // 1-based
	Kind  NewKind
	Num   float64 // NewNumber; NaN and infinities are refused
	Text  string  // NewInline
	SST   int     // NewShared
	Style int     // index into cellXfs; 0 writes no style
	// StyleFrom, when not 0, is a column of the same row whose cell's
	// style the new cell takes, when that cell comes before it in the row
	// and has a style below SheetEdit.MaxStyle; else Style.
	StyleFrom int
}

// RowSource gives the cells to append, one row at a time.
type RowSource interface {
	// Next returns the next row, in ascending row order, with its cells
	// in ascending column order; ok is false after the last. The cells
	// slice may be reused by the following call.
	Next() (row int, cells []NewCell, ok bool)
}

// Mark asks RewriteSheet to change the style of one cell (creating an
// empty cell there when the sheet has none): SheetEdit.Restyle gives the
// new style from the cell's current one and Code.
type Mark struct {
	Row, Col int
	Code     uint8
}

// ColWidth is a width for columns Min..Max (1-based), in characters.
type ColWidth struct {
	Min, Max int
	Width    float64
}

// SheetEdit is what RewriteSheet changes in a worksheet.
type SheetEdit struct {
	Rows RowSource // cells to append (nil: none)
	// Marks are the cells whose style changes, sorted by row, then
	// column (a mark where a cell is appended is dropped); Restyle maps a marked cell's style (0 when it has none) and
	// the mark's code to the new style.
	Marks   []Mark
	Restyle func(style int, code uint8) int
	// Extent is the area of the appended cells and marks, for the sheet's
	// dimension (the zero Range leaves the dimension as it is).
	Extent Range
	// Cols are widths for new columns; a column the sheet already gives a
	// width keeps it.
	Cols []ColWidth
	// MaxStyle bounds the styles StyleFrom takes from the sheet: the
	// number of cell formats the styles part had (a cell naming one past
	// them is malformed).
	MaxStyle int
	// LegacyDrawing, when not "", is the relationship id of a VML drawing
	// (the shapes of cell comments): a <legacyDrawing> element naming it is
	// added. The sheet must not have one already.
	LegacyDrawing string
}

// ErrOccupied is returned (wrapped, naming the cell) when a cell would be
// appended where the sheet already has a value, a formula or an inline
// string.
var ErrOccupied = errors.New("the cell is occupied")

const nsRel = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"

// RewriteSheet copies the worksheet XML of r to w with the edit applied:
// the cells of e.Rows appended to their rows (rows the sheet lacks are
// created in order), the marked cells restyled, the dimension widened to
// e.Extent, the widths e.Cols added to <cols> where no existing range
// covers them, and a <legacyDrawing> added when asked. Everything else is
// copied token for token as it was written: rows and cells that the edit
// does not touch, formulas (shared and array ones too), comments,
// processing instructions, merged cells, conditional formats, data
// validations, hyperlinks, drawings, table parts, extensions. An original
// cell without an r attribute that comes after an inserted cell in its row
// gets one (its position would otherwise shift).
//
// It reads and writes as a stream through fixed buffers (a token larger
// than the buffer grows it, up to 64 MB). Errors: malformed XML, rows or
// cells out of order, a row or cell reference that is not valid, a number
// that is NaN or infinite, and ErrOccupied (wrapped with the cell's
// reference) for an appended cell where the sheet holds a value, a
// formula or an inline string; the output is then incomplete.
func RewriteSheet(w io.Writer, r io.Reader, e *SheetEdit) error {
	return rewriteSheet(w, r, e, false)
}

// rewriteSheet is RewriteSheet; with general set, every cell is copied
// token by token (tests compare the two ways).
func rewriteSheet(w io.Writer, r io.Reader, e *SheetEdit, general bool) error {
	rw := &rewriter{t: NewTok(r), w: bufio.NewWriterSize(w, 64<<10), e: e, general: general}
	rw.t.Verbatim = true
	if e.Rows != nil {
		rw.advance()
	}
	if err := rw.run(); err != nil {
		return err
	}
	return rw.w.Flush()
}

type rewriter struct {
	t   *Tok
	w   *bufio.Writer
	e   *SheetEdit
	pfx []byte // the prefix of the spreadsheet elements ("x:" or none)
	err error

	// The next row of e.Rows not yet written.
	pendRow   int
	pendCells []NewCell
	pendOK    bool
	mark      int // next mark not yet written

	relPfx   string // the prefix bound to the relationships namespace on the root
	depth    int
	colsSeen bool
	lastRow  int
	legacy   bool // the legacy drawing is written
	scratch  []byte
	ops      []op
	cur      []NewCell // the appended cells of the row being written
	from     []int     // columns whose style cells of the row take (StyleFrom)
	fromSt   []int     // their styles, as met
	general  bool      // no copyQuickCell
}

// op is one change in a row: an appended cell or a mark.
type op struct {
	col  int
	cell *NewCell // nil for a mark
	code uint8
}

func (rw *rewriter) advance() {
	rw.pendRow, rw.pendCells, rw.pendOK = rw.e.Rows.Next()
}

func (rw *rewriter) fail(format string, args ...any) error {
	if rw.err == nil {
		rw.err = fmt.Errorf(format, args...)
	}
	return rw.err
}

// nextRowWork is the smallest row with work (appended cells or marks);
// ok is false when there is none.
func (rw *rewriter) nextRowWork() (int, bool) {
	n, ok := 0, false
	if rw.pendOK {
		n, ok = rw.pendRow, true
	}
	if rw.mark < len(rw.e.Marks) {
		if m := rw.e.Marks[rw.mark].Row; !ok || m < n {
			n, ok = m, true
		}
	}
	return n, ok
}

// rowOps gathers the work of row n into rw.ops, sorted by column.
func (rw *rewriter) rowOps(n int) error {
	rw.ops = rw.ops[:0]
	rw.from, rw.fromSt = rw.from[:0], rw.fromSt[:0]
	// The source may reuse its slice on the next call: copy.
	rw.cur = rw.cur[:0]
	if rw.pendOK && rw.pendRow == n {
		rw.cur = append(rw.cur, rw.pendCells...)
	}
	cells := rw.cur
	ci := 0
	for {
		var mk *Mark
		if rw.mark < len(rw.e.Marks) && rw.e.Marks[rw.mark].Row == n {
			mk = &rw.e.Marks[rw.mark]
		}
		switch {
		case ci < len(cells) && (mk == nil || cells[ci].Col <= mk.Col):
			c := &cells[ci]
			if c.Col < 1 || c.Col > MaxCol || len(rw.ops) > 0 && rw.ops[len(rw.ops)-1].col >= c.Col {
				return rw.fail("row %d: appended cells must be in increasing columns within A..XFD (column %d)", n, c.Col)
			}
			if mk != nil && mk.Col == c.Col {
				rw.mark++ // the appended cell takes the place: its own style wins
			}
			rw.ops = append(rw.ops, op{col: c.Col, cell: c})
			if c.StyleFrom > 0 {
				rw.from = append(rw.from, c.StyleFrom)
				rw.fromSt = append(rw.fromSt, -1)
			}
			ci++
		case mk != nil:
			if mk.Col < 1 || mk.Col > MaxCol || len(rw.ops) > 0 && rw.ops[len(rw.ops)-1].col >= mk.Col {
				return rw.fail("row %d: marks must be sorted by column within A..XFD (column %d)", n, mk.Col)
			}
			rw.ops = append(rw.ops, op{col: mk.Col, code: mk.Code})
			rw.mark++
		default:
			if rw.pendOK && rw.pendRow == n {
				rw.advance()
				if rw.pendOK && rw.pendRow <= n {
					return rw.fail("appended rows must be in increasing order (row %d after row %d)", rw.pendRow, n)
				}
			}
			if rw.mark < len(rw.e.Marks) && rw.e.Marks[rw.mark].Row < n {
				return rw.fail("marks must be sorted by row (row %d after row %d)", rw.e.Marks[rw.mark].Row, n)
			}
			return nil
		}
	}
}

func (rw *rewriter) run() error {
	t := rw.t
	for {
		k := t.Next()
		if rw.err != nil {
			return rw.err
		}
		switch k {
		case TokEOF:
			if err := t.Err(); err != nil {
				return err
			}
			if rw.depth != 0 {
				return rw.fail("the worksheet ends before its root element is closed (truncated?)")
			}
			if _, left := rw.nextRowWork(); left {
				return rw.fail("the worksheet has no cell data (sheetData) to add cells to")
			}
			return nil
		case TokStart:
			if rw.depth == 0 {
				rw.root()
			}
			if rw.depth == 1 {
				if err := rw.topStart(); err != nil {
					return err
				}
				continue
			}
			rw.write(t.Raw)
			if !t.Empty {
				rw.depth++
			}
		case TokEnd:
			if rw.depth == 1 && rw.e.LegacyDrawing != "" && !rw.legacy {
				rw.writeLegacy()
			}
			rw.write(t.Raw)
			rw.depth--
			if rw.depth < 0 {
				return rw.fail("an end tag </%s> closes no element (the worksheet is malformed)", t.Name)
			}
		default:
			rw.write(t.Raw)
		}
	}
}

// root reads the root element's prefix and the prefix it binds to the
// relationships namespace.
func (rw *rewriter) root() {
	raw := rw.t.Raw[1:]
	n := 0
	for n < len(raw) && !isSpace(raw[n]) && raw[n] != '>' && raw[n] != '/' {
		n++
	}
	if i := bytes.IndexByte(raw[:n], ':'); i >= 0 {
		rw.pfx = append([]byte(nil), raw[:i+1]...)
	}
	a := rw.t.Attrs
	for i := 0; i < len(a); {
		j := bytes.Index(a[i:], []byte("xmlns:"))
		if j < 0 {
			break
		}
		i += j + len("xmlns:")
		k := i
		for k < len(a) && a[k] != '=' && !isSpace(a[k]) {
			k++
		}
		if v, ok := RawAttr(a, string(a[i:k]), true); ok && string(v) == nsRel {
			rw.relPfx = string(a[i:k])
			return
		}
	}
}

// topStart handles a start tag that is a child of the root.
func (rw *rewriter) topStart() error {
	t := rw.t
	switch {
	case t.Is("dimension"):
		rw.dimension()
		if !t.Empty {
			rw.depth++
		}
		return nil
	case t.Is("cols"):
		rw.colsSeen = true
		if t.Empty {
			rw.writeCols(t.Raw)
			return rw.err
		}
		return rw.cols()
	case t.Is("sheetData"):
		if !rw.colsSeen {
			rw.writeCols(nil)
			rw.colsSeen = true
		}
		return rw.sheetData()
	case rw.e.LegacyDrawing != "" && !rw.legacy && (t.Is("legacyDrawingHF") || t.Is("drawingHF") || t.Is("picture") ||
		t.Is("oleObjects") || t.Is("controls") || t.Is("webPublishItems") || t.Is("tableParts") || t.Is("extLst")):
		rw.writeLegacy()
	case t.Is("legacyDrawing") && rw.e.LegacyDrawing != "":
		return rw.fail("the worksheet already has a legacy drawing (comments): a second one cannot be added")
	}
	rw.write(t.Raw)
	if !t.Empty {
		rw.depth++
	}
	return nil
}

// dimension writes the <dimension> tag widened to the edit's extent.
func (rw *rewriter) dimension() {
	t := rw.t
	ext := rw.e.Extent
	if ext.C1 == 0 {
		rw.write(t.Raw)
		return
	}
	old, ok := RawAttr(t.Attrs, "ref", false)
	if !ok {
		rw.write(t.Raw)
		return
	}
	r, ok := ParseRange(string(old))
	if !ok {
		r = ext
	} else {
		r = Range{min(r.C1, ext.C1), min(r.R1, ext.R1), max(r.C2, ext.C2), max(r.R2, ext.R2)}
	}
	ref := CellRef(r.C1, r.R1)
	if r.C2 != r.C1 || r.R2 != r.R1 {
		ref = r.String()
	}
	rw.write(replaceAttr(rw.scratch[:0], t.Raw, "ref", ref))
}

// replaceAttr returns raw (a start tag) with attribute name set to val,
// added before the end of the tag when it has none.
func replaceAttr(dst, raw []byte, name, val string) []byte {
	v, ok := rawAttrPos(raw, name)
	if ok {
		dst = append(dst, raw[:v[0]]...)
		dst = appendEscaped(dst, val, true)
		return append(dst, raw[v[1]:]...)
	}
	end := len(raw) - 1
	if end > 0 && raw[end-1] == '/' {
		end--
	}
	dst = append(dst, raw[:end]...)
	dst = append(dst, ' ')
	dst = append(dst, name...)
	dst = append(dst, `="`...)
	dst = appendEscaped(dst, val, true)
	dst = append(dst, '"')
	return append(dst, raw[end:]...)
}

// rawAttrPos finds the value of the unprefixed attribute name in a raw
// start tag: the offsets of its first and last+1 byte.
func rawAttrPos(raw []byte, name string) ([2]int, bool) {
	i := 0
	for i < len(raw) && raw[i] != ' ' && raw[i] != '\t' && raw[i] != '\n' && raw[i] != '\r' {
		i++
	}
	a := raw[i:]
	v, ok := RawAttr(a, name, false)
	if !ok {
		return [2]int{}, false
	}
	// v is a subslice of raw: both end where their array ends, so the
	// difference of their capacities is v's offset in raw.
	off := cap(raw) - cap(v)
	return [2]int{off, off + len(v)}, true
}

func (rw *rewriter) write(b []byte) {
	if rw.err == nil {
		if _, err := rw.w.Write(b); err != nil {
			rw.err = err
		}
	}
}

func (rw *rewriter) writeString(s string) {
	if rw.err == nil {
		if _, err := rw.w.WriteString(s); err != nil {
			rw.err = err
		}
	}
}

// writeLegacy writes the <legacyDrawing> element.
func (rw *rewriter) writeLegacy() {
	rw.legacy = true
	b := append(rw.scratch[:0], '<')
	b = append(b, rw.pfx...)
	b = append(b, "legacyDrawing "...)
	p := rw.relPfx
	if p == "" {
		p = "r"
		b = append(b, `xmlns:r="`+nsRel+`" `...)
	}
	b = append(b, p+`:id="`...)
	b = appendEscaped(b, rw.e.LegacyDrawing, true)
	b = append(b, `"/>`...)
	rw.scratch = b
	rw.write(b)
}

// sheetData copies the cell data with the edit, from its start tag to its
// end tag.
func (rw *rewriter) sheetData() error {
	t := rw.t
	if _, work := rw.nextRowWork(); t.Empty && !work {
		rw.write(t.Raw)
		return rw.err
	}
	if t.Empty {
		rw.write(sheetDataOpen(t.Raw))
		if err := rw.rowsBefore(math.MaxInt); err != nil {
			return err
		}
		b := append(rw.scratch[:0], "</"...)
		b = append(b, rw.pfx...)
		b = append(b, "sheetData>"...)
		rw.write(b)
		return rw.err
	}
	rw.write(t.Raw)
	for {
		switch t.Next() {
		case TokEOF:
			if err := t.Err(); err != nil {
				return err
			}
			return rw.fail("the worksheet ends inside its cell data (truncated?)")
		case TokStart:
			if !t.Is("row") {
				rw.write(t.Raw)
				if !t.Empty {
					if err := rw.copyElement(); err != nil {
						return err
					}
				}
				continue
			}
			if err := rw.row(); err != nil {
				return err
			}
		case TokEnd:
			if !t.Is("sheetData") {
				return rw.fail("unexpected </%s> in the cell data (the worksheet is malformed)", t.Name)
			}
			if err := rw.rowsBefore(math.MaxInt); err != nil {
				return err
			}
			rw.write(t.Raw)
			return rw.err
		default:
			rw.write(t.Raw)
		}
	}
}

// sheetDataOpen turns <sheetData/> into <sheetData>.
func sheetDataOpen(raw []byte) []byte {
	out := append([]byte(nil), raw[:len(raw)-2]...)
	return append(out, '>')
}

// copyElement copies tokens up to the end tag closing the element just
// started.
func (rw *rewriter) copyElement() error {
	t := rw.t
	depth := 1
	for depth > 0 {
		switch t.Next() {
		case TokEOF:
			if err := t.Err(); err != nil {
				return err
			}
			return rw.fail("the worksheet ends inside an element (truncated?)")
		case TokStart:
			if !t.Empty {
				depth++
			}
		case TokEnd:
			depth--
		}
		rw.write(t.Raw)
	}
	return rw.err
}

// rowsBefore writes the rows with work numbered below n, which the sheet
// does not have.
func (rw *rewriter) rowsBefore(n int) error {
	for {
		r, ok := rw.nextRowWork()
		if !ok || r >= n {
			return rw.err
		}
		if r <= rw.lastRow {
			return rw.fail("row %d: appended rows and marks must be in increasing row order", r)
		}
		if err := rw.rowOps(r); err != nil {
			return err
		}
		b := append(rw.scratch[:0], '<')
		b = append(b, rw.pfx...)
		b = append(b, `row r="`...)
		b = strconv.AppendInt(b, int64(r), 10)
		b = append(b, `">`...)
		rw.scratch = b
		rw.write(b)
		for i := range rw.ops {
			if err := rw.writeOp(r, &rw.ops[i], 0); err != nil {
				return err
			}
		}
		rw.closeTag("row")
		rw.lastRow = r
	}
}

func (rw *rewriter) closeTag(name string) {
	b := append(rw.scratch[:0], "</"...)
	b = append(b, rw.pfx...)
	b = append(b, name...)
	b = append(b, '>')
	rw.scratch = b
	rw.write(b)
}
