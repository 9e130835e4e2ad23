package bookio

import "bytes"

// The shapes nearly every cell of a worksheet has, whoever wrote it:
//
//	<c r="A1" s="3" t="s"><v>12</v></c>                  shared string
//	<c r="B1"><v>1.5</v></c>                              number
//	<c r="C1" s="2"><f>B1*2</f><v>3</v></c>               formula and its result
//	<c r="D1" t="inlineStr"><is><t>kg</t></is></c>        inline string
//
// quickStart and quickCell read these straight from the tokenizer's
// buffer, without a token per element, and the rewriter copies their
// content in one piece (copyQuickCell); anything else (a prefix, white
// space between the elements, attributes on <v> or <f>, rich text, CDATA,
// comments, content longer than the look-ahead) goes the general way,
// token by token, which gives the same cells and the same bytes (the
// tests and fuzz tests compare the two ways).

// quickLook is how many bytes quickCell wants in the buffer before it
// looks: more than almost any cell's content.
const quickLook = 4096

// cellAttrs reads the r, s and t attributes of a cell's start tag in one
// pass; each is what RawAttr would return for it. Attributes written
// x="..." (one-letter name, no space around '=') take a short cut.
func cellAttrs(a []byte) (r, s, t []byte, hasR, hasS, hasT bool) {
	for i := 0; i < len(a); {
		c := a[i]
		if isSpace(c) {
			i++
			continue
		}
		var name, val []byte
		if i+2 < len(a) && c != '=' && a[i+1] == '=' && (a[i+2] == '"' || a[i+2] == '\'') {
			n := bytes.IndexByte(a[i+3:], a[i+2])
			if n < 0 {
				return
			}
			name, val = a[i:i+1], a[i+3:i+3+n]
			i += n + 4
		} else {
			var ok bool
			if name, val, i, ok = nextAttr(a, i); !ok {
				return
			}
		}
		if len(name) != 1 {
			continue
		}
		switch name[0] {
		case 'r':
			if !hasR {
				r, hasR = val, true
			}
		case 's':
			if !hasS {
				s, hasS = val, true
			}
		case 't':
			if !hasT {
				t, hasT = val, true
			}
		}
	}
	return
}

// quickStart reads the next cell's start tag when it is written the usual
// way: <c followed by name="value" pairs (no space around '=') and > or
// />, whole in the buffer. It gives what Next and cellAttrs would give;
// false, with nothing read, for anything else.
func (s *SheetReader) quickStart(tag *cellTag) bool {
	t := s.t
	if want := min(quickLook, len(t.buf)); t.end-t.pos < want {
		t.ensure(want)
	}
	b := t.buf[t.pos:t.end]
	if len(b) < 3 || b[0] != '<' || b[1] != 'c' || !isSpace(b[2]) && b[2] != '>' && b[2] != '/' {
		return false
	}
	*tag = cellTag{}
	hasT := false
	for i := 2; i < len(b); {
		c := b[i]
		switch {
		case isSpace(c):
			i++
			continue
		case c == '>':
			t.pos += i + 1
			return true
		case c == '/':
			if i+1 < len(b) && b[i+1] == '>' {
				tag.empty = true
				t.pos += i + 2
				return true
			}
			return false
		}
		j := i
		for j < len(b) && b[j] != '=' && b[j] != '>' && b[j] != '/' && b[j] != '"' && b[j] != '\'' && !isSpace(b[j]) {
			j++
		}
		if j+1 >= len(b) || b[j] != '=' || j == i || b[j+1] != '"' && b[j+1] != '\'' {
			return false
		}
		k := bytes.IndexByte(b[j+2:], b[j+1])
		if k < 0 {
			return false
		}
		if val := b[j+2 : j+2+k]; j == i+1 {
			switch c {
			case 'r':
				if !tag.hasR {
					tag.r, tag.hasR = val, true
				}
			case 's':
				if !tag.hasS {
					tag.s, tag.hasS = val, true
				}
			case 't':
				if !hasT {
					tag.t, hasT = val, true
				}
			}
		}
		i = j + 2 + k + 1
	}
	return false
}

// refInRow reads the column of a cell reference that must be in row row;
// ok is false when it is not a reference or names another row. Plain
// references (AB12) take no detour through a string.
func refInRow(ref []byte, row int) (col int, ok bool) {
	i := 0
	for i < len(ref) && ref[i] >= 'A' && ref[i] <= 'Z' && i < 3 {
		col = col*26 + int(ref[i]-'A'+1)
		i++
	}
	n := 0
	for j := i; j < len(ref); j++ {
		if ref[j] < '0' || ref[j] > '9' || i == 0 || j-i >= 7 {
			c, r, ok := ParseRef(string(ref))
			return c, ok && r == row
		}
		n = n*10 + int(ref[j]-'0')
	}
	if i == 0 || i == len(ref) || col > MaxCol || n == 0 || n > MaxRow {
		c, r, ok := ParseRef(string(ref))
		return c, ok && r == row
	}
	return col, n == row
}

// quickCell reads the content of the cell just started, up to its end
// tag, when it has one of the shapes above. handled is false, with
// nothing read, for any other shape; ok is false when the cell was read
// and is not valid (s.err says why).
func (s *SheetReader) quickCell(c *Cell, typ string) (handled, ok bool) {
	t := s.t
	if want := min(quickLook, len(t.buf)); t.end-t.pos < want {
		t.ensure(want)
	}
	m, found := matchCell(t.buf[t.pos:t.end], typ == "inlineStr")
	if !found {
		return false, true
	}
	if m.inline {
		text := s.texts.get(m.text)
		t.pos += m.n
		return true, s.finishCell(c, typ, nil, false, text, true)
	}
	t.pos += m.n
	c.Formula = m.formula
	return true, s.finishCell(c, typ, m.text, m.hasV, "", false)
}

// cellMatch is a cell's content in one of the usual shapes.
type cellMatch struct {
	n       int    // its length, the cell's end tag included
	formula bool   // it has an <f>
	hasV    bool   // it has a <v>
	inline  bool   // it is an inline string
	text    []byte // the raw text of the <v> or the inline string
}

// matchCell matches b, what follows a cell's start tag, against the usual
// shapes (inline strings only when inline is set); found is false for
// anything else, or when b ends first.
func matchCell(b []byte, inline bool) (m cellMatch, found bool) {
	p := 0
	if hasPrefix(b, tagF) {
		i := bytes.IndexByte(b[len(tagF):], '<')
		if i < 0 {
			return m, false
		}
		p = len(tagF) + i
		if !hasPrefix(b[p:], endF) {
			return m, false
		}
		p += len(endF)
		m.formula = true
	}
	switch {
	case hasPrefix(b[p:], tagV):
		v := b[p+len(tagV):]
		i := bytes.IndexByte(v, '<')
		if i < 0 || !hasPrefix(v[i:], endVC) {
			return m, false
		}
		m.n, m.hasV, m.text = p+len(tagV)+i+len(endVC), true, v[:i]
		return m, true
	case m.formula && hasPrefix(b[p:], endC):
		m.n = p + len(endC)
		return m, true
	case !m.formula && inline && hasPrefix(b, tagIsT):
		p = len(tagIsT)
		switch {
		case hasPrefix(b[p:], gt):
			p++
		case hasPrefix(b[p:], preserveGT):
			p += len(preserveGT)
		default:
			return m, false
		}
		v := b[p:]
		i := bytes.IndexByte(v, '<')
		if i < 0 || !hasPrefix(v[i:], endTIsC) {
			return m, false
		}
		m.n, m.inline, m.text = p+i+len(endTIsC), true, v[:i]
		return m, true
	}
	return m, false
}

// The literal markup quickCell looks for.
const (
	tagF       = "<f>"
	endF       = "</f>"
	tagV       = "<v>"
	endVC      = "</v></c>"
	endC       = "</c>"
	tagIsT     = "<is><t"
	gt         = ">"
	preserveGT = ` xml:space="preserve">`
	endTIsC    = "</t></is></c>"
)

func hasPrefix(b []byte, s string) bool { return len(b) >= len(s) && string(b[:len(s)]) == s }
