package bookio

import (
	"bytes"
	"math"
	"strconv"
	"unicode/utf8"
)

// textTable hands out the strings of a sheet's cell texts, one string per
// distinct short text: a column of fuel names or units repeats a handful
// of values down a hundred thousand rows, and allocating each again would
// be most of the reader's garbage. The table holds at most textTableSize
// entries of at most textTableLen bytes; when it is full it starts afresh,
// so that a column of unique values (invoice numbers) cannot keep the
// repeating ones out for long. Its zero value is ready to use.
type textTable struct{ m map[string]string }

const (
	textTableLen  = 64
	textTableSize = 4096
)

// get decodes raw cell text (entities, invalid UTF-8) as Unescape does.
func (x *textTable) get(raw []byte) string {
	if len(raw) > textTableLen {
		return Unescape(raw)
	}
	if s, ok := x.m[string(raw)]; ok {
		return s
	}
	var s string
	if bytes.IndexByte(raw, '&') < 0 && utf8.Valid(raw) {
		s = string(raw)
	} else {
		s = Unescape(raw)
	}
	if x.m == nil {
		x.m = make(map[string]string, 256)
	} else if len(x.m) >= textTableSize {
		clear(x.m)
	}
	if s == string(raw) {
		x.m[s] = s
	} else {
		x.m[string(raw)] = s
	}
	return s
}

// parseNumber reads the number of a cell's <v> as strconv.ParseFloat
// reads it (64 bits). Short plain decimals (-12.5, 45658: at most 15
// digits, no exponent), which are most numbers in a sheet, are read
// directly: their digits make an integer below 2^53 and the power of ten
// is at most 1e15, both exact as float64, so the one division is rounded
// correctly, giving what ParseFloat gives. Anything else goes to
// ParseFloat.
func parseNumber(b []byte) (float64, error) {
	neg := false
	i := 0
	if len(b) > 0 && b[0] == '-' {
		neg, i = true, 1
	}
	var m uint64
	digits, frac, dot := 0, 0, false
	for ; i < len(b); i++ {
		c := b[i]
		switch {
		case c >= '0' && c <= '9':
			m = m*10 + uint64(c-'0')
			digits++
			if dot {
				frac++
			}
		case c == '.' && !dot:
			dot = true
		default:
			return strconv.ParseFloat(string(b), 64)
		}
	}
	if digits == 0 || digits > 15 {
		return strconv.ParseFloat(string(b), 64)
	}
	f := float64(m)
	if frac > 0 {
		f /= math.Pow10(frac)
	}
	if neg {
		f = -f
	}
	return f, nil
}
