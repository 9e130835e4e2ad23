package importer

import (
	"archive/zip"
	"context"
	"encoding/json"
	"io"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/calctest"
	"github.com/fluecell/fluecell/importer/demo"
)

// annotateDemo annotates the demo workbook number i (0 fuel log, 1 monthly
// energy, 2 build plan) with opt and returns the report and the output.
func annotateDemo(t *testing.T, i int, opt Options) (*Report, string) {
	t.Helper()
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	out := filepath.Join(dir, "out.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), paths[i], out, opt)
	must(t, err)
	return rep, out
}

// openpyxlLinksScript prints, as JSON, every hyperlink of the workbook
// (sheet, cell, location) and every chart (sheet, bar direction, and each
// series' name, category and value references), as openpyxl reads them.
const openpyxlLinksScript = `
import json, sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
links, charts = [], []
for ws in wb.worksheets:
    for row in ws.iter_rows():
        for c in row:
            if c.hyperlink is not None:
                links.append([ws.title, c.coordinate, c.hyperlink.location or ""])
    for ch in ws._charts:
        ser = []
        for s in ch.series:
            cat = s.cat.strRef.f if s.cat is not None and s.cat.strRef is not None else ""
            ser.append({"name": s.tx.strRef.f if s.tx is not None and s.tx.strRef is not None else "", "cat": cat, "val": s.val.numRef.f})
        charts.append({"sheet": ws.title, "dir": getattr(ch, "barDir", ""), "series": ser})
print(json.dumps({"links": links, "charts": charts}))
`

type pyChart struct {
	Sheet  string `json:"sheet"`
	Dir    string `json:"dir"`
	Series []struct {
		Name, Cat, Val string
	} `json:"series"`
}

// openpyxlLinks reads the hyperlinks and charts of path with Debian's
// openpyxl (skipping like calctest.Openpyxl when it is missing).
func openpyxlLinks(t *testing.T, path string) (links map[string]string, charts []pyChart) {
	t.Helper()
	calctest.Openpyxl(t, path) // skips, or fails under FLUECELL_REQUIRE_CALC, without openpyxl
	out, err := exec.Command("/usr/bin/python3", "-c", openpyxlLinksScript, path).Output()
	if err != nil {
		t.Fatalf("openpyxl: %v", err)
	}
	var got struct {
		Links  [][3]string `json:"links"`
		Charts []pyChart   `json:"charts"`
	}
	must(t, json.Unmarshal(out, &got))
	links = map[string]string{}
	for _, l := range got.Links {
		links[l[0]+"!"+l[1]] = l[2]
	}
	return links, got.Charts
}

// Every finding of Carbon warnings links to its cell ("'Fuel log'!C11"),
// read back with excelize and with openpyxl; the summary's headings and
// its list of tables link to the tables' header rows.
func TestWarningsLinkToCells(t *testing.T) {
	rep, out := annotateDemo(t, 0, Options{})
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	links, _ := openpyxlLinks(t, out)
	if len(rep.Warnings) < 10 {
		t.Fatalf("%d findings in the demo fuel log", len(rep.Warnings))
	}
	for i, w := range rep.Warnings {
		ref := cellRef(2, i+2)
		want := quoteSheet(w.Sheet) + "!" + w.Cell
		ok, target, err := g.GetCellHyperLink(SheetWarnings, ref)
		must(t, err)
		if !ok || target != want {
			t.Errorf("%s!%s (%s %s) links to %q, want %q", SheetWarnings, ref, w.Code, w.Cell, target, want)
		}
		if got := links[SheetWarnings+"!"+ref]; got != want {
			t.Errorf("openpyxl: %s!%s links to %q, want %q", SheetWarnings, ref, got, want)
		}
		if v, _ := g.GetCellValue(SheetWarnings, ref); v != w.Cell {
			t.Errorf("%s!%s reads %q, want the cell %q as text", SheetWarnings, ref, v, w.Cell)
		}
		if f, _ := g.GetCellFormula(SheetWarnings, ref); f != "" {
			t.Errorf("%s!%s holds the formula %q", SheetWarnings, ref, f)
		}
	}
	// The summary: the list of tables and each block's heading link to the
	// table's first header cell, A4.
	rows, err := g.GetRows(SheetSummary)
	must(t, err)
	headings := 0
	for i, r := range rows {
		if len(r) == 0 {
			continue
		}
		if strings.HasSuffix(r[0], "(Fuel log!A4)") || strings.HasPrefix(r[0], "  table A4:G21") {
			headings++
			ref := cellRef(1, i+1)
			if ok, target, _ := g.GetCellHyperLink(SheetSummary, ref); !ok || target != "'Fuel log'!A4" {
				t.Errorf("summary %s %q links to %q", ref, r[0], target)
			}
			if got := links[SheetSummary+"!"+ref]; got != "'Fuel log'!A4" {
				t.Errorf("openpyxl: summary %s %q links to %q", ref, r[0], got)
			}
		}
	}
	if headings != 3 { // by day, by site, the table in the list
		t.Errorf("%d summary lines name the table", headings)
	}
}

// With the computed columns on a side sheet, a finding in the table's rows
// links to its cell and to the same row of the side sheet; the summary's
// table list links to both.
func TestWarningsLinkToSideSheet(t *testing.T) {
	rep, out := annotateDemo(t, 0, Options{InlineMaxCells: -1})
	if rep.Layout != LayoutSideSheet {
		t.Fatalf("layout %s", rep.Layout)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	links, _ := openpyxlLinks(t, out)
	n := 0
	for i, w := range rep.Warnings {
		_, row, ok := parseRef(w.Cell)
		if !ok || w.Sheet != "Fuel log" || row < 4 {
			continue
		}
		n++
		ref := cellRef(6, i+2)
		text, _ := g.GetCellValue(SheetWarnings, ref)
		want := SheetColumns + "!B" + itoaT(row)
		ok, target, _ := g.GetCellHyperLink(SheetWarnings, ref)
		if text != want || !ok || target != linkTarget(want) || links[SheetWarnings+"!"+ref] != linkTarget(want) {
			t.Errorf("%s!%s for %s: %q linking to %q (openpyxl %q), want %q", SheetWarnings, ref, w.Cell, text, target, links[SheetWarnings+"!"+ref], want)
		}
	}
	if n == 0 {
		t.Fatal("no finding in the table's rows")
	}
	rows, err := g.GetRows(SheetSummary)
	must(t, err)
	for i, r := range rows {
		if len(r) > 6 && strings.HasPrefix(r[0], "  table A4:G21") {
			if ok, target, _ := g.GetCellHyperLink(SheetSummary, cellRef(7, i+1)); !ok || target != "'"+SheetColumns+"'!A4" {
				t.Errorf("the table's computed columns %q link to %q", r[6], target)
			}
			return
		}
	}
	t.Error("no table line in the summary")
}

// chartXML is one chart part of a workbook: its series' names, categories
// and values as the drawing references them (DrawingML chart elements,
// with or without the c: prefix).
type chartXML struct {
	dir                string
	names, cats, value []string
}

var (
	serRe  = regexp.MustCompile(`(?s)<(?:c:)?ser>.*?</(?:c:)?ser>`)
	txRe   = regexp.MustCompile(`(?s)<(?:c:)?tx><(?:c:)?strRef><(?:c:)?f>([^<]*)</`)
	catRe  = regexp.MustCompile(`(?s)<(?:c:)?cat><(?:c:)?(?:str|num)Ref><(?:c:)?f>([^<]*)</`)
	valRe  = regexp.MustCompile(`(?s)<(?:c:)?val><(?:c:)?numRef><(?:c:)?f>([^<]*)</`)
	dirRe  = regexp.MustCompile(`<(?:c:)?barDir val="(\w+)"`)
	unesc  = strings.NewReplacer("&#39;", "'", "&apos;", "'", "&amp;", "&")
	rangeR = regexp.MustCompile(`^'?(.*?)'?!\$([A-Z]+)\$(\d+)(?::\$([A-Z]+)\$(\d+))?$`)
)

// readCharts reads the chart parts of the xlsx at path, in part order.
func readCharts(t *testing.T, path string) []chartXML {
	t.Helper()
	z, err := zip.OpenReader(path)
	must(t, err)
	defer z.Close()
	var names []string
	files := map[string]*zip.File{}
	for _, f := range z.File {
		if strings.HasPrefix(f.Name, "xl/charts/chart") {
			names = append(names, f.Name)
			files[f.Name] = f
		}
	}
	sort.Strings(names)
	var out []chartXML
	for _, n := range names {
		rc, err := files[n].Open()
		must(t, err)
		b, err := io.ReadAll(rc)
		rc.Close()
		must(t, err)
		var c chartXML
		if m := dirRe.FindSubmatch(b); m != nil {
			c.dir = string(m[1])
		}
		for _, s := range serRe.FindAll(b, -1) {
			get := func(re *regexp.Regexp) string {
				if m := re.FindSubmatch(s); m != nil {
					return unesc.Replace(string(m[1]))
				}
				return ""
			}
			c.names = append(c.names, get(txRe))
			c.cats = append(c.cats, get(catRe))
			c.value = append(c.value, get(valRe))
		}
		out = append(out, c)
	}
	return out
}

// cellsOf reads the cells of a one-column reference "'Carbon summary'!$A$5:$A$10".
func cellsOf(t *testing.T, g *excelize.File, ref string) []string {
	t.Helper()
	m := rangeR.FindStringSubmatch(ref)
	if m == nil {
		t.Fatalf("reference %q", ref)
	}
	sheet := strings.ReplaceAll(m[1], "''", "'")
	first, last := m[3], m[5]
	if last == "" {
		last = first
	}
	var out []string
	for r := atoiT(first); r <= atoiT(last); r++ {
		v, err := g.GetCellValue(sheet, m[2]+itoaT(r))
		must(t, err)
		out = append(out, v)
	}
	return out
}

func atoiT(s string) int {
	n := 0
	for _, c := range s {
		n = n*10 + int(c-'0')
	}
	return n
}

// The demo fuel log's summary charts, read back from the chart parts and
// with openpyxl: three, each one thing. Fossil tCO2e beside the biogenic
// memo by fuel (two series), tCO2e by day (one series, the six days as
// categories), tCO2e by site (one series); no chart puts tCO2 beside tCO2e.
func TestSummaryCharts(t *testing.T) {
	_, out := annotateDemo(t, 0, Options{})
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	charts := readCharts(t, out)
	if len(charts) != 3 {
		t.Fatalf("%d charts, want 3", len(charts))
	}
	series := func(c chartXML) []string {
		var out []string
		for _, n := range c.names {
			out = append(out, cellsOf(t, g, n)[0])
		}
		return out
	}
	if got := strings.Join(series(charts[0]), "|"); got != "tCO2e|tCO2 biogenic (memo)" || charts[0].dir != "bar" {
		t.Errorf("chart 1: series %q (%s), want tCO2e beside the biogenic memo, bars across", got, charts[0].dir)
	}
	if got := cellsOf(t, g, charts[0].cats[0]); strings.Join(got, "|") != "gas_diesel_oil|natural_gas|lpg|wood" {
		t.Errorf("chart 1 fuels %q", got)
	}
	if got := strings.Join(series(charts[1]), "|"); got != "tCO2e" || charts[1].dir != "col" {
		t.Errorf("chart 2: series %q (%s), want tCO2e in columns", got, charts[1].dir)
	}
	if got := cellsOf(t, g, charts[1].cats[0]); strings.Join(got, "|") != "2026-03-30|2026-03-31|2026-04-01|2026-04-02|2026-04-03|2026-04-04" {
		t.Errorf("chart 2 days %q", got)
	}
	if got := cellsOf(t, g, charts[2].cats[0]); strings.Join(series(charts[2]), "|") != "tCO2e" || strings.Join(got, "|") != "Depot|Creamery|Farm shop" {
		t.Errorf("chart 3: series %q, sites %q", series(charts[2]), got)
	}
	for i, c := range charts {
		if s := series(c); len(s) > 1 && s[0] == "tCO2 (fossil)" || len(s) > 1 && s[1] == "tCO2 (fossil)" {
			t.Errorf("chart %d sets tCO2 beside tCO2e: %q", i+1, s)
		}
	}
	_, py := openpyxlLinks(t, out)
	if len(py) != 3 || len(py[0].Series) != 2 || len(py[1].Series) != 1 || len(py[2].Series) != 1 {
		t.Fatalf("openpyxl charts %+v", py)
	}
	for i, c := range py {
		for j, s := range c.Series {
			if s.Cat != charts[i].cats[j] || s.Val != charts[i].value[j] {
				t.Errorf("openpyxl chart %d series %d: %+v, the part says %s %s", i+1, j+1, s, charts[i].cats[j], charts[i].value[j])
			}
		}
	}
}

// Carbon sources wraps long texts: the sources of the factors wrap in
// their column, a caution spans the sheet merged and wrapped, and a row of
// long text is taller than one line.
func TestSourcesWrap(t *testing.T) {
	_, out := annotateDemo(t, 0, Options{})
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	wraps := func(ref string) bool {
		id, err := g.GetCellStyle(SheetSources, ref)
		must(t, err)
		st, err := g.GetStyle(id)
		must(t, err)
		return st.Alignment != nil && st.Alignment.WrapText
	}
	rows, err := g.GetRows(SheetSources)
	must(t, err)
	factors, tall := 0, 0
	for i, r := range rows {
		if len(r) > 7 && strings.HasPrefix(r[0], "ipcc2006/") {
			factors++
			if ref := cellRef(8, i+1); !wraps(ref) {
				t.Errorf("%s (%s) does not wrap", ref, r[7])
			}
		}
		if h, err := g.GetRowHeight(SheetSources, i+1); err == nil && h > 15 {
			tall++
		}
	}
	if factors < 10 {
		t.Errorf("%d factor rows", factors)
	}
	if tall == 0 {
		t.Error("no row is taller than one line")
	}
	merged, err := g.GetMergeCells(SheetSources)
	must(t, err)
	found := false
	for _, m := range merged {
		if m.GetStartAxis() == "A2" && m.GetEndAxis() == "H2" && m.GetCellValue() == CautionTier1 && wraps("A2") {
			found = true
		}
	}
	if !found {
		t.Errorf("the first caution is not merged across A2:H2 and wrapped: %+v", merged)
	}
}

// The cautions fit the tables: the combustion-factor caution under a fuel
// log, the life-cycle caution (and not the combustion one) under a build
// plan, the grid caution under purchased electricity; the regulated-
// reporting caution everywhere; in the summary and in Carbon sources.
func TestCautionsFitTables(t *testing.T) {
	texts := func(path string) string {
		g, err := excelize.OpenFile(path)
		must(t, err)
		defer g.Close()
		var b strings.Builder
		for _, sh := range []string{SheetSummary, SheetSources} {
			for r := 1; r <= 8; r++ {
				v, _ := g.GetCellValue(sh, cellRef(1, r))
				b.WriteString(sh + ": " + v + "\n")
			}
		}
		return b.String()
	}
	check := func(name, text string, want, not []string) {
		t.Helper()
		for _, c := range want {
			for _, sh := range []string{SheetSummary, SheetSources} {
				if !strings.Contains(text, sh+": "+c+"\n") {
					t.Errorf("%s: %s lacks %q", name, sh, c)
				}
			}
		}
		for _, c := range not {
			if strings.Contains(text, c) {
				t.Errorf("%s: shows %q", name, c)
			}
		}
	}
	_, fuel := annotateDemo(t, 0, Options{})
	check("fuel log", texts(fuel), []string{CautionTier1, CautionRegulated}, []string{CautionLifeCycle, CautionGrid})
	_, plan := annotateDemo(t, 2, Options{})
	check("build plan", texts(plan), []string{CautionLifeCycle, CautionRegulated}, []string{CautionTier1, CautionGrid})

	f := newBook(t, "Energy")
	setRows(t, f, "Energy", 1, energyLog)
	dir := t.TempDir()
	in := save(t, f, filepath.Join(dir, "energy.xlsx"))
	out := filepath.Join(dir, "energy.carbon.xlsx")
	_, err := Annotate(context.Background(), testEngine(t), in, out, Options{Grid: "Germany"})
	must(t, err)
	check("fuel and electricity", texts(out), []string{CautionTier1, CautionGrid, CautionRegulated}, []string{CautionLifeCycle})
}

// A sheet name with an apostrophe is quoted in the link as in a formula
// reference (the name in single quotes, its apostrophe doubled), and the
// cell column keeps the cell as text. Names are invented.
func TestWarningLinkQuotesSheet(t *testing.T) {
	const sheet = "Brae's log"
	f := newBook(t, sheet)
	setRows(t, f, sheet, 1, [][]any{
		{"Fuel", "Quantity", "Unit"},
		{"diesel", 1200, "L"},
		{"diesel", 300, "furlongs"},
	})
	dir := t.TempDir()
	in := save(t, f, filepath.Join(dir, "brae.xlsx"))
	out := filepath.Join(dir, "brae.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	must(t, err)
	at := -1
	for i, w := range rep.Warnings {
		if w.Sheet == sheet && w.Cell == "C3" {
			at = i
		}
	}
	if at < 0 {
		t.Fatalf("no finding at C3: %s", listFindings(rep))
	}
	ref := cellRef(2, at+2)
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	want := "'Brae''s log'!C3"
	if ok, target, _ := g.GetCellHyperLink(SheetWarnings, ref); !ok || target != want {
		t.Errorf("excelize: %s links to %q, want %q", ref, target, want)
	}
	links, _ := openpyxlLinks(t, out)
	if got := links[SheetWarnings+"!"+ref]; got != want {
		t.Errorf("openpyxl: %s links to %q, want %q", ref, got, want)
	}
}
