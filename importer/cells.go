package importer

import (
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/bookio"
)

// cellKind says what a cell holds.
type cellKind uint8

const (
	kEmpty  cellKind = iota
	kNumber          // a number (or a formula with a numeric cached value)
	kText            // a string (shared, inline or a formula's string result)
	kBool
	kError // an error value such as #DIV/0!
)

// cell is one worksheet or CSV cell as read.
type cell struct {
	col     int // 1-based column
	kind    cellKind
	num     float64 // for kNumber
	text    string  // for kText, kError; the raw value for kBool
	formula bool    // the cell holds a formula
	noCache bool    // a formula whose file holds no cached value
}

// row is one row of cells in column order; num is 1-based.
type row struct {
	num   int
	cells []cell
}

// blank reports whether the row has no value and no formula.
func (r *row) blank() bool {
	for i := range r.cells {
		if !r.cells[i].isBlank() {
			return false
		}
	}
	return true
}

// isBlank reports a cell that shows nothing: no value, or only spaces. A
// formula without a stored result is not blank (its value is unknown until
// evaluated); a formula whose stored result is "" (=IF(B2="","",B2*2)) is.
func (c *cell) isBlank() bool {
	if c.noCache {
		return false
	}
	return c.kind == kEmpty || c.kind == kText && strings.TrimSpace(c.text) == ""
}

// at returns the cell in column col, or an empty cell.
func (r *row) at(col int) cell {
	// Cells are sorted by column; rows are short, a linear scan is fastest.
	for i := range r.cells {
		if r.cells[i].col == col {
			return r.cells[i]
		}
		if r.cells[i].col > col {
			break
		}
	}
	return cell{col: col}
}

// display is the cell as a short string for messages.
func (c cell) display() string {
	switch c.kind {
	case kNumber:
		return funcs.FormatNumber(c.num)
	case kEmpty:
		if c.noCache {
			return "(formula without a stored result)"
		}
		return "(empty)"
	}
	return c.text
}

// textNumber reads a number stored as text: plain decimals, thousands
// separators (1,250.5 or 1 250,5 or 1.250,5), a decimal comma when it cannot
// be a thousands separator (12,5), accounting negatives (1,250.5) and a
// trailing percent sign (35 % gives 0.35). ok is false for anything else;
// ambiguous is set for a value such as 1,250 that reads as 1250 with a
// thousands comma but as 1.25 with a decimal comma: it is never guessed.
func textNumber(s string) (v float64, ok, ambiguous bool) {
	s = strings.TrimSpace(s)
	if s == "" || len(s) > 64 {
		return 0, false, false
	}
	if f, isNum := funcs.ParseNumber(s); isNum {
		return f, true, false
	}
	neg := false
	if strings.HasPrefix(s, "(") && strings.HasSuffix(s, ")") {
		neg, s = true, strings.TrimSpace(s[1:len(s)-1])
	}
	pct := false
	if strings.HasSuffix(s, "%") {
		pct, s = true, strings.TrimSpace(strings.TrimSuffix(s, "%"))
	}
	if strings.HasPrefix(s, "-") || strings.HasPrefix(s, "+") {
		if neg {
			return 0, false, false
		}
		neg, s = s[0] == '-', strings.TrimSpace(s[1:])
	}
	// Spaces (also no-break and narrow no-break) are thousands separators.
	s = dropSeparators(s)
	if s == "" {
		return 0, false, false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= '0' && c <= '9' || c == '.' || c == ',') {
			return 0, false, false
		}
	}
	dot, comma := strings.Count(s, "."), strings.Count(s, ",")
	var plain string
	switch {
	case comma == 0 && dot <= 1:
		plain = s
	case comma > 0 && dot > 0:
		// Both: the last one is the decimal mark, the other groups thousands.
		lastDot, lastComma := strings.LastIndexByte(s, '.'), strings.LastIndexByte(s, ',')
		dec, thou := byte('.'), ","
		if lastComma > lastDot {
			dec, thou = ',', "."
		}
		if strings.Count(s, string(dec)) != 1 {
			return 0, false, false
		}
		i := strings.LastIndexByte(s, dec)
		if !grouped(s[:i], thou) {
			return 0, false, false
		}
		plain = strings.ReplaceAll(s[:i], thou, "") + "." + s[i+1:]
	case comma > 0:
		// Only commas: groups of three (1,250,000) are thousands, except one
		// group which could also be a decimal comma (1,250).
		if grouped(s, ",") {
			if comma == 1 {
				return 0, false, true
			}
			plain = strings.ReplaceAll(s, ",", "")
		} else if comma == 1 {
			plain = strings.Replace(s, ",", ".", 1)
		} else {
			return 0, false, false
		}
	default: // several dots: 1.250.000 (thousands dots)
		if !grouped(s, ".") {
			return 0, false, false
		}
		plain = strings.ReplaceAll(s, ".", "")
	}
	if plain == "" || plain == "." || strings.HasPrefix(plain, ".") && len(plain) == 1 {
		return 0, false, false
	}
	f, err := strconv.ParseFloat(plain, 64)
	if err != nil {
		return 0, false, false
	}
	if pct {
		f /= 100
	}
	if neg {
		f = -f
	}
	return f, true, false
}

// grouped reports whether s is digits split by sep into groups of three after
// a first group of one to three.
func grouped(s, sep string) bool {
	parts := strings.Split(s, sep)
	if len(parts) < 2 {
		return false
	}
	for i, p := range parts {
		if p == "" || len(p) > 3 || i > 0 && len(p) != 3 {
			return false
		}
	}
	return true
}

// colName is the column letter(s) of a 1-based column (bookio.ColName).
func colName(col int) string { return bookio.ColName(col) }

// cellRef is "B7" for column 2, row 7.
func cellRef(col, row int) string { return bookio.CellRef(col, row) }

// parseRef reads "AB12" (optionally with $ signs) into column and row
// (bookio.ParseRef).
func parseRef(s string) (col, row int, ok bool) { return bookio.ParseRef(s) }

// rangeRef is a rectangle of cells, 1-based and inclusive.
type rangeRef struct{ c1, r1, c2, r2 int }

// parseRange reads "A1:C9" or "B2" (bookio.ParseRange).
func parseRange(s string) (rangeRef, bool) {
	r, ok := bookio.ParseRange(s)
	return rangeRef{r.C1, r.R1, r.C2, r.R2}, ok
}

func (r rangeRef) String() string {
	return cellRef(r.c1, r.r1) + ":" + cellRef(r.c2, r.r2)
}

func (r rangeRef) contains(col, row int) bool {
	return col >= r.c1 && col <= r.c2 && row >= r.r1 && row <= r.r2
}

// dropSeparators removes spaces (also no-break and narrow no-break) and
// apostrophes used as thousands separators.
func dropSeparators(s string) string {
	if !strings.ContainsAny(s, " '\u00a0\u202f") {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		switch r {
		case ' ', '\'', '\u00a0', '\u202f':
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}
