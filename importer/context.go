package importer

import (
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/importer/tables"
)

// titleContext reads the title rows above a header (rows with one or two
// cells of text) and the sheet name for what the table leaves unsaid: a
// unit for every amount ("Thousand Barrels", "(MMcf)") and a fuel for a
// table without a fuel column ("Monthly diesel issues").
func (d *detector) titleContext(t *tableSpec, above []row) {
	sc := d.sc
	var texts []string
	for i := range above {
		r := &above[i]
		var cells []string
		for j := range r.cells {
			c := &r.cells[j]
			if c.kind == kText && strings.TrimSpace(c.text) != "" {
				cells = append(cells, c.text)
			} else if !c.isBlank() {
				cells = nil
				break
			}
		}
		if len(cells) == 0 || len(cells) > 2 {
			continue
		}
		texts = append(texts, cells...)
	}
	for _, s := range texts {
		if len(s) > 300 {
			continue
		}
		if sc.vocab.Hints(words(s)).Any(tables.HintOutput) {
			t.output = true
		}
		if u := titleUnit(s); u != "" && t.ctxUnit == "" {
			t.ctxUnit = u
		}
	}
	for _, s := range append(texts, d.sheet, strings.TrimSuffix(filepath.Base(sc.path), filepath.Ext(sc.path))) {
		if len(s) > 300 || rateText(s) {
			continue
		}
		if id := sc.phraseFuel(s); id != "" {
			t.ctxFuel, t.ctxFrom = id, s
			return
		}
	}
}

// titleUnit finds a unit of energy, mass or volume stated by a title:
// in brackets ("Natural gas consumption (MMcf)") or after "in"
// ("Quantities in thousand barrels").
func titleUnit(s string) string {
	s = cleanHeader(s)
	for _, m := range reAnyParen.FindAllStringSubmatch(s, -1) {
		if h := parseHeader("x (" + m[1] + ")"); h.unitTxt != "" && h.unitErr == nil && isQuantityDim(h.unit) {
			return m[1]
		}
	}
	low := strings.ToLower(s)
	for _, lead := range []string{" in ", "unit: ", "units: "} {
		if i := strings.LastIndex(low, lead); i >= 0 {
			u := strings.TrimRight(strings.TrimSpace(s[i+len(lead):]), ".")
			if h := parseHeader("x (" + u + ")"); h.unitTxt != "" && h.unitErr == nil && isQuantityDim(h.unit) {
				return u
			}
		}
	}
	return ""
}

// phraseFuel finds a fuel named anywhere in a phrase (longest run of words
// first), without the total and rate vetoes of fuelName: a title
// "Combined diesel purchases" still names diesel. "" when none.
func (sc *scanCtx) phraseFuel(s string) string {
	ws := words(s)
	ws = sc.vocab.Strip(ws, tables.HintQty|tables.HintTotal)
	for n := min(len(ws), 4); n >= 1; n-- {
		for i := 0; i+n <= len(ws); i++ {
			cand := strings.Join(ws[i:i+n], " ")
			if n == 1 && len(cand) < 3 {
				continue
			}
			if f := sc.fuel(cand); f.err == nil {
				return f.id
			}
		}
	}
	return ""
}

// upperHeaderRows returns, for a header at rows[h], the text that header
// rows right above it (two or more cells, mostly text: a grouped header
// split over rows) give each column: "Natural Gas" over "Use | Cost". A
// group label is carried right over the blank cells it spans.
func (d *detector) upperHeaderRows(rows []row, h, first, last int) func(col int) string {
	var ups []*row
	for k := h - 1; k >= 0 && len(ups) < 3; k-- {
		r := &rows[k]
		if r.num != rows[h].num-len(ups)-1 || !headerLike(r) || unitRowLike(r) || hasNumber(r) || sameTexts(r, &rows[h]) {
			break
		}
		ups = append([]*row{r}, ups...)
	}
	if len(ups) == 0 {
		return func(int) string { return "" }
	}
	texts := make([]map[int]string, len(ups))
	for i, r := range ups {
		m := map[int]string{}
		carry := ""
		for c := first; c <= last; c++ {
			x := r.at(c)
			if x.kind == kText && strings.TrimSpace(x.text) != "" {
				carry = strings.TrimSpace(x.text)
			} else if x.kind == kNumber {
				carry = ""
			}
			if carry != "" {
				m[c] = carry
			}
		}
		texts[i] = m
	}
	return func(col int) string {
		var parts []string
		for _, m := range texts {
			if s := m[col]; s != "" {
				parts = append(parts, s)
			}
		}
		return strings.Join(parts, " ")
	}
}

func hasNumber(r *row) bool {
	for i := range r.cells {
		if r.cells[i].kind == kNumber {
			return true
		}
	}
	return false
}

// sameTexts reports whether two rows repeat each other's texts (data rows
// of a long table, not a header split over rows).
func sameTexts(a, b *row) bool {
	same, n := 0, 0
	for i := range a.cells {
		c := &a.cells[i]
		if c.kind != kText || strings.TrimSpace(c.text) == "" {
			continue
		}
		n++
		if x := b.at(c.col); x.kind == kText && x.text == c.text {
			same++
		}
	}
	return n > 0 && 2*same >= n
}
