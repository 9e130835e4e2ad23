package importer

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
)

// sheetReader streams the rows of one worksheet part. Unlike excelize's
// Rows iterator it keeps what each cell is (number, text, formula, formula
// without a cached value), which the checks need, and it allocates nothing
// per cell beyond the strings it returns.
type sheetReader struct {
	part   string
	t      *xmlTok
	rc     io.Closer
	sst    []string
	inData bool
	done   bool
	rowNum int
	cells  []cell
	err    error
}

func (b *book) openSheet(s sheetRef) (*sheetReader, error) {
	if s.Part == "" {
		return nil, fmt.Errorf("sheet %q has no part in the package", s.Name)
	}
	rc, err := b.open(s.Part)
	if err != nil {
		return nil, err
	}
	return &sheetReader{part: s.Part, t: newXMLTok(rc), rc: rc, sst: b.sst}, nil
}

func (s *sheetReader) close() { s.rc.Close() }

// next returns the next row that has at least one cell element; the cells
// slice is reused by the following call.
func (s *sheetReader) next() (row, bool) {
	t := s.t
	for !s.done {
		k := t.next()
		switch k {
		case tokEOF:
			s.done = true
			if err := t.fail(); err != nil {
				s.err = fmt.Errorf("%s: %v", s.part, err)
			}
		case tokStart:
			switch {
			case !s.inData:
				if t.is("sheetData") {
					if t.empty {
						s.done = true
					}
					s.inData = true
				}
			case t.is("row"):
				n := s.rowNum + 1
				if v, ok := rawAttr(t.attrs, "r", false); ok {
					r, err := strconv.Atoi(string(v))
					if err != nil || r < 1 || r > 1048576 {
						s.fail("row number %q is not valid", v)
						return row{}, false
					}
					n = r
				}
				s.rowNum = n
				if t.empty {
					continue
				}
				if !s.readRow() {
					return row{}, false
				}
				if len(s.cells) > 0 {
					return row{num: s.rowNum, cells: s.cells}, true
				}
			}
		case tokEnd:
			if s.inData && t.is("sheetData") {
				s.done = true
			}
		}
	}
	return row{}, false
}

func (s *sheetReader) fail(format string, args ...any) {
	s.err = fmt.Errorf("%s: "+format, append([]any{s.part}, args...)...)
	s.done = true
}

// readRow reads the cells of the row just started, up to </row>.
func (s *sheetReader) readRow() bool {
	t := s.t
	s.cells = s.cells[:0]
	col := 0
	for {
		switch t.next() {
		case tokEOF:
			if t.fail() == nil {
				s.fail("the sheet ends inside row %d (truncated?)", s.rowNum)
			} else {
				s.fail("%v", t.fail())
			}
			return false
		case tokEnd:
			if t.is("row") {
				return true
			}
		case tokStart:
			if !t.is("c") {
				if !t.empty {
					if _, err := t.collectText(string(t.name), "", ""); err != nil {
						s.fail("row %d: %v", s.rowNum, err)
						return false
					}
				}
				continue
			}
			col++
			if v, ok := rawAttr(t.attrs, "r", false); ok {
				c, r, ok := parseRef(string(v))
				if !ok || r != s.rowNum {
					s.fail("cell reference %q in row %d is not valid", v, s.rowNum)
					return false
				}
				if c < col {
					s.fail("cell %s comes after a cell to its right (the sheet is corrupt)", v)
					return false
				}
				col = c
			}
			if col > 16384 {
				s.fail("row %d has more than 16384 columns", s.rowNum)
				return false
			}
			// Copy the type now: reading the children may move the buffer.
			rawTyp, _ := rawAttr(t.attrs, "t", false)
			typ := cellType(rawTyp)
			c := cell{col: col}
			if !t.empty {
				if !s.readCell(&c, typ) {
					return false
				}
			}
			if c.kind != kEmpty || c.formula {
				s.cells = append(s.cells, c)
			}
		}
	}
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
func (s *sheetReader) readCell(c *cell, typ string) bool {
	t := s.t
	var v []byte
	hasV := false
	var inline string
	hasInline := false
	for {
		switch t.next() {
		case tokEOF:
			s.fail("the sheet ends inside cell %s", cellRef(c.col, s.rowNum))
			return false
		case tokEnd:
			if !t.is("c") {
				continue
			}
			return s.finishCell(c, typ, v, hasV, inline, hasInline)
		case tokStart:
			switch {
			case t.is("v"):
				hasV = true
				if t.empty {
					continue
				}
				// The value is almost always a single text token.
				if t.next() == tokText && !t.cdata {
					v = append(v[:0], t.text...)
					if t.next() != tokEnd {
						s.fail("cell %s: unexpected content in <v>", cellRef(c.col, s.rowNum))
						return false
					}
				} else if t.kind == tokText {
					v = append(v[:0], bytes.ReplaceAll(t.text, []byte("&"), []byte("&amp;"))...)
					t.next()
				} else if t.kind != tokEnd {
					s.fail("cell %s: unexpected content in <v>", cellRef(c.col, s.rowNum))
					return false
				}
			case t.is("f"):
				c.formula = true
				if !t.empty {
					if _, err := t.collectText("f", "", ""); err != nil {
						s.fail("cell %s: %v", cellRef(c.col, s.rowNum), err)
						return false
					}
				}
			case t.is("is"):
				hasInline = true
				if !t.empty {
					str, err := t.collectText("is", "t", "rPh")
					if err != nil {
						s.fail("cell %s: %v", cellRef(c.col, s.rowNum), err)
						return false
					}
					inline = str
				}
			default:
				if !t.empty {
					if _, err := t.collectText(string(t.name), "", ""); err != nil {
						s.fail("cell %s: %v", cellRef(c.col, s.rowNum), err)
						return false
					}
				}
			}
		}
	}
}

func (s *sheetReader) finishCell(c *cell, typ string, v []byte, hasV bool, inline string, hasInline bool) bool {
	if hasV && typ != "str" && typ != "inlineStr" && len(bytes.TrimSpace(v)) == 0 {
		hasV = false // an empty <v> holds no number, shared string, boolean or error
	}
	switch typ {
	case "s":
		if !hasV {
			break
		}
		i, err := strconv.Atoi(string(bytes.TrimSpace(v)))
		if err != nil || i < 0 || i >= len(s.sst) {
			s.fail("cell %s refers to shared string %q, which does not exist (the workbook is corrupt)", cellRef(c.col, s.rowNum), v)
			return false
		}
		c.kind, c.text = kText, s.sst[i]
	case "inlineStr":
		if hasInline {
			c.kind, c.text = kText, inline
		} else if hasV {
			c.kind, c.text = kText, unescape(v)
		}
	case "str":
		if hasV {
			c.kind, c.text = kText, unescape(v)
		}
	case "b":
		if hasV {
			c.kind, c.text = kBool, "FALSE"
			if string(bytes.TrimSpace(v)) == "1" {
				c.text = "TRUE"
			}
		}
	case "e":
		if hasV {
			c.kind, c.text = kError, unescape(v)
		}
	case "d":
		// An ISO 8601 date stored as text; keep it as text.
		if hasV {
			c.kind, c.text = kText, unescape(v)
		}
	default: // "n" or absent
		if hasV {
			raw := bytes.TrimSpace(v)
			f, err := strconv.ParseFloat(string(raw), 64)
			if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
				s.fail("cell %s holds %q, which is not a number (the workbook is corrupt)", cellRef(c.col, s.rowNum), raw)
				return false
			}
			c.kind, c.num = kNumber, f
		}
	}
	c.noCache = formulaWithoutResult(c, typ, hasV)
	return true
}

// formulaWithoutResult reports a formula cell whose file holds no stored
// result: no <v>, or an empty <v></v> (openpyxl writes <f>2*300</f><v></v>;
// other libraries write <v/>). An empty <v> is a stored result only for a
// string formula (t="str", Excel's and LibreOffice's way of storing ""); for
// a number, boolean or error it holds nothing.
func formulaWithoutResult(c *cell, typ string, hasV bool) bool {
	return c.formula && c.kind == kEmpty && !(hasV && typ == "str")
}

// readMerges returns the merged ranges of a worksheet part. They follow the
// cell data, so the part is read to its end; only the tail after
// </sheetData> is tokenized.
func (b *book) readMerges(s sheetRef) ([]rangeRef, error) {
	if s.Part == "" {
		return nil, nil
	}
	rc, err := b.open(s.Part)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	tail, err := afterSheetData(rc)
	if err != nil {
		return nil, err
	}
	if tail == nil {
		return nil, nil
	}
	t := newXMLTok(bytes.NewReader(tail))
	var out []rangeRef
	for k := t.next(); k != tokEOF; k = t.next() {
		if k == tokStart && t.is("mergeCell") {
			ref, _ := t.attr("ref", false)
			if r, ok := parseRange(ref); ok {
				out = append(out, r)
			}
			if len(out) > 1<<20 {
				return nil, fmt.Errorf("%s: more than a million merged ranges", s.Part)
			}
		}
	}
	if err := t.fail(); err != nil {
		return nil, fmt.Errorf("%s: %v", s.Part, err)
	}
	return out, nil
}

// afterSheetData reads r to its end and returns what follows the end tag
// </sheetData> (nil when there is none).
func afterSheetData(r io.Reader) ([]byte, error) {
	const keep = 64
	pat := []byte("sheetData>")
	chunk := make([]byte, 256<<10)
	win := make([]byte, 0, len(chunk)+keep)
	var tail []byte
	found := false
	for {
		n, err := r.Read(chunk)
		if n > 0 {
			if found {
				tail = append(tail, chunk[:n]...)
				if len(tail) > 64<<20 {
					return nil, fmt.Errorf("the part after its cell data is over 64 MB")
				}
			} else {
				win = append(win, chunk[:n]...)
				for i := bytes.Index(win, pat); i >= 0; {
					if isEndTag(win, i) {
						found = true
						tail = append([]byte(nil), win[i+len(pat):]...)
						break
					}
					next := bytes.Index(win[i+1:], pat)
					if next < 0 {
						break
					}
					i += 1 + next
				}
				if !found {
					cut := max(0, len(win)-keep)
					win = append(win[:0], win[cut:]...)
				}
			}
		}
		if err == io.EOF {
			return tail, nil
		}
		if err != nil {
			return nil, err
		}
	}
}

// isEndTag reports whether the name at buf[j:] is preceded by "</" or
// "</prefix:".
func isEndTag(buf []byte, j int) bool {
	k := j - 1
	if k >= 0 && buf[k] == ':' {
		k--
		for k >= 0 && buf[k] != '<' && buf[k] != '/' && !isSpace(buf[k]) {
			k--
		}
	}
	return k >= 1 && buf[k] == '/' && buf[k-1] == '<'
}
