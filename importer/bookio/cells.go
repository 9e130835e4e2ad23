package bookio

import (
	"strconv"
	"strings"
)

// Worksheet bounds (Excel's): the last column (XFD) and the last row.
const (
	MaxCol = 16384
	MaxRow = 1048576
)

// CellKind says what a cell holds.
type CellKind uint8

// The kinds of cells.
const (
	Empty  CellKind = iota
	Number          // a number (or a formula with a numeric cached value)
	Text            // a string (shared, inline or a formula's string result)
	Bool
	Error // an error value such as #DIV/0!
)

// Cell is one worksheet cell as read.
type Cell struct {
	Col     int // 1-based column
	Kind    CellKind
	Num     float64 // for Number
	Text    string  // for Text, Error; the raw value for Bool
	Formula bool    // the cell holds a formula
	NoCache bool    // a formula whose file holds no cached value
	Style   int     // the cell's style (index into cellXfs), 0 when it names none
}

// Row is one row of cells in column order; Num is 1-based.
type Row struct {
	Num   int
	Cells []Cell
}

// ColName is the column letter(s) of a 1-based column.
func ColName(col int) string {
	var b [4]byte
	i := len(b)
	for col > 0 {
		col--
		i--
		b[i] = byte('A' + col%26)
		col /= 26
	}
	return string(b[i:])
}

// appendColName appends the column letters of col to b.
func appendColName(b []byte, col int) []byte {
	var tmp [4]byte
	i := len(tmp)
	for col > 0 {
		col--
		i--
		tmp[i] = byte('A' + col%26)
		col /= 26
	}
	return append(b, tmp[i:]...)
}

// CellRef is "B7" for column 2, row 7.
func CellRef(col, row int) string { return ColName(col) + strconv.Itoa(row) }

// ParseRef reads "AB12" (optionally with $ signs) into column and row.
func ParseRef(s string) (col, row int, ok bool) {
	i := 0
	for i < len(s) && s[i] == '$' {
		i++
	}
	for ; i < len(s); i++ {
		c := s[i]
		if c >= 'a' && c <= 'z' {
			c -= 'a' - 'A'
		}
		if c < 'A' || c > 'Z' {
			break
		}
		col = col*26 + int(c-'A'+1)
		if col > MaxCol {
			return 0, 0, false
		}
	}
	if col == 0 {
		return 0, 0, false
	}
	if i < len(s) && s[i] == '$' {
		i++
	}
	if i == len(s) {
		return 0, 0, false
	}
	for ; i < len(s); i++ {
		c := s[i]
		if c < '0' || c > '9' {
			return 0, 0, false
		}
		row = row*10 + int(c-'0')
		if row > MaxRow {
			return 0, 0, false
		}
	}
	return col, row, row > 0
}

// parseCol reads the column letters at the start of a reference ("AB12"
// gives 28); 0 when there are none or they pass the last column.
func parseCol(b []byte) int {
	col := 0
	for _, c := range b {
		if c >= 'a' && c <= 'z' {
			c -= 'a' - 'A'
		}
		if c < 'A' || c > 'Z' {
			break
		}
		col = col*26 + int(c-'A'+1)
		if col > MaxCol {
			return 0
		}
	}
	return col
}

// Range is a rectangle of cells, 1-based and inclusive.
type Range struct{ C1, R1, C2, R2 int }

// ParseRange reads "A1:C9" or "B2".
func ParseRange(s string) (Range, bool) {
	a, b, found := strings.Cut(s, ":")
	c1, r1, ok := ParseRef(a)
	if !ok {
		return Range{}, false
	}
	if !found {
		return Range{c1, r1, c1, r1}, true
	}
	c2, r2, ok := ParseRef(b)
	if !ok {
		return Range{}, false
	}
	return Range{min(c1, c2), min(r1, r2), max(c1, c2), max(r1, r2)}, true
}

func (r Range) String() string {
	return CellRef(r.C1, r.R1) + ":" + CellRef(r.C2, r.R2)
}
