package bookio

import (
	"sort"
	"strconv"
)

// colEl is a <col> element of the sheet (raw, with the text before it) or
// a new one (raw nil).
type colEl struct {
	min, max int
	raw      []byte
	width    float64
}

// cols copies the <cols> element (its start tag just read) with the new
// widths merged in, in column order.
func (rw *rewriter) cols() error {
	t := rw.t
	start := append([]byte(nil), t.Raw...)
	var els []colEl
	var pending []byte // text between elements, kept with the next one
	for {
		switch t.Next() {
		case TokEOF:
			if err := t.Err(); err != nil {
				return err
			}
			return rw.fail("the worksheet ends inside its column widths (truncated?)")
		case TokStart:
			el := colEl{raw: append(pending, t.Raw...)}
			pending = nil
			if t.Is("col") {
				lo, _ := RawAttr(t.Attrs, "min", false)
				hi, _ := RawAttr(t.Attrs, "max", false)
				el.min, _ = strconv.Atoi(string(lo))
				el.max, _ = strconv.Atoi(string(hi))
			}
			if !t.Empty {
				// a <col> has no children; copy whatever it holds
				depth := 1
				for depth > 0 {
					switch t.Next() {
					case TokEOF:
						return rw.fail("the worksheet ends inside its column widths (truncated?)")
					case TokStart:
						if !t.Empty {
							depth++
						}
					case TokEnd:
						depth--
					}
					el.raw = append(el.raw, t.Raw...)
				}
			}
			els = append(els, el)
		case TokEnd:
			rw.write(start)
			rw.writeColEls(els)
			rw.write(pending)
			rw.write(t.Raw)
			return rw.err
		default:
			pending = append(pending, t.Raw...)
		}
	}
}

// writeCols writes a <cols> element holding only the new widths, when
// there are any, in place of the sheet's empty one (orig, <cols/>) or
// where it has none (orig nil).
func (rw *rewriter) writeCols(orig []byte) {
	if len(newCols(rw.e.Cols, nil)) == 0 {
		rw.write(orig)
		return
	}
	b := append([]byte{'<'}, rw.pfx...)
	rw.write(append(b, "cols>"...))
	rw.writeColEls(nil)
	rw.closeTag("cols")
}

// writeColEls writes the sheet's col elements and the new ones, sorted by
// their first column.
func (rw *rewriter) writeColEls(els []colEl) {
	all := append(els, newCols(rw.e.Cols, els)...)
	sort.SliceStable(all, func(i, j int) bool { return all[i].min < all[j].min })
	for _, el := range all {
		if el.raw != nil {
			rw.write(el.raw)
			continue
		}
		b := append(rw.scratch[:0], '<')
		b = append(b, rw.pfx...)
		b = append(b, `col min="`...)
		b = strconv.AppendInt(b, int64(el.min), 10)
		b = append(b, `" max="`...)
		b = strconv.AppendInt(b, int64(el.max), 10)
		b = append(b, `" width="`...)
		b = strconv.AppendFloat(b, el.width, 'f', -1, 64)
		b = append(b, `" customWidth="1"/>`...)
		rw.scratch = b
		rw.write(b)
	}
}

// newCols is the parts of want that no range of have covers.
func newCols(want []ColWidth, have []colEl) []colEl {
	var out []colEl
	for _, w := range want {
		lo, hi := max(w.Min, 1), min(w.Max, MaxCol)
		for lo <= hi {
			// the first existing range that covers lo, or starts after it
			end := hi
			covered := false
			for _, h := range have {
				if h.min <= lo && lo <= h.max {
					covered, lo = true, h.max+1
					break
				}
				if h.min > lo && h.min-1 < end {
					end = h.min - 1
				}
			}
			if covered {
				continue
			}
			for _, o := range out { // new ranges never overlap each other either
				if o.min <= lo && lo <= o.max {
					covered, lo = true, o.max+1
					break
				}
				if o.min > lo && o.min-1 < end {
					end = o.min - 1
				}
			}
			if covered {
				continue
			}
			out = append(out, colEl{min: lo, max: end, width: w.Width})
			lo = end + 1
		}
	}
	return out
}
