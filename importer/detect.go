package importer

import (
	"github.com/fluecell/fluecell/importer/tables"
	"math"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// role is what a column means to fluecell.
type role uint8

const (
	roleNone     role = iota
	roleFuel          // fuel names
	roleQuantity      // amounts of fuel
	roleUnit          // the unit of the quantity (or of the capacity)
	roleWideFuel      // one fuel per column: "Diesel (L)"
	roleTech          // technology of a build plan
	roleCapacity      // capacity of a build plan
	roleCF            // capacity factor
	roleLifetime      // lifetime in years
	roleExisting      // the workbook's own carbon figures
	roleGroup         // site, region, department...: totals by it
	rolePeriod        // one period per column (Jan, Feb... or 2024, 2025) of the row's fuel
	roleWhen          // the date or period of a row (YYYYMM, Date): annual rows among monthly ones are left out
	roleGrid          // the country or grid region of each row: its electricity grid (scope2.go)
	roleCarrier       // one column of purchased energy: "Electricity (kWh)", "Steam (MMBtu)" (scope2.go)
	roleGas           // refrigerant or other fugitive gas names: R-410A, HFC-134a (fugitive.go)
	roleSector        // the sector where a row's fuel is burned: energy, commercial (fleet.go)
	roleVehicle       // vehicle types of distance-based rows: "Medium petrol car" (distance.go)
)

func (r role) String() string {
	return [...]string{"", "fuel", "quantity", "unit", "fuel-column", "technology", "capacity",
		"capacity-factor", "lifetime", "existing-carbon", "group", "period", "date", "grid", "purchased-energy", "gas", "sector", "vehicle"}[r]
}

// Table kinds.
const (
	kindFuelLog   = "fuel-log"
	kindWide      = "wide"
	kindBuildPlan = "build-plan"
	kindCustom    = "custom"
	kindPeriods   = "fuel-by-period" // a fuel per row, a period per column
)

// column is one column of a detected table.
type column struct {
	col        int
	hdr        headerInfo
	ident      string
	unitIdent  string // ident+"_unit" when the header carries a unit
	role       role
	fuelID     string   // roleWideFuel: the fuel of the column
	partOf     *column  // a per-fuel column left out because a total column of its fuel is used
	biogenic   bool     // a per-fuel column of a biogenic fuel, left out of the fossil totals
	sameAs     *column  // a per-fuel column of a fuel already given in another unit, left out
	numStyle   numStyle // how its numbers stored as text are written (decimal point or comma)
	styleGuess bool     // numStyle comes from values that only lean one way: said in a finding
	fuelAlias  bool
	fromUnit   bool    // roleWideFuel: the fuel read from a unit only natural gas is billed in (unitfuel.go)
	carrier    carrier // roleCarrier: the energy bought
	gallonText string  // a bare gallon of the header read as imperial, as the mapping says (gallons.go)
	carbon     carbonCol
	numeric    bool // values are mostly numbers
	unitBad    bool // the header unit cannot be used for this column's role
	st         colStats
}

// tableSpec is a detected table: its header, columns and roles.
type tableSpec struct {
	sheet     string
	headerRow int
	unitRow   int // a row of units under the header, 0 when none
	dataStart int // first row that may hold data
	cols      []*column
	kind      string
	firstCol  int
	lastCol   int
	headerErr *Warning // a header-level problem that stops every row (no unit anywhere)
	score     int
	sampled   int     // rows sampled under the header
	ctxFuel   string  // a fuel named by the title rows or the sheet name, for a table without a fuel column
	ctxFrom   string  // where ctxFuel was read, for the note
	ctxCol    int     // the column whose header gave ctxFuel (0: a title, sheet or file name)
	ctxUnit   string  // a unit named by the title rows ("(MMcf)", "Quadrillion Btu")
	partial   bool    // amounts in columns fluecell leaves out (electricity, steam): existing carbon figures cover more
	when      *column // the date or period of each row of a long table (YYYYMM, Date)
	output    bool    // the title speaks of generation: amounts in Wh are electricity made, not fuel burned
	rateTitle string  // a title stating prices or rates ("Dollars per Million Btu")

	// Purchased energy (scope2.go): the grid of its electricity, from a
	// column, the mapping, the options or a title or header (ctxGrid, and
	// ctxGridFrom saying which).
	grid        gridChoice
	gridCol     *column
	ctxGrid     string
	ctxGridFrom string
	scope2      []*column // columns of purchased energy (roleCarrier)
	titles      []string  // the title rows above the header

	// Refrigerant logs (fugitive.go): the gas column, and a charge held
	// where no mass released is given.
	gas, charge *column

	// Distance-based vehicle rows (distance.go): the vehicle type column;
	// the distance is qty.
	vehicle *column

	// Combustion (fleet.go): a fleet's evidence (mobile combustion), or the
	// sector column and the sector arguments of fuel_co2e.
	mobile     string
	stationary map[string]bool // fuels of a fleet without road CH4 and N2O in the pack
	sector     *column
	sectorArgs string

	// The columns with a role (nil when absent).
	fuel, qty, unit, group   *column
	tech, capacity, cf, life *column
	wide, periods, existing  []*column
}

func (t *tableSpec) colAt(c int) *column {
	for _, x := range t.cols {
		if x.col == c {
			return x
		}
	}
	return nil
}

// sampleRows is how many rows under a candidate header are looked at.
const sampleRows = 50

// detector finds tables in buffered rows.
type detector struct {
	sc     *scanCtx
	lx     *lexicon // how texts read: all detection asks of the names
	sheet  string
	merges []rangeRef
}

// headerLike reports whether r could be a header row: at least two cells,
// mostly text, not a total row.
func headerLike(r *row) bool {
	n, txt, periods := 0, 0, 0
	for i := range r.cells {
		c := &r.cells[i]
		if c.isBlank() {
			continue
		}
		n++
		switch c.kind {
		case kText:
			if _, ok, amb := textNumber(c.text); !ok && !amb {
				txt++
			} else if tables.PeriodHeader(c.text) {
				periods++
			}
		case kNumber:
			if c.num == math.Trunc(c.num) && tables.PeriodHeader(funcs.FormatNumber(c.num)) {
				periods++
			}
		}
	}
	// Names, or a few names then a run of periods (State | Unit | 1960 |
	// 1961 ...: one column per year).
	return n >= 2 && !totalRow(r) && (3*txt >= 2*n || txt >= 1 && periods >= 2 && txt+periods == n)
}

// totalRow reports a "Total" / "Subtotal" / "Sum" row.
func totalRow(r *row) bool {
	for i := range r.cells {
		c := &r.cells[i]
		if c.isBlank() {
			continue
		}
		if c.kind != kText {
			return false
		}
		w := words(c.text)
		return len(w) > 0 && len(w) <= 4 && hasWord(w[:1], "total", "totals", "subtotal", "sum", "grand")
	}
	return false
}

// keywordHits counts cells that name a role (a unit alone does not: data
// rows have units), for telling a header from a data row.
func (lx *lexicon) keywordHits(r *row) int {
	n := 0
	for i := range r.cells {
		c := &r.cells[i]
		if c.kind != kText {
			continue
		}
		h := lx.header(c.text)
		ws := words(h.Base)
		if len(ws) > 4 {
			continue // a sentence, not a header
		}
		if hasWord(ws, "fuel", "unit", "units", "uom", "technology", "capacity", "month", "date", "year") || hasWord(ws, qtyWords...) || hasWord(ws, groupWords...) ||
			h.UnitText != "" && h.Base != h.Text && lx.fuel(h.Base).err == nil {
			n++
		} else if _, ok := parseCarbonHeader(h.Text); ok {
			n++
		}
	}
	return n
}

// pick looks for a header among rows[0:look] and returns the table and the
// index of its header row. The earliest header that fits wins, except that a
// better one at most three rows below it (the real header under a banner
// row) is preferred.
func (d *detector) pick(rows []row, look int, final bool) (*tableSpec, int) {
	var best *tableSpec
	bestI, firstNum := -1, 0
	for i := 0; i < look; i++ {
		// A better header up to three rows below the first that fits (the
		// real header under a banner), or anywhere in a block of rows
		// without numbers (a header printed over several rows).
		if best != nil && rows[i].num-firstNum > 3 && (hasNumber(&rows[i-1]) || rows[i].num-rows[i-1].num > 3) {
			break
		}
		if named, mapped := d.mappedHeader(&rows[i]); named && !mapped || !named && !headerLike(&rows[i]) {
			continue
		}
		if !final && len(rows)-i-1 < sampleRows {
			break
		}
		t := d.tryHeader(rows, i)
		if t != nil && best == nil {
			firstNum = rows[i].num
		}
		if t != nil && (best == nil || t.score > best.score) {
			best, bestI = t, i
		}
	}
	return best, bestI
}

// cellAt finds the cell at (col, rowNum) among buffered rows.
func cellAt(rows []row, col, rowNum int) cell {
	for i := range rows {
		if rows[i].num == rowNum {
			return rows[i].at(col)
		}
	}
	return cell{col: col}
}

func (d *detector) headerText(rows []row, col, rowNum int) string {
	c := cellAt(rows, col, rowNum)
	if c.kind == kText && strings.TrimSpace(c.text) != "" {
		return c.text
	}
	if c.kind == kNumber {
		return funcs.FormatNumber(c.num)
	}
	for _, m := range d.merges {
		if m.contains(col, rowNum) && (m.c1 != col || m.r1 != rowNum) {
			tl := cellAt(rows, m.c1, m.r1)
			if tl.kind == kText {
				return tl.text
			}
		}
	}
	return ""
}

// tryHeader evaluates rows[h] as a header row; nil when no table fits.
func (d *detector) tryHeader(rows []row, h int) *tableSpec {
	sc := d.sc
	hdr := &rows[h]
	t := &tableSpec{sheet: d.sheet, headerRow: hdr.num}
	// A data row of a long table is not a header: its texts recur below
	// (checked first on a few rows, because it prunes most candidates).
	var peek []*row
	for j := h + 1; j < len(rows) && len(peek) < 10; j++ {
		if !rows[j].blank() {
			peek = append(peek, &rows[j])
		}
	}
	if len(peek) > 0 && !d.headerFits(hdr, peek) {
		return nil
	}
	// Rows of labels without numbers right under it, before the numbers
	// start: the header goes on below (a header printed over several rows).
	if len(peek) >= 2 && headerLike(peek[0]) && !hasNumber(peek[0]) && !unitRowLike(peek[0]) && !d.mostlyNames(peek[0]) {
		for _, r := range peek[1:] {
			if hasNumber(r) {
				return nil
			}
		}
	}
	// Sample rows: up to sampleRows non-blank rows, stopping at a gap of
	// three blank rows or at the next header-like row with role keywords.
	var sample []*row
	prev := hdr.num
	for j := h + 1; j < len(rows) && len(sample) < sampleRows; j++ {
		r := &rows[j]
		if r.num-prev > 3 {
			break
		}
		prev = r.num
		if r.blank() || totalRow(r) {
			continue
		}
		if footerRow(r, 1, 1<<14) {
			break // "Source: ...", notes: the table above has ended
		}
		if headerLike(r) && !hasNumber(r) && d.lx.keywordHits(r) >= 2 && len(sample) > 0 {
			break
		}
		sample = append(sample, r)
	}
	// Columns: every header cell, and cells under a merged header.
	first, last := 0, 0
	for i := range hdr.cells {
		if !hdr.cells[i].isBlank() {
			if first == 0 {
				first = hdr.cells[i].col
			}
			last = hdr.cells[i].col
		}
	}
	// Header cells merged down from the row above, or across from the left,
	// belong to the header too.
	for grown := true; grown; {
		grown = false
		for _, m := range d.merges {
			if m.r1 > hdr.num || hdr.num > m.r2 || first != 0 && (m.c2 < first-1 || m.c1 > last+1) || first != 0 && m.c1 >= first && m.c2 <= last {
				continue
			}
			if d.headerText(rows, m.c1, m.r1) == "" {
				continue
			}
			if first == 0 || m.c1 < first {
				first = m.c1
			}
			last, grown = max(last, m.c2), true
		}
	}
	if first == 0 {
		return nil
	}
	// A banner over the real header ("Fuel use" merged over "Amount | Unit")
	// is not the header. A data row naming fewer roles than this row
	// ("Farm | Red diesel | 2400 | litres" under "Site | Fuel type |
	// Quantity | Unit") is no header below a banner.
	if len(sample) > 0 && headerLike(sample[0]) {
		if n := d.lx.keywordHits(sample[0]); n >= 2 && (n >= d.lx.keywordHits(hdr) || !hasNumber(sample[0])) {
			return nil
		}
	}
	// A row of units right under the header ("L", "kWh", "t").
	if len(sample) > 0 && unitRowLike(sample[0]) {
		t.unitRow = sample[0].num
		sample = sample[1:]
	}
	if len(sample) == 0 || !d.headerFits(hdr, sample) {
		return nil
	}
	blk := d.upperHeaderRows(rows, h)
	if blk.first > 0 {
		first, last = min(first, blk.first), max(last, blk.last)
	}
	t.firstCol, t.lastCol = first, last
	t.sampled = len(sample)
	d.titleContext(t, rows[:h])
	own := func(c int) bool { return d.headerText(rows, c, hdr.num) != "" }
	t.dataStart = hdr.num + 1
	if t.unitRow > 0 {
		t.dataStart = t.unitRow + 1
	}
	used := map[string]bool{}
	for c := first; c <= last; c++ {
		text := d.headerText(rows, c, hdr.num)
		if pre := blk.text(c, own); pre != "" && !strings.Contains(text, pre) {
			text = strings.TrimSpace(pre + " " + text)
		}
		col := &column{col: c, hdr: parseHeader(text)}
		if col.hdr.UnitText == "" && t.ctxUnit != "" && t.unitRow == 0 {
			// A title's unit stands for columns that name none, unless a
			// row of units under the header gives each its own.
			if uh := parseHeader(col.hdr.Text + " (" + t.ctxUnit + ")"); uh.UnitText != "" {
				uh.Text = col.hdr.Text
				col.hdr = uh
			}
		}
		col.st.hint = d.lx.vocab.Hints(words(col.hdr.Text))
		if t.unitRow > 0 && col.hdr.UnitText == "" {
			if u := cellAt(rows, c, t.unitRow); u.kind == kText && strings.TrimSpace(u.text) != "" {
				uh := parseHeader("x (" + u.text + ")")
				col.hdr.UnitText, col.hdr.Unit, col.hdr.UnitErr, col.hdr.Percent, col.hdr.Scale = uh.UnitText, uh.Unit, uh.UnitErr, uh.Percent, uh.Scale
				if uh.UnitText == "" {
					if _, err := units.Parse(u.text); err != nil {
						if ue, ok := err.(*units.Error); ok {
							col.hdr.UnitText, col.hdr.UnitErr = strings.TrimSpace(u.text), ue
						}
					}
				}
			}
		}
		name := col.hdr.Base
		if name == "" {
			name = col.hdr.Text
		}
		id := identFor(name, c)
		if sc.isFunction(id) {
			id += "_col"
		}
		base := id
		for k := 2; used[id]; k++ {
			id = base + "_" + itoa(k)
		}
		used[id] = true
		col.ident = id
		if col.hdr.UnitText != "" {
			col.unitIdent = id + "_unit"
		}
		for _, r := range sample {
			d.count(col, r.at(c))
		}
		col.numeric = col.st.nonEmpty > 0 && 2*col.st.num >= col.st.nonEmpty
		col.decideStyle()
		t.cols = append(t.cols, col)
	}
	for _, col := range t.cols {
		if col.unitIdent != "" {
			if used[col.unitIdent] {
				col.unitIdent = "" // a real column of that name wins
			} else {
				used[col.unitIdent] = true
			}
		}
	}
	if t.ctxFuel == "" {
		d.headerContext(t)
	}
	d.assignRoles(t)
	d.applyMapping(t)
	d.fleetEvidence(t)
	d.chooseSector(t)
	d.imperialHeaders(t)
	d.titleGrid(t, t.titles)
	d.chooseGrid(t)
	if !d.decideKind(t) {
		if _, seen := sc.skipWhy[d.sheet]; !seen {
			sc.skipWhy[d.sheet] = whyNot(t)
		}
		return nil
	}
	t.score = 10 + min(len(sample), 5)
	for _, c := range t.cols {
		if c.role != roleNone {
			t.score += 3
		}
	}
	return t
}

func itoa(n int) string { return funcs.FormatNumber(float64(n)) }

// unitRowLike reports a row whose non-empty cells are all units.
func unitRowLike(r *row) bool {
	n := 0
	for i := range r.cells {
		c := &r.cells[i]
		if c.isBlank() {
			continue
		}
		if c.kind != kText {
			return false
		}
		s := strings.Trim(strings.TrimSpace(c.text), "()[]")
		if _, err := units.Parse(s); err != nil {
			if ue, ok := err.(*units.Error); !ok || ue.Code == units.CodeUnknown {
				return false
			}
		}
		n++
	}
	return n >= 1
}

// headerFits reports whether hdr reads as the header of the sampled rows,
// not as one of them: its numbers are periods (2024, a date), and its texts
// do not recur among the values below (a text-heavy data row of a long
// table).
func (d *detector) headerFits(hdr *row, sample []*row) bool {
	texts, recur := 0, 0
	for i := range hdr.cells {
		c := &hdr.cells[i]
		switch {
		case c.kind == kNumber:
			if !tables.PeriodHeader(funcs.FormatNumber(c.num)) {
				return false
			}
		case c.kind == kText && strings.TrimSpace(c.text) != "":
			texts++
			for _, r := range sample {
				if x := r.at(c.col); x.kind == kText && x.text == c.text {
					recur++
					break
				}
			}
		}
	}
	return texts == 0 || 2*recur < texts
}

// mostlyNames reports a row whose texts are mostly fuel names or units: a
// data row of a fuel log that happens to hold no number.
func (d *detector) mostlyNames(r *row) bool {
	n, names := 0, 0
	for i := range r.cells {
		c := &r.cells[i]
		if c.kind != kText || strings.TrimSpace(c.text) == "" {
			continue
		}
		n++
		if d.lx.fuelName(c.text).kind == nameFuel {
			names++
		} else if u := d.lx.unit(c.text); u.err == nil {
			names++
		}
	}
	return n > 0 && 2*names >= n
}
