package importer

import (
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/importer/bookio"
	"github.com/xuri/excelize/v2"
)

// Fills that mark a data cell with a finding, by its most severe finding.
// They are fluecell's own light colours, chosen so that the cell's text
// stays readable in black or dark fonts:
//
//	error   FDE2E1  soft red   (the row could not be computed)
//	warning FFEFC7  amber      (computed, but check it)
//	info    E3EFFA  pale blue  (how a value was read)
const (
	fillError   = "FDE2E1"
	fillWarning = "FFEFC7"
	fillInfo    = "E3EFFA"
)

// Bounds of the marking work.
const (
	// maxCellNotes is the number of comments written per sheet; further
	// cells with findings are only filled (every finding stays listed in
	// the Carbon warnings sheet).
	maxCellNotes = 2000
	// maxNoteLines is the number of findings listed in one comment; the
	// rest are counted ("n more in Carbon warnings").
	maxNoteLines = 3
	// maxNoteLine is the length, in characters, of one finding's line in a
	// comment; a longer message is cut with "…".
	maxNoteLine = 160
)

// noteAuthor is the author shown on fluecell's comments.
const noteAuthor = "fluecell"

// sevRank orders severities, most severe highest.
func sevRank(sev string) int {
	switch sev {
	case SevError:
		return 3
	case SevWarning:
		return 2
	case SevInfo:
		return 1
	}
	return 0
}

// sevFill is the fill colour of a severity ("" for an unknown one).
func sevFill(sev string) string {
	switch sev {
	case SevError:
		return fillError
	case SevWarning:
		return fillWarning
	case SevInfo:
		return fillInfo
	}
	return ""
}

// ownFill reports whether hex (RRGGBB, any case) is one of the fills above.
func ownFill(hex string) bool {
	switch strings.ToUpper(hex) {
	case fillError, fillWarning, fillInfo:
		return true
	}
	return false
}

// cellFinding gathers the findings at one cell.
type cellFinding struct {
	col, row int
	worst    string
	list     []Warning
}

// fillKey identifies a derived style: the cell's own style and the
// severity whose fill it adds.
type fillKey struct {
	style int
	sev   string
}

// markFindings marks, in the data sheets that get computed columns in
// place (work, with their occupancy occs), each cell with a finding of the
// report: a comment listing the findings' severity, code and message, and
// a light fill by the most severe one (see fillError and the others),
// added to the cell's own style so that its value, number format, font,
// border and alignment stay as they were. The styles are made in g (the
// added book, whose styles become the workbook's); the comments are added
// to the edit ed.
//
// Only sheets that hold computed columns written in place are marked: a
// sheet whose table went to a side sheet is left untouched, and so is
// every sheet with no computed table. Within a marked sheet:
//   - a finding is marked only inside the area of the sheet's tables
//     (column A to the tables' last column, row 1 to their last row),
//     which lies within the sheet's used range; findings elsewhere are in
//     the Carbon warnings sheet only;
//   - a finding inside a merged range goes to the range's top-left cell,
//     the one Excel shows;
//   - a cell that already has a comment keeps it as it is: it gets the
//     fill only, and its findings are read in Carbon warnings;
//   - at most maxCellNotes comments are written per sheet, in row order;
//     further cells get the fill only.
//
// Derived styles are cached by (original style, severity), so thousands of
// findings add only a few styles. The new style repeats what excelize reads
// of the old one (number format, font, border, alignment, protection); a
// link to a named cell style ("Heading 1") is not carried over, and a
// conditional format of the sheet still draws over the fill.
func (res *ScanResult) markFindings(g *excelize.File, ed *bookio.Edit, work map[string]*sheetWork, occs map[string]*sheetOccupancy) error {
	type area struct{ cols, rows int }
	areas := map[string]*area{}
	side := map[string]bool{}
	for _, t := range res.sc.tables {
		if len(t.rules) == 0 || t.n() == 0 {
			continue
		}
		sh := t.spec.sheet
		if t.layout != LayoutInline {
			side[sh] = true
			continue
		}
		a := areas[sh]
		if a == nil {
			a = &area{}
			areas[sh] = a
		}
		a.cols = max(a.cols, t.spec.lastCol)
		a.rows = max(a.rows, t.lastRow, t.spec.headerRow)
	}
	bySheet := map[string][]Warning{}
	for _, w := range res.Report.Warnings {
		if areas[w.Sheet] != nil && !side[w.Sheet] {
			bySheet[w.Sheet] = append(bySheet[w.Sheet], w)
		}
	}
	sheets := make([]string, 0, len(bySheet))
	for s := range bySheet {
		sheets = append(sheets, s)
	}
	sort.Strings(sheets)
	cache := map[fillKey]int{}
	fill := func(old int, sev string) int {
		k := fillKey{old, sev}
		id, ok := cache[k]
		if !ok {
			id = filledStyle(g, old, sevFill(sev))
			cache[k] = id
		}
		return id
	}
	for _, sheet := range sheets {
		if err := res.sc.cancelled(); err != nil {
			return err
		}
		a, occ, w := areas[sheet], occs[sheet], work[sheet]
		if occ == nil || w == nil {
			continue
		}
		cells := findingCells(occ.merges, bySheet[sheet], a.cols, a.rows)
		w.marks, w.notes = markSheet(cells, false)
		w.restyle = restyler(fill)
	}
	return nil
}

// markSheet gives each cell of cells a mark (coded by its worst
// severity, sevRank) and, unless the sheet has comments of its own
// (ownNotes), a note, for the first maxCellNotes cells.
func markSheet(cells []*cellFinding, ownNotes bool) ([]bookio.Mark, []bookio.Note) {
	var marks []bookio.Mark
	var notes []bookio.Note
	for _, cf := range cells {
		marks = append(marks, bookio.Mark{Row: cf.row, Col: cf.col, Code: uint8(sevRank(cf.worst))})
		if !ownNotes && len(notes) < maxCellNotes {
			notes = append(notes, bookio.Note{Col: cf.col, Row: cf.row, Text: noteText(cf.list)})
		}
	}
	return marks, notes
}

// restyler is the style of a marked cell from its own style and its
// mark's code: fill's derived style, or its own where fill fails (-1: a
// style that cannot be read back leaves the cell unfilled).
func restyler(fill func(old int, sev string) int) func(old int, code uint8) int {
	return func(old int, code uint8) int {
		if id := fill(old, sevByRank(code)); id >= 0 {
			return id
		}
		return old
	}
}

// sevByRank is the severity of a sevRank.
func sevByRank(r uint8) string {
	switch r {
	case 3:
		return SevError
	case 2:
		return SevWarning
	}
	return SevInfo
}

// findingCells groups ws by the cell they mark, within columns 1..cols and
// rows 1..rows, moving a cell inside a merged range (spans) to its
// top-left cell. The cells come in row, then column order.
func findingCells(spans []rangeRef, ws []Warning, cols, rows int) []*cellFinding {
	at := map[[2]int]*cellFinding{}
	var out []*cellFinding
	for _, w := range ws {
		c, r, ok := parseRef(w.Cell)
		if !ok || c < 1 || r < 1 || c > cols || r > rows || sevFill(w.Severity) == "" {
			continue
		}
		for _, s := range spans {
			if c >= s.c1 && c <= s.c2 && r >= s.r1 && r <= s.r2 {
				c, r = s.c1, s.r1
				break
			}
		}
		cf := at[[2]int{c, r}]
		if cf == nil {
			cf = &cellFinding{col: c, row: r}
			at[[2]int{c, r}] = cf
			out = append(out, cf)
		}
		cf.list = append(cf.list, w)
		if sevRank(w.Severity) > sevRank(cf.worst) {
			cf.worst = w.Severity
		}
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].row != out[j].row {
			return out[i].row < out[j].row
		}
		return out[i].col < out[j].col
	})
	return out
}

// filledStyle returns a new style: style old with the solid fill color,
// or -1 when old cannot be read or the new one made.
func filledStyle(f *excelize.File, old int, color string) (id int) {
	defer func() {
		if recover() != nil { // excelize indexes the styles part as it finds it
			id = -1
		}
	}()
	st, err := f.GetStyle(old)
	if err != nil || st == nil {
		return -1
	}
	cp := *st // GetStyle builds a fresh Style: only Fill is replaced
	cp.Fill = excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{color}}
	if id, err = f.NewStyle(&cp); err != nil {
		return -1
	}
	return id
}

// noteText is the comment for the findings ws at one cell: one line per
// finding, "severity code: message", most severe first, at most
// maxNoteLines lines, each at most maxNoteLine characters.
func noteText(ws []Warning) string {
	ws = append([]Warning(nil), ws...)
	sort.SliceStable(ws, func(i, j int) bool { return sevRank(ws[i].Severity) > sevRank(ws[j].Severity) })
	var b strings.Builder
	for i, w := range ws {
		if i == maxNoteLines {
			b.WriteString("\n" + strconv.Itoa(len(ws)-i) + " more in " + SheetWarnings)
			break
		}
		if i > 0 {
			b.WriteByte('\n')
		}
		line := w.Severity + " " + w.Code + ": " + w.Message
		if r := []rune(line); len(r) > maxNoteLine {
			line = string(r[:maxNoteLine-1]) + "…"
		}
		b.WriteString(line)
	}
	return b.String()
}

// notComputedPrefix starts the text written in the computed cells of a row
// that got no number.
const notComputedPrefix = "not computed: "

// shortReason is the few words, by finding code, that say in a computed
// cell why its row has no number; the finding itself (Carbon warnings, and
// the comment at its cell) says the rest.
func shortReason(code string) string {
	switch code {
	case CodeFuelUnknown:
		return "unknown fuel"
	case CodeTechUnknown:
		return "unknown technology"
	case CodeUnitUnknown:
		return "no unit"
	case CodeUnitAmbiguous:
		return "ambiguous unit"
	case CodeUnitDimension:
		return "unit does not fit"
	case CodeValueNotNumber:
		return "no number"
	case CodeFormulaNoCache:
		return "formula not evaluated"
	case CodeFactorMissing:
		return "no factor"
	case CodeRuleError:
		return "rule failed"
	case CodeNotComputed:
		return "left out"
	case CodeGridUnknown:
		return "no grid given"
	}
	return strings.ReplaceAll(code, "-", " ")
}

// rowReasons returns, for the row index i of t (an index into t.rowNums),
// the short text to write in its computed cells when the row got no number
// from any rule, such as "not computed: unknown fuel"; "" for a row with a
// number. The reason is the row's first error finding inside the table's
// columns, else its not-computed or grid finding, else a table-wide one (a
// header cell's error, a table dropped as a copy), else "see Carbon
// warnings" (a finding summed up with others of its column).
func (res *ScanResult) rowReasons(t *table) func(i int) string {
	byRow := map[int]string{}
	rank := map[int]int{}
	table := ""
	tableRank := 0
	for _, w := range res.Report.Warnings {
		if w.Sheet != t.spec.sheet {
			continue
		}
		c, r, ok := parseRef(w.Cell)
		if !ok || c < t.spec.firstCol || c > t.spec.lastCol || r < t.spec.headerRow || r > t.lastRow {
			continue
		}
		k := 0
		switch {
		case w.Severity == SevError:
			k = 2
		case w.Code == CodeNotComputed || w.Code == CodeGridUnknown:
			k = 1
		default:
			continue
		}
		why := shortReason(w.Code)
		if r == t.spec.headerRow {
			if k > tableRank {
				table, tableRank = why, k
			}
			continue
		}
		if k > rank[r] {
			byRow[r], rank[r] = why, k
		}
	}
	if t.copyOf != nil {
		table = "a copy of another table"
	}
	if table == "" {
		table = "see " + SheetWarnings
	}
	return func(i int) string {
		for j := range t.rules {
			if !math.IsNaN(t.res[j].at(i)) {
				return ""
			}
		}
		if why := byRow[t.rowNum(i)]; why != "" {
			return notComputedPrefix + why
		}
		return notComputedPrefix + table
	}
}

// fillReasons puts why into every cell of vals (a streamed row's computed
// cells) when why is not "".
func fillReasons(vals []any, why string) {
	if why == "" {
		return
	}
	for j := range vals {
		vals[j] = why
	}
}
