package importer

import (
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/xuri/excelize/v2"
)

// quoteSheet writes a sheet name for a formula reference.
func quoteSheet(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }

// writeWarnings streams the warnings, one per row; the cell of each is a
// link to it, and a finding in a table whose computed columns went to a side
// sheet links to that row of the side sheet too (warnlinks.go).
func (res *ScanResult) writeWarnings(f *excelize.File, st *styles) error {
	name := SheetWarnings
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	linkStyle, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Color: "1F5FA8", Underline: "single"}})
	if err != nil {
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
	_ = sw.SetColWidth(6, 6, 22)
	_ = sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"})
	head := []any{}
	for _, h := range []string{"sheet", "cell", "severity", "code", "message", "computed columns"} {
		head = append(head, excelize.Cell{StyleID: st.head, Value: h})
	}
	if err := sw.SetRow("A1", head); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	links := res.newWarnLinks(f, name)
	vals := make([]any, 6)
	for i, w := range res.Report.Warnings {
		r := i + 2
		cellLink, side := links.targets(w)
		vals[0], vals[1], vals[2], vals[3], vals[4], vals[5] = w.Sheet, w.Cell, w.Severity, w.Code, w.Message, nil
		if cellLink != "" && links.room() {
			vals[1] = excelize.Cell{StyleID: linkStyle, Value: w.Cell}
			links.add(cellRef(2, r), cellLink)
		}
		if side != "" && links.room() {
			vals[5] = excelize.Cell{StyleID: linkStyle, Value: side}
			links.add(cellRef(6, r), linkTarget(side))
		}
		if err := sw.SetRow("A"+strconv.Itoa(r), vals); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	n := len(res.Report.Warnings)
	if n == 0 {
		if err := sw.SetRow("A2", []any{"", "", "", "", "no warnings: every unit and value was read as written"}); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	if links.skipped > 0 {
		msg := "the first " + itoa(maxWarnLinks) + " links were written; the cells of the other rows are named without a link"
		if err := sw.SetRow("A"+strconv.Itoa(n+3), []any{"", "", "", "", msg}); err != nil {
			return excelErr(res.Path, "sheet "+name, err)
		}
	}
	if links.err != nil {
		return excelErr(res.Path, "sheet "+name, links.err)
	}
	if err := sw.Flush(); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	return nil
}

// writeSources streams the provenance: cautions, rules, packs with their
// versions, every factor used with its citation, and the notes. Long texts
// wrap: a caution or note spans the sheet's width, a source wraps in its
// column, and each row is as tall as its longest text needs (sourcewrap.go),
// on screen and on a printed page (one page wide, landscape).
func (res *ScanResult) writeSources(f *excelize.File, st *styles) error {
	name := SheetSources
	if _, err := f.NewSheet(name); err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	ww, err := newWrapWriter(f, name, st, []float64{44, 16, 14, 10, 10, 10, 10, 70})
	if err != nil {
		return excelErr(res.Path, "sheet "+name, err)
	}
	put, span := ww.put, ww.span
	put(st.title, "Carbon sources")
	for _, c := range res.cautions() {
		span(0, c)
	}
	ww.skip()
	// Each table, then its rules across the sheet's width: a rule of a
	// table of many fuel columns is long.
	put(st.head, "table, then its rules", "rows computed", "of rows")
	for i, t := range res.sc.tables {
		info := res.Report.Tables[i]
		put(0, info.Sheet+"!"+info.Range, t.computed, t.dataRows)
		for _, r := range t.rules {
			span(0, "rule: "+r.src)
		}
		if len(t.rules) == 0 {
			span(0, "(no rule: see Carbon warnings)")
		}
	}
	ww.skip()
	put(st.head, "factor pack", "version", "basis", "rows", "", "", "", "title")
	for _, p := range res.Report.Packs {
		put(0, p.Name, p.Version, p.Basis, p.Rows, "", "", "", p.Title)
	}
	span(0, "engine version "+res.e.Version()+"; default pack "+res.e.DefaultPackName()+"; GWP set "+res.Report.GWPSet+" unless a rule names another")
	if m := res.Report.Mapping; m != nil {
		span(0, "tables read with the mapping "+m.Path+" (sha256 "+m.SHA256+"): header rows, roles, units and fuel names as it says")
	}
	ww.skip()
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
		span(0, "(no factor was used: no row was computed)")
	}
	ww.skip()
	put(st.head, "note", "", "", "", "", "", "", "rows")
	for _, n := range res.sc.noteOrd {
		ww.note(n, *res.sc.notes[n])
	}
	for _, n := range res.readingNotes() {
		span(0, n)
	}
	if ww.err != nil {
		return excelErr(res.Path, "sheet "+name, ww.err)
	}
	if err := ww.sw.Flush(); err != nil {
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
		why := "where they could not go beside the table (see the " + CodeColumnsMoved + " findings)"
		if n := res.sc.lim.layoutCells; n < 0 {
			why = "(side sheets were asked for)"
		} else if n < math.MaxInt {
			why = "on sheets with more than " + strconv.Itoa(n) + " cells, or " + why
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
