package importer

import (
	"archive/zip"
	"bytes"
	"context"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// TestAnnotateConcurrent runs many annotations of one input at once (batch
// does): every report is the same, every output complete.
func TestAnnotateConcurrent(t *testing.T) {
	dir := t.TempDir()
	in := writeMessy(t, dir)
	e := testEngine(t)
	const n = 8
	reps := make([][]byte, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	for i := 0; i < n; i++ {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			out := filepath.Join(dir, "out"+strconv.Itoa(i)+".xlsx")
			rep, err := Annotate(context.Background(), e, in, out, Options{InlineMaxCells: []int{0, -1}[i%2]})
			if err != nil {
				errs[i] = err
				return
			}
			rep.Output = ""
			rep.Layout = ""
			for j := range rep.Tables {
				rep.Tables[j].Layout, rep.Tables[j].Output = "", ""
			}
			reps[i] = reportJSON(t, rep)
		}(i)
	}
	wg.Wait()
	for i := 0; i < n; i++ {
		if errs[i] != nil {
			t.Fatal(errs[i])
		}
		if !bytes.Equal(reps[i], reps[0]) {
			t.Errorf("report %d differs from report 0", i)
		}
		if _, err := excelize.OpenFile(filepath.Join(dir, "out"+strconv.Itoa(i)+".xlsx")); err != nil {
			t.Errorf("output %d: %v", i, err)
		}
	}
	assertNoTemp(t, dir)
}

// TestAnnotateCancel stops an annotation through its context: no output,
// no temporary file.
func TestAnnotateCancel(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "big.xlsx")
	writeFuelLog(t, in, 30_000)
	e := testEngine(t)
	out := filepath.Join(dir, "big.carbon.xlsx")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := Annotate(ctx, e, in, out, Options{})
	checkRefusal(t, err, ErrCancelled, "stopped")
	ctx, cancel = context.WithTimeout(context.Background(), 30*time.Millisecond)
	defer cancel()
	start := time.Now()
	_, err = Annotate(ctx, e, in, out, Options{})
	checkRefusal(t, err, ErrCancelled, "stopped")
	if d := time.Since(start); d > 2*time.Second {
		t.Errorf("stopping took %v", d)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("an output was written")
	}
	assertNoTemp(t, dir)
}

// TestOutputPath refuses outputs that would replace or break the input.
func TestOutputPath(t *testing.T) {
	dir := t.TempDir()
	in := smallLog(t, filepath.Join(dir, "log.xlsx"))
	before := fileHash(t, in)
	e := testEngine(t)
	cases := []struct{ out, code, msg string }{
		{in, ErrInput, "would replace the input"},
		{filepath.Join(dir, ".", "log.xlsx"), ErrInput, "would replace the input"},
		{filepath.Join(dir, "log.carbon.csv"), ErrInput, `keep the input's extension ".xlsx"`},
		{filepath.Join(dir, "no-such-folder", "x.xlsx"), ErrIO, "does not exist"},
		{"", ErrInput, "log.carbon.xlsx"},
	}
	for _, c := range cases {
		_, err := Annotate(context.Background(), e, in, c.out, Options{})
		checkRefusal(t, err, c.code, c.msg)
	}
	must(t, os.Link(in, filepath.Join(dir, "hard.xlsx")))
	_, err := Annotate(context.Background(), e, in, filepath.Join(dir, "hard.xlsx"), Options{})
	checkRefusal(t, err, ErrInput, "is the input file")
	if fileHash(t, in) != before {
		t.Fatal("the input changed")
	}
	if got := DefaultOutput(filepath.Join("a", "b.xlsm")); got != filepath.Join("a", "b.carbon.xlsm") {
		t.Errorf("DefaultOutput = %s", got)
	}
}

// TestReannotate refuses to write over fluecell's own sheets, and Scan of
// an annotated workbook reads only the original tables.
func TestReannotate(t *testing.T) {
	dir := t.TempDir()
	in := smallLog(t, filepath.Join(dir, "log.xlsx"))
	out := filepath.Join(dir, "log.carbon.xlsx")
	e := testEngine(t)
	first, err := Annotate(context.Background(), e, in, out, Options{})
	must(t, err)
	_, err = Annotate(context.Background(), e, out, filepath.Join(dir, "again.xlsx"), Options{})
	checkRefusal(t, err, ErrInput, "already has a sheet")
	res, err := Scan(context.Background(), e, out, Options{})
	must(t, err)
	if len(res.Report.Tables) != 1 || math.Abs(res.Report.Totals.TCO2-first.Totals.TCO2) > 1e-9 {
		t.Errorf("rescan: %d tables, %v tCO2 (first %v)", len(res.Report.Tables), res.Report.Totals.TCO2, first.Totals.TCO2)
	}
	for _, w := range res.Report.Warnings {
		if w.Code == CodeExistingMismatch {
			t.Errorf("the computed tCO2 column, read back as an existing one, mismatches: %+v", w)
		}
	}
}

// TestMacroWorkbook keeps the VBA project of an .xlsm byte for byte and the
// macro-enabled content type.
func TestMacroWorkbook(t *testing.T) {
	dir := t.TempDir()
	// Any OLE compound file passes as a stand-in project: it is copied, not run.
	vba, err := os.ReadFile(filepath.Join("testdata", "legacy-fuel-log.xls"))
	must(t, err)
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"diesel", 1000, "L"}})
	must(t, f.AddVBAProject(vba))
	in := save(t, f, filepath.Join(dir, "macro.xlsm"))
	out := filepath.Join(dir, "macro.carbon.xlsm")
	if _, err := Annotate(context.Background(), testEngine(t), in, out, Options{}); err != nil {
		t.Fatal(err)
	}
	if got := zipPart(t, out, "xl/vbaProject.bin"); !bytes.Equal(got, vba) {
		t.Error("the VBA project changed")
	}
	if ct := string(zipPart(t, out, "[Content_Types].xml")); !strings.Contains(ct, "application/vnd.ms-excel.sheet.macroEnabled.main+xml") {
		t.Errorf("content types lack the macro-enabled workbook: %s", ct)
	}
}

// TestOwnFactorsSheet uses a workbook's "Carbon factors" sheet (the pack CSV
// columns) over the embedded packs and cites it.
func TestOwnFactorsSheet(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"diesel", 1000, "L"}, {"natural_gas", 10, "GJ"}})
	addSheet(t, f, SheetFactors)
	setRows(t, f, SheetFactors, 1, [][]any{
		{"pack", "id", "quantity", "value", "unit", "low", "high", "basis", "source", "from_memory"},
		{"ipcc2006", "natural_gas", "co2_ef", 50000, "kg CO2/TJ", nil, nil, "NCV", "supplier certificate 2025 (invented test value)", "false"},
	})
	in := save(t, f, filepath.Join(dir, "own.xlsx"))
	out := filepath.Join(dir, "own.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	must(t, err)
	// 10 GJ x 50 000 kg/TJ = 0.5 t (the sheet's own value).
	if got := rep.ByFuel["natural_gas"].TCO2; math.Abs(got-0.5) > 1e-12 {
		t.Errorf("natural gas %v t CO2, want 0.5 from the workbook's own factor", got)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	rows, err := g.GetRows(SheetSources)
	must(t, err)
	found := false
	for _, r := range rows {
		if len(r) > 7 && r[0] == "ipcc2006/natural_gas/co2_ef" && strings.Contains(r[7], "supplier certificate") {
			found = true
		}
	}
	if !found {
		t.Errorf("the sources sheet does not cite the workbook's factor: %v", rows)
	}

	// A malformed row names the sheet and row.
	f = newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"diesel", 1000, "L"}})
	addSheet(t, f, SheetFactors)
	setRows(t, f, SheetFactors, 1, [][]any{
		{"pack", "id", "quantity", "value", "unit", "basis", "source"},
		{"ipcc2006", "natural_gas", "co2_ef", 50000, "kg CO2/TJ", "NCV", "ok"},
		{},
		{"ipcc2006", "diesel fuel", "co2_ef", "lots", "kg CO2/TJ", "NCV", "bad"},
	})
	bad := save(t, f, filepath.Join(dir, "bad-factors.xlsx"))
	_, err = Scan(context.Background(), testEngine(t), bad, Options{})
	checkRefusal(t, err, ErrFactors, `"Carbon factors" sheet, row 4, column id`)
}

// TestUserRules computes the columns the rules name; totals come from the
// rules named tCO2 and tCO2e; a failing row points at the cell of the
// parameter that failed.
func TestUserRules(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel type", "Litres", "Cost (EUR)"}, {"diesel", 1000, 1500}, {"diesel", 500, 800}, {"petrol", 0, 10}})
	in := save(t, f, filepath.Join(dir, "rules.xlsx"))
	rules := []string{
		`tCO2 = fuel_co2(fuel_type, litres, litres_unit)`,
		`kg_per_eur = 1000 * fuel_co2(fuel_type, litres, "L") / cost_eur`,
		`per_litre = cost_eur / litres`,
	}
	out := filepath.Join(dir, "rules.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{Rules: rules})
	must(t, err)
	if len(rep.Rules) != 3 || rep.Tables[0].Kind != kindCustom && rep.Tables[0].Kind != kindFuelLog {
		t.Fatalf("rules %v kind %s", rep.Rules, rep.Tables[0].Kind)
	}
	// 1500 L of diesel: 1.5 x 2.65259475 t (see TestComputedValues).
	if math.Abs(rep.Totals.TCO2-1.5*2.65259475) > 1e-9 || rep.Totals.TCO2e != 0 {
		t.Errorf("totals %+v", rep.Totals)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	head, _ := g.GetRows("Log")
	if strings.Join(head[0], "|") != "Fuel type|Litres|Cost (EUR)|tCO2|kg_per_eur|per_litre|source" {
		t.Errorf("header %v", head[0])
	}
	var div *Warning
	for i, w := range rep.Warnings {
		if w.Code == CodeRuleError {
			div = &rep.Warnings[i]
		}
	}
	if div == nil || div.Cell != "C4" || !strings.Contains(div.Message, "division by zero") {
		t.Errorf("division by zero: %+v (all: %+v)", div, rep.Warnings)
	}
	// A misspelt variable gets a suggestion.
	_, err = Scan(context.Background(), testEngine(t), in, Options{Rules: []string{"tCO2 = fuel_co2(fuel_typ, litres, litres_unit)"}})
	checkRefusal(t, err, ErrNoTable, "did you mean fuel_type?")
}

// TestOptionsSheetPackLayout: --sheet, --pack and the size threshold.
func TestOptionsSheetPackLayout(t *testing.T) {
	dir := t.TempDir()
	in := writeMessy(t, dir)
	rep := scanFile(t, in, Options{Sheet: "Monthly energy"})
	if len(rep.Tables) != 1 || rep.Tables[0].Sheet != "Monthly energy" {
		t.Errorf("--sheet: tables %+v", rep.Tables)
	}
	f := newBook(t, "Gas")
	setRows(t, f, "Gas", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", 1000, "scf"}})
	gas := save(t, f, filepath.Join(dir, "gas.xlsx"))
	// US EPA GHG Emission Factors Hub 2025 Table 1: 0.001026 MMBtu/scf and
	// 53.06 kg CO2/MMBtu (HHV): 1000 scf = 0.05443956 t CO2.
	rep = scanFile(t, gas, Options{Pack: "epa2025"})
	if got := rep.Totals.TCO2; math.Abs(got-0.05443956) > 1e-12 {
		t.Errorf("epa2025: %v t CO2", got)
	}
	rep, err := Annotate(context.Background(), testEngine(t), in, filepath.Join(dir, "small.xlsx"), Options{InlineMaxCells: 10})
	must(t, err)
	if rep.Layout != LayoutSideSheet {
		t.Fatalf("layout %s", rep.Layout)
	}
	outs := map[string]bool{}
	for _, tb := range rep.Tables {
		outs[strings.SplitN(tb.Output, "!", 2)[0]] = true
		if tb.Layout != LayoutSideSheet {
			t.Errorf("table %s: layout %s", tb.Range, tb.Layout)
		}
	}
	if !outs[SheetColumns] || !outs[SheetColumns+" 2"] || !outs[SheetColumns+" 3"] {
		t.Errorf("side sheets %v", outs)
	}
}

// TestStackedTables finds two tables on one sheet, under a banner row with
// a unit row, and a total row between.
func TestStackedTables(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Sites")
	setRows(t, f, "Sites", 1, [][]any{
		{"Site A - boilers"},
		{"Fuel", "Consumption", "Unit"},
		{"natural_gas", 100, "GJ"},
		{"natural_gas", 120, "GJ"},
		{"Total", 220},
		{},
		{},
		{},
		{"Site B - vehicles"},
		{"Month", "Diesel", "Petrol"},
		{nil, "L", "L"},
		{"Jan", 1000, 200},
		{"Feb", 900, nil},
	})
	in := save(t, f, filepath.Join(dir, "stacked.xlsx"))
	rep := scanFile(t, in, Options{})
	if len(rep.Tables) != 2 {
		t.Fatalf("%d tables: %+v", len(rep.Tables), rep.Tables)
	}
	a, b := rep.Tables[0], rep.Tables[1]
	if a.HeaderRow != 2 || a.Kind != kindFuelLog || a.Rows != 2 || a.Computed != 2 {
		t.Errorf("table A %+v", a)
	}
	if b.HeaderRow != 10 || b.Kind != kindWide || b.Rows != 2 || b.Computed != 2 {
		t.Errorf("table B %+v", b)
	}
	// 220 GJ x 56.1 kg/GJ + 1900 L diesel + 200 L petrol (IPCC 2006 Vol 2 Ch 1
	// Tables 1.2 and 1.4 with the pack's densities).
	if rep.Totals.TCO2 < 12.342+5.0 || rep.Computed != 4 {
		t.Errorf("totals %+v computed %d", rep.Totals, rep.Computed)
	}
}

// TestTwoRowHeader reads a header whose first columns are merged down over
// two rows and whose quantity is split under a merged banner.
func TestTwoRowHeader(t *testing.T) {
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{
		{"Heron Mills energy register"},
		{},
		{"Site", "Fuel", "Fuel use", nil, "Cost"},
		{nil, nil, "Amount", "Unit", "EUR"},
		{"Mill 1", "Natural gas", 1200, "MWh", 50000},
		{"Mill 1", "Gas oil", 3000, "litres", 3000},
		{"Mill 2", "Heavy fuel oil", 12, "tonnes", 9000},
	})
	must(t, f.MergeCell("Log", "A3", "A4"))
	must(t, f.MergeCell("Log", "B3", "B4"))
	must(t, f.MergeCell("Log", "C3", "D3"))
	rep := scanFile(t, save(t, f, filepath.Join(t.TempDir(), "two.xlsx")), Options{})
	if len(rep.Tables) != 1 || rep.Tables[0].HeaderRow != 4 || rep.Tables[0].Range != "A4:E7" || rep.Computed != 3 {
		t.Fatalf("tables %+v", rep.Tables)
	}
	roles := map[string]string{}
	for _, c := range rep.Tables[0].Columns {
		roles[c.Header] = c.Role
	}
	// The group label over two columns is part of their headers.
	if roles["Site"] != "group" || roles["Fuel"] != "fuel" || roles["Fuel use Amount"] != "quantity" || roles["Fuel use Unit"] != "unit" {
		t.Errorf("roles %v", roles)
	}
}

func TestErrorsAreTyped(t *testing.T) {
	_, err := Scan(context.Background(), testEngine(t), "", Options{})
	var ie *Error
	if !errors.As(err, &ie) {
		t.Fatalf("%T", err)
	}
}

// TestAnnotateLayoutOption: Options.Layout side-sheet puts the columns in a
// side sheet at any size and leaves the table's sheet as it was; an
// unknown layout is refused, naming the option.
func TestAnnotateLayoutOption(t *testing.T) {
	dir := t.TempDir()
	in := smallLog(t, filepath.Join(dir, "log.xlsx"))
	e := testEngine(t)
	rep, err := Annotate(context.Background(), e, in, filepath.Join(dir, "side.xlsx"), Options{Layout: LayoutSideSheet})
	must(t, err)
	if rep.Layout != LayoutSideSheet || !strings.HasPrefix(rep.Tables[0].Output, SheetColumns+"!") {
		t.Errorf("layout %s, output %s: want the side sheet", rep.Layout, rep.Tables[0].Output)
	}
	before, after := partsOf(t, in), partsOf(t, filepath.Join(dir, "side.xlsx"))
	if !bytes.Equal(before[partSheet], after[partSheet]) {
		t.Error("the table's sheet changed with a side sheet")
	}
	_, err = Annotate(context.Background(), e, in, filepath.Join(dir, "bad.xlsx"), Options{Layout: "sideways"})
	if err == nil || !strings.Contains(err.Error(), "Options.Layout") {
		t.Errorf("err = %v, want a refusal naming Options.Layout", err)
	}
}

// TestAnnotateRawCopy: annotating in place changes only the sheets that
// get computed columns or marks, the styles, the shared strings (the
// source texts appended at their end: TestPreservationRich checks the
// existing ones), the workbook's sheet list, relationships and content
// types; every other part of the input is in
// the output with the same compressed bytes (copied raw, not inflated and
// deflated again).
func TestAnnotateRawCopy(t *testing.T) {
	dir := t.TempDir()
	in := richWorkbook(t, dir)
	out := filepath.Join(dir, "out.xlsx")
	_, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	must(t, err)
	raw := func(path string) map[string][]byte {
		zr, err := zip.OpenReader(path)
		must(t, err)
		defer zr.Close()
		m := map[string][]byte{}
		for _, f := range zr.File {
			rc, err := f.OpenRaw()
			must(t, err)
			b, err := io.ReadAll(rc)
			must(t, err)
			m[f.Name] = b
		}
		return m
	}
	a, b := raw(in), raw(out)
	changed := 0
	for name, data := range a {
		got, ok := b[name]
		if !ok {
			t.Errorf("%s is missing from the output", name)
			continue
		}
		if bytes.Equal(got, data) {
			continue
		}
		changed++
		switch {
		case strings.HasPrefix(name, "xl/worksheets/sheet"), name == "xl/styles.xml", name == "xl/workbook.xml", name == "xl/sharedStrings.xml",
			name == "[Content_Types].xml", strings.HasSuffix(name, ".rels"), strings.HasPrefix(name, "xl/comments"), strings.HasSuffix(name, ".vml"):
		default:
			t.Errorf("%s changed", name)
		}
	}
	if changed == 0 || len(b) <= len(a) {
		t.Errorf("%d parts changed, %d parts in, %d out: the annotation wrote nothing", changed, len(a), len(b))
	}
}
