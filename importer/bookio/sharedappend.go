package bookio

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"path"
	"strconv"
)

const (
	relSharedStrings = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings"
	ctSharedStrings  = "application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"
	nsMain           = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
)

// AppendShared has texts appended, in order, to the workbook's shared
// strings and returns the index of the first of them, for cells written
// as NewShared. refs is the number of cells that will refer to them: it
// is added to the part's count attribute when the part has one (the
// uniqueCount attribute, when present, becomes the number of strings).
// The existing strings are copied byte for byte; a workbook without
// shared strings gets a new part, its content type and the workbook's
// relationship to it. ok is false, with nothing changed, when the
// strings cannot be appended (the package's shared strings part is not
// named by the workbook's relationships, or a relationship names a part
// the package lacks): the caller writes inline strings instead. It is
// called at most once per edit. Errors: malformed XML in the shared
// strings part, or a second call.
func (e *Edit) AppendShared(texts []string, refs int) (first int, ok bool, err error) {
	if e.sstDone {
		return 0, false, fmt.Errorf("shared strings are appended once per edit")
	}
	if len(texts) == 0 {
		return 0, true, nil
	}
	b := e.b
	switch {
	case b.sstPart == "" && b.sstRel, b.sstPart != "" && !b.sstRel:
		return 0, false, nil
	case b.sstPart == "":
		e.sstDone = true
		name := e.FreeName(path.Join(path.Dir(b.wbPart), "sharedStrings.xml"))
		data := []byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n")
		data = append(data, `<sst xmlns="`+nsMain+`" count="`...)
		data = strconv.AppendInt(data, int64(refs), 10)
		data = append(data, `" uniqueCount="`...)
		data = strconv.AppendInt(data, int64(len(texts)), 10)
		data = append(data, `">`...)
		data = appendSI(data, nil, texts)
		data = append(data, `</sst>`...)
		e.AddPart(name, ctSharedStrings, data)
		e.AddRel(b.wbPart, relSharedStrings, name)
		return 0, true, nil
	}
	n, err := countSI(b, b.sstPart)
	if err != nil {
		return 0, false, err
	}
	e.sstDone = true
	e.Rewrite(b.File(b.sstPart).Name, func(w io.Writer, r io.Reader) error {
		return appendSST(w, r, texts, refs, n)
	})
	return n, true, nil
}

// countSI counts the <si> elements of the shared strings part.
func countSI(b *Book, part string) (int, error) {
	rc, err := b.OpenPart(part)
	if err != nil {
		return 0, err
	}
	defer rc.Close()
	t := NewTok(rc)
	n, depth := 0, 0
	for k := t.Next(); k != TokEOF; k = t.Next() {
		switch k {
		case TokStart:
			if depth == 1 && t.Is("si") {
				n++
			}
			if !t.Empty {
				depth++
			}
		case TokEnd:
			depth--
		}
	}
	if err := t.Err(); err != nil {
		return 0, fmt.Errorf("%s: %v", part, err)
	}
	return n, nil
}

// appendSST copies the shared strings part r to w with texts appended
// before its end and its count attributes updated; n is the number of
// strings r holds.
func appendSST(w io.Writer, r io.Reader, texts []string, refs, n int) error {
	t := NewTok(r)
	t.Verbatim = true
	bw := bufio.NewWriterSize(w, 64<<10)
	depth := 0
	var pfx []byte
	done := false
	for k := t.Next(); k != TokEOF; k = t.Next() {
		switch {
		case k == TokStart && depth == 0:
			if !t.Is("sst") {
				return fmt.Errorf("the shared strings part's root is <%s>, not <sst>", t.Name)
			}
			pfx = rootPrefix(t.Raw)
			tag := t.Raw
			if v, ok := RawAttr(t.Attrs, "count", false); ok {
				c, err := strconv.Atoi(string(bytes.TrimSpace(v)))
				if err != nil || c < 0 {
					c = 0 // a count that is not a number is written anew
				}
				tag = replaceAttr(nil, tag, "count", strconv.Itoa(c+refs))
			}
			if _, ok := RawAttr(t.Attrs, "uniqueCount", false); ok {
				tag = replaceAttr(nil, tag, "uniqueCount", strconv.Itoa(n+len(texts)))
			}
			if t.Empty { // <sst .../>: opened, filled and closed here
				tag = append(tag[:len(tag)-2:len(tag)-2], '>')
				tag = appendSI(tag, pfx, texts)
				tag = append(append(append(tag, "</"...), pfx...), "sst>"...)
				done = true
			} else {
				depth++
			}
			bw.Write(tag)
		case k == TokEnd && depth == 1:
			bw.Write(appendSI(nil, pfx, texts))
			bw.Write(t.Raw)
			depth--
			done = true
		default:
			if k == TokStart && !t.Empty {
				depth++
			} else if k == TokEnd {
				depth--
			}
			bw.Write(t.Raw)
		}
	}
	if err := t.Err(); err != nil {
		return err
	}
	if !done {
		return fmt.Errorf("the shared strings part has no <sst> element")
	}
	return bw.Flush()
}

// rootPrefix is the namespace prefix, with its colon, of the start tag raw
// ("" when none).
func rootPrefix(raw []byte) []byte {
	raw = raw[1:]
	n := 0
	for n < len(raw) && !isSpace(raw[n]) && raw[n] != '>' && raw[n] != '/' {
		n++
	}
	if i := bytes.IndexByte(raw[:n], ':'); i >= 0 {
		return append([]byte(nil), raw[:i+1]...)
	}
	return nil
}

// appendSI appends texts as <si><t>…</t></si> elements with the prefix pfx.
func appendSI(b, pfx []byte, texts []string) []byte {
	for _, s := range texts {
		b = append(append(append(b, '<'), pfx...), "si><"...)
		b = append(append(b, pfx...), 't')
		if s != "" && (isSpace(s[0]) || isSpace(s[len(s)-1])) {
			b = append(b, ` xml:space="preserve"`...)
		}
		b = append(b, '>')
		b = appendEscaped(b, s, false)
		b = append(append(append(b, "</"...), pfx...), "t></"...)
		b = append(append(b, pfx...), "si>"...)
	}
	return b
}
