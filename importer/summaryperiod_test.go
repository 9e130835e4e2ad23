package importer

import (
	"bufio"
	"context"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/demo"
)

func day(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }

// The grain rule (our own, stated in chooseGrain): the finest grain no finer
// than the dates are written that gives at most 24 periods, else the year.
func TestChooseGrain(t *testing.T) {
	for _, c := range []struct {
		name     string
		from, to time.Time
		written  grain
		want     grain
	}{
		{"the demo's six days", day(2026, 3, 30), day(2026, 4, 4), grainDay, grainDay},
		{"24 days", day(2026, 1, 1), day(2026, 1, 24), grainDay, grainDay},
		{"25 days: weeks", day(2026, 1, 1), day(2026, 1, 25), grainDay, grainWeek},
		{"three months of days: weeks", day(2026, 1, 1), day(2026, 3, 31), grainDay, grainWeek},
		{"a year of days: months", day(2025, 1, 1), day(2025, 12, 31), grainDay, grainMonth},
		{"three fiscal years of fill-ups: quarters", day(2021, 7, 1), day(2024, 6, 30), grainDay, grainQuarter},
		{"a year of months", day(2025, 1, 1), day(2025, 12, 1), grainMonth, grainMonth},
		{"two years of months", day(2024, 1, 1), day(2025, 12, 1), grainMonth, grainMonth},
		{"22 years of months: years", day(2001, 1, 1), day(2023, 1, 1), grainMonth, grainYear},
		{"years stay years", day(2020, 1, 1), day(2023, 1, 1), grainYear, grainYear},
		{"months never split into weeks", day(2025, 1, 1), day(2025, 3, 1), grainMonth, grainMonth},
	} {
		if got := chooseGrain(c.from, c.to, c.written); got != c.want {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
}

// Periods read from cells: an Excel date serial is a day (or a month when it
// is the first), YYYYMM a month, YYYY13 (an annual total) none, a year
// number or text a year, "FY2025" a fiscal year, "2025 Q3" a quarter.
func TestReadPeriod(t *testing.T) {
	num := func(x float64) cellVal { return cellVal{kind: kNumber, num: x} }
	txt := func(s string) cellVal { return cellVal{kind: kText, text: s} }
	for _, c := range []struct {
		v     cellVal
		label string // at the grain read
		ok    bool
	}{
		{num(46111), "2026-03-30", true}, // Excel serial of 2026-03-30
		{num(45658), "Jan 2025", true},   // 2025-01-01: a month
		{num(202503), "Mar 2025", true},
		{num(202513), "", false},
		{num(2024), "2024", true},
		{txt("2024"), "2024", true},
		{txt("FY2025"), "FY2025", true},
		{txt("FY 22"), "FY2022", true},
		{txt("2025 Q3"), "2025 Q3", true},
		{txt("Q1 2024"), "2024 Q1", true},
		{txt("Jan 2023"), "Jan 2023", true},
		{txt("2026-03-30"), "2026-03-30", true},
		{txt("pending"), "", false},
		{num(-3), "", false},
	} {
		p, ok := readPeriod(c.v)
		if ok != c.ok {
			t.Errorf("%+v: ok %v, want %v", c.v, ok, c.ok)
			continue
		}
		if ok {
			if got := periodLabel(periodIndex(p.at, p.res), p.res, p.fiscal); got != c.label {
				t.Errorf("%+v: %q, want %q", c.v, got, c.label)
			}
		}
	}
}

// summaryBlock finds the lines under the heading of the Carbon summary that
// starts with prefix: the header row, then the lines up to a note or a
// blank row.
func summaryBlock(t *testing.T, rows [][]string, prefix string) (at int, header []string, lines [][]string, note string) {
	t.Helper()
	for i, r := range rows {
		if len(r) == 0 || !strings.HasPrefix(r[0], prefix) {
			continue
		}
		header = rows[i+1]
		for _, l := range rows[i+2:] {
			if len(l) == 0 || l[0] == "" {
				break
			}
			if len(l) == 1 {
				note = l[0]
				break
			}
			lines = append(lines, l)
		}
		return i + 1, header, lines, note
	}
	t.Fatalf("no heading %q in the summary", prefix)
	return
}

// excelDate is the date of an Excel 1900-system serial (after 1900-03-01).
func excelDate(t *testing.T, raw string) time.Time {
	t.Helper()
	x, err := strconv.ParseFloat(raw, 64)
	if err != nil {
		t.Fatalf("date cell %q: %v", raw, err)
	}
	return time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC).AddDate(0, 0, int(math.Round(x)))
}

// colOf is the 1-based column whose header cell in row reads name.
func colOf(t *testing.T, f *excelize.File, sheet string, row int, name string) int {
	t.Helper()
	rows, err := f.GetRows(sheet)
	must(t, err)
	for i, h := range rows[row-1] {
		if h == name {
			return i + 1
		}
	}
	t.Fatalf("%s: no %q header in row %d: %q", sheet, name, row, rows[row-1])
	return 0
}

// The demo fuel log's dates span six days: its summary is by day (at most
// 24 periods, so each day is its own). Each day's tCO2e equals the sum of
// the tCO2e cells the annotation wrote in that day's rows, read back from
// the data sheet; the days add up to the kind's total.
func TestSummaryByPeriodDemo(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	out := filepath.Join(dir, "fuel.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), paths[0], out, Options{})
	must(t, err)
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()

	const sheet, hr = "Fuel log", 4
	co2eCol := colOf(t, g, sheet, hr, "tCO2e")
	want := map[string]float64{}
	found := map[string]int{}
	for r := hr + 1; r <= 21; r++ { // the demo's 17 data rows
		raw, err := g.GetCellValue(sheet, cellRef(1, r), excelize.Options{RawCellValue: true})
		must(t, err)
		label := excelDate(t, raw).Format("2006-01-02")
		found[label]++
		v, _ := g.GetCellValue(sheet, cellRef(co2eCol, r), excelize.Options{RawCellValue: true})
		if x, err := strconv.ParseFloat(v, 64); err == nil {
			want[label] += x
		}
	}
	rows, err := g.GetRows(SheetSummary, excelize.Options{RawCellValue: true})
	must(t, err)
	at, header, lines, note := summaryBlock(t, rows, "By day: "+KindLabel(KindStationary)+" (Fuel log!A4)")
	if header[0] != "day" || header[2] != "tCO2e" || header[3] != "tCO2 biogenic (memo)" {
		t.Errorf("header %q", header)
	}
	days := []string{"2026-03-30", "2026-03-31", "2026-04-01", "2026-04-02", "2026-04-03", "2026-04-04"}
	if len(lines) != len(days) {
		t.Fatalf("%d lines by day, want %d: %q", len(lines), len(days), lines)
	}
	sum := 0.0
	for i, l := range lines {
		got, err := strconv.ParseFloat(l[2], 64)
		must(t, err)
		sum += got
		if l[0] != days[i] || !near(got, want[days[i]]) || l[5] != itoaT(found[days[i]]) {
			t.Errorf("line %q: want %s, %.9g tCO2e (sum of the day's tCO2e cells), %d rows found", l, days[i], want[days[i]], found[days[i]])
		}
	}
	if !strings.HasPrefix(note, "by day: ") || !strings.Contains(note, "6 days") {
		t.Errorf("note %q", note)
	}
	if k := rep.ByKind[0]; k.Kind != KindStationary || !near(sum, k.TCO2e) {
		t.Errorf("the days add up to %.9g tCO2e, the kind's total is %+v", sum, k)
	}
	if ok, target, _ := g.GetCellHyperLink(SheetSummary, cellRef(1, at)); !ok || target != "'Fuel log'!A4" {
		t.Errorf("the heading links to %q (%v), want 'Fuel log'!A4", target, ok)
	}
}

// A real workbook of monthly rows (testdata/realworld, EIA monthly natural
// gas consumption of Colorado's industry, Million Cubic Feet, Jan 2001 to
// Jan 2023): 22 years of months are more than 24 periods by month or by
// quarter, so the summary is by year. Each year's tCO2e, and each month's
// when the grain is set to the month, is the file's own amounts summed from
// lines (read here line by line, not by fluecell) times the one
// factor the rule applies per unit of the header.
func TestSummaryByPeriodRealMonthly(t *testing.T) {
	path := filepath.Join("..", "testdata", "realworld", "eia_colorado_natural_gas_industrial.csv")
	e := testEngine(t)
	res, err := scanAnyFormat(context.Background(), e, path, Options{}, nil)
	must(t, err)
	if len(res.sc.tables) != 1 {
		t.Fatalf("%d tables", len(res.sc.tables))
	}
	tb := res.sc.tables[0]
	p, why := tb.readDates()
	if p == nil {
		t.Fatalf("no dates: %s", why)
	}
	if p.col.hdr.Text != "Month" || p.grain != grainYear || p.dated != 265 || p.rows != 265 {
		t.Fatalf("plan %+v, want the Month column by year, 265 dated rows", *p)
	}
	if len(tb.spec.wide) != 1 {
		t.Fatalf("%d amount columns", len(tb.spec.wide))
	}
	unit := tb.spec.wide[0].hdr.UnitText
	k, err := e.CallValues("fuel_co2e", "natural_gas", 1.0, unit)
	must(t, err)

	// The file's own numbers, from its lines.
	fh, err := os.Open(path)
	must(t, err)
	defer fh.Close()
	byYear, byMonth := map[string]float64{}, map[string]float64{}
	sc := bufio.NewScanner(fh)
	n := 0
	for sc.Scan() {
		month, amount, ok := strings.Cut(sc.Text(), ",")
		d, err := time.Parse("Jan 2006", month)
		if !ok || err != nil {
			continue
		}
		x, err := strconv.ParseFloat(amount, 64)
		must(t, err)
		byYear[strconv.Itoa(d.Year())] += x
		byMonth[month] += x
		n++
	}
	if n != 265 {
		t.Fatalf("%d monthly lines in the file", n)
	}
	ks, labels := tb.periodShares(p)
	if len(labels) != 23 || labels[0] != "2001" || labels[22] != "2023" {
		t.Fatalf("years %q", labels)
	}
	for _, y := range labels {
		s := ks.byKind[KindStationary][y]
		if s == nil || !near(s.co2e, byYear[y]*k.Value) {
			t.Errorf("%s: %+v, want %.9g tCO2e (%.9g %s x %.9g)", y, s, byYear[y]*k.Value, byYear[y], unit, k.Value)
		}
	}
	// The same rows by month.
	m := *p
	m.grain = grainMonth
	m.first, m.last = periodIndex(m.from, grainMonth), periodIndex(m.to, grainMonth)
	ks, labels = tb.periodShares(&m)
	if len(labels) != 265 {
		t.Fatalf("%d months", len(labels))
	}
	for _, l := range labels {
		s := ks.byKind[KindStationary][l]
		if s == nil || s.found != 1 || !near(s.co2e, byMonth[l]*k.Value) {
			t.Errorf("%s: %+v, want %.9g tCO2e from one row", l, s, byMonth[l]*k.Value)
		}
	}
}

// On a workbook of the development set (FLUECELL_DEVSET, the folder of the
// shared real workbooks): EIA's monthly US natural gas consumption, a .xls
// of Excel-dated monthly rows from 1973 to 2019. The summary is by year;
// each year's tCO2e equals the sum of the tCO2e cells of its monthly rows,
// read back from the annotated data sheet with their dates.
func TestSummaryByPeriodDevsetMonthly(t *testing.T) {
	dir := os.Getenv("FLUECELL_DEVSET")
	if dir == "" {
		t.Skip("set FLUECELL_DEVSET to the folder of the development set (see testdata/realworld/README.md)")
	}
	in := filepath.Join(dir, "eia_NG_CONS_SUM_DCU_NUS_M.xls")
	if _, err := os.Stat(in); err != nil {
		t.Skipf("%v", err)
	}
	out := filepath.Join(t.TempDir(), "ng.carbon.xlsx")
	if _, err := Annotate(context.Background(), testEngine(t), in, out, Options{}); err != nil {
		if strings.Contains(err.Error(), "soffice") || strings.Contains(err.Error(), "LibreOffice") {
			t.Skipf("no converter for .xls: %v", err)
		}
		t.Fatal(err)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	const sheet, hr = "Data 1", 3
	co2eCol := colOf(t, g, sheet, hr, "tCO2e")
	data, err := g.GetRows(sheet, excelize.Options{RawCellValue: true})
	must(t, err)
	want := map[string]float64{}
	months := map[string]int{}
	for _, r := range data[hr:] {
		if len(r) < co2eCol || r[0] == "" {
			continue
		}
		d := excelDate(t, r[0])
		x, err := strconv.ParseFloat(r[co2eCol-1], 64)
		if err != nil {
			continue
		}
		y := strconv.Itoa(d.Year())
		want[y] += x
		months[y]++
	}
	rows, err := g.GetRows(SheetSummary, excelize.Options{RawCellValue: true})
	must(t, err)
	var lines [][]string
	var note string
	for i, r := range rows {
		if len(r) > 0 && strings.HasPrefix(r[0], "By year: ") && strings.HasSuffix(r[0], "(Data 1!A3)") {
			_, _, lines, note = summaryBlock(t, rows[i:], r[0])
			break
		}
	}
	if len(lines) != 47 || !strings.HasPrefix(note, "by year: ") {
		t.Fatalf("%d lines by year (want 1973 to 2019), note %q", len(lines), note)
	}
	for _, l := range lines {
		got, err := strconv.ParseFloat(l[2], 64)
		must(t, err)
		if !near(got, want[l[0]]) || l[5] != itoaT(months[l[0]]) {
			t.Errorf("%q: want %.9g tCO2e from %d monthly rows", l, want[l[0]], months[l[0]])
		}
	}
}

// A table of one period per column: each month's tCO2e is the sum over the
// rows of the month's amount times the row's factor per unit (the rule is
// one call per column, proportional to the amount). Names are invented.
func TestSummaryByPeriodColumns(t *testing.T) {
	f := newBook(t, "Use")
	setRows(t, f, "Use", 1, [][]any{
		{"Fuel", "Unit", "Jan 2024", "Feb 2024", "Mar 2024"},
		{"Diesel", "L", 1200, 900, 0},
		{"Natural gas", "kWh", 30000, 28000, 21000},
		{"Propane", "kg", 0, 150, 300},
	})
	dir := t.TempDir()
	in := save(t, f, filepath.Join(dir, "brindle-fuel-by-month.xlsx"))
	out := filepath.Join(dir, "brindle.carbon.xlsx")
	e := testEngine(t)
	rep, err := Annotate(context.Background(), e, in, out, Options{})
	must(t, err)
	if rep.Computed != 3 || rep.Tables[0].Kind != kindPeriods {
		t.Fatalf("computed %d, kind %s; findings %s", rep.Computed, rep.Tables[0].Kind, listFindings(rep))
	}
	per := func(fuel, unit string) float64 {
		r, err := e.CallValues("fuel_co2e", fuel, 1.0, unit)
		must(t, err)
		return r.Value
	}
	d, g, p := per("diesel", "L"), per("natural gas", "kWh"), per("propane", "kg")
	want := []float64{1200*d + 30000*g, 900*d + 28000*g + 150*p, 21000*g + 300*p}
	found := []string{"2", "3", "2"}
	x, err := excelize.OpenFile(out)
	must(t, err)
	defer x.Close()
	rows, err := x.GetRows(SheetSummary, excelize.Options{RawCellValue: true})
	must(t, err)
	_, _, lines, note := summaryBlock(t, rows, "By month: "+KindLabel(KindStationary)+" (Use!A1)")
	if len(lines) != 3 || !strings.HasPrefix(note, "by month: ") {
		t.Fatalf("lines %q, note %q", lines, note)
	}
	for i, l := range lines {
		got, err := strconv.ParseFloat(l[2], 64)
		must(t, err)
		if l[0] != []string{"Jan 2024", "Feb 2024", "Mar 2024"}[i] || !near(got, want[i]) || l[5] != found[i] {
			t.Errorf("line %q: want %.9g tCO2e, %s rows with an amount", l, want[i], found[i])
		}
	}
}

// By fuel, the demo fuel log's own words stand next to fluecell's ids:
// "Gas oil", "Diesel" and "Heating oil" are gas_diesel_oil; the misspelt
// "Natral gas" is no known name and its row is left out.
func TestSummaryByFuelWords(t *testing.T) {
	_, out := annotateDemo(t, 0, Options{})
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	rows, err := g.GetRows(SheetSummary)
	must(t, err)
	_, header, lines, _ := summaryBlock(t, rows, "By fuel: "+KindLabel(KindStationary))
	if header[0] != "as written in the workbook" || header[1] != "fluecell id" {
		t.Fatalf("header %q", header)
	}
	got := map[string]string{}
	for _, l := range lines {
		got[l[1]] = l[0]
	}
	for id, words := range map[string]string{"gas_diesel_oil": "Gas oil; Diesel; Heating oil", "natural_gas": "Natural gas", "lpg": "LPG", "wood": "Wood pellets"} {
		if got[id] != words {
			t.Errorf("%s: %q, want %q (lines %q)", id, got[id], words, lines)
		}
	}
	if got["(unknown names)"] != "not read as a fuel: Natral gas" {
		t.Errorf("the misspelt fuel: %q", got["(unknown names)"])
	}
}

// TestSpacingGrain: annual rows written as year-end dates (an
// energy-benchmarking export's "Year Ending" 2011-12-31, 2012-12-31,
// 2013-12-31) are summed by year, not spread over quarters that hold
// nothing; monthly readings by month; daily fill-ups keep the day.
func TestSpacingGrain(t *testing.T) {
	plan := func(dates ...string) *periodPlan {
		p := &periodPlan{days: map[int64]struct{}{}}
		for _, d := range dates {
			at, err := time.Parse("2006-01-02", d)
			if err != nil {
				t.Fatal(err)
			}
			p.days[at.Unix()/86400] = struct{}{}
		}
		return p
	}
	cases := []struct {
		dates []string
		want  grain
	}{
		{[]string{"2011-12-31", "2012-12-31", "2013-12-31"}, grainYear},
		{[]string{"2025-03-31", "2025-06-30", "2025-09-30", "2025-12-31"}, grainQuarter},
		{[]string{"2025-01-31", "2025-02-28", "2025-03-31"}, grainMonth},
		{[]string{"2026-03-30", "2026-04-06", "2026-04-13"}, grainWeek},
		{[]string{"2026-03-30", "2026-03-31", "2026-04-03"}, grainDay},
		{[]string{"2026-03-30"}, grainDay},
	}
	for _, c := range cases {
		if got := plan(c.dates...).spacingGrain(); got != c.want {
			t.Errorf("%v: grain %v, want %v", c.dates, got, c.want)
		}
	}
	// Year-end dates over three years: by year, three lines.
	from, _ := time.Parse("2006-01-02", "2011-12-31")
	to, _ := time.Parse("2006-01-02", "2013-12-31")
	if g := chooseGrain(from, to, max(grainDay, plan("2011-12-31", "2012-12-31", "2013-12-31").spacingGrain())); g != grainYear {
		t.Errorf("year-end dates: grain %v, want year", g)
	}
}
