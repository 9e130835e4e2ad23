package bookio

import "bytes"

// The shapes nearly every cell of a worksheet has, whoever wrote it:
//
//	<c r="A1" s="3" t="s"><v>12</v></c>                  shared string
//	<c r="B1"><v>1.5</v></c>                              number
//	<c r="C1" s="2"><f>B1*2</f><v>3</v></c>               formula and its result
//	<c r="D1" t="inlineStr"><is><t>kg</t></is></c>        inline string
//
// quickCell reads these straight from the tokenizer's buffer, without a
// token per element; anything else (a prefix, white space between the
// elements, attributes on <v> or <f>, rich text, CDATA, an entity in a
// formula, content longer than the look-ahead) goes the general way,
// readCell, which gives the same cells.

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

// quickCell reads the content of the cell just started, up to its end
// tag, when it has one of the shapes above. handled is false, with
// nothing read, for any other shape; ok is false when the cell was read
// and is not valid (s.err says why).
func (s *SheetReader) quickCell(c *Cell, typ string) (handled, ok bool) {
	t := s.t
	if want := min(quickLook, len(t.buf)); t.end-t.pos < want {
		t.ensure(want)
	}
	b := t.buf[t.pos:t.end]
	p := 0
	formula := false
	if hasPrefix(b, tagF) {
		i := bytes.IndexByte(b[len(tagF):], '<')
		if i < 0 {
			return false, true
		}
		p = len(tagF) + i
		if !hasPrefix(b[p:], endF) {
			return false, true
		}
		p += len(endF)
		formula = true
	}
	switch {
	case hasPrefix(b[p:], tagV):
		v := b[p+len(tagV):]
		i := bytes.IndexByte(v, '<')
		if i < 0 || !hasPrefix(v[i:], endVC) {
			return false, true
		}
		t.pos += p + len(tagV) + i + len(endVC)
		c.Formula = formula
		return true, s.finishCell(c, typ, v[:i], true, "", false)
	case formula && hasPrefix(b[p:], endC):
		t.pos += p + len(endC)
		c.Formula = true
		return true, s.finishCell(c, typ, nil, false, "", false)
	case !formula && typ == "inlineStr" && hasPrefix(b, tagIsT):
		p = len(tagIsT)
		switch {
		case hasPrefix(b[p:], gt):
			p++
		case hasPrefix(b[p:], preserveGT):
			p += len(preserveGT)
		default:
			return false, true
		}
		v := b[p:]
		i := bytes.IndexByte(v, '<')
		if i < 0 || !hasPrefix(v[i:], endTIsC) {
			return false, true
		}
		text := s.texts.get(v[:i])
		t.pos += p + i + len(endTIsC)
		return true, s.finishCell(c, typ, nil, false, text, true)
	}
	return false, true
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
