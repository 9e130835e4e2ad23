package importer

import (
	"strings"
	"unicode"
)

// cellVal is a stored cell of a table row, for the columns rules and checks
// read.
type cellVal struct {
	kind    cellKind
	formula bool
	noCache bool
	merged  bool // filled from the top-left cell of a merged range
	num     float64
	text    string
}

// table is a detected table with its stored rows and, after evaluate, its
// results.
type table struct {
	spec      *tableSpec
	slots     []*column // stored columns
	slotOf    map[int]int
	ps        *pageSet          // where the per-row columns below keep their pages
	rowNums   *paged[int32]     // the sheet row of each stored row (tablerows.go)
	vals      []*paged[cellVal] // the stored cells, a column per slot: a pass over one column reads only its pages
	rowBuf    []cellVal         // a row's stored cells while it is added
	totalRows []int
	sections  []sectionLabel // rows of one label inside the table ("Commercial Sector")
	lastRow   int
	maxUsed   int // rightmost used column in the table's rows
	intern    map[string]string
	days      *paged[float64] // per row, the days of its period, for flows (flow.go); nil without flows
	copyOf    *table          // the table whose rows this one repeats (duplicate.go); its results are dropped
	rules     []*rule
	alts      map[carrier]*ruleSet // rules of rows of purchased energy (rowrules.go)
	noted     map[carrier]bool     // carriers whose reading was said in a finding
	modes     map[string]*ruleSet  // rules of a fleet's rows by road mode (fleet.go)
	modeNoted map[string]bool
	merges    []rangeRef
	cost      *costCells // the cost column of a fuel log, for the price check (prices.go)
	unc       *tableUnc  // the uncertainty models of its totals (uncertainty.go)

	// Results (see evaluate).
	res       []*paged[float64] // per rule, per row; NaN when not computed
	src       *paged[int32]     // per row: index into srcText, -1 for none
	bio       *paged[float64]   // per row: biogenic CO2 moved out of tCO2 (kinds.go); nil without a tCO2 rule
	hasBio    bool              // some row has biogenic CO2: the table gets a tCO2_biogenic column
	rowState  *paged[int8]      // per row: rowBlank, rowFound or rowComputed (kinds.go)
	rowKind   *paged[uint8]     // per row: rowDefault, rowScope2 or rowStationary
	srcText   []string
	dataRows  int
	computed  int
	byFuel    map[string]*sum
	byGroup   map[string]*sum
	groupOrd  []string
	fuelOrd   []string
	layout    string
	outSheet  string
	outCol    int
	unitsSeen map[string]*unitSeen
	unitOrder []string
	memo      *valueMemo // good fuel and unit cells, worked out once per text (cellmemo.go)
}

// sum accumulates totals.
type sum struct {
	Totals
	rows int
}

// newTable sets up a table for a detected spec: it compiles the rules and
// decides which columns are stored.
func (sc *scanCtx) newTable(spec *tableSpec, merges []rangeRef) (*table, error) {
	t := &table{spec: spec, ps: sc.pages, slotOf: map[int]int{}, intern: map[string]string{}, lastRow: spec.dataStart - 1, maxUsed: spec.lastCol}
	for _, m := range merges {
		if m.r2 >= spec.dataStart {
			t.merges = append(t.merges, m)
		}
	}
	for _, c := range spec.cols {
		if c.role != roleNone || wideBiogenic(spec, c) || periodColumn(spec, c) {
			t.slot(c) // a date column too, for the summary by period (summaryperiod.go)
		}
	}
	if err := sc.compileRules(t); err != nil {
		return nil, err
	}
	if t.cost = costColumn(spec); t.cost != nil {
		t.cost.v = newFixed(t.ps, 0, 0.0)
	}
	return t, nil
}

func (t *table) slot(c *column) int {
	if i, ok := t.slotOf[c.col]; ok {
		return i
	}
	t.slots = append(t.slots, c)
	t.slotOf[c.col] = len(t.slots) - 1
	return len(t.slots) - 1
}

// bind finds the column or header unit behind a rule variable.
func (t *table) bind(name string) *binding {
	for _, c := range t.spec.cols {
		if c.ident == name {
			return &binding{name: name, col: c, slot: t.slot(c)}
		}
	}
	for _, c := range t.spec.cols {
		if c.unitIdent == name {
			return &binding{name: name, unitOf: c, constant: c.hdr.UnitText, slot: -1}
		}
	}
	if name == periodDaysIdent && t.spec.when != nil {
		return &binding{name: name, days: true, slot: -1}
	}
	return &binding{name: name, slot: -1} // not reached: rules compile against the table's identifiers
}

// blankIn reports whether r has no value in the table's columns.
func (t *table) blankIn(r *row) bool {
	for i := range r.cells {
		c := &r.cells[i]
		if c.col >= t.spec.firstCol && c.col <= t.spec.lastCol && !c.isBlank() {
			return false
		}
	}
	return true
}

// add stores a data row.
func (t *table) add(r *row) {
	for i := len(r.cells) - 1; i >= 0; i-- {
		if !r.cells[i].isBlank() {
			t.maxUsed = max(t.maxUsed, r.cells[i].col)
			break
		}
	}
	t.lastRow = r.num
	if t.blankIn(r) {
		return
	}
	if totalRow(r) || t.aggregateRow(r) {
		t.totalRows = append(t.totalRows, r.num)
		return
	}
	if t.sectionRow(r) {
		t.sections = append(t.sections, sectionLabel{r.num, r.cells[0].col})
		return
	}
	if t.rowBuf == nil {
		t.rowBuf = make([]cellVal, len(t.slots))
	}
	vals := t.rowBuf
	clear(vals)
	for i := range r.cells {
		c := &r.cells[i]
		s, ok := t.slotOf[c.col]
		if !ok {
			continue
		}
		v := &vals[s]
		v.kind, v.formula, v.noCache, v.num = c.kind, c.formula, c.noCache, c.num
		if c.kind != kNumber {
			v.text = t.internStr(c.text)
		}
	}
	t.storeRow(r.num, vals)
	t.keepCost(r)
}

func (t *table) internStr(s string) string {
	if s == "" {
		return ""
	}
	if v, ok := t.intern[s]; ok {
		return v
	}
	if len(t.intern) < 50_000 {
		t.intern[s] = s
	}
	return s
}

// fillMerged copies the top-left value of merged ranges into the covered
// rows of the stored columns (a site or fuel merged down over its rows).
func (t *table) fillMerged() {
	if len(t.merges) == 0 || t.n() == 0 {
		return
	}
	for _, m := range t.merges {
		if m.r1 == m.r2 {
			continue
		}
		s, ok := t.slotOf[m.c1]
		if !ok {
			continue
		}
		top := t.indexOfRow(m.r1)
		if top < 0 {
			continue
		}
		src := t.val(top, s)
		for r := m.r1 + 1; r <= m.r2; r++ {
			if i := t.indexOfRow(r); i >= 0 {
				if v := t.val(i, s); v.kind == kEmpty && !v.formula {
					src.merged = true
					t.setVal(i, s, src)
					src.merged = false
				}
			}
		}
	}
}

// segmenter splits the rows of one sheet into tables as they stream by.
type segmenter struct {
	sc     *scanCtx
	det    *detector
	sheet  string
	merges []rangeRef
	head   []row
	cur    *table
}

// headKeep is how many rows are buffered while looking for a header:
// candidates in the first headLook rows, each with sampleRows rows under it.
const (
	headLook = 40
	headKeep = headLook + sampleRows
)

func copyRow(r row) row {
	return row{num: r.num, cells: append([]cell(nil), r.cells...)}
}

// feed takes the next row of the sheet (rows arrive in order; rows with
// no cells are absent).
func (s *segmenter) feed(r row) error {
	if s.cur != nil {
		t := s.cur
		switch {
		case r.num-t.lastRow > 3 || footerRow(&r, t.spec.firstCol, t.spec.lastCol):
			// A gap of rows, or the notes and sources under a table, end it.
			if err := s.closeTable(); err != nil {
				return err
			}
		case !t.dataLike(&r) && !t.blankIn(&r) && headerLike(&r) && (s.sc.keywordHits(&r) >= 2 || t.repeatsHeader(&r)):
			if t.n() == 0 {
				s.cur = nil // a header row straight after a header: the first was a banner
				break
			}
			if err := s.closeTable(); err != nil {
				return err
			}
		default:
			t.add(&r)
			return nil
		}
	}
	s.head = append(s.head, copyRow(r))
	if len(s.head) >= headKeep {
		return s.tryDetect(false)
	}
	return nil
}

// dataLike reports whether r has a number in a column where the table has
// numbers (a data row, however text-heavy).
func (t *table) dataLike(r *row) bool {
	for _, c := range t.spec.cols {
		if c.numeric && r.at(c.col).kind == kNumber {
			return true
		}
	}
	return false
}

// tryDetect looks for a header in the buffered rows. Without final, only
// candidates in the first headLook rows are tried and the buffer slides on
// when none fits.
func (s *segmenter) tryDetect(final bool) error {
	for len(s.head) > 0 {
		look := s.head
		if !final && len(look) > headLook {
			look = look[:headLook]
		}
		spec, h := s.det.pick(s.head, len(look), final)
		if spec == nil {
			if final {
				s.head = nil
				return nil
			}
			s.head = append(s.head[:0], s.head[len(look):]...)
			return nil
		}
		t, err := s.sc.newTable(spec, s.merges)
		if err != nil {
			return err
		}
		rest := s.head[h+1:]
		s.head = nil
		s.cur = t
		for _, r := range rest {
			if r.num < spec.dataStart {
				continue
			}
			if err := s.feed(r); err != nil {
				return err
			}
		}
		if s.cur != nil || !final {
			return nil
		}
	}
	return nil
}

// closeTable finishes the current table.
func (s *segmenter) closeTable() error {
	t := s.cur
	s.cur = nil
	t.fillMerged()
	s.sc.tables = append(s.sc.tables, t)
	return s.sc.evaluate(t)
}

// finish ends the sheet.
func (s *segmenter) finish() error {
	if s.cur != nil {
		if err := s.closeTable(); err != nil {
			return err
		}
	}
	if len(s.head) > 0 {
		if err := s.tryDetect(true); err != nil {
			return err
		}
		if s.cur != nil {
			return s.closeTable()
		}
	}
	return nil
}

// sectionLabel is a row of a table that holds only a label.
type sectionLabel struct{ row, col int }

// sectionRow reports a row with one text in the table and nothing else,
// outside the columns of names (fuel, technology, unit): a label over the
// rows that follow, as statistics tables print sectors.
func (t *table) sectionRow(r *row) bool {
	var one *cell
	for i := range r.cells {
		c := &r.cells[i]
		if c.col < t.spec.firstCol || c.col > t.spec.lastCol || c.isBlank() {
			continue
		}
		if one != nil || c.kind != kText || c.formula {
			return false
		}
		one = c
	}
	if one == nil {
		return false
	}
	if col := t.spec.colAt(one.col); col != nil && (col.role == roleFuel || col.role == roleTech || col.role == roleUnit) {
		return false
	}
	return true
}

// repeatsHeader reports a row that names the table's columns again (a second
// block under the same header, such as the shares after the amounts): it
// starts a new table.
func (t *table) repeatsHeader(r *row) bool {
	n, same := 0, 0
	for _, c := range t.spec.cols {
		if c.hdr.Text == "" {
			continue
		}
		x := r.at(c.col)
		if x.kind != kText {
			continue
		}
		n++
		if cleanHeader(x.text) == c.hdr.Text || strings.Contains(c.hdr.Text, cleanHeader(x.text)) {
			same++
		}
	}
	return n >= 2 && 2*same >= n
}

// footerRow reports the notes under a table: a row whose text in the
// table's columns (firstCol to lastCol), in its first filled cell, begins "Source", "Note" or a footnote number
// glued to a word ("3Natural gas, plus..."), or reads as a sentence (six
// words or more), and that holds no number.
func footerRow(r *row, firstCol, lastCol int) bool {
	var first *cell
	for i := range r.cells {
		c := &r.cells[i]
		if c.isBlank() || c.col < firstCol || c.col > lastCol {
			continue
		}
		if c.kind == kNumber {
			return false
		}
		if c.kind == kText {
			if _, ok, amb := textNumber(c.text); ok || amb {
				return false
			}
		}
		if first == nil {
			first = c
		}
	}
	if first == nil || first.kind != kText {
		return false
	}
	text := strings.TrimSpace(cleanHeader(first.text))
	low := strings.ToLower(text)
	for _, p := range []string{"source:", "sources:", "source ", "note:", "notes:", "note ", "footnote", "* ", "data source"} {
		if strings.HasPrefix(low, p) {
			return true
		}
	}
	if len(text) > 1 && text[0] >= '0' && text[0] <= '9' && (text[1] >= 'A' && text[1] <= 'Z' || len(text) > 2 && text[1] >= '0' && text[1] <= '9' && text[2] >= 'A' && text[2] <= 'Z') {
		return true // "3Natural gas, plus...", "11Industrial combined-heat-and-power"
	}
	return len(strings.Fields(text)) >= 6
}

// aggregateRow reports a row that a label elsewhere in it marks as the
// sum of other rows: "All local authorities", "All sectors", "Total" in a
// column other than the fuel's (a region's row above its authorities).
func (t *table) aggregateRow(r *row) bool {
	for i := range r.cells {
		c := &r.cells[i]
		if c.kind != kText || c.col < t.spec.firstCol || c.col > t.spec.lastCol {
			continue
		}
		if x := t.spec.colAt(c.col); x != nil && (x.role == roleFuel || x.role == roleUnit || x.role == roleTech) {
			continue
		}
		if !startsAllOrTotal(c.text) {
			continue // the words need not be split (most cells of a long table)
		}
		w := words(c.text)
		if len(w) >= 2 && len(w) <= 4 && (w[0] == "all" || w[0] == "total" || w[0] == "totals") {
			return true
		}
	}
	return false
}

// startsAllOrTotal reports whether s, after any leading characters that
// are neither letters nor digits, begins with "all" or "total" in any case:
// what a first word "all", "total" or "totals" needs.
func startsAllOrTotal(s string) bool {
	i := strings.IndexFunc(s, func(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) })
	if i < 0 {
		return false
	}
	s = s[i:]
	return len(s) >= 3 && strings.EqualFold(s[:3], "all") || len(s) >= 5 && strings.EqualFold(s[:5], "total")
}
