package importer

import (
	"path/filepath"
	"strings"
	"unicode"

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
	t.titles = texts
	for _, s := range texts {
		if len(s) > 300 || len(strings.Fields(s)) > 14 {
			continue // a note, not a title: its units speak of something else
		}
		if d.lx.vocab.Hints(words(s)).Any(tables.HintOutput) {
			t.output = true
		}
		if tables.RateTitle(s) {
			t.rateTitle = s // "(Dollars per Million Btu)": the numbers are prices
			continue
		}
		if u := titleUnit(s); u != "" && t.ctxUnit == "" {
			t.ctxUnit = u
		}
	}
	for _, s := range append(texts, d.sheet, strings.TrimSuffix(filepath.Base(sc.path), filepath.Ext(sc.path))) {
		if len(s) > 300 || tables.RateTitle(s) {
			continue
		}
		if id := d.lx.phraseFuel(s); id != "" {
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
		// "(Subset of Table 8.4a; Billion Btu)": each part on its own.
		for _, part := range strings.FieldsFunc(m[1], func(r rune) bool { return r == ';' || r == ',' }) {
			part = strings.TrimSpace(part)
			if h := parseHeader("x (" + part + ")"); h.UnitText != "" && h.UnitErr == nil && isQuantityDim(h.Unit) {
				return part
			}
		}
	}
	low := strings.ToLower(s)
	if len(strings.Fields(s)) > 8 {
		return "" // "... reported in short tons" in a sentence is a note's, not the table's
	}
	for _, lead := range []string{" in ", "unit: ", "units: "} {
		if i := strings.LastIndex(low, lead); i >= 0 {
			u := strings.TrimRight(strings.TrimSpace(s[i+len(lead):]), ".")
			if h := parseHeader("x (" + u + ")"); h.UnitText != "" && h.UnitErr == nil && isQuantityDim(h.Unit) {
				return u
			}
		}
	}
	return ""
}

// headerBlock is a header split over rows: the rows above the header row
// that hold parts of its column names ("Natural" over "Gas 3"; "Fuel use"
// over "Amount | Unit"), with up to two blank rows between them, as
// statistics tables print them.
type headerBlock struct {
	texts       []map[int]string // per upper row, top first: column -> text
	first, last int              // columns the block spans
}

// upperHeaderRows finds the header block above rows[h]: rows without
// numbers, with text in at least one cell, that are not a one-cell title
// and do not repeat the header's own texts (data rows of a long table).
func (d *detector) upperHeaderRows(rows []row, h int) headerBlock {
	var ups []*row
	next := rows[h].num
	for k := h - 1; k >= 0 && len(ups) < 5; k-- {
		r := &rows[k]
		if next-r.num > 3 {
			break // more than two blank rows: the block has ended
		}
		if r.blank() {
			continue
		}
		if hasNumber(r) || unitRowLike(r) || sameTexts(r, &rows[h]) || titleRow(r) || codeRow(r) {
			break
		}
		ups = append([]*row{r}, ups...)
		next = r.num
	}
	blk := headerBlock{}
	for _, r := range ups {
		m := map[int]string{}
		for i := range r.cells {
			c := &r.cells[i]
			if c.kind == kText && strings.TrimSpace(c.text) != "" {
				m[c.col] = cleanHeader(c.text)
				if blk.first == 0 || c.col < blk.first {
					blk.first = c.col
				}
				blk.last = max(blk.last, c.col)
			}
		}
		for _, mg := range d.merges {
			if mg.r1 == r.num && mg.c2 > mg.c1 {
				if tl := cleanHeader(d.headerText(rows, mg.c1, mg.r1)); tl != "" {
					for c := mg.c1; c <= mg.c2; c++ {
						m[c] = tl
					}
				}
			}
		}
		blk.texts = append(blk.texts, m)
	}
	return blk
}

// text is the part of column col's name that the block gives. A label is
// carried right over blank cells only into columns that have no label of
// their own further down (a group label over its sub-columns).
func (blk headerBlock) text(col int, own func(col int) bool) string {
	var parts []string
	for i, m := range blk.texts {
		s, ok := m[col]
		if !ok && !own(col) {
			for c := col - 1; c >= blk.first && c >= col-12; c-- {
				if blk.labelBelow(i, c) && c != col {
					break
				}
				if x, ok := m[c]; ok {
					s = x
					break
				}
			}
		}
		if s != "" && !slicesContains(parts, s) {
			parts = append(parts, s)
		}
	}
	return strings.Join(parts, " ")
}

// labelBelow reports whether column c has a label in a block row under row i.
func (blk headerBlock) labelBelow(i, c int) bool {
	for _, m := range blk.texts[i+1:] {
		if _, ok := m[c]; ok {
			return true
		}
	}
	return false
}

// titleRow reports a row of one text in the first column or of one long
// text: a title or a note, not a part of a header (a group label sits
// over the columns it names).
func titleRow(r *row) bool {
	n, long := 0, false
	for i := range r.cells {
		c := &r.cells[i]
		if c.isBlank() {
			continue
		}
		n++
		if c.kind == kText && (c.col == 1 || len([]rune(strings.TrimSpace(c.text))) > 30) {
			long = true
		}
	}
	return n == 1 && long
}

// hasNumber reports a row with a number, or a number stored as text
// ("1 250,5" in a CSV export).
func hasNumber(r *row) bool {
	for i := range r.cells {
		c := &r.cells[i]
		if c.kind == kNumber {
			return true
		}
		if c.kind == kText {
			if _, ok, amb := textNumber(c.text); ok || amb {
				return true
			}
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

// codeRow reports a row of series codes ("Sourcekey | N9140US2 | N9160US2"):
// most texts are one word mixing letters and digits. Codes are not part of
// the column names.
func codeRow(r *row) bool {
	n, codes := 0, 0
	for i := range r.cells {
		c := &r.cells[i]
		if c.kind != kText || strings.TrimSpace(c.text) == "" {
			continue
		}
		n++
		t := strings.TrimSpace(c.text)
		if !strings.ContainsAny(t, " ") && strings.ContainsAny(t, "0123456789") && strings.IndexFunc(t, unicode.IsLetter) >= 0 {
			codes++
		}
	}
	return n >= 2 && 5*codes >= 4*(n-1)
}

// headerContext takes the fuel of a table without one from its headers when
// exactly one fuel is named among them, in a column that is no amount of
// that fuel itself ("Diesel kWh Generated" beside "Fuel Used Gallons").
func (d *detector) headerContext(t *tableSpec) {
	found, from, col := "", "", 0
	for _, c := range t.cols {
		id := d.lx.phraseFuel(c.hdr.Base)
		if id == "" {
			continue
		}
		if found != "" && id != found {
			return // several fuels: no one fuel for the table
		}
		found, from, col = id, c.hdr.Text, c.col
	}
	if found != "" {
		t.ctxFuel, t.ctxFrom, t.ctxCol = found, from, col
	}
}
