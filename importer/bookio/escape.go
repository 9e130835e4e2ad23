package bookio

import (
	"unicode/utf8"
)

// appendEscaped appends s as XML character data (or, with attr, an
// attribute value in double quotes). Characters XML 1.0 does not allow
// (control characters other than tab, line feed and carriage return, and
// U+FFFE, U+FFFF) are written in text as Excel writes them, _xHHHH_, and a
// literal "_xHHHH_" in the text gets its underscore escaped (_x005F_) so
// that it reads back as written; in an attribute they become U+FFFD.
// Bytes that are not UTF-8 become U+FFFD.
func appendEscaped(b []byte, s string, attr bool) []byte {
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			switch {
			case c == '&':
				b = append(b, "&amp;"...)
			case c == '<':
				b = append(b, "&lt;"...)
			case c == '>':
				b = append(b, "&gt;"...)
			case c == '"' && attr:
				b = append(b, "&quot;"...)
			case c == '\t' || c == '\n' || c == '\r':
				if attr {
					b = append(b, "&#"...)
					b = append(b, byte('0'+c/10), byte('0'+c%10), ';')
				} else {
					b = append(b, c)
				}
			case c < 0x20:
				b = appendInvalid(b, rune(c), attr)
			case c == '_' && !attr && escapeLike(s[i:]):
				b = append(b, "_x005F_"...)
			default:
				b = append(b, c)
			}
			i++
			continue
		}
		r, n := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && n == 1:
			b = append(b, "\uFFFD"...)
		case r == 0xFFFE || r == 0xFFFF:
			b = appendInvalid(b, r, attr)
		default:
			b = append(b, s[i:i+n]...)
		}
		i += n
	}
	return b
}

// appendInvalid writes a character XML does not allow.
func appendInvalid(b []byte, r rune, attr bool) []byte {
	if attr {
		return append(b, "\uFFFD"...)
	}
	const hex = "0123456789ABCDEF"
	return append(b, '_', 'x', hex[r>>12&15], hex[r>>8&15], hex[r>>4&15], hex[r&15], '_')
}

// escapeLike reports whether s starts with _xHHHH_, which Excel would read
// as an escaped character.
func escapeLike(s string) bool {
	if len(s) < 7 || s[1] != 'x' || s[6] != '_' {
		return false
	}
	for _, c := range []byte(s[2:6]) {
		if !('0' <= c && c <= '9' || 'a' <= c && c <= 'f' || 'A' <= c && c <= 'F') {
			return false
		}
	}
	return true
}
