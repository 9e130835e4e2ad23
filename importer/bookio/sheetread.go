package bookio

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
)

// SheetReader streams the rows of one worksheet part. Unlike excelize's
// Rows iterator it keeps what each cell is (number, text, formula, formula
// without a cached value), which the checks need, and it allocates nothing
// per cell beyond the strings it returns.
type SheetReader struct {
	part   string
	t      *Tok
	rc     io.Closer
	sst    []string
	inData bool
	done   bool
	rowNum int
	cells  []Cell
	err    error

	// KeepStyled keeps cells that hold nothing but have a style (their
	// Style set, Kind Empty), which Next otherwise leaves out.
	KeepStyled bool
	// NoText leaves the text of shared strings unread (Kind Text, Text ""):
	// for a reader that needs only where cells are, on a Book opened
	// without its shared strings.
	NoText bool

	v       []byte    // the current cell's <v>, reused from cell to cell
	texts   textTable // one string per distinct short text
	general bool      // every cell read the general way (tests compare the two)
}

// Err is the error that ended the rows, if any.
func (s *SheetReader) Err() error { return s.err }

// OpenSheet starts streaming the rows of sheet s.
func (b *Book) OpenSheet(s SheetRef) (*SheetReader, error) {
	if s.Part == "" {
		return nil, fmt.Errorf("sheet %q has no part in the package", s.Name)
	}
	rc, err := b.OpenPart(s.Part)
	if err != nil {
		return nil, err
	}
	// The part inflates in its own goroutine, beside the tokenizer.
	ra := newReadAhead(rc)
	return &SheetReader{part: s.Part, t: NewTok(ra), rc: aheadCloser{ra, rc}, sst: b.SST}, nil
}

// aheadCloser stops the read-ahead, then closes the part.
type aheadCloser struct {
	ra *readAhead
	rc io.Closer
}

func (c aheadCloser) Close() error {
	c.ra.Close()
	return c.rc.Close()
}

// Close closes the part.
func (s *SheetReader) Close() { s.rc.Close() }

// Next returns the next row that has at least one cell element; the cells
// slice is reused by the following call.
func (s *SheetReader) Next() (Row, bool) {
	t := s.t
	for !s.done {
		k := t.Next()
		switch k {
		case TokEOF:
			s.done = true
			if err := t.Err(); err != nil {
				s.err = fmt.Errorf("%s: %v", s.part, err)
			}
		case TokStart:
			switch {
			case !s.inData:
				if t.Is("sheetData") {
					if t.Empty {
						s.done = true
					}
					s.inData = true
				}
			case t.Is("row"):
				n := s.rowNum + 1
				if v, ok := RawAttr(t.Attrs, "r", false); ok {
					r, err := strconv.Atoi(string(v))
					if err != nil || r < 1 || r > 1048576 {
						s.fail("row number %q is not valid", v)
						return Row{}, false
					}
					n = r
				}
				s.rowNum = n
				if t.Empty {
					continue
				}
				if !s.readRow() {
					return Row{}, false
				}
				if len(s.cells) > 0 {
					return Row{Num: s.rowNum, Cells: s.cells}, true
				}
			}
		case TokEnd:
			if s.inData && t.Is("sheetData") {
				s.done = true
			}
		}
	}
	return Row{}, false
}

func (s *SheetReader) fail(format string, args ...any) {
	s.err = fmt.Errorf("%s: "+format, append([]any{s.part}, args...)...)
	s.done = true
}

// readRow reads the cells of the row just started, up to </row>.
func (s *SheetReader) readRow() bool {
	t := s.t
	s.cells = s.cells[:0]
	col := 0
	for {
		var tag cellTag
		if s.general || !s.quickStart(&tag) {
			switch t.Next() {
			case TokEOF:
				if t.Err() == nil {
					s.fail("the sheet ends inside row %d (truncated?)", s.rowNum)
				} else {
					s.fail("%v", t.Err())
				}
				return false
			case TokEnd:
				if t.Is("row") {
					return true
				}
				continue
			case TokStart:
				if !t.Is("c") {
					if !t.Empty {
						if err := t.SkipElement(string(t.Name)); err != nil {
							s.fail("row %d: %v", s.rowNum, err)
							return false
						}
					}
					continue
				}
				tag.r, tag.s, tag.t, tag.hasR, tag.hasS, _ = cellAttrs(t.Attrs)
				tag.empty = t.Empty
			default:
				continue
			}
		}
		if !s.readCellAt(&col, &tag) {
			return false
		}
	}
}

// cellTag is what a cell's start tag says: its r, s and t attributes (raw,
// valid until the tokenizer reads on) and whether it is empty (<c .../>).
type cellTag struct {
	r, s, t    []byte
	hasR, hasS bool
	empty      bool
}

// readCellAt reads the cell whose start tag was just read; col is the
// column of the cell before it, and becomes this one's.
func (s *SheetReader) readCellAt(col *int, tag *cellTag) bool {
	*col++
	if tag.hasR {
		c, ok := refInRow(tag.r, s.rowNum)
		if !ok {
			s.fail("cell reference %q in row %d is not valid", tag.r, s.rowNum)
			return false
		}
		if c < *col {
			s.fail("cell %s comes after a cell to its right (the sheet is corrupt)", tag.r)
			return false
		}
		*col = c
	}
	if *col > 16384 {
		s.fail("row %d has more than 16384 columns", s.rowNum)
		return false
	}
	// Take the type now: reading the children may move the buffer.
	typ := cellType(tag.t)
	c := Cell{Col: *col}
	if tag.hasS {
		c.Style = atoiStyle(tag.s)
	}
	if !tag.empty {
		handled, ok := false, true
		if !s.general {
			handled, ok = s.quickCell(&c, typ)
		}
		if !ok || !handled && !s.readCell(&c, typ) {
			return false
		}
	}
	if c.Kind != Empty || c.Formula || s.KeepStyled && c.Style != 0 {
		s.cells = append(s.cells, c)
	}
	return true
}

// atoiStyle reads a style index; 0 for anything that is not one.
func atoiStyle(b []byte) int {
	n := 0
	for _, c := range b {
		if c < '0' || c > '9' || n > 1<<24 {
			return 0
		}
		n = n*10 + int(c-'0')
	}
	return n
}

// cellType interns the t attribute of a cell (no allocation for the usual
// values).
func cellType(b []byte) string {
	switch string(b) {
	case "":
		return ""
	case "s":
		return "s"
	case "n":
		return "n"
	case "str":
		return "str"
	case "inlineStr":
		return "inlineStr"
	case "b":
		return "b"
	case "e":
		return "e"
	case "d":
		return "d"
	}
	return string(b)
}

// readCell reads the children of <c> (<v>, <f>, <is>) up to </c>.
func (s *SheetReader) readCell(c *Cell, typ string) bool {
	t := s.t
	v := s.v[:0]
	defer func() { s.v = v[:0] }()
	hasV := false
	var inline string
	hasInline := false
	for {
		switch t.Next() {
		case TokEOF:
			s.fail("the sheet ends inside cell %s", CellRef(c.Col, s.rowNum))
			return false
		case TokEnd:
			if !t.Is("c") {
				continue
			}
			return s.finishCell(c, typ, v, hasV, inline, hasInline)
		case TokStart:
			switch {
			case t.Is("v"):
				hasV = true
				if t.Empty {
					continue
				}
				// The value is almost always a single text token.
				if t.Next() == TokText && !t.CDATA {
					v = append(v[:0], t.Text...)
					if t.Next() != TokEnd {
						s.fail("cell %s: unexpected content in <v>", CellRef(c.Col, s.rowNum))
						return false
					}
				} else if t.Kind == TokText {
					v = appendCDATA(v[:0], t.Text)
					t.Next()
				} else if t.Kind != TokEnd {
					s.fail("cell %s: unexpected content in <v>", CellRef(c.Col, s.rowNum))
					return false
				}
			case t.Is("f"):
				c.Formula = true
				if !t.Empty {
					if err := t.SkipElement("f"); err != nil {
						s.fail("cell %s: %v", CellRef(c.Col, s.rowNum), err)
						return false
					}
				}
			case t.Is("is"):
				hasInline = true
				if !t.Empty {
					raw, err := t.collect("is", "t", "rPh", true)
					if err != nil {
						s.fail("cell %s: %v", CellRef(c.Col, s.rowNum), err)
						return false
					}
					inline = s.texts.get(raw)
				}
			default:
				if !t.Empty {
					if err := t.SkipElement(string(t.Name)); err != nil {
						s.fail("cell %s: %v", CellRef(c.Col, s.rowNum), err)
						return false
					}
				}
			}
		}
	}
}

// finishCell gives c its kind and value from the cell's type, its <v>
// (raw text, valid only during the call) and its inline string.
func (s *SheetReader) finishCell(c *Cell, typ string, v []byte, hasV bool, inline string, hasInline bool) bool {
	if hasV && typ != "str" && typ != "inlineStr" && len(bytes.TrimSpace(v)) == 0 {
		hasV = false // an empty <v> holds no number, shared string, boolean or error
	}
	switch typ {
	case "s":
		if !hasV {
			break
		}
		if s.NoText {
			c.Kind = Text
			break
		}
		i, ok := atoiIndex(bytes.TrimSpace(v))
		if !ok || i >= len(s.sst) {
			s.fail("cell %s refers to shared string %q, which does not exist (the workbook is corrupt)", CellRef(c.Col, s.rowNum), v)
			return false
		}
		c.Kind, c.Text = Text, s.sst[i]
	case "inlineStr":
		if hasInline {
			c.Kind, c.Text = Text, inline
		} else if hasV {
			c.Kind, c.Text = Text, s.texts.get(v)
		}
	case "str":
		if hasV {
			c.Kind, c.Text = Text, s.texts.get(v)
		}
	case "b":
		if hasV {
			c.Kind, c.Text = Bool, "FALSE"
			if string(bytes.TrimSpace(v)) == "1" {
				c.Text = "TRUE"
			}
		}
	case "e":
		if hasV {
			c.Kind, c.Text = Error, s.texts.get(v)
		}
	case "d":
		// An ISO 8601 date stored as text; keep it as text.
		if hasV {
			c.Kind, c.Text = Text, s.texts.get(v)
		}
	default: // "n" or absent
		if hasV {
			raw := bytes.TrimSpace(v)
			f, err := parseNumber(raw)
			if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
				s.fail("cell %s holds %q, which is not a number (the workbook is corrupt)", CellRef(c.Col, s.rowNum), raw)
				return false
			}
			c.Kind, c.Num = Number, f
		}
	}
	c.NoCache = formulaWithoutResult(c, typ, hasV)
	return true
}

// atoiIndex reads a shared-string index as strconv.Atoi reads it; ok is
// false for anything Atoi refuses and for a negative index. Plain digits,
// which is what writers write, take no detour through a string.
func atoiIndex(b []byte) (int, bool) {
	if len(b) == 0 || len(b) > 18 {
		return atoiSlow(b)
	}
	n := 0
	for _, c := range b {
		if c < '0' || c > '9' {
			return atoiSlow(b)
		}
		n = n*10 + int(c-'0')
	}
	return n, true
}

func atoiSlow(b []byte) (int, bool) {
	i, err := strconv.Atoi(string(b))
	return i, err == nil && i >= 0
}

// formulaWithoutResult reports a formula cell whose file holds no stored
// result: no <v>, or an empty <v></v> (openpyxl writes <f>2*300</f><v></v>;
// other libraries write <v/>). An empty <v> is a stored result only for a
// string formula (t="str", Excel's and LibreOffice's way of storing ""); for
// a number, boolean or error it holds nothing.
func formulaWithoutResult(c *Cell, typ string, hasV bool) bool {
	return c.Formula && c.Kind == Empty && !(hasV && typ == "str")
}
