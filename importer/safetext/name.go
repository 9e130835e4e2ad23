package safetext

import (
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// unsafeRune reports whether r must not reach a terminal as it is: C0 and
// C1 control characters and DEL (line breaks, escape sequences), the
// bidirectional overrides and isolates that reorder what is shown
// (U+202A-U+202E, U+2066-U+2069), the line and paragraph separators, and
// the byte-order mark.
func unsafeRune(r rune) bool {
	switch {
	case unicode.IsControl(r):
		return true
	case r >= 0x202A && r <= 0x202E, r >= 0x2066 && r <= 0x2069:
		return true
	case r == 0x2028, r == 0x2029, r == 0xFEFF:
		return true
	}
	return false
}

// needsQuote reports whether s holds invalid UTF-8 or an unsafe rune.
func needsQuote(s string) bool {
	for i, r := range s {
		if r == utf8.RuneError {
			if _, n := utf8.DecodeRuneInString(s[i:]); n == 1 {
				return true
			}
		}
		if unsafeRune(r) {
			return true
		}
	}
	return false
}

// Name returns a file name (or any short untrusted text) as it should be
// shown in a one-line message: unchanged when it is valid UTF-8 without
// control characters, else in Go double-quoted form (strconv.Quote), so
// that "a\nb.xlsx" shows as "a\nb.xlsx" on one line and an escape sequence
// cannot reach the terminal.
func Name(s string) string {
	if !needsQuote(s) {
		return s
	}
	return strconv.Quote(s)
}

// Line returns a message with every unsafe rune and invalid byte escaped
// (\n, \x1b, \u202e, \xff), so that it stays one line and shows what it
// says; other text, including non-ASCII letters, is unchanged.
func Line(s string) string {
	if !needsQuote(s) {
		return s
	}
	var b strings.Builder
	for i, r := range s {
		if r == utf8.RuneError {
			if _, n := utf8.DecodeRuneInString(s[i:]); n == 1 {
				b.WriteString(`\x` + strconv.FormatUint(uint64(s[i])|0x100, 16)[1:])
				continue
			}
		}
		if unsafeRune(r) {
			q := strconv.QuoteRuneToASCII(r)
			b.WriteString(q[1 : len(q)-1])
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// Cut returns s cut to at most n bytes without splitting a UTF-8
// character, with "..." in place of what was cut (the result is then at
// most n bytes, "..." included). n below 4 is taken as 4.
func Cut(s string, n int) string {
	if len(s) <= n {
		return s
	}
	n = max(n, 4) - 3
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n] + "..."
}
