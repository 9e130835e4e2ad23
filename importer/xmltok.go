package importer

import (
	"bytes"
	"errors"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"
)

// xmlTok is a small pull tokenizer for the XML parts of a workbook. It is
// much faster than encoding/xml on worksheet data because it allocates
// nothing per token: names, attributes and text are slices of its buffer,
// valid until the next call of next. It understands start, end and empty
// tags, text, CDATA, comments and processing instructions; it refuses a
// DOCTYPE (workbook parts never have one, and skipping it safely would need
// a full parser). Element and attribute names are compared by local name, so
// prefixed parts (<x:row>) read like unprefixed ones.
type xmlTok struct {
	r   io.Reader
	buf []byte
	pos int // next unread byte
	end int // bytes valid in buf
	eof bool
	err error
	max int // largest token accepted, bytes

	kind  tokKind
	name  []byte // local name of a start or end tag
	attrs []byte // raw attribute text of a start tag
	empty bool   // start tag closed with "/>"
	text  []byte // raw text (entities not decoded) or CDATA content
	cdata bool
}

type tokKind uint8

const (
	tokEOF tokKind = iota
	tokStart
	tokEnd
	tokText
)

// errXML marks malformed XML.
var errXML = errors.New("malformed XML")

const (
	tokBufSize = 64 << 10
	tokMax     = 64 << 20
)

func newXMLTok(r io.Reader) *xmlTok { return newXMLTokSize(r, tokBufSize) }

// newXMLTokSize starts with a buffer of size bytes (tests use tiny ones to
// put every token across a buffer boundary).
func newXMLTokSize(r io.Reader, size int) *xmlTok {
	return &xmlTok{r: r, buf: make([]byte, max(size, 16)), max: tokMax}
}

// fill moves the unread bytes to the front of the buffer and reads more,
// growing the buffer when it is full. It reports whether new bytes arrived.
func (t *xmlTok) fill() bool {
	if t.eof || t.err != nil {
		return false
	}
	if t.pos > 0 {
		n := copy(t.buf, t.buf[t.pos:t.end])
		t.pos, t.end = 0, n
	}
	if t.end == len(t.buf) {
		if len(t.buf) >= t.max {
			t.err = errors.New("an XML token is larger than " + strconv.Itoa(t.max>>20) + " MB")
			return false
		}
		nb := make([]byte, 2*len(t.buf))
		copy(nb, t.buf[:t.end])
		t.buf = nb
	}
	for {
		n, err := t.r.Read(t.buf[t.end:])
		t.end += n
		if err != nil {
			if err == io.EOF {
				t.eof = true
			} else {
				t.err = err
			}
			return n > 0
		}
		if n > 0 {
			return true
		}
	}
}

// ensure makes at least n unread bytes available if the input has them.
func (t *xmlTok) ensure(n int) bool {
	for t.end-t.pos < n {
		if !t.fill() {
			return false
		}
	}
	return true
}

// find returns the offset (from pos) of pat at or after offset from,
// reading more input as needed; -1 when the input ends first.
func (t *xmlTok) find(from int, pat []byte) int {
	for {
		if i := bytes.Index(t.buf[t.pos+from:t.end], pat); i >= 0 {
			return from + i
		}
		from = max(0, t.end-t.pos-len(pat)+1)
		if !t.fill() {
			return -1
		}
	}
}

var (
	patPIEnd      = []byte("?>")
	patCommentEnd = []byte("-->")
	patCDATAEnd   = []byte("]]>")
	patCDATA      = []byte("<![CDATA[")
)

// next reads the next token; tokEOF at the end of input or on an error
// (see fail).
func (t *xmlTok) next() tokKind {
	for {
		if t.pos >= t.end && !t.fill() {
			t.kind = tokEOF
			return tokEOF
		}
		if t.buf[t.pos] != '<' {
			return t.readText()
		}
		if !t.ensure(2) {
			return t.malformed()
		}
		switch t.buf[t.pos+1] {
		case '?':
			i := t.find(2, patPIEnd)
			if i < 0 {
				return t.malformed()
			}
			t.pos += i + 2
			continue
		case '!':
			t.ensure(9)
			rest := t.buf[t.pos:t.end]
			switch {
			case bytes.HasPrefix(rest, []byte("<!--")):
				i := t.find(4, patCommentEnd)
				if i < 0 {
					return t.malformed()
				}
				t.pos += i + 3
				continue
			case bytes.HasPrefix(rest, patCDATA):
				i := t.find(len(patCDATA), patCDATAEnd)
				if i < 0 {
					return t.malformed()
				}
				t.text = t.buf[t.pos+len(patCDATA) : t.pos+i]
				t.cdata = true
				t.pos += i + 3
				t.kind = tokText
				return tokText
			}
			t.err = errors.New("the XML holds a DOCTYPE or other declaration, which workbook parts never have")
			t.kind = tokEOF
			return tokEOF
		case '/':
			i := t.find(2, []byte{'>'})
			if i < 0 {
				return t.malformed()
			}
			t.name = localName(bytes.TrimSpace(t.buf[t.pos+2 : t.pos+i]))
			t.pos += i + 1
			t.kind = tokEnd
			return tokEnd
		}
		return t.readStart()
	}
}

func (t *xmlTok) malformed() tokKind {
	if t.err == nil {
		t.err = errXML
	}
	t.kind = tokEOF
	return tokEOF
}

func (t *xmlTok) readText() tokKind {
	from := 0
	for {
		if i := bytes.IndexByte(t.buf[t.pos+from:t.end], '<'); i >= 0 {
			t.text = t.buf[t.pos : t.pos+from+i]
			t.pos += from + i
			break
		}
		from = t.end - t.pos
		if !t.fill() {
			t.text = t.buf[t.pos:t.end]
			t.pos = t.end
			break
		}
	}
	t.cdata = false
	t.kind = tokText
	return tokText
}

// readStart reads a start tag; '>' inside quoted attribute values is legal.
func (t *xmlTok) readStart() tokKind {
	off := 1
	var quote byte
	for {
		for ; t.pos+off < t.end; off++ {
			c := t.buf[t.pos+off]
			switch {
			case quote != 0:
				if c == quote {
					quote = 0
				}
			case c == '"' || c == '\'':
				quote = c
			case c == '>':
				tag := t.buf[t.pos+1 : t.pos+off]
				t.empty = len(tag) > 0 && tag[len(tag)-1] == '/'
				if t.empty {
					tag = tag[:len(tag)-1]
				}
				n := 0
				for n < len(tag) && !isSpace(tag[n]) {
					n++
				}
				if n == 0 {
					return t.malformed()
				}
				t.name = localName(tag[:n])
				t.attrs = tag[n:]
				t.pos += off + 1
				t.kind = tokStart
				return tokStart
			}
		}
		if !t.fill() {
			return t.malformed()
		}
	}
}

func isSpace(c byte) bool { return c == ' ' || c == '\t' || c == '\n' || c == '\r' }

func localName(b []byte) []byte {
	if i := bytes.LastIndexByte(b, ':'); i >= 0 {
		return b[i+1:]
	}
	return b
}

// is reports whether the current token's local name is name.
func (t *xmlTok) is(name string) bool { return string(t.name) == name }

// fail returns the tokenizer's error, if any.
func (t *xmlTok) fail() error { return t.err }

// attr returns the decoded value of the attribute with the given local
// name (prefix ignored unless prefixed is set, which requires a prefix, as
// for r:id) of the current start tag.
func (t *xmlTok) attr(name string, prefixed bool) (string, bool) {
	v, ok := rawAttr(t.attrs, name, prefixed)
	if !ok {
		return "", false
	}
	return unescape(v), true
}

// rawAttr finds an attribute in raw attribute text without decoding it.
func rawAttr(a []byte, name string, prefixed bool) ([]byte, bool) {
	i := 0
	for i < len(a) {
		for i < len(a) && isSpace(a[i]) {
			i++
		}
		start := i
		for i < len(a) && a[i] != '=' && !isSpace(a[i]) {
			i++
		}
		full := a[start:i]
		for i < len(a) && isSpace(a[i]) {
			i++
		}
		if i >= len(a) || a[i] != '=' {
			return nil, false
		}
		i++
		for i < len(a) && isSpace(a[i]) {
			i++
		}
		if i >= len(a) || (a[i] != '"' && a[i] != '\'') {
			return nil, false
		}
		q := a[i]
		i++
		vs := i
		for i < len(a) && a[i] != q {
			i++
		}
		if i >= len(a) {
			return nil, false
		}
		val := a[vs:i]
		i++
		local, hasPrefix := full, false
		if c := bytes.IndexByte(full, ':'); c >= 0 {
			local, hasPrefix = full[c+1:], true
		}
		if string(local) == name && prefixed == hasPrefix {
			return val, true
		}
	}
	return nil, false
}

// unescape decodes the five predefined entities and character references.
// Text that is not valid UTF-8 or holds a malformed reference is kept as
// written, with invalid bytes replaced.
func unescape(b []byte) string {
	if bytes.IndexByte(b, '&') < 0 {
		if utf8.Valid(b) {
			return string(b)
		}
		return strings.ToValidUTF8(string(b), "\uFFFD")
	}
	var sb strings.Builder
	sb.Grow(len(b))
	for len(b) > 0 {
		i := bytes.IndexByte(b, '&')
		if i < 0 {
			sb.Write(b)
			break
		}
		sb.Write(b[:i])
		b = b[i:]
		j := bytes.IndexByte(b, ';')
		if j < 0 || j > 12 {
			sb.WriteByte('&')
			b = b[1:]
			continue
		}
		ent := b[1:j]
		switch string(ent) {
		case "lt":
			sb.WriteByte('<')
		case "gt":
			sb.WriteByte('>')
		case "amp":
			sb.WriteByte('&')
		case "quot":
			sb.WriteByte('"')
		case "apos":
			sb.WriteByte('\'')
		default:
			r, ok := charRef(ent)
			if !ok {
				sb.Write(b[:j+1])
			} else {
				sb.WriteRune(r)
			}
		}
		b = b[j+1:]
	}
	return strings.ToValidUTF8(sb.String(), "\uFFFD")
}

func charRef(ent []byte) (rune, bool) {
	if len(ent) < 2 || ent[0] != '#' {
		return 0, false
	}
	var n uint64
	var err error
	if ent[1] == 'x' || ent[1] == 'X' {
		n, err = strconv.ParseUint(string(ent[2:]), 16, 32)
	} else {
		n, err = strconv.ParseUint(string(ent[1:]), 10, 32)
	}
	if err != nil || n > utf8.MaxRune {
		return 0, false
	}
	return rune(n), true
}

// collectText reads up to the end tag of the element just started (whose
// local name is name) and returns its text. With inner set, only text inside
// elements of that local name counts (the <t> runs of a shared or inline
// string; white space between elements is not content). Text inside elements
// named skip (rPh, phonetic runs) is left out.
func (t *xmlTok) collectText(name, inner, skip string) (string, error) {
	var sb []byte
	depth, skipAt, innerAt := 0, -1, -1
	for {
		switch t.next() {
		case tokEOF:
			if t.err != nil {
				return "", t.err
			}
			return "", errXML
		case tokText:
			if skipAt < 0 && (inner == "" || innerAt >= 0) {
				if t.cdata {
					sb = append(sb, bytes.ReplaceAll(t.text, []byte("&"), []byte("&amp;"))...)
				} else {
					sb = append(sb, t.text...)
				}
			}
		case tokStart:
			if t.empty {
				continue
			}
			depth++
			if skipAt < 0 && skip != "" && t.is(skip) {
				skipAt = depth
			}
			if innerAt < 0 && inner != "" && t.is(inner) {
				innerAt = depth
			}
		case tokEnd:
			if depth == 0 {
				if !t.is(name) {
					return "", errXML
				}
				return unescape(sb), nil
			}
			if depth == skipAt {
				skipAt = -1
			}
			if depth == innerAt {
				innerAt = -1
			}
			depth--
		}
	}
}
