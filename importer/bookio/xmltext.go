package bookio

import (
	"bytes"
	"strconv"
	"strings"
	"unicode/utf8"
)

// The attributes and text of the tokens: raw attribute values found
// without decoding, and text decoded.

// RawAttr finds an attribute in raw attribute text without decoding it.
func RawAttr(a []byte, name string, prefixed bool) ([]byte, bool) {
	for i := 0; ; {
		full, val, next, ok := nextAttr(a, i)
		if !ok {
			return nil, false
		}
		i = next
		local, hasPrefix := full, false
		if c := bytes.IndexByte(full, ':'); c >= 0 {
			local, hasPrefix = full[c+1:], true
		}
		if string(local) == name && prefixed == hasPrefix {
			return val, true
		}
	}
}

// nextAttr reads the attribute of raw attribute text a that starts at or
// after offset i: its full name, its raw value and the offset after it. ok
// is false at the end of a and where the text stops being name="value"
// pairs (what follows is then never read, by RawAttr either).
func nextAttr(a []byte, i int) (name, val []byte, next int, ok bool) {
	for i < len(a) && isSpace(a[i]) {
		i++
	}
	start := i
	for i < len(a) && a[i] != '=' && !isSpace(a[i]) {
		i++
	}
	name = a[start:i]
	for i < len(a) && isSpace(a[i]) {
		i++
	}
	if i >= len(a) || a[i] != '=' {
		return nil, nil, 0, false
	}
	i++
	for i < len(a) && isSpace(a[i]) {
		i++
	}
	if i >= len(a) || (a[i] != '"' && a[i] != '\'') {
		return nil, nil, 0, false
	}
	q := a[i]
	i++
	vs := i
	if n := bytes.IndexByte(a[i:], q); n >= 0 {
		return name, a[vs : i+n], i + n + 1, true
	}
	return nil, nil, 0, false
}

// Unescape decodes the five predefined entities and character references.
// Text that is not valid UTF-8 or holds a malformed reference is kept as
// written, with invalid bytes replaced.
func Unescape(b []byte) string {
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

// appendCDATA appends the content of a CDATA section to raw text, its
// ampersands escaped, so that decoding the whole gives it back as written.
func appendCDATA(b, cdata []byte) []byte {
	for {
		i := bytes.IndexByte(cdata, '&')
		if i < 0 {
			return append(b, cdata...)
		}
		b = append(append(b, cdata[:i]...), "&amp;"...)
		cdata = cdata[i+1:]
	}
}
