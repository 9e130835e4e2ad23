package importer

import (
	"strings"
	"testing"
)

// utilityBillExport has the columns of a California utility's monthly
// billing export (time-of-use electricity usage by period, its total,
// demand in kW, and gas in therms; the layout a public schema description
// of such exports lists); the customer and the amounts are invented.
var utilityBillExport = [][]any{
	{"Billing Name", "Account #", "Bill End Date", "Rate", "Total Bill Amount ($)",
		"On Peak (kWh)", "Partial Peak (kWh)", "Off Peak Usage (kWh)", "Super Off Peak (kWh)", "Total Usage (kWh)",
		"Total Usage (Therms)", "Max. Max Demand (kW)"},
	{"HILLTOP ASSOC", 1001, "2024-01-31", "B19", 4210.55, 2000, 3000, 9000, 1000, 15000, nil, 62},
	{"HILLTOP ASSOC", 1001, "2024-02-29", "B19", 3980.10, 1900, 2800, 8800, 900, 14400, nil, 60},
	{"HILLTOP ASSOC", 1002, "2024-01-31", "G-NR1", 820.00, nil, nil, nil, nil, nil, 640, nil},
	{"HILLTOP ASSOC", 1002, "2024-02-29", "G-NR1", 760.00, nil, nil, nil, nil, nil, 590, nil},
}

// TestUtilityBillExport: time-of-use usage columns are purchased
// electricity (only electricity is billed by time of use) and counted once,
// from the periods, with the total beside them noted as such; therms name
// natural gas (the unit gas is billed in), with a note; demand (kW) is no
// amount. 29,400 kWh on the given grid, 1,230 therms of gas.
func TestUtilityBillExport(t *testing.T) {
	rep := scanWith(t, "bills.xlsx", "monthly", utilityBillExport, Options{Grid: "CAMX"})
	if rep.Computed != 4 || rep.Rows != 4 {
		t.Fatalf("computed %d of %d rows, want 4 of 4; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	e := testEngine(t)
	call := func(name string, args ...any) float64 {
		r, err := e.CallValues(name, args...)
		if err != nil {
			t.Fatalf("%s%v: %v", name, args, err)
		}
		return r.Value
	}
	if got, want := rep.ByFuel["Scope 2: electricity"].TCO2e, call("electricity_co2e", 29400.0, "kWh", "us_camx"); !near(got, want) {
		t.Errorf("electricity %.9g t CO2e, want %.9g (29,400 kWh once: the periods, not again the total)", got, want)
	}
	if got, want := rep.Totals.TCO2, call("fuel_co2", "natural_gas", 1230.0, "therm"); !near(got, want) {
		t.Errorf("tCO2 %.9g, want %.9g (1,230 therms of natural gas)", got, want)
	}
	notes := map[string]string{
		"F1": "read as purchased electricity",
		"J1": "is a total: left out, so that the amounts of the columns beside it are not counted twice",
		"K1": "names no fuel; read as natural gas",
	}
	for _, w := range rep.Warnings {
		if w.Severity == SevError || w.Severity == SevWarning {
			t.Errorf("%s %s %s: %s", w.Cell, w.Severity, w.Code, w.Message)
		}
		if m, ok := notes[w.Cell]; ok && strings.Contains(w.Message, m) {
			delete(notes, w.Cell)
		}
	}
	for cell, m := range notes {
		t.Errorf("no note at %s saying %q; findings: %s", cell, m, listFindings(rep))
	}
}
