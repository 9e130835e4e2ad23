package importer

import (
	"strings"
	"testing"
)

// benchmarkingExport has the column headers of an energy-benchmarking
// export as US cities publish them for their municipal buildings (for
// example the City of Philadelphia's municipal building benchmarking data,
// 2011-13): each fuel in two units, energy totals over all fuels, national
// medians and weather-normalized figures beside the metered amounts. The
// buildings and amounts are invented.
var benchmarkingExport = [][]any{
	{"Property Name", "Year",
		"Electricity Use - Grid Purchase and Generated from Onsite Renewable Systems (kWh)",
		"Electricity Use - Grid Purchase and Generated from Onsite Renewable Systems (kBtu)",
		"Natural Gas Use (therms)", "Natural Gas Use (kBtu)",
		"Site Energy Use (kBtu)", "National Median Site Energy Use (kBtu)",
		"Weather Normalized Site Natural Gas Use (therms)"},
	{"Harbour Street Library", 2012, 100000, 341200, 2000, 200000, 541200, 600000, 2100},
	{"Quarry Lane Depot", 2012, 50000, 170600, 1000, 100000, 270600, 250000, 950},
}

// TestBenchmarkingExportColumns: the grid-purchase electricity column is
// read as purchased electricity (with a note that on-site generation in it
// has no Scope 2 emissions) and counted once, not again from its kBtu
// twin; gas is counted once from therms; energy totals, medians and
// weather-normalized figures are left out with a note each, not a warning.
// Factors: US eGRID2022 RFCE, and natural gas by therm in the default pack
// (the same function calls the annotation makes, checked against
// themselves here: the test is about which columns count, not the factors).
func TestBenchmarkingExportColumns(t *testing.T) {
	rep := scanWith(t, "benchmarking.xlsx", "Data", benchmarkingExport, Options{Grid: "RFCE"})
	if rep.Computed != 2 {
		t.Fatalf("computed %d of %d rows; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	e := testEngine(t)
	call := func(name string, args ...any) float64 {
		r, err := e.CallValues(name, args...)
		if err != nil {
			t.Fatalf("%s%v: %v", name, args, err)
		}
		return r.Value
	}
	elec := call("electricity_co2e", 150000.0, "kWh", "us_rfce")
	if got := rep.ByFuel["Scope 2: electricity"].TCO2e; !near(got, elec) {
		t.Errorf("electricity %.9g t CO2e, want %.9g (150,000 kWh once, not again from kBtu)", got, elec)
	}
	gas := call("fuel_co2", "natural_gas", 3000.0, "therm")
	if got := rep.Totals.TCO2; !near(got, gas) {
		t.Errorf("tCO2 %.9g, want %.9g (3,000 therms of gas once, not again from kBtu or the totals)", got, gas)
	}
	want := map[string]string{
		"C1": "read as purchased electricity",
		"D1": "gives purchased electricity again, in kBtu: counted once",
		"F1": "gives natural_gas again, in kBtu: counted once",
		"G1": "is an energy total over all fuels, not an amount of one fuel",
		"H1": "is a rate, an average or a modelled figure",
		"I1": "is a rate, an average or a modelled figure",
	}
	for _, w := range rep.Warnings {
		if w.Severity != SevInfo && strings.HasSuffix(w.Cell, "1") && len(w.Cell) == 2 {
			t.Errorf("%s %s %s: %s (a header of a benchmarking export deserves a note, not a %s)", w.Cell, w.Severity, w.Code, w.Message, w.Severity)
		}
		if m, ok := want[w.Cell]; ok && strings.Contains(w.Message, m) {
			delete(want, w.Cell)
			if w.Cell == "C1" && !strings.Contains(w.Message, "generated on site too") {
				t.Errorf("C1: %q does not say that on-site generation is in the figure", w.Message)
			}
		}
	}
	for cell, m := range want {
		t.Errorf("no note at %s saying %q; findings: %s", cell, m, listFindings(rep))
	}
}
