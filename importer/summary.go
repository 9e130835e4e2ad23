package importer

import (
	"path/filepath"
	"sort"
	"strings"

	"github.com/xuri/excelize/v2"
)

// sumWriter writes the Carbon summary cell by cell, keeping the first error.
type sumWriter struct {
	f      *excelize.File
	name   string
	st     *styles
	row    int
	err    error
	charts []chartSpec // drawn below the tables once they are written
	wrap   int         // wrapped text style (wrapStyle)
}

func (w *sumWriter) set(ref string, v any, style int) {
	if w.err != nil {
		return
	}
	if s, ok := v.(string); ok {
		w.err = w.f.SetCellStr(w.name, ref, s) // text stays text, never a formula
	} else {
		w.err = w.f.SetCellValue(w.name, ref, v)
	}
	if w.err == nil && style != 0 {
		w.err = w.f.SetCellStyle(w.name, ref, ref, style)
	}
	if w.err == nil && style == w.st.headWrap && style != 0 {
		// two lines for a heading that wraps in its narrow column
		if _, r, err := excelize.CellNameToCoordinates(ref); err == nil {
			w.err = w.f.SetRowHeight(w.name, r, 30)
		}
	}
}

// wrapStyle is a wrapped, top-aligned text style, made once.
func (w *sumWriter) wrapStyle() int {
	if w.wrap == 0 && w.err == nil {
		w.wrap, w.err = w.f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}})
	}
	return w.wrap
}

// tall gives the current row the height of n lines of text.
func (w *sumWriter) tall(n int) {
	if n > 1 && w.err == nil {
		w.err = w.f.SetRowHeight(w.name, w.row, min(float64(n*lineHeight), excelize.MaxRowHeight))
	}
}

// link makes the cell ref of the summary an internal hyperlink to target
// ("'Fuel log'!A4").
func (w *sumWriter) link(ref, target string) {
	if w.err == nil {
		w.err = w.f.SetCellHyperLink(w.name, ref, target, "Location")
	}
}

// tableAnchor is where a table starts: its first header cell, "Fuel log!A4".
func tableAnchor(t *table) string {
	return t.spec.sheet + "!" + cellRef(t.spec.firstCol, t.spec.headerRow)
}

// heading writes a block's heading naming table t, linked to its header
// row, with a second link to its computed columns when they went to a side
// sheet.
func (w *sumWriter) heading(text string, t *table) {
	ref := cellRef(1, w.row)
	w.set(ref, text, w.st.head)
	if t != nil {
		w.link(ref, linkTarget(tableAnchor(t)))
		if t.layout == LayoutSideSheet && t.outSheet != "" {
			side := t.outSheet + "!" + cellRef(t.outCol, t.spec.headerRow)
			w.set(cellRef(7, w.row), "computed columns: "+side, 0)
			w.link(cellRef(7, w.row), linkTarget(side))
		}
	}
	w.row++
}

// writeSummary writes the Carbon summary: cautions fitting the tables,
// totals by kind, the build plan, totals by fuel in the workbook's words,
// by period and by grouping column (one section per kind, never a sum
// across kinds), every sheet and table with what happened to it, and the
// charts.
func (res *ScanResult) writeSummary(f *excelize.File, st *styles) error {
	name := SheetSummary
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	w := &sumWriter{f: f, name: name, st: st}
	rep := res.Report
	w.set("A1", "Carbon summary", st.title)
	w.set("A2", "Workbook: "+filepath.Base(res.Path)+"; rules: "+strings.Join(rep.Rules, "; "), st.note)
	w.row = 3
	for _, c := range res.cautions() {
		w.set(cellRef(1, w.row), c, st.note)
		w.row++
	}
	chartsAt := w.row // the line that points at the charts, once they are placed
	w.row += 2
	var kerr error
	w.row, kerr = res.writeKindBlock(f, name, w.set, st, w.row)
	if kerr != nil {
		return excelErr(res.Path, "sheet "+name, kerr)
	}
	if bp := rep.BuildPlan; bp != nil {
		// GtC and ppm of a plan are small numbers: three significant figures
		sciFmt := "0.000E+00"
		sci, err := f.NewStyle(&excelize.Style{CustomNumFmt: &sciFmt})
		if err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
		w.row = writeBuildPlanBlock(w.set, st, sci, w.row, bp)
	}
	// The breakdowns read every row once each: a stop is honoured between
	// tables.
	if err := res.sc.cancelled(); err != nil {
		return err
	}
	res.writeFuelBlock(w)
	for _, t := range res.sc.tables {
		if err := res.sc.cancelled(); err != nil {
			return err
		}
		res.writePeriodBlock(w, t)
	}
	for _, t := range res.sc.tables {
		if err := res.sc.cancelled(); err != nil {
			return err
		}
		res.writeGroupBlock(w, t)
	}
	res.writeTableList(w)
	if w.err != nil {
		return excelErr(res.Path, "sheet "+name, w.err)
	}
	// Widths that hold the figures (a national total has 18 characters),
	// the column headings wrapping within them; printed in landscape at
	// 70 %, the columns of a total up to its completeness (A to I) fit
	// one page, the links to the rows left out follow on the next.
	_ = f.SetColWidth(name, "A", "A", 28)
	_ = f.SetColWidth(name, "B", "E", 14)
	_ = f.SetColWidth(name, "F", "F", 14)
	_ = f.SetColWidth(name, "G", "G", 10)
	_ = f.SetColWidth(name, "H", "H", 9)
	_ = f.SetColWidth(name, "I", "I", 22)
	_ = f.SetColWidth(name, "J", "M", 14)
	_ = f.SetPageLayout(name, &excelize.PageLayoutOptions{Orientation: strPtr("landscape"), AdjustTo: uintPtr(70)})
	// The charts go below the tables, one under the other, each as wide
	// as the tables: readable on screen and on a printed page.
	if len(w.charts) > 0 {
		w.row++
		first := w.row
		w.set(cellRef(1, w.row), "Charts", st.head)
		w.row++
		for i, c := range w.charts {
			// A printed page per chart: none is cut between two pages.
			at := w.row
			if i == 0 {
				at = first
			}
			if err := f.InsertPageBreak(name, cellRef(1, at)); err != nil {
				return excelErr(res.Path, "sheet "+name, err)
			}
			if err := c.add(f, name, cellRef(1, w.row)); err != nil {
				return excelErr(res.Path, "the summary chart "+quoteText(c.title), err)
			}
			w.row += c.rows()
		}
		w.set(cellRef(1, chartsAt), "Charts: below the tables, from row "+itoa(first)+" (one thing each: tCO2e by fuel, period or group of one kind)", st.note)
		w.link(cellRef(1, chartsAt), quoteSheet(name)+"!A"+itoa(first))
	}
	if w.err != nil {
		return excelErr(res.Path, "sheet "+name, w.err)
	}
	return nil
}

func boolPtr(b bool) *bool    { return &b }
func intPtr(n int) *int       { return &n }
func strPtr(s string) *string { return &s }
func uintPtr(n uint) *uint    { return &n }

// breakdownColumns are the headers of a period or group line: those of the
// totals by kind, so that the columns read the same in every block.
func breakdownColumns(first string) []string {
	return []string{first, "tCO2 (fossil)", "tCO2e", "tCO2 biogenic (memo)", "rows computed", "rows found"}
}

// writeLines writes the lines of one kind of ks, in the order of keys, from
// column 1 on: key, fossil tCO2, tCO2e, biogenic CO2, rows computed and
// found; it returns the first and last rows written.
func (w *sumWriter) writeLines(ks *keyedShares, kind string, keys []string) (first, last int) {
	first = w.row
	m := ks.byKind[kind]
	for _, k := range keys {
		s := m[k]
		if s == nil {
			s = &share{}
		}
		w.set(cellRef(1, w.row), k, 0)
		w.set(cellRef(2, w.row), summaryValue(s.co2, nil), w.st.num)
		w.set(cellRef(3, w.row), summaryValue(s.co2e, nil), w.st.num)
		w.set(cellRef(4, w.row), summaryValue(s.bio, nil), w.st.num)
		w.set(cellRef(5, w.row), s.computed, w.st.int)
		w.set(cellRef(6, w.row), s.found, w.st.int)
		w.row++
	}
	return first, w.row - 1
}

// writePeriodBlock writes t's tCO2e by period, one section per kind: by
// the date of each row, or by its period columns.
func (res *ScanResult) writePeriodBlock(w *sumWriter, t *table) {
	if t.copyOf != nil || t.rowState == nil || t.computed == 0 {
		return
	}
	var ks *keyedShares
	var labels []string
	var grain, note string
	if t.spec.kind == kindPeriods && len(t.spec.periods) > 0 {
		cp := t.planColumns()
		ks, labels, grain, note = t.columnShares(cp), cp.labels, cp.grain, cp.note
	} else {
		p, why := t.readDates()
		if p == nil {
			if why != "" {
				w.set(cellRef(1, w.row), why+" ("+tableAnchor(t)+")", w.st.note)
				w.row += 2
			}
			return
		}
		ks, labels = t.periodShares(p)
		grain, note = p.grain.String(), p.note()
	}
	for _, kind := range ks.kinds() {
		w.heading("By "+grain+": "+KindLabel(kind)+" ("+tableAnchor(t)+")", t)
		for i, h := range breakdownColumns(grain) {
			w.set(cellRef(1+i, w.row), h, w.st.headWrap)
		}
		w.row++
		first, last := w.writeLines(ks, kind, labels)
		if _, ok := ks.byKind[kind]["(no date)"]; ok {
			w.writeLines(ks, kind, []string{"(no date)"})
		}
		w.set(cellRef(1, w.row), note, w.st.note)
		w.row += 2
		if len(w.charts) < maxCharts && last > first {
			ml := 0
			for _, l := range labels {
				ml = max(ml, labelLen(l))
			}
			w.charts = append(w.charts, chartSpec{title: "tCO2e by " + grain + ": " + KindLabel(kind) + ", " + t.spec.sheet,
				catCol: 1, valCols: []int{3}, first: first, last: last, maxLabel: ml, maxValue: maxOf(ks.byKind[kind], labels)})
		}
	}
}

// writeGroupBlock writes t's totals by its grouping column, one section per
// kind, largest first.
func (res *ScanResult) writeGroupBlock(w *sumWriter, t *table) {
	if t.copyOf != nil || t.computed == 0 {
		return
	}
	ks, why := t.groupShares()
	if ks == nil {
		if why != "" {
			w.set(cellRef(1, w.row), why+" ("+tableAnchor(t)+")", w.st.note)
			w.row += 2
		}
		return
	}
	g := t.spec.group
	for _, kind := range ks.kinds() {
		w.heading("By "+g.hdr.Text+": "+KindLabel(kind)+" ("+tableAnchor(t)+")", t)
		for i, h := range breakdownColumns(strings.ToLower(g.hdr.Text)) {
			w.set(cellRef(1+i, w.row), h, w.st.headWrap)
		}
		w.row++
		keys := byShare(ks.byKind[kind], ks.order[kind])
		first, _ := w.writeLines(ks, kind, keys)
		w.row++
		last, title := chartEnd(ks.byKind[kind], keys, first, "tCO2e by "+strings.ToLower(g.hdr.Text)+": "+KindLabel(kind)+", "+t.spec.sheet)
		if len(w.charts) < maxCharts && last > first {
			w.charts = append(w.charts, chartSpec{title: title, catCol: 1, valCols: []int{3}, first: first, last: last, horizontal: true, maxValue: maxOf(ks.byKind[kind], keys)})
		}
	}
}

// chartEnd is the last row a bar chart of lines keys (from row first)
// shows: the last line with a number, and no more than maxChartBar lines,
// the title saying so when lines are left out of the chart.
func chartEnd(m map[string]*share, keys []string, first int, title string) (int, string) {
	n := 0
	for i, k := range keys {
		if s := m[k]; s != nil && (s.co2e != 0 || s.bio != 0 || s.co2 != 0) {
			n = i + 1
		}
	}
	if n > maxChartBar {
		return first + maxChartBar - 1, title + " (the largest " + itoa(maxChartBar) + " of " + itoa(n) + ")"
	}
	return first + n - 1, title
}

// maxOf is the largest tCO2e or biogenic CO2 of the lines keys.
func maxOf(m map[string]*share, keys []string) float64 {
	x := 0.0
	for _, k := range keys {
		if s := m[k]; s != nil {
			x = max(x, s.co2e, s.bio)
		}
	}
	return x
}

// byShare orders keys by tCO2e, then fossil tCO2, largest first, then
// by name.
func byShare(m map[string]*share, keys []string) []string {
	out := append([]string(nil), keys...)
	sort.SliceStable(out, func(i, j int) bool {
		a, b := m[out[i]], m[out[j]]
		if a.co2e != b.co2e {
			return a.co2e > b.co2e
		}
		if a.co2 != b.co2 {
			return a.co2 > b.co2
		}
		return out[i] < out[j]
	})
	return out
}

// writeFuelBlock writes the totals by fuel, one section per kind: the
// workbook's words for each fuel beside fluecell's id, and a chart of the
// largest kind (fossil tCO2e beside the biogenic CO2 memo when there is
// any).
func (res *ScanResult) writeFuelBlock(w *sumWriter) {
	ks, fw := res.fuelShares()
	kinds := ks.kinds()
	if len(kinds) == 0 {
		return
	}
	w.set(cellRef(1, w.row), "By fuel (technology for build plans), in the workbook's words: kinds apart", w.st.head)
	w.row++
	for _, kind := range kinds {
		w.set(cellRef(1, w.row), "By fuel: "+KindLabel(kind), w.st.head)
		w.row++
		for i, h := range []string{"as written in the workbook", "fluecell id", "tCO2 (fossil)", "tCO2e", "tCO2 biogenic (memo)", "rows computed", "rows found"} {
			w.set(cellRef(1+i, w.row), h, w.st.headWrap)
		}
		w.row++
		m := ks.byKind[kind]
		first := w.row
		bio := false
		keys := byShare(m, ks.order[kind])
		// Names read as no fuel, with no row computed (prices, counts, a
		// misspelt fuel), share one line: their rows are in the findings.
		var quiet []string
		quietRows := 0
		shown := keys[:0:0]
		for _, k := range keys {
			if s := m[k]; fw.unknown[kind+"|"+k] && s.computed == 0 && !s.has {
				quiet = append(quiet, k)
				quietRows += s.found
				continue
			}
			shown = append(shown, k)
		}
		keys = shown
		for _, k := range keys {
			s := m[k]
			words := fw.text(kind, k)
			if words == "" {
				words = k
			}
			w.set(cellRef(1, w.row), words, 0)
			w.set(cellRef(2, w.row), fw.id(kind, k), 0)
			w.set(cellRef(3, w.row), summaryValue(s.co2, nil), w.st.num)
			w.set(cellRef(4, w.row), summaryValue(s.co2e, nil), w.st.num)
			w.set(cellRef(5, w.row), summaryValue(s.bio, nil), w.st.num)
			w.set(cellRef(6, w.row), s.computed, w.st.int)
			w.set(cellRef(7, w.row), s.found, w.st.int)
			bio = bio || s.bio != 0
			w.row++
		}
		if len(quiet) > 0 {
			text := strings.Join(quiet[:min(len(quiet), maxFuelWords)], "; ")
			if len(quiet) > maxFuelWords {
				text += "; and " + plural(len(quiet)-maxFuelWords, "other name")
			}
			w.set(cellRef(1, w.row), "not read as a fuel: "+text, w.wrapStyle())
			w.tall(textLines("not read as a fuel: "+text, 44))
			w.set(cellRef(2, w.row), "(unknown names)", 0)
			w.set(cellRef(6, w.row), 0, w.st.int)
			w.set(cellRef(7, w.row), quietRows, w.st.int)
			w.row++
		}
		title := "tCO2e by fuel: " + KindLabel(kind)
		vals := []int{4}
		if bio {
			title, vals = "Fossil tCO2e and biogenic CO2 (memo) by fuel: "+KindLabel(kind), []int{4, 5}
		}
		last, title := chartEnd(m, keys, first, title)
		if len(w.charts) < maxCharts && last > first {
			w.charts = append(w.charts, chartSpec{title: title, catCol: 2, valCols: vals, first: first, last: last, horizontal: true, maxValue: maxOf(m, keys)})
		}
	}
	w.set(cellRef(1, w.row), "Rows are counted per fuel, and a row of two kinds (a fuel and its purchased energy) in each; the totals by kind above are the sums.", w.st.note)
	w.row += 2
}

// writeTableList writes every sheet and table with what happened to it,
// each table linked to its header row and to its computed columns.
func (res *ScanResult) writeTableList(w *sumWriter) {
	rep := res.Report
	w.set(cellRef(1, w.row), "Sheets and tables: what was computed, and why not", w.st.head)
	w.row++
	for i, h := range []string{"sheet or table", "status", "rows", "computed", "reason", "", "computed columns"} {
		if h != "" {
			w.set(cellRef(1+i, w.row), h, w.st.headWrap)
		}
	}
	w.row++
	for _, sh := range rep.Sheets {
		w.set(cellRef(1, w.row), sh.Name, 0)
		w.set(cellRef(2, w.row), sh.Status, 0)
		w.set(cellRef(3, w.row), sh.Rows, w.st.int)
		w.set(cellRef(4, w.row), sh.Computed, w.st.int)
		w.set(cellRef(5, w.row), sh.Reason, 0)
		w.row++
		for _, tb := range rep.Tables {
			if tb.Sheet != sh.Name {
				continue
			}
			ref := cellRef(1, w.row)
			w.set(ref, "  table "+tb.Range+" ("+tb.Kind+")", 0)
			w.link(ref, linkTarget(tb.Sheet+"!"+tb.Range[:indexByteOr(tb.Range, ':')]))
			w.set(cellRef(2, w.row), tb.Status, 0)
			w.set(cellRef(3, w.row), tb.Rows, w.st.int)
			w.set(cellRef(4, w.row), tb.Computed, w.st.int)
			w.set(cellRef(5, w.row), tb.Reason, 0)
			if tb.Output != "" {
				at := tb.Output[:indexByteOr(tb.Output, ':')]
				w.set(cellRef(7, w.row), tb.Output, 0)
				w.link(cellRef(7, w.row), linkTarget(at))
			}
			w.row++
		}
	}
}
