package importer

import (
	"context"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestComputedValues annotates the messy workbook and checks computed
// cells against the published factors, by hand:
//
//   - diesel 1000 L: 1 m3 x 832.5 kg/m3 (pack density: EN 590 midpoint, from
//     memory) x 43.0 TJ/Gg (IPCC 2006 Vol 2 Ch 1 Table 1.2) x 74 100 kg CO2/TJ
//     (Table 1.4) = 2.65259475 t CO2;
//   - natural gas 50 MWh = 0.18 TJ x 56 100 kg CO2/TJ (Table 1.4) = 10.098 t
//     CO2; CO2e adds 0.18 TJ x 1 kg CH4/TJ x 28 and 0.18 TJ x 0.1 kg N2O/TJ x
//     265 (IPCC 2006 Vol 2 Ch 2 Table 2.2; GWP-100 IPCC AR5 WG1 Ch 8 Table
//     8.A.1): 10.10781 t CO2e;
//   - natural gas 20 MMBtu HHV: 20 x 1.05505585262 GJ (Btu IT, NIST SP 811) x
//     0.90 NCV/GCV (IPCC 2006 Vol 2 Ch 1 section 1.4.1, ratio from memory) x
//     56.1 kg/GJ = 1.0654 t CO2;
//   - LPG 300 kg: 0.0003 Gg x 47.3 TJ/Gg x 63 100 kg/TJ (Tables 1.2, 1.4) =
//     0.895389 t CO2; the January row of the monthly table adds 42 000 kWh of
//     gas (8.48232 t) and 1200 L of gas oil (3.1831137 t);
//   - 40 MW of utility PV at a capacity factor of 0.21 over 30 years:
//     48 g CO2e/kWh (IPCC AR5 WG3 Annex III Table A.III.2, median, no direct
//     emissions) x 1000 x 0.21 x 8760 h x 30 / 1e6 x 40 = 105 960.96 t CO2e.
func TestComputedValues(t *testing.T) {
	dir := t.TempDir()
	in := writeMessy(t, dir)
	out := filepath.Join(dir, "out.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Layout != LayoutInline || rep.Output != out {
		t.Fatalf("layout %q output %q", rep.Layout, rep.Output)
	}
	f, err := excelize.OpenFile(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	checks := []struct {
		sheet, cell string
		want        float64 // NaN: no number (a reason or empty, see notComputedCells)
	}{
		{"Fuel log", "I4", math.NaN()}, // header, checked below
		{"Fuel log", "I5", 2.65259475},
		{"Fuel log", "I7", 10.098},
		{"Fuel log", "J7", 10.10781},
		{"Fuel log", "I13", 20 * 1.05505585262 * 0.90 * 56.1 / 1000},
		{"Fuel log", "I9", math.NaN()},  // "ton": never a guess
		{"Fuel log", "I12", math.NaN()}, // kW
		{"Fuel log", "I16", math.NaN()}, // "Disel"
		{"Fuel log", "I20", math.NaN()}, // total row
		{"Monthly energy", "G3", 8.48232 + 1.2*2.65259475 + 0.895389},
		{"Build plan", "G4", 105960.96},
	}
	// rows with no number say why (cellnotes.go); a total row stays empty
	notComputedCells := map[string]string{"I9": "not computed: ambiguous unit", "I12": "not computed: unit does not fit", "I16": "not computed: unknown fuel"}
	for _, c := range checks {
		v, err := f.GetCellValue(c.sheet, c.cell, excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		if math.IsNaN(c.want) {
			if c.cell == "I4" {
				if v != "tCO2" {
					t.Errorf("%s!%s = %q, want the header tCO2", c.sheet, c.cell, v)
				}
			} else if want := notComputedCells[c.cell]; v != want {
				t.Errorf("%s!%s = %q, want %q", c.sheet, c.cell, v, want)
			}
			continue
		}
		got, err := strconv.ParseFloat(v, 64)
		if err != nil || math.Abs(got-c.want) > 1e-9*math.Abs(c.want) {
			t.Errorf("%s!%s = %q, want %v", c.sheet, c.cell, v, c.want)
		}
	}
	heads := map[string]string{"J4": "tCO2e", "K4": "source"}
	for cell, want := range heads {
		if v, _ := f.GetCellValue("Fuel log", cell); v != want {
			t.Errorf("Fuel log!%s = %q, want %q", cell, v, want)
		}
	}
	src, _ := f.GetCellValue("Fuel log", "K5")
	for _, part := range []string{"ipcc2006/gas_diesel_oil:", "density", "ncv", "co2_ef", "common/ch4/gwp100_ar5"} {
		if !strings.Contains(src, part) {
			t.Errorf("source %q lacks %q", src, part)
		}
	}
	// Totals: the sum of the computed cells.
	var sumCO2 float64
	for r := 5; r <= 19; r++ {
		v, _ := f.GetCellValue("Fuel log", "I"+strconv.Itoa(r), excelize.Options{RawCellValue: true})
		if x, err := strconv.ParseFloat(v, 64); err == nil {
			sumCO2 += x
		}
	}
	for r := 3; r <= 6; r++ {
		v, _ := f.GetCellValue("Monthly energy", "G"+strconv.Itoa(r), excelize.Options{RawCellValue: true})
		if x, err := strconv.ParseFloat(v, 64); err == nil {
			sumCO2 += x
		}
	}
	if math.Abs(rep.Totals.TCO2-sumCO2) > 1e-9*sumCO2 {
		t.Errorf("total tCO2 %v, sum of the cells %v", rep.Totals.TCO2, sumCO2)
	}
	if d := rep.ByFuel["pv_utility"].TCO2e; math.Abs(d-105960.96) > 1e-6 {
		t.Errorf("by_fuel pv_utility %v", d)
	}
}

// TestPeriodsAndScale reads a fuel per row with a month per column, and a
// header in thousands of litres.
func TestPeriodsAndScale(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Monthly")
	setRows(t, f, "Monthly", 1, [][]any{
		{"Site", "Fuel", "Unit", "Jan", "Feb", "Mar", "Total"},
		{"Depot", "diesel", "L", 1000, nil, 500, 1500},
		{"Boilers", "natural_gas", "GJ", 100, 80, "-", 180},
	})
	addSheet(t, f, "Fleet")
	setRows(t, f, "Fleet", 1, [][]any{{"Fuel", "Quantity ('000 L)"}, {"diesel", 2}})
	rep := scanFile(t, save(t, f, filepath.Join(dir, "periods.xlsx")), Options{})
	if len(rep.Tables) != 2 || rep.Tables[0].Kind != kindPeriods {
		t.Fatalf("tables %+v", rep.Tables)
	}
	if !strings.Contains(rep.Rules[0], "fuel_co2(fuel, jan, unit) + fuel_co2(fuel, feb, unit) + fuel_co2(fuel, mar, unit)") {
		t.Errorf("rule %s", rep.Rules[0])
	}
	// 1500 L of diesel and 180 GJ of gas (TestComputedValues), then 2000 L.
	want := []float64{1.5*2.65259475 + 0.18*56.1, 2 * 2.65259475}
	for i, w := range want {
		if got := rep.Tables[i].Totals.TCO2; math.Abs(got-w) > 1e-9 {
			t.Errorf("table %d: %v t CO2, want %v", i, got, w)
		}
	}
	if !strings.Contains(rep.Rules[len(rep.Rules)-2], "quantity * 1000") {
		t.Errorf("rules %v", rep.Rules)
	}
}
