package bookio

import (
	"fmt"
	"math"
	"strconv"
)

// row copies one <row> element (its start tag just read) with its work.
func (rw *rewriter) row() error {
	t := rw.t
	n := rw.lastRow + 1
	if v, ok := RawAttr(t.Attrs, "r", false); ok {
		r, err := strconv.Atoi(string(v))
		if err != nil || r < 1 || r > MaxRow {
			return rw.fail("row number %q is not valid (the worksheet is corrupt)", v)
		}
		n = r
	}
	if n <= rw.lastRow {
		return rw.fail("row %d comes after row %d (the worksheet is corrupt)", n, rw.lastRow)
	}
	if err := rw.rowsBefore(n); err != nil {
		return err
	}
	rw.lastRow = n
	if w, ok := rw.nextRowWork(); !ok || w != n {
		rw.write(t.Raw)
		if !t.Empty {
			return rw.copyElement()
		}
		return rw.err
	}
	if err := rw.rowOps(n); err != nil {
		return err
	}
	raw := t.Raw
	if v, ok := RawAttr(t.Attrs, "spans", false); ok {
		// spans is a hint of the row's first and last column: widen it.
		last := rw.ops[len(rw.ops)-1].col
		var a, b int
		if _, err := fmt.Sscanf(string(v), "%d:%d", &a, &b); err == nil && b < last {
			raw = replaceAttr(nil, raw, "spans", strconv.Itoa(a)+":"+strconv.Itoa(last))
		}
	}
	if t.Empty {
		rw.write(raw[:len(raw)-2])
		rw.write([]byte{'>'})
		for i := range rw.ops {
			if err := rw.writeOp(n, &rw.ops[i], 0); err != nil {
				return err
			}
		}
		rw.closeTag("row")
		return rw.err
	}
	rw.write(raw)
	return rw.rowCells(n)
}

// rowCells copies the children of row n up to </row>, with rw.ops merged
// in by column.
func (rw *rewriter) rowCells(n int) error {
	t := rw.t
	oi, col, inserted := 0, 0, false
	for {
		switch t.Next() {
		case TokEOF:
			if err := t.Err(); err != nil {
				return err
			}
			return rw.fail("the worksheet ends inside row %d (truncated?)", n)
		case TokEnd:
			for ; oi < len(rw.ops); oi++ {
				if err := rw.writeOp(n, &rw.ops[oi], 0); err != nil {
					return err
				}
			}
			rw.write(t.Raw)
			return rw.err
		case TokStart:
			if !t.Is("c") {
				rw.write(t.Raw)
				if !t.Empty {
					if err := rw.copyElement(); err != nil {
						return err
					}
				}
				continue
			}
			col++
			rv, hasR := RawAttr(t.Attrs, "r", false)
			if hasR {
				c := parseCol(rv)
				if c == 0 {
					return rw.fail("cell reference %q in row %d is not valid (the worksheet is corrupt)", rv, n)
				}
				if c < col {
					return rw.fail("cell %s comes after a cell to its right (the worksheet is corrupt)", rv)
				}
				col = c
			}
			if col > MaxCol {
				return rw.fail("row %d has more than %d columns (the worksheet is corrupt)", n, MaxCol)
			}
			for ; oi < len(rw.ops) && rw.ops[oi].col < col; oi++ {
				if err := rw.writeOp(n, &rw.ops[oi], 0); err != nil {
					return err
				}
				inserted = true
			}
			for i, fc := range rw.from {
				if fc == col {
					rw.fromSt[i] = 0
					if v, ok := RawAttr(t.Attrs, "s", false); ok {
						rw.fromSt[i] = atoiStyle(v)
					}
				}
			}
			raw := t.Raw
			if inserted && !hasR {
				raw = replaceAttr(nil, raw, "r", CellRef(col, n))
			}
			if oi < len(rw.ops) && rw.ops[oi].col == col {
				o := &rw.ops[oi]
				oi++
				if err := rw.onCell(n, col, o, raw); err != nil {
					return err
				}
				continue
			}
			rw.write(raw)
			if !t.Empty && !rw.copyQuickCell() {
				if err := rw.copyElement(); err != nil {
					return err
				}
			}
		default:
			rw.write(t.Raw)
		}
	}
}

// copyQuickCell copies the content of the cell just started, up to its
// end tag, in one piece when it has one of the usual shapes (matchCell):
// the same bytes copyElement would copy token by token. It reports false,
// having copied nothing, for any other shape.
func (rw *rewriter) copyQuickCell() bool {
	t := rw.t
	if rw.general {
		return false
	}
	if want := min(quickLook, len(t.buf)); t.end-t.pos < want {
		t.ensure(want)
	}
	b := t.buf[t.pos:t.end]
	m, ok := matchCell(b, true)
	if !ok {
		return false
	}
	rw.write(b[:m.n])
	t.pos += m.n
	return true
}

// onCell handles an original cell at the column of an op: a mark restyles
// it; an appended cell replaces it when it holds nothing (a cell with only
// a style), and is refused otherwise.
func (rw *rewriter) onCell(n, col int, o *op, raw []byte) error {
	t := rw.t
	old := 0
	if v, ok := RawAttr(t.Attrs, "s", false); ok {
		old = atoiStyle(v)
	}
	empty := t.Empty
	if o.cell == nil {
		raw = replaceAttr(nil, raw, "s", strconv.Itoa(rw.e.Restyle(old, o.code)))
		rw.write(raw)
		if !empty {
			return rw.copyElement()
		}
		return rw.err
	}
	if !empty {
		// Read the cell's children: any value, formula or inline string
		// makes it occupied.
		depth := 1
		for depth > 0 {
			switch t.Next() {
			case TokEOF:
				if err := t.Err(); err != nil {
					return err
				}
				return rw.fail("the worksheet ends inside cell %s (truncated?)", CellRef(col, n))
			case TokStart:
				if depth == 1 && (t.Is("v") || t.Is("f") || t.Is("is")) {
					return fmt.Errorf("cell %s: %w", CellRef(col, n), ErrOccupied)
				}
				if !t.Empty {
					depth++
				}
			case TokEnd:
				depth--
			}
		}
	}
	return rw.writeOp(n, o, old)
}

// writeOp writes the cell of an op in row n: an appended cell (with style
// keep when its own is 0), or an empty cell with a mark's style.
func (rw *rewriter) writeOp(n int, o *op, keep int) error {
	b := append(rw.scratch[:0], '<')
	b = append(b, rw.pfx...)
	b = append(b, `c r="`...)
	b = appendColName(b, o.col)
	b = strconv.AppendInt(b, int64(n), 10)
	b = append(b, '"')
	c := o.cell
	if c == nil {
		b = append(b, ` s="`...)
		b = strconv.AppendInt(b, int64(rw.e.Restyle(0, o.code)), 10)
		b = append(b, `"/>`...)
		rw.scratch = b
		rw.write(b)
		return rw.err
	}
	style := c.Style
	if c.StyleFrom > 0 {
		for i, fc := range rw.from {
			if fc == c.StyleFrom && rw.fromSt[i] > 0 && rw.fromSt[i] < rw.e.MaxStyle {
				style = rw.fromSt[i]
			}
		}
	}
	if style == 0 {
		style = keep
	}
	if style > 0 {
		b = append(b, ` s="`...)
		b = strconv.AppendInt(b, int64(style), 10)
		b = append(b, '"')
	}
	switch c.Kind {
	case NewNumber:
		if math.IsNaN(c.Num) || math.IsInf(c.Num, 0) {
			return rw.fail("cell %s: the number %v cannot be written", CellRef(o.col, n), c.Num)
		}
		b = append(b, '>')
		b = rw.open(b, "v")
		b = appendNumber(b, c.Num)
		b = rw.end(b, "v")
	case NewShared:
		if c.SST < 0 {
			return rw.fail("cell %s: shared string %d is not valid", CellRef(o.col, n), c.SST)
		}
		b = append(b, ` t="s">`...)
		b = rw.open(b, "v")
		b = strconv.AppendInt(b, int64(c.SST), 10)
		b = rw.end(b, "v")
	case NewInline:
		b = append(b, ` t="inlineStr">`...)
		b = rw.open(b, "is")
		b = append(b, '<')
		b = append(b, rw.pfx...)
		b = append(b, 't')
		if c.Text != "" && (isSpace(c.Text[0]) || isSpace(c.Text[len(c.Text)-1])) {
			b = append(b, ` xml:space="preserve"`...)
		}
		b = append(b, '>')
		b = appendEscaped(b, c.Text, false)
		b = rw.end(b, "t")
		b = rw.end(b, "is")
	default:
		return rw.fail("cell %s: unknown kind of cell %d", CellRef(o.col, n), c.Kind)
	}
	b = rw.end(b, "c")
	rw.scratch = b
	rw.write(b)
	return rw.err
}

func (rw *rewriter) open(b []byte, name string) []byte {
	b = append(b, '<')
	b = append(b, rw.pfx...)
	b = append(b, name...)
	return append(b, '>')
}

func (rw *rewriter) end(b []byte, name string) []byte {
	b = append(b, "</"...)
	b = append(b, rw.pfx...)
	b = append(b, name...)
	return append(b, '>')
}

// appendNumber writes v as Excel does: plain decimals from 1E-05 to below
// 1E+15, exponent notation outside, the shortest form that reads back as v.
func appendNumber(b []byte, v float64) []byte {
	if a := math.Abs(v); a == 0 || a >= 1e-5 && a < 1e15 {
		return strconv.AppendFloat(b, v, 'f', -1, 64)
	}
	return strconv.AppendFloat(b, v, 'E', -1, 64)
}
