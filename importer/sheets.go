package importer

import (
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/xuri/excelize/v2"
)

// Cautions written to the Carbon sources sheet (and the summary).
const (
	CautionTier1     = "Default factors are Tier 1 estimates (IPCC 2006 defaults, US EPA Hub averages), not measurements of these fuels or plants."
	CautionRegulated = "Regulated reporting follows the jurisdiction's rules and accredited verification: check the figures and factors before relying on them."
)

// quoteSheet writes a sheet name for a formula reference.
func quoteSheet(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }

type sumRow struct {
	key string
	sum
}

// sortedSums orders totals by tCO2e (then tCO2), largest first.
func sortedSums(m map[string]*sum) []sumRow {
	out := make([]sumRow, 0, len(m))
	for k, s := range m {
		out = append(out, sumRow{k, *s})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].TCO2e != out[j].TCO2e {
			return out[i].TCO2e > out[j].TCO2e
		}
		if out[i].TCO2 != out[j].TCO2 {
			return out[i].TCO2 > out[j].TCO2
		}
		return out[i].key < out[j].key
	})
	return out
}

// writeSummary writes totals by fuel and by each table's grouping column,
// with a column chart of the totals by fuel.
func (res *ScanResult) writeSummary(f *excelize.File, st *styles) error {
	name := SheetSummary
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	var werr error
	set := func(ref string, v any, style int) {
		if werr != nil {
			return
		}
		if s, ok := v.(string); ok {
			werr = f.SetCellStr(name, ref, s)
		} else {
			werr = f.SetCellValue(name, ref, v)
		}
		if werr == nil && style != 0 {
			werr = f.SetCellStyle(name, ref, ref, style)
		}
	}
	rep := res.Report
	set("A1", "Carbon summary", st.title)
	set("A2", "Workbook: "+filepath.Base(res.Path)+"; rules: "+strings.Join(rep.Rules, "; "), st.note)
	set("A3", CautionTier1+" "+CautionRegulated, st.note)
	row := 5
	header := func(first string) {
		for i, h := range []string{first, "tCO2", "tCO2e", "rows"} {
			set(cellRef(1+i, row), h, st.head)
		}
		row++
	}
	row, kerr := res.writeKindBlock(f, name, set, st, row)
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
		row = writeBuildPlanBlock(set, st, sci, row, bp)
	}

	fuels := map[string]*sum{}
	for _, t := range res.sc.tables {
		for k, s := range t.byFuel {
			a := fuels[k]
			if a == nil {
				a = &sum{}
				fuels[k] = a
			}
			a.TCO2 += s.TCO2
			a.TCO2e += s.TCO2e
			a.rows += s.rows
		}
	}
	set(cellRef(1, row), "By fuel (technology for build plans)", st.head)
	row++
	header("fuel")
	fuelFirst := row
	for _, s := range sortedSums(fuels) {
		set(cellRef(1, row), s.key, 0)
		set(cellRef(2, row), summaryValue(s.TCO2, nil), st.num)
		set(cellRef(3, row), summaryValue(s.TCO2e, nil), st.num)
		set(cellRef(4, row), s.rows, st.int)
		row++
	}
	fuelLast := row - 1
	row++
	type groupBlock struct{ first, last int }
	var groups []groupBlock
	for _, t := range res.sc.tables {
		if t.spec.group == nil || len(t.byGroup) == 0 {
			continue
		}
		main, _ := t.baseKinds()
		set(cellRef(1, row), "By "+t.spec.group.hdr.Text+" ("+t.spec.sheet+"!"+cellRef(t.spec.firstCol, t.spec.headerRow)+"; "+KindLabel(main)+" only)", st.head)
		row++
		header(strings.ToLower(t.spec.group.hdr.Text))
		g := groupBlock{first: row}
		for _, s := range sortedSums(t.byGroup) {
			set(cellRef(1, row), s.key, 0)
			set(cellRef(2, row), summaryValue(s.TCO2, nil), st.num)
			set(cellRef(3, row), summaryValue(s.TCO2e, nil), st.num)
			set(cellRef(4, row), s.rows, st.int)
			row++
		}
		g.last = row - 1
		groups = append(groups, g)
		row++
	}
	// Every sheet and table, with what happened to it: nothing is skipped
	// without a word.
	set(cellRef(1, row), "Sheets and tables: what was computed, and why not", st.head)
	row++
	for i, h := range []string{"sheet or table", "status", "rows", "computed", "reason"} {
		set(cellRef(1+i, row), h, st.head)
	}
	row++
	for _, sh := range rep.Sheets {
		set(cellRef(1, row), sh.Name, 0)
		set(cellRef(2, row), sh.Status, 0)
		set(cellRef(3, row), sh.Rows, st.int)
		set(cellRef(4, row), sh.Computed, st.int)
		set(cellRef(5, row), sh.Reason, 0)
		row++
		for _, tb := range rep.Tables {
			if tb.Sheet != sh.Name {
				continue
			}
			set(cellRef(1, row), "  table "+tb.Range+" ("+tb.Kind+")", 0)
			set(cellRef(2, row), tb.Status, 0)
			set(cellRef(3, row), tb.Rows, st.int)
			set(cellRef(4, row), tb.Computed, st.int)
			set(cellRef(5, row), tb.Reason, 0)
			row++
		}
	}
	if werr != nil {
		return excelErr(res.Path, "sheet "+name, werr)
	}
	_ = f.SetColWidth(name, "A", "A", 40)
	_ = f.SetColWidth(name, "B", "F", 14)
	_ = f.SetColWidth(name, "G", "G", 26)
	_ = f.SetColWidth(name, "H", "J", 16)
	q := quoteSheet(name)
	chart := func(cell, title string, first, last int) error {
		if last < first {
			return nil
		}
		cats := q + "!$A$" + strconv.Itoa(first) + ":$A$" + strconv.Itoa(last)
		return f.AddChart(name, cell, &excelize.Chart{
			Type: excelize.Col,
			Series: []excelize.ChartSeries{
				{Name: q + "!$B$" + strconv.Itoa(first-1), Categories: cats, Values: q + "!$B$" + strconv.Itoa(first) + ":$B$" + strconv.Itoa(last)},
				{Name: q + "!$C$" + strconv.Itoa(first-1), Categories: cats, Values: q + "!$C$" + strconv.Itoa(first) + ":$C$" + strconv.Itoa(last)},
			},
			Title:     excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: title}}},
			Legend:    excelize.ChartLegend{Position: "bottom"},
			Dimension: excelize.ChartDimension{Width: 560, Height: 300},
			YAxis:     excelize.ChartAxis{Title: excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: "t"}}}},
		})
	}
	if err := chart("L5", "Emissions by fuel (t)", fuelFirst, fuelLast); err != nil {
		return excelErr(res.Path, "the summary chart", err)
	}
	for i, g := range groups {
		if i >= 3 {
			break
		}
		if err := chart("L"+strconv.Itoa(22+18*i), "Emissions by group (t)", g.first, g.last); err != nil {
			return excelErr(res.Path, "the summary chart", err)
		}
	}
	return nil
}

// writeWarnings streams the warnings, one per row.
func (res *ScanResult) writeWarnings(f *excelize.File, st *styles) error {
	name := SheetWarnings
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	sw, err := f.NewStreamWriter(name)
	if err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	_ = sw.SetColWidth(1, 1, 20)
	_ = sw.SetColWidth(2, 2, 8)
	_ = sw.SetColWidth(3, 3, 9)
	_ = sw.SetColWidth(4, 4, 18)
	_ = sw.SetColWidth(5, 5, 110)
	_ = sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"})
	head := []any{}
	for _, h := range []string{"sheet", "cell", "severity", "code", "message"} {
		head = append(head, excelize.Cell{StyleID: st.head, Value: h})
	}
	if err := sw.SetRow("A1", head); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	vals := make([]any, 5)
	for i, w := range res.Report.Warnings {
		vals[0], vals[1], vals[2], vals[3], vals[4] = w.Sheet, w.Cell, w.Severity, w.Code, w.Message
		if err := sw.SetRow("A"+strconv.Itoa(i+2), vals); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	if len(res.Report.Warnings) == 0 {
		if err := sw.SetRow("A2", []any{"", "", "", "", "no warnings: every unit and value was read as written"}); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	if err := sw.Flush(); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	return nil
}

// writeSources streams the provenance: cautions, rules, packs with their
// versions, every factor used with its citation, and the notes.
func (res *ScanResult) writeSources(f *excelize.File, st *styles) error {
	name := SheetSources
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	sw, err := f.NewStreamWriter(name)
	if err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	_ = sw.SetColWidth(1, 1, 42)
	_ = sw.SetColWidth(2, 3, 16)
	_ = sw.SetColWidth(4, 7, 11)
	_ = sw.SetColWidth(8, 8, 70)
	row := 1
	var werr error
	put := func(style int, vals ...any) {
		if werr != nil {
			return
		}
		if style != 0 {
			for i, v := range vals {
				vals[i] = excelize.Cell{StyleID: style, Value: v}
			}
		}
		werr = sw.SetRow("A"+strconv.Itoa(row), vals)
		row++
	}
	put(st.title, "Carbon sources")
	put(0, CautionTier1)
	put(0, CautionRegulated)
	row++
	put(st.head, "rule", "table", "rows computed", "of rows")
	for i, t := range res.sc.tables {
		info := res.Report.Tables[i]
		for _, r := range t.rules {
			put(0, r.src, info.Sheet+"!"+info.Range, t.computed, t.dataRows)
		}
		if len(t.rules) == 0 {
			put(0, "(no rule: see Carbon warnings)", info.Sheet+"!"+info.Range, 0, t.dataRows)
		}
	}
	row++
	put(st.head, "factor pack", "version", "basis", "rows", "", "", "", "title")
	for _, p := range res.Report.Packs {
		put(0, p.Name, p.Version, p.Basis, p.Rows, "", "", "", p.Title)
	}
	put(0, "engine version "+res.e.Version()+"; default pack "+res.e.DefaultPackName()+"; GWP set "+res.Report.GWPSet+" unless a rule names another")
	if m := res.Report.Mapping; m != nil {
		put(0, "tables read with the mapping "+m.Path+" (sha256 "+m.SHA256+"): header rows, roles, units and fuel names as it says")
	}
	row++
	put(st.head, "factor", "value", "unit", "low", "high", "basis", "rows using it", "source")
	used := append([]*funcs.Factor(nil), res.sc.usedOrd...)
	sort.SliceStable(used, func(i, j int) bool { return used[i].Key() < used[j].Key() })
	for _, fa := range used {
		u := res.sc.used[fa]
		src := fa.Source
		if fa.FromMemory && !strings.Contains(strings.ToLower(src), "memory") {
			src += " (value from memory: check it against the publication)"
		}
		put(0, fa.Key(), fa.Value, fa.Unit, optFloat(fa.Low), optFloat(fa.High), fa.BasisName, u.rows, src)
	}
	if len(used) == 0 {
		put(0, "(no factor was used: no row was computed)")
	}
	row++
	put(st.head, "note", "rows")
	for _, n := range res.sc.noteOrd {
		put(0, n, res.sc.notes[n])
	}
	for _, n := range res.readingNotes() {
		put(0, n)
	}
	if werr != nil {
		return excelErr(res.Path, "sheet "+name, werr)
	}
	if err := sw.Flush(); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	return nil
}

func optFloat(p *float64) any {
	if p == nil {
		return nil
	}
	return *p
}

// readingNotes says how the workbook was read where that is a convention.
func (res *ScanResult) readingNotes() []string {
	var out []string
	wide, side := false, false
	for _, t := range res.sc.tables {
		wide = wide || t.spec.kind == kindWide || t.spec.kind == kindPeriods
		side = side || t.layout == LayoutSideSheet
	}
	if wide {
		out = append(out, "blank cells and dashes in a per-fuel or per-period column count as zero use")
	}
	if side {
		why := "on sheets with more than " + strconv.Itoa(res.sc.lim.inlineCells) + " cells"
		if res.sc.lim.inlineCells < 0 {
			why = "(side sheets were asked for)"
		}
		out = append(out, "tables "+why+" get their computed columns in a \""+SheetColumns+"\" sheet, row for row; their own sheet is left untouched")
	}
	out = append(out, "numbers stored as text are read where they are unambiguous (1,250.5) and flagged; a row with an unusable cell gets no number (see "+SheetWarnings+")")
	return out
}

// buildPlanTotal sums the embodied tCO2e of the build-plan tables, with the
// range of each technology's published minimum and maximum (infrastructure &
// supply chain, IPCC AR5 WG3 Annex III Table A.III.2), as GtC and ppm. It is
// nil when no build-plan row was computed.
func (res *ScanResult) buildPlanTotal() *BuildPlanTotal {
	var bp *BuildPlanTotal
	low, high := 0.0, 0.0
	var unranged []string
	for _, t := range res.sc.tables {
		if t.spec.kind != kindBuildPlan || t.copyOf != nil || t.computed == 0 {
			continue
		}
		if bp == nil {
			bp = &BuildPlanTotal{AirborneFraction: 1, ObservedAirborneFraction: funcs.ObservedAirborneFraction}
		}
		for _, k := range t.fuelOrd {
			s := t.byFuel[k]
			bp.TCO2e += s.TCO2e
			lo, hi, ok := res.embodiedRange(k)
			if !ok || len(res.sc.userRules) > 0 {
				unranged = append(unranged, k)
				continue
			}
			low += s.TCO2e * lo
			high += s.TCO2e * hi
		}
	}
	if bp == nil {
		return nil
	}
	switch {
	case len(res.sc.userRules) > 0:
		bp.RangeNote = "no range: the rules were given, and the spread of their factors is not known here"
	case len(unranged) > 0:
		bp.RangeNote = "no range: no published minimum and maximum for " + strings.Join(unranged, ", ")
	default:
		bp.Low, bp.High = &low, &high
	}
	if r, err := res.e.CallValues("carbon_from_co2", bp.TCO2e); err == nil {
		bp.GtC = r.Value / 1e9
	}
	if r, err := res.e.CallValues("ppm_from_co2", bp.TCO2e, "t"); err == nil {
		bp.PPM = r.Value
	}
	if r, err := res.e.CallValues("ppm_from_co2", bp.TCO2e, "t", bp.ObservedAirborneFraction); err == nil {
		bp.PPMObserved = r.Value
	}
	return bp
}

// embodiedRange is the ratio of a technology's published minimum and maximum
// infrastructure & supply-chain intensity to its median: the factor by which a
// build-plan row's median result scales to its low and high.
func (res *ScanResult) embodiedRange(tech string) (lo, hi float64, ok bool) {
	med, err := res.e.CallValues("lifecycle_part", tech, "infrastructure")
	if err != nil || med.Value <= 0 {
		return 0, 0, false
	}
	mn, err := res.e.CallValues("lifecycle_part", tech, "infrastructure", "min")
	if err != nil {
		return 0, 0, false
	}
	mx, err := res.e.CallValues("lifecycle_part", tech, "infrastructure", "max")
	if err != nil {
		return 0, 0, false
	}
	return mn.Value / med.Value, mx.Value / med.Value, true
}

// writeBuildPlanBlock writes the build plan's total with its range, as GtC and
// as ppm at the stated airborne fractions, from row on; it returns the next
// free row.
func writeBuildPlanBlock(set func(string, any, int), st *styles, sci, row int, bp *BuildPlanTotal) int {
	set(cellRef(1, row), "Build plan in the atmosphere (embodied emissions of what the plan builds)", st.head)
	row++
	for i, h := range []string{"", "median", "low", "high"} {
		set(cellRef(1+i, row), h, st.head)
	}
	row++
	line := func(label string, v float64, style int) {
		set(cellRef(1, row), label, 0)
		set(cellRef(2, row), v, style)
		if bp.Low != nil && bp.High != nil && bp.TCO2e != 0 {
			set(cellRef(3, row), v*(*bp.Low)/bp.TCO2e, style)
			set(cellRef(4, row), v*(*bp.High)/bp.TCO2e, style)
		}
		row++
	}
	line("tCO2e", bp.TCO2e, st.num)
	line("GtC (CO2e counted as CO2, x 12/44)", bp.GtC, sci)
	line("ppm CO2, airborne fraction "+funcs.FormatNumber(bp.AirborneFraction)+" (all of it stays: mass to concentration, 2.124 GtC per ppm)", bp.PPM, sci)
	line("ppm CO2, airborne fraction "+funcs.FormatNumber(bp.ObservedAirborneFraction)+" (long-run observed share that stays, Global Carbon Budget)", bp.PPMObserved, sci)
	note := "low and high: every row at its technology's published minimum and maximum (IPCC AR5 WG3 Annex III Table A.III.2). Screening estimates."
	if bp.RangeNote != "" {
		note = bp.RangeNote + ". Screening estimates."
	}
	set(cellRef(1, row), note, st.note)
	return row + 2
}
