package bookio

import (
	"bytes"
	"fmt"
	"io"
)

// ReadMerges returns the merged ranges of a worksheet part. They follow the
// cell data, so the part is inflated to its end, but the cell data is only
// searched for its end tag as bytes (no tokens); only the tail after
// </sheetData> is tokenized.
func (b *Book) ReadMerges(s SheetRef) ([]Range, error) {
	if s.Part == "" {
		return nil, nil
	}
	rc, err := b.OpenPart(s.Part)
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
	return mergeCells(NewTok(bytes.NewReader(tail)), s.Part)
}

// Merges returns the merged ranges of the sheet, reading the rest of the
// part: for a reader that can take them after the rows (call it once Next
// has returned false), which saves ReadMerges' pass over the whole part.
// Rows not yet read are skipped. The error is the one that ended the rows,
// if any.
func (s *SheetReader) Merges() ([]Range, error) {
	if s.err != nil {
		return nil, s.err
	}
	ms, err := mergeCells(s.t, s.part)
	if err != nil {
		s.err = err
	}
	return ms, err
}

// mergeCells reads t to its end and returns the ranges of its mergeCell
// elements.
func mergeCells(t *Tok, part string) ([]Range, error) {
	var out []Range
	for k := t.Next(); k != TokEOF; k = t.Next() {
		if k == TokStart && t.Is("mergeCell") {
			ref, _ := t.Attr("ref", false)
			if r, ok := ParseRange(ref); ok {
				out = append(out, r)
			}
			if len(out) > 1<<20 {
				return nil, fmt.Errorf("%s: more than a million merged ranges", part)
			}
		}
	}
	if err := t.Err(); err != nil {
		return nil, fmt.Errorf("%s: %v", part, err)
	}
	return out, nil
}

// The window afterSheetData searches: reads of mergeRead bytes, of which
// the last mergeAhead are looked at again with the next read (a match
// there may need the bytes after it to be decided), with mergeBehind bytes
// before them kept as context (the "</x:" before a name).
const (
	mergeRead   = 256 << 10
	mergeAhead  = 128
	mergeBehind = 64
	mergeTail   = 64 << 20 // the most afterSheetData keeps after the cell data
)

// afterSheetData reads r to its end and returns what follows the sheet
// data (</sheetData>, </x:sheetData>, <sheetData/>); nil when there is
// none. The bytes are searched where they were read, never
// copied, until the end tag is found.
func afterSheetData(r io.Reader) ([]byte, error) {
	// The search is for the name without its first letter: 's' is in
	// nearly every cell (t="s", s="3"), 'h' in few, and a search for a
	// rare first byte runs at the speed of bytes.IndexByte.
	pat := []byte("heetData")
	buf := make([]byte, mergeBehind+mergeAhead+mergeRead)
	n, from := 0, 0 // bytes valid in buf; where the unexamined matches start
	for {
		m, err := io.ReadFull(r, buf[n:])
		n += m
		eof := err == io.EOF || err == io.ErrUnexpectedEOF
		if err != nil && !eof {
			return nil, err
		}
		limit := n // matches at or after limit wait for the next read
		if !eof {
			limit = n - mergeAhead
		}
		for i := from; i < limit; {
			j := bytes.Index(buf[i:n], pat)
			if j < 0 || i+j >= limit {
				break
			}
			if at := i + j - 1; at >= 0 && buf[at] == 's' {
				if end, ok := endTagAt(buf[:n], at, len(pat)+1); ok {
					return readTail(r, buf[end:n], eof)
				}
			}
			i += j + 1
		}
		if eof {
			return nil, nil
		}
		keep := min(n, mergeBehind+mergeAhead)
		copy(buf, buf[n-keep:n])
		n, from = keep, keep-mergeAhead
	}
}

// endTagAt reports whether the name of length k at buf[j:] ends the
// sheet data: an end tag (</sheetData>, </x:sheetData >) or an empty
// element (<sheetData/>, a sheet without cells that may still have merged
// ranges); and where the tag ends.
func endTagAt(buf []byte, j, k int) (int, bool) {
	end := isEndTag(buf, j)
	if !end && !isStartTag(buf, j) {
		return 0, false
	}
	e := j + k
	for e < len(buf) && isSpace(buf[e]) {
		e++
	}
	if !end && e < len(buf) && buf[e] == '/' {
		e++
		end = true
	}
	if end && e < len(buf) && buf[e] == '>' {
		return e + 1, true
	}
	return 0, false
}

// isStartTag reports whether the name at buf[j:] is preceded by "<" or
// "<prefix:".
func isStartTag(buf []byte, j int) bool {
	k := j - 1
	if k >= 0 && buf[k] == ':' {
		k--
		for k >= 0 && buf[k] != '<' && buf[k] != '/' && !isSpace(buf[k]) {
			k--
		}
	}
	return k >= 0 && buf[k] == '<'
}

// readTail is the rest of r after the bytes got, at most mergeTail bytes.
func readTail(r io.Reader, got []byte, eof bool) ([]byte, error) {
	tail := append(make([]byte, 0, len(got)+512), got...)
	if eof {
		return tail, nil
	}
	for {
		if len(tail) == cap(tail) {
			tail = append(tail, 0)[:len(tail)]
		}
		m, err := r.Read(tail[len(tail):cap(tail)])
		tail = tail[:len(tail)+m]
		if len(tail) > mergeTail {
			return nil, fmt.Errorf("the part after its cell data is over %d MB", mergeTail>>20)
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
