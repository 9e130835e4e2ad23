package bookio

import (
	"bytes"
	"errors"
	"io"
	"strconv"
)

// Tok is a small pull tokenizer for the XML parts of a workbook. It is
// much faster than encoding/xml on worksheet data because it allocates
// nothing per token: names, attributes and text are slices of its buffer,
// valid until the next call of Next. It understands start, end and empty
// tags, text, CDATA, comments and processing instructions; it refuses a
// DOCTYPE (workbook parts never have one, and skipping it safely would need
// a full parser). Element and attribute names are compared by local name, so
// prefixed parts (<x:row>) read like unprefixed ones.
type Tok struct {
	r   io.Reader
	buf []byte
	pos int // next unread byte
	end int // bytes valid in buf
	eof bool
	err error
	max int // largest token accepted, bytes

	// The current token; the slices point into the buffer and are valid
	// until the next call of Next.
	Kind  TokKind
	Name  []byte // local name of a start or end tag
	Attrs []byte // raw attribute text of a start tag
	Empty bool   // start tag closed with "/>"
	Text  []byte // raw text (entities not decoded) or CDATA content
	CDATA bool
	Raw   []byte // the token as it is in the input, for copying it through

	// Verbatim makes Next return comments, processing instructions and
	// the XML declaration as TokOther tokens (with Raw) instead of
	// skipping them: a rewriter copies them through.
	Verbatim bool

	text []byte // CollectText's buffer, reused from element to element
}

// TokKind is the kind of a token.
type TokKind uint8

// The kinds of tokens: TokOther (a comment, processing instruction or the
// XML declaration) only in Verbatim mode.
const (
	TokEOF TokKind = iota
	TokStart
	TokEnd
	TokText
	TokOther
)

// ErrXML marks malformed XML.
var ErrXML = errors.New("malformed XML")

const (
	tokBufSize = 64 << 10
	tokMax     = 64 << 20
)

func NewTok(r io.Reader) *Tok { return NewTokSize(r, tokBufSize) }

// NewTokSize starts with a buffer of size bytes (tests use tiny ones to
// put every token across a buffer boundary).
func NewTokSize(r io.Reader, size int) *Tok {
	return &Tok{r: r, buf: make([]byte, max(size, 16)), max: tokMax}
}

// fill moves the unread bytes to the front of the buffer and reads more,
// growing the buffer when it is full. It reports whether new bytes arrived.
func (t *Tok) fill() bool {
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
func (t *Tok) ensure(n int) bool {
	for t.end-t.pos < n {
		if !t.fill() {
			return false
		}
	}
	return true
}

// find returns the offset (from pos) of pat at or after offset from,
// reading more input as needed; -1 when the input ends first.
func (t *Tok) find(from int, pat []byte) int {
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

// Next reads the next token; TokEOF at the end of input or on an error
// (see Err).
func (t *Tok) Next() TokKind {
	for {
		if t.pos >= t.end && !t.fill() {
			t.Kind = TokEOF
			return TokEOF
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
			if t.Verbatim {
				return t.other(i + 2)
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
				if t.Verbatim {
					return t.other(i + 3)
				}
				t.pos += i + 3
				continue
			case bytes.HasPrefix(rest, patCDATA):
				i := t.find(len(patCDATA), patCDATAEnd)
				if i < 0 {
					return t.malformed()
				}
				t.Text = t.buf[t.pos+len(patCDATA) : t.pos+i]
				t.Raw = t.buf[t.pos : t.pos+i+3]
				t.CDATA = true
				t.pos += i + 3
				t.Kind = TokText
				return TokText
			}
			t.err = errors.New("the XML holds a DOCTYPE or other declaration, which workbook parts never have")
			t.Kind = TokEOF
			return TokEOF
		case '/':
			i := t.find(2, []byte{'>'})
			if i < 0 {
				return t.malformed()
			}
			t.Name = localName(bytes.TrimSpace(t.buf[t.pos+2 : t.pos+i]))
			t.Raw = t.buf[t.pos : t.pos+i+1]
			t.pos += i + 1
			t.Kind = TokEnd
			return TokEnd
		}
		return t.readStart()
	}
}

// other returns the n bytes at pos as a TokOther token.
func (t *Tok) other(n int) TokKind {
	t.Raw = t.buf[t.pos : t.pos+n]
	t.pos += n
	t.Kind = TokOther
	return TokOther
}

func (t *Tok) malformed() TokKind {
	if t.err == nil {
		t.err = ErrXML
	}
	t.Kind = TokEOF
	return TokEOF
}

func (t *Tok) readText() TokKind {
	from := 0
	for {
		if i := bytes.IndexByte(t.buf[t.pos+from:t.end], '<'); i >= 0 {
			t.Text = t.buf[t.pos : t.pos+from+i]
			t.Raw = t.Text
			t.pos += from + i
			break
		}
		from = t.end - t.pos
		if !t.fill() {
			t.Text = t.buf[t.pos:t.end]
			t.Raw = t.Text
			t.pos = t.end
			break
		}
	}
	t.CDATA = false
	t.Kind = TokText
	return TokText
}

// readStart reads a start tag; '>' inside quoted attribute values is legal.
func (t *Tok) readStart() TokKind {
	off := 1
	var quote byte // the quote of the value the scan is in, 0 outside one
	for {
		b := t.buf[t.pos:t.end]
		for off < len(b) {
			if quote != 0 {
				j := bytes.IndexByte(b[off:], quote)
				if j < 0 {
					off = len(b)
					break
				}
				off += j + 1
				quote = 0
				continue
			}
			c := b[off]
			if c == '"' || c == '\'' {
				quote = c
			} else if c == '>' {
				return t.startTag(off)
			}
			off++
		}
		if !t.fill() {
			return t.malformed()
		}
	}
}

// startTag makes the start tag that ends with the '>' at pos+off the
// current token.
func (t *Tok) startTag(off int) TokKind {
	tag := t.buf[t.pos+1 : t.pos+off]
	t.Empty = len(tag) > 0 && tag[len(tag)-1] == '/'
	if t.Empty {
		tag = tag[:len(tag)-1]
	}
	n := 0
	for n < len(tag) && !isSpace(tag[n]) {
		n++
	}
	if n == 0 {
		return t.malformed()
	}
	t.Name = localName(tag[:n])
	t.Attrs = tag[n:]
	t.Raw = t.buf[t.pos : t.pos+off+1]
	t.pos += off + 1
	t.Kind = TokStart
	return TokStart
}

func isSpace(c byte) bool { return c == ' ' || c == '\t' || c == '\n' || c == '\r' }

func localName(b []byte) []byte {
	if i := bytes.LastIndexByte(b, ':'); i >= 0 {
		return b[i+1:]
	}
	return b
}

// Is reports whether the current token's local name is name.
func (t *Tok) Is(name string) bool { return string(t.Name) == name }

// Err returns the tokenizer's error, if any.
func (t *Tok) Err() error { return t.err }

// Attr returns the decoded value of the attribute with the given local
// name (prefix ignored unless prefixed is set, which requires a prefix, as
// for r:id) of the current start tag.
func (t *Tok) Attr(name string, prefixed bool) (string, bool) {
	v, ok := RawAttr(t.Attrs, name, prefixed)
	if !ok {
		return "", false
	}
	return Unescape(v), true
}

// CollectText reads up to the end tag of the element just started (whose
// local name is name) and returns its text. With inner set, only text inside
// elements of that local name counts (the <t> runs of a shared or inline
// string; white space between elements is not content). Text inside elements
// named skip (rPh, phonetic runs) is left out.
func (t *Tok) CollectText(name, inner, skip string) (string, error) {
	raw, err := t.collect(name, inner, skip, true)
	if err != nil {
		return "", err
	}
	return Unescape(raw), nil
}

// SkipElement reads up to the end tag of the element just started (whose
// local name is name), as CollectText does, without keeping its text.
func (t *Tok) SkipElement(name string) error {
	_, err := t.collect(name, "", "", false)
	return err
}

// collect is CollectText before decoding: the raw text, CDATA sections
// escaped, in a buffer of the tokenizer's that the next call reuses. With
// keep unset it gathers nothing.
func (t *Tok) collect(name, inner, skip string, keep bool) ([]byte, error) {
	sb := t.text[:0]
	defer func() { t.text = sb[:0] }()
	depth, skipAt, innerAt := 0, -1, -1
	for {
		switch t.Next() {
		case TokEOF:
			if t.err != nil {
				return nil, t.err
			}
			return nil, ErrXML
		case TokText:
			if keep && skipAt < 0 && (inner == "" || innerAt >= 0) {
				if t.CDATA {
					sb = appendCDATA(sb, t.Text)
				} else {
					sb = append(sb, t.Text...)
				}
			}
		case TokStart:
			if t.Empty {
				continue
			}
			depth++
			if skipAt < 0 && skip != "" && t.Is(skip) {
				skipAt = depth
			}
			if innerAt < 0 && inner != "" && t.Is(inner) {
				innerAt = depth
			}
		case TokEnd:
			if depth == 0 {
				if !t.Is(name) {
					return nil, ErrXML
				}
				return sb, nil
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
