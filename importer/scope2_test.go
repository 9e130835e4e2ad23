package importer

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Published factors the checks below use:
//   - Germany: 424.9 g CO2/kWh, France: 34.8 g CO2/kWh (European
//     Environment Agency, CO2 emission intensity of electricity generation
//     by Member State, 2014 values; CO2 only);
//   - United Kingdom: 0.20707 kg CO2e/kWh (UK Government GHG Conversion
//     Factors for Company Reporting 2023, UK electricity: electricity
//     generated);
//   - purchased steam: 66.33 kg CO2, 1.25 g CH4 and 0.125 g N2O per MMBtu
//     (US EPA GHG Emission Factors Hub 2025, Table 7 Steam and Heat), CH4
//     and N2O weighted by 28 and 265 (IPCC AR5 WG1 Table 8.7, the default
//     GWP set).
const (
	deKgPerKWh  = 0.4249
	frKgPerKWh  = 0.0348
	gbKgPerKWh  = 0.20707
	steamTPerMM = (66.33 + 1.25e-3*28 + 0.125e-3*265) / 1000
)

// energyLog is a long table with fuels and purchased energy in one column.
var energyLog = [][]any{
	{"Site energy 2024"},
	{},
	{"Energy carrier", "Quantity", "Unit"},
	{"Diesel", 1000, "L"},
	{"Electricity", 10000, "kWh"},
	{"District steam", 100, "MMBtu"},
	{"Electricity", 5000, "kWh"},
}

func scanWith(t *testing.T, name, sheet string, rows [][]any, opt Options) *Report {
	t.Helper()
	f := newBook(t, sheet)
	setRows(t, f, sheet, 1, rows)
	path := save(t, f, filepath.Join(t.TempDir(), name))
	return scanFile(t, path, opt)
}

// TestElectricityRowsWithGrid: with --grid, the electricity rows of a long
// table are computed with electricity_co2e, the steam row with heat_co2e,
// the diesel row as before; the totals by fuel name them as Scope 2.
func TestElectricityRowsWithGrid(t *testing.T) {
	rep := scanWith(t, "energy.xlsx", "Energy", energyLog, Options{Grid: "Germany"})
	if rep.Computed != 4 || rep.Rows != 4 {
		t.Fatalf("computed %d of %d rows, want 4 of 4; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	if got, want := rep.ByFuel["Scope 2: electricity"].TCO2e, 15000*deKgPerKWh/1000; !near(got, want) {
		t.Errorf("electricity %.9g t CO2e, want %.9g", got, want)
	}
	if got, want := rep.ByFuel["Scope 2: steam"].TCO2e, 100*steamTPerMM; !near(got, want) {
		t.Errorf("steam %.9g t CO2e, want %.9g", got, want)
	}
	rules := strings.Join(rep.Rules, "\n")
	for _, want := range []string{`tCO2e = electricity_co2e(quantity, unit, "de")`, `tCO2e = heat_co2e(quantity, unit, "steam")`, "tCO2e = fuel_co2e(energy_carrier, quantity, unit)"} {
		if !strings.Contains(rules, want) {
			t.Errorf("rules %q lack %q", rules, want)
		}
	}
	if w := wantFinding(t, rep, "Energy", "A5", SevInfo, CodeReadAs); !strings.Contains(w.Message, "grid de from --grid") {
		t.Errorf("A5: %q, want the grid and where it came from", w.Message)
	}
	if _, ok := findingAt(rep, "Energy", "C6", CodeUnitBasis); ok {
		t.Errorf("a basis note at the steam row's MMBtu: delivered energy has no basis; %s", listFindings(rep))
	}
	for _, w := range rep.Warnings {
		if w.Code == CodeGridUnknown {
			t.Errorf("grid-unknown with a grid: %+v", w)
		}
	}
}

// TestElectricityRowsWithoutGrid: without a grid, one grid-unknown finding
// at the first electricity cell says how to choose one; every electricity
// row has its reason; the steam and diesel rows are computed.
func TestElectricityRowsWithoutGrid(t *testing.T) {
	rep := scanWith(t, "energy.xlsx", "Energy", energyLog, Options{})
	w := wantFinding(t, rep, "Energy", "A5", SevWarning, CodeGridUnknown)
	for _, want := range []string{"--grid", "mapping", "column"} {
		if !strings.Contains(w.Message, want) {
			t.Errorf("grid-unknown %q does not mention %s", w.Message, want)
		}
	}
	n := 0
	for _, w := range rep.Warnings {
		if w.Code == CodeGridUnknown {
			n++
		}
	}
	if n != 1 {
		t.Errorf("%d grid-unknown findings, want 1", n)
	}
	for _, cell := range []string{"A5", "A7"} {
		if w := wantFinding(t, rep, "Energy", cell, SevInfo, CodeNotComputed); !strings.Contains(w.Message, "no grid") {
			t.Errorf("%s: %q", cell, w.Message)
		}
	}
	if rep.Computed != 2 || rep.Rows != 4 {
		t.Errorf("computed %d of %d rows, want 2 of 4", rep.Computed, rep.Rows)
	}
}

// TestElectricityColumnWide: a wide table's "Electricity (kWh)" column is
// computed into tCO2e_scope2 with the mapping's grid, beside the gas.
func TestElectricityColumnWide(t *testing.T) {
	f := newBook(t, "Monthly")
	setRows(t, f, "Monthly", 1, [][]any{
		{"Month", "Natural gas (GJ)", "Electricity (kWh)"},
		{"Jan", 100, 20000},
		{"Feb", 80, 18000},
	})
	dir := t.TempDir()
	path := save(t, f, filepath.Join(dir, "monthly.xlsx"))
	mpath := filepath.Join(dir, "m.json")
	must(t, os.WriteFile(mpath, []byte(`{"fluecell_mapping": 1, "tables": [], "grid": "UK"}`), 0o644))
	m, err := LoadMapping(testEngine(t), mpath)
	if err != nil {
		t.Fatal(err)
	}
	rep := scanFile(t, path, Options{Mapping: m})
	if got, want := rep.ByFuel["Scope 2: electricity"].TCO2e, 38000*gbKgPerKWh/1000; !near(got, want) {
		t.Errorf("electricity %.9g t CO2e, want %.9g; rules %v; findings %s", got, want, rep.Rules, listFindings(rep))
	}
	if !strings.Contains(strings.Join(rep.Rules, "\n"), `tCO2e_scope2 = electricity_co2e(electricity, electricity_unit, "gb")`) {
		t.Errorf("rules %v", rep.Rules)
	}
	if w := wantFinding(t, rep, "Monthly", "C1", SevInfo, CodeReadAs); !strings.Contains(w.Message, "the mapping") {
		t.Errorf("C1: %q", w.Message)
	}
	col := annotatedColumnOpt(t, path, "Monthly", scope2Column, Options{Mapping: m})
	if got, want := col[2], 20000*gbKgPerKWh/1000; !near(got, want) {
		t.Errorf("row 2 %s = %.9g, want %.9g", scope2Column, got, want)
	}
}

// TestGridColumn: a column of countries gives each row its grid.
func TestGridColumn(t *testing.T) {
	rep := scanWith(t, "sites.xlsx", "Sites", [][]any{
		{"Site", "Country", "Electricity (kWh)"},
		{"Depot North", "Germany", 1000},
		{"Depot South", "France", 2000},
		{"Depot East", "Germany", 500},
	}, Options{Grid: "UK"})
	tb := rep.Tables[0]
	if got := columnAt(t, tb, "B1"); got.Role != "grid" {
		t.Errorf("B1 role %q, want grid", got.Role)
	}
	want := (1500*deKgPerKWh + 2000*frKgPerKWh) / 1000
	if got := kindTotalOf(rep, KindScope2).TCO2e; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g (the column's grids, not --grid); findings %s", got, want, listFindings(rep))
	}
	if rep.Computed != 3 {
		t.Errorf("computed %d rows, want 3", rep.Computed)
	}
}

// TestGridInTitle: "Electricity use, Germany" above the table names its grid.
func TestGridInTitle(t *testing.T) {
	rep := scanWith(t, "title.xlsx", "Power", [][]any{
		{"Electricity use, Germany"},
		{},
		{"Month", "Electricity (MWh)"},
		{"Jan", 10},
		{"Feb", 12},
	}, Options{})
	if got, want := kindTotalOf(rep, KindScope2).TCO2e, 22*1000*deKgPerKWh/1000; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; findings %s", got, want, listFindings(rep))
	}
}

// TestBadGridOption: an unknown --grid is an input error naming it.
func TestBadGridOption(t *testing.T) {
	f := newBook(t, "Energy")
	setRows(t, f, "Energy", 1, energyLog)
	path := save(t, f, filepath.Join(t.TempDir(), "energy.xlsx"))
	_, err := Scan(context.Background(), testEngine(t), path, Options{Grid: "Atlantis"})
	ie, ok := err.(*Error)
	if !ok || ie.Code != ErrInput || !strings.Contains(ie.Msg, `grid "Atlantis"`) {
		t.Fatalf("err = %v, want an input error naming the grid", err)
	}
}

// TestElectricityInKW: "kW" where kWh was meant is a unit-dimension error at
// the header; the column is left out and the row's gas still counts.
func TestElectricityInKW(t *testing.T) {
	rep := scanWith(t, "kw.xlsx", "Meters", [][]any{
		{"Month", "Electricity consumption (kW)", "Natural gas (GJ)"},
		{"Jan", 1200, 50},
		{"Feb", 1100, 40},
	}, Options{Grid: "DE"})
	if w := wantFinding(t, rep, "Meters", "B1", SevError, "unit-dimension"); !strings.Contains(w.Message, "did you mean kWh?") {
		t.Errorf("B1: %q", w.Message)
	}
	if rep.Computed != 2 || rep.ByFuel["Scope 2: electricity"].TCO2e != 0 {
		t.Errorf("computed %d rows, Scope 2 %v; want the gas of both rows and no electricity", rep.Computed, rep.ByFuel)
	}
}

// TestCarriersWithoutFactor: chilled water, for which the default set
// publishes no factor, is left out with a reason per row, not an error;
// electricity from the site's own cogeneration is not purchased.
func TestCarriersWithoutFactor(t *testing.T) {
	rep := scanWith(t, "campus.xlsx", "Utilities", [][]any{
		{"Utility", "Value", "Unit"},
		{"Natural gas", 100, "GJ"},
		{"Chilled Water", 40, "MMBtu"},
		{"Cogen Electricity", 9000, "kWh"},
		{"Natural gas", 120, "GJ"},
	}, Options{Grid: "DE"})
	if w := wantFinding(t, rep, "Utilities", "A3", SevInfo, CodeNotComputed); !strings.Contains(w.Message, "no factor") {
		t.Errorf("A3: %q", w.Message)
	}
	if w := wantFinding(t, rep, "Utilities", "A4", SevInfo, CodeNotComputed); !strings.Contains(w.Message, "not a fuel burned on site") {
		t.Errorf("A4: %q", w.Message)
	}
	if n := rep.Count(SevError); n != 0 {
		t.Errorf("%d errors: %s", n, listFindings(rep))
	}
	if _, ok := rep.ByFuel["Scope 2: electricity"]; ok {
		t.Errorf("cogeneration counted as purchased electricity: %v", rep.ByFuel)
	}
}

// TestGridColumnLongTable: in a long table a country column gives the grid
// of each electricity row; a country without grid factors is an error at
// its cell.
func TestGridColumnLongTable(t *testing.T) {
	rep := scanWith(t, "group.xlsx", "Energy", [][]any{
		{"Site", "Country", "Energy", "Quantity", "Unit"},
		{"Works A", "Germany", "Electricity", 1000, "kWh"},
		{"Works B", "France", "Electricity", 2000, "kWh"},
		{"Works A", "Germany", "Natural gas", 10, "GJ"},
		{"Works C", "Atlantis", "Electricity", 500, "kWh"},
	}, Options{})
	if got, want := rep.ByFuel["Scope 2: electricity"].TCO2e, (1000*deKgPerKWh+2000*frKgPerKWh)/1000; !near(got, want) {
		t.Errorf("electricity %.9g t CO2e, want %.9g; rules %v findings %s", got, want, rep.Rules, listFindings(rep))
	}
	if w := wantFinding(t, rep, "Energy", "B5", SevError, CodeGridUnknown); !strings.Contains(w.Message, `"Atlantis"`) {
		t.Errorf("B5: %q", w.Message)
	}
}

// TestGridInHeader: "Electricity use, Germany (kWh)" names its grid.
func TestGridInHeader(t *testing.T) {
	rep := scanWith(t, "header.xlsx", "Meters", [][]any{
		{"Month", "Electricity use, Germany (kWh)"},
		{"Jan", 1000},
		{"Feb", 1500},
	}, Options{})
	if got, want := kindTotalOf(rep, KindScope2).TCO2e, 2500*deKgPerKWh/1000; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; findings %s", got, want, listFindings(rep))
	}
	if w := wantFinding(t, rep, "Meters", "B1", SevInfo, CodeReadAs); !strings.Contains(w.Message, `the header "Electricity use, Germany (kWh)"`) {
		t.Errorf("B1: %q", w.Message)
	}
}
