package importer

import (
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// TestWarningsAtCells checks every warning of the messy workbook: its
// sheet, cell, code and severity, and a piece of its message. Nothing else
// may be reported.
func TestWarningsAtCells(t *testing.T) {
	rep := scanFile(t, writeMessy(t, t.TempDir()), Options{})
	want := []struct {
		sheet, cell, code, sev, msg string
	}{
		{"Fuel log", "C5", CodeFuelAlias, SevInfo, `"Diesel" read as gas_diesel_oil`},
		{"Fuel log", "D6", CodeValueTextNumber, SevWarning, `"1,250.5": read as 1250.5`},
		{"Fuel log", "E7", CodeUnitMixed, SevWarning, "L in 8 rows, MWh in 1 row, GJ in 1 row, MMBtu HHV in 1 row"},
		{"Fuel log", "C9", CodeFuelAlias, SevInfo, "other_bituminous_coal"},
		{"Fuel log", "E9", CodeUnitAmbiguous, SevError, `"ton": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb)`},
		{"Fuel log", "C10", CodeFuelAlias, SevInfo, "motor_gasoline"},
		{"Fuel log", "E10", CodeUnitAmbiguous, SevError, `"MT"`},
		{"Fuel log", "E11", CodeUnitAmbiguous, SevError, "kBtu (thousand Btu) or MMBtu (million Btu)"},
		{"Fuel log", "E12", CodeUnitDimension, SevError, "did you mean kWh?"},
		{"Fuel log", "E13", CodeUnitBasis, SevInfo, "declares HHV; pack ipcc2006 is on an NCV basis"},
		{"Fuel log", "D14", CodeValueNegative, SevWarning, "-150"},
		{"Fuel log", "D15", CodeValueOutlier, SevWarning, `118000 is 118 times the median 1000 of the 5 rows of "diesel" (gas_diesel_oil in L)`},
		{"Fuel log", "C16", CodeFuelUnknown, SevError, `"Disel": did you mean gas_diesel_oil?`},
		{"Fuel log", "G17", CodeExistingMismatch, SevWarning, "the workbook says 2 t CO2, fluecell computes 2.38734 t CO2"},
		{"Fuel log", "D18", CodeFormulaNoCache, SevWarning, `evaluated it to "1000"`},
		{"Fuel log", "C19", CodeFuelAlias, SevInfo, `"Gas oil" read as gas_diesel_oil`},
		{"Monthly energy", "C2", CodeFuelAlias, SevInfo, "gas_diesel_oil"},
		{"Monthly energy", "E2", CodeGridUnknown, SevWarning, "--grid"},
		{"Monthly energy", "E2", CodeNotComputed, SevInfo, "no grid is given"},
		{"Monthly energy", "F2", CodeUnitAmbiguous, SevError, `(in the header "Coal (ton)"); the column is left out of the totals`},
		{"Build plan", "E5", CodeValueNotNumber, SevInfo, "the technology's default is used"},
		{"Build plan", "D6", CodeUnitMixed, SevWarning, "MW in 3 rows, kW in 1 row, GW in 1 row"},
		{"Build plan", "B8", CodeTechUnknown, SevError, `no life-cycle row for technology "battery"`},
		{"Fuel log", "A20", CodeNotComputed, SevInfo, "a total row: not computed"},
		// Gas in watt-hours without a basis: bills give kWh gross (common practice).
		{"Fuel log", "D7", CodeUnitBasis, SevWarning, "natural gas in MWh without a basis is read as NCV"},
		{"Monthly energy", "B2", CodeUnitBasis, SevWarning, "natural gas in kWh without a basis is read as NCV"},
	}
	got := keysOf(rep.Warnings)
	for _, w := range want {
		k := wkey{w.sheet, w.cell, w.code, w.sev}
		g, ok := got[k]
		if !ok {
			t.Errorf("missing %s!%s %s %s (%s)", w.sheet, w.cell, w.sev, w.code, w.msg)
			continue
		}
		if !strings.Contains(g.Message, w.msg) {
			t.Errorf("%s!%s %s: message %q does not contain %q", w.sheet, w.cell, w.code, g.Message, w.msg)
		}
		delete(got, k)
	}
	for k, g := range got {
		t.Errorf("unexpected %s!%s %s %s: %s", k.sheet, k.cell, k.sev, k.code, g.Message)
	}
	if len(rep.Warnings) != len(want) {
		t.Errorf("%d warnings, want %d", len(rep.Warnings), len(want))
	}
	// Sorted by sheet (workbook order), row, column.
	order := map[string]int{"Fuel log": 0, "Monthly energy": 1, "Build plan": 2}
	if !sort.SliceIsSorted(rep.Warnings, func(i, j int) bool {
		a, b := rep.Warnings[i], rep.Warnings[j]
		if a.Sheet != b.Sheet {
			return order[a.Sheet] < order[b.Sheet]
		}
		ca, ra, _ := parseRef(a.Cell)
		cb, rb, _ := parseRef(b.Cell)
		return ra < rb || ra == rb && ca < cb
	}) {
		t.Error("warnings are not in sheet, row, column order")
	}
	if rep.Rows != 15+4+5 || rep.Computed != 10+4+4 {
		t.Errorf("rows %d computed %d, want 24 and 18", rep.Rows, rep.Computed)
	}
}

// TestWarningCases checks single findings in small tables, with the cell
// each must point at.
func TestWarningCases(t *testing.T) {
	cases := []struct {
		name string
		rows [][]any
		cell string // the one error or warning expected ("" for none)
		code string
		sev  string
	}{
		{"clean", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", 10, "GJ"}, {"natural_gas", 12, "GJ"}}, "", "", ""},
		{"unit unknown with suggestion", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", 10, "GJJ"}}, "C2", CodeUnitUnknown, SevError},
		{"empty unit", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", 10, nil}}, "C2", CodeUnitUnknown, SevError},
		{"text not a number", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", "pending", "GJ"}}, "B2", CodeValueNotNumber, SevError},
		{"number with its unit", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", "1200 GJ", "GJ"}}, "B2", CodeValueNotNumber, SevError},
		{"ambiguous decimal comma", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", "1,250", "GJ"}}, "B2", CodeValueNotNumber, SevError},
		{"decimal comma", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", "12,5", "GJ"}}, "B2", CodeValueTextNumber, SevWarning},
		{"no quantity", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", nil, "GJ"}}, "B2", CodeValueNotNumber, SevWarning},
		{"number as fuel", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", 3, "GJ"}, {42, 10, "GJ"}}, "A3", CodeFuelUnknown, SevError},
		{"header unit ambiguous", [][]any{{"Fuel", "Quantity (MT)"}, {"natural_gas", 10}}, "B1", CodeUnitAmbiguous, SevError},
		{"header unit is a power", [][]any{{"Fuel", "Consumption (kW)"}, {"natural_gas", 10}}, "B1", CodeUnitDimension, SevError},
		{"no unit anywhere", [][]any{{"Fuel", "Quantity"}, {"natural_gas", 10}}, "B1", CodeUnitUnknown, SevError},
		{"MMBtu without basis (read as HHV, a note only)", [][]any{{"Fuel", "Quantity", "Unit"}, {"natural_gas", 10, "MMBtu"}}, "", "", ""},
		{"missing density", [][]any{{"Fuel", "Quantity", "Unit"}, {"peat", 10, "L"}}, "C2", CodeFactorMissing, SevError},
	}
	dir := t.TempDir()
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := newBook(t, "Log")
			setRows(t, f, "Log", 1, c.rows)
			rep := scanFile(t, save(t, f, filepath.Join(dir, "case"+itoaT(i)+".xlsx")), Options{})
			var found []Warning
			for _, w := range rep.Warnings {
				if w.Severity != SevInfo {
					found = append(found, w)
				}
			}
			if c.cell == "" {
				if len(found) > 0 {
					t.Fatalf("want no findings, got %+v", found)
				}
				return
			}
			if len(found) != 1 || found[0].Cell != c.cell || found[0].Code != c.code || found[0].Severity != c.sev {
				t.Fatalf("want one %s %s at %s, got %+v", c.sev, c.code, c.cell, found)
			}
		})
	}
}

// TestWarningCap lists at most MaxWarningsPerColumn warnings of one code in
// one column and sums up the rest in one warning.
func TestWarningCap(t *testing.T) {
	rows := [][]any{{"Fuel", "Quantity", "Unit"}}
	for i := 0; i < 30; i++ {
		rows = append(rows, []any{"natural_gas", "1,000.5", "GJ"})
	}
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, rows)
	path := save(t, f, filepath.Join(t.TempDir(), "cap.xlsx"))
	rep := scanFile(t, path, Options{MaxWarningsPerColumn: 5})
	if len(rep.Warnings) != 6 {
		t.Fatalf("%d warnings, want 5 and a summary: %+v", len(rep.Warnings), rep.Warnings)
	}
	last := rep.Warnings[5]
	if last.Cell != "B7" || !strings.Contains(last.Message, "and 25 more cells in column B (rows 7 to 31)") {
		t.Errorf("summary warning %+v", last)
	}
	if rep.Computed != 30 {
		t.Errorf("computed %d, want 30", rep.Computed)
	}
	_ = os.Remove(path)
}
