package importer

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The tests of table detection on layouts seen in real workbooks
// (statistics tables, utility and fleet exports) build small invented
// workbooks and check what Scan reads from them. The expected amounts of
// CO2 are worked by hand from the published factors below, never from the
// engine.

// Conversion factors.
const (
	jPerBtu    = 1055.05585262  // J per Btu (International Table): NIST SP 811
	lPerGal    = 3.785411784    // L per US gallon: NIST SP 811
	galPerBbl  = 42.0           // US gallons per barrel (petroleum): NIST SP 811
	m3PerCF    = 0.028316846592 // m3 per cubic foot: NIST SP 811 (standard cubic foot, 40 CFR 98.6)
	kgPerShort = 907.18474      // kg per short ton (2000 lb): NIST SP 811
)

// Default factors of the ipcc2006 and common packs (funcs/data).
const (
	gasEF      = 56100.0        // kg CO2/TJ natural gas: IPCC 2006 Vol 2 Ch 1 Table 1.4
	dieselEF   = 74100.0        // kg CO2/TJ gas/diesel oil: IPCC 2006 Vol 2 Ch 1 Table 1.4
	coalEF     = 94600.0        // kg CO2/TJ other bituminous coal: IPCC 2006 Vol 2 Ch 1 Table 1.4
	gasNCV     = 48.0           // TJ/Gg natural gas: IPCC 2006 Vol 2 Ch 1 Table 1.2
	dieselNCV  = 43.0           // TJ/Gg gas/diesel oil: IPCC 2006 Vol 2 Ch 1 Table 1.2
	coalNCV    = 25.8           // TJ/Gg other bituminous coal: IPCC 2006 Vol 2 Ch 1 Table 1.2
	dieselRho  = 832.5          // kg/m3: EN 590 density limits, midpoint (the pack marks it from memory)
	gasHHVscf  = 1.026e-3       // MMBtu/scf natural gas: 40 CFR 98 Table C-1 (the ipcc2006 pack's volume path)
	m3PerScf   = 0.028316846592 // m3 per cubic foot: NIST SP 811
	gjPerMMBtu = 1.05505585262  // GJ per MMBtu (Btu IT): NIST SP 811
	gasNetGr   = 0.90           // NCV/GCV of gas: IPCC 2006 Vol 2 Ch 1 section 1.4.1 (the pack marks it from memory)
	oilNetGr   = 0.95           // NCV/GCV of oil: IPCC 2006 Vol 2 Ch 1 section 1.4.1 (from memory)
	coalNetGr  = 0.95           // NCV/GCV of coal: IPCC 2006 Vol 2 Ch 1 section 1.4.1 (from memory)
	kgPerTonne = 1000.0         // SI
)

// Tonnes of CO2 worked by hand from the factors above.

// gasGrossT is t CO2 from natural gas given in J on a gross (HHV) basis.
func gasGrossT(j float64) float64 { return j / 1e12 * gasNetGr * gasEF / kgPerTonne }

// gasVolT is t CO2 from m3 of natural gas: heat content per scf (HHV), then NCV.
func gasVolT(m3 float64) float64 {
	return m3 / m3PerScf * gasHHVscf * gjPerMMBtu * gasNetGr * gasEF / 1e6
}

// dieselT is t CO2 from litres of diesel: density, then NCV.
func dieselT(l float64) float64 {
	return l / 1000 * dieselRho / 1e6 * dieselNCV * dieselEF / kgPerTonne
}

// dieselGrossT is t CO2 from distillate oil given in J on a gross basis.
func dieselGrossT(j float64) float64 { return j / 1e12 * oilNetGr * dieselEF / kgPerTonne }

// coalT is t CO2 from kg of other bituminous coal.
func coalT(kg float64) float64 { return kg / 1e6 * coalNCV * coalEF / kgPerTonne }

// coalGrossT is t CO2 from coal given in J on a gross basis.
func coalGrossT(j float64) float64 { return j / 1e12 * coalNetGr * coalEF / kgPerTonne }

// near reports got within a relative 1e-9 of want (the engine rounds an
// exact fraction to float64 once).
func near(got, want float64) bool {
	return math.Abs(got-want) <= 1e-9*math.Max(math.Abs(want), 1e-12)
}

// scanRows writes rows into sheet of a new workbook named name and scans it.
func scanRows(t *testing.T, name, sheet string, rows [][]any) (*Report, string) {
	t.Helper()
	f := newBook(t, sheet)
	setRows(t, f, sheet, 1, rows)
	path := save(t, f, filepath.Join(t.TempDir(), name))
	return scanFile(t, path, Options{}), path
}

// scanCSVText writes text to a CSV file named name and scans it.
func scanCSVText(t *testing.T, name, text string) *Report {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	must(t, os.WriteFile(path, []byte(text), 0o644))
	return scanFile(t, path, Options{})
}

// oneTable returns the only table of the report.
func oneTable(t *testing.T, rep *Report) TableInfo {
	t.Helper()
	if len(rep.Tables) != 1 {
		t.Fatalf("%d tables %+v, want 1; sheets %+v", len(rep.Tables), rep.Tables, rep.Sheets)
	}
	return rep.Tables[0]
}

// roleOf is the role given to the column headed header ("" for none);
// the test fails when no column has that header.
func roleOf(t *testing.T, tb TableInfo, header string) string {
	t.Helper()
	for _, c := range tb.Columns {
		if c.Header == header {
			return c.Role
		}
	}
	t.Fatalf("no column headed %q in %s!%s; columns %+v", header, tb.Sheet, tb.Range, tb.Columns)
	return ""
}

// columnAt is the column whose header cell is cell.
func columnAt(t *testing.T, tb TableInfo, cell string) ColumnInfo {
	t.Helper()
	for _, c := range tb.Columns {
		if c.Cell == cell {
			return c
		}
	}
	t.Fatalf("no column at %s in %s!%s; columns %+v", cell, tb.Sheet, tb.Range, tb.Columns)
	return ColumnInfo{}
}

// findingAt returns the finding of code at sheet!cell.
func findingAt(rep *Report, sheet, cell, code string) (Warning, bool) {
	for _, w := range rep.Warnings {
		if w.Sheet == sheet && w.Cell == cell && w.Code == code {
			return w, true
		}
	}
	return Warning{}, false
}

// wantFinding fails unless sheet!cell has a finding of code and severity.
func wantFinding(t *testing.T, rep *Report, sheet, cell, sev, code string) Warning {
	t.Helper()
	w, ok := findingAt(rep, sheet, cell, code)
	if !ok || w.Severity != sev {
		t.Errorf("no %s %s finding at %s!%s; findings: %s", sev, code, sheet, cell, listFindings(rep))
	}
	return w
}

func listFindings(rep *Report) string {
	var b strings.Builder
	for _, w := range rep.Warnings {
		b.WriteString("\n  " + w.Sheet + "!" + w.Cell + " " + w.Severity + " " + w.Code + ": " + w.Message)
	}
	return b.String()
}

// wantTCO2 compares a total of t CO2 with the one worked by hand.
func wantTCO2(t *testing.T, what string, got, want float64) {
	t.Helper()
	if !near(got, want) {
		t.Errorf("%s = %.12g t CO2, want %.12g", what, got, want)
	}
}

// annotatedColumn annotates the workbook at path and returns the numbers
// of the computed column named col ("tCO2") of the table on sheet, by row.
func annotatedColumn(t *testing.T, path, sheet, col string) map[int]float64 {
	t.Helper()
	return annotatedColumnOpt(t, path, sheet, col, Options{})
}

// annotatedColumnOpt is annotatedColumn with options.
func annotatedColumnOpt(t *testing.T, path, sheet, col string, opt Options) map[int]float64 {
	t.Helper()
	out := filepath.Join(t.TempDir(), "out-"+filepath.Base(path))
	rep, err := Annotate(context.Background(), testEngine(t), path, out, opt)
	if err != nil {
		t.Fatalf("Annotate: %v", err)
	}
	hdr := 0
	for _, tb := range rep.Tables {
		if tb.Sheet == sheet {
			hdr = tb.HeaderRow
		}
	}
	if hdr == 0 {
		t.Fatalf("no table on %s: %+v", sheet, rep.Sheets)
	}
	f, err := excelize.OpenFile(out)
	must(t, err)
	defer f.Close()
	rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
	must(t, err)
	at := -1
	for j, v := range rows[hdr-1] {
		if v == col {
			at = j
		}
	}
	if at < 0 {
		t.Fatalf("no column %q in row %d of %s: %q", col, hdr, sheet, rows[hdr-1])
	}
	vals := map[int]float64{}
	for i := hdr; i < len(rows); i++ {
		if at < len(rows[i]) {
			if x, err := strconv.ParseFloat(rows[i][at], 64); err == nil {
				vals[i+1] = x
			}
		}
	}
	return vals
}

// TestEverySheetAccountedFor: the report names every sheet, in workbook
// order, with what happened to it and why; a workbook whose sheets hold no
// table is reported, not refused.
func TestEverySheetAccountedFor(t *testing.T) {
	f := newBook(t, "Fleet")
	setRows(t, f, "Fleet", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"Diesel", 100, "L"}, {"Diesel", 200, "L"}})
	addSheet(t, f, "Boilers")
	setRows(t, f, "Boilers", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"Natural gas", 10, "GJ"}, {"Natral gas", 5, "GJ"}})
	addSheet(t, f, "Stores")
	setRows(t, f, "Stores", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"Coal", 5, "ton"}, {"Coal", 7, "ton"}})
	addSheet(t, f, "Prices")
	setRows(t, f, "Prices", 1, [][]any{{"Fuel", "Price ($/gal)"}, {"Diesel", 3.1}, {"Propane", 2.2}, {"Gasoline", 3.3}})
	addSheet(t, f, "Blank")
	addSheet(t, f, "Notes")
	setRows(t, f, "Notes", 1, [][]any{{"Prepared by the site team from delivery notes."}})
	rep := scanFile(t, save(t, f, filepath.Join(t.TempDir(), "sites.xlsx")), Options{})

	want := []struct{ name, status, reason string }{
		{"Fleet", StatusOK, "computed 2 of 2 rows in 1 table"},
		{"Boilers", StatusPartial, "computed 1 of 2 rows in 1 table"},
		{"Stores", StatusNone, "computed 0 of 2 rows in 1 table"}, // "ton" is ambiguous: never a guess
		{"Prices", StatusSkipped, "prices, rates or counts"},
		{"Blank", StatusSkipped, "Fuel | Quantity | Unit"},
		{"Notes", StatusSkipped, "Fuel | Quantity | Unit"},
	}
	if len(rep.Sheets) != len(want) {
		t.Fatalf("sheets %+v, want %d", rep.Sheets, len(want))
	}
	for i, w := range want {
		got := rep.Sheets[i]
		if got.Name != w.name || got.Status != w.status || !strings.Contains(got.Reason, w.reason) {
			t.Errorf("sheet %d = %+v, want %s %q with a reason containing %q", i, got, w.name, w.status, w.reason)
		}
	}
	// 300 L of diesel and 10 GJ of gas (factors above).
	wantTCO2(t, "total", rep.Totals.TCO2, dieselT(300)+10e9/1e12*gasEF/kgPerTonne)
}

// TestNoTableIsNoError: a CSV file and a workbook without any table scan
// without an error; their one sheet is skipped with what fluecell looks for.
func TestNoTableIsNoError(t *testing.T) {
	csvRep := scanCSVText(t, "minutes.csv", "Minutes of the site meeting\nAgenda,Owner\nBudget,Finance\n")
	xlsxRep, _ := scanRows(t, "minutes.xlsx", "Minutes", [][]any{{"Minutes of the site meeting"}, {"Agenda", "Owner"}, {"Budget", "Finance"}})
	for name, rep := range map[string]*Report{"minutes.csv": csvRep, "minutes.xlsx": xlsxRep} {
		if len(rep.Sheets) != 1 || rep.Sheets[0].Status != StatusSkipped || rep.Sheets[0].Reason == "" || len(rep.Tables) != 0 {
			t.Errorf("%s: sheets %+v tables %d, want one skipped sheet with a reason and no table", name, rep.Sheets, len(rep.Tables))
		}
	}
}
