package importer

import (
	"strings"
	"testing"
)

// TestSiteTableWithMileage: a site table in the layout of a UK company's
// energy and carbon report (gas and electricity in kWh, diesel and petrol
// in litres, business mileage in miles; the sites and amounts are
// invented). The mileage column does not make the sites vehicles: the gas
// is burned in boilers (stationary CH4 and N2O), diesel and petrol take
// road factors, and the miles, with no vehicle type, are noted as not
// computed.
func TestSiteTableWithMileage(t *testing.T) {
	rows := [][]any{
		{"Site", "Gas (kWh)", "Electricity (kWh)", "Diesel (litres)", "Petrol (litres)", "Business mileage (miles)"},
		{"Leeds office", 120000, 80000, 1500, 300, 12000},
		{"York depot", 45000, 30000, 9000, 100, 4000},
	}
	rep := scanWith(t, "sites.xlsx", "Energy", rows, Options{Grid: "UK"})
	if rep.Computed != 2 {
		t.Fatalf("computed %d of %d rows; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	rules := strings.Join(rep.Rules, "\n")
	for _, want := range []string{`fuel_co2e("natural_gas", gas, gas_unit)`, `mobile_co2e("gas_diesel_oil", diesel, diesel_unit, "road")`} {
		if !strings.Contains(rules, want) {
			t.Errorf("rules do not hold %s:\n%s", want, rules)
		}
	}
	e := testEngine(t)
	r, err := e.CallValues("fuel_co2e", "natural_gas", 165000.0, "kWh")
	if err != nil {
		t.Fatal(err)
	}
	if got := rep.ByFuel["natural_gas"].TCO2e; !near(got, r.Value) {
		t.Errorf("natural gas %.9g t CO2e, want %.9g (165,000 kWh with stationary CH4 and N2O)", got, r.Value)
	}
	found := false
	for _, w := range rep.Warnings {
		if w.Cell == "F1" && w.Code == CodeNotComputed && strings.Contains(w.Message, "distance driven with no vehicle type") {
			found = true
		}
	}
	if !found {
		t.Errorf("no note at the mileage column; findings: %s", listFindings(rep))
	}
}

// TestWaterColumnNoted: a monthly utilities table with water beside gas
// and electricity says why water is not computed, instead of passing it
// over (the amounts are invented).
func TestWaterColumnNoted(t *testing.T) {
	rows := [][]any{
		{"Month", "Electricity kWh", "Gas kWh", "Water m3", "Spend GBP"},
		{"Apr-24", 12000, 30000, 150, 5400},
		{"May-24", 11500, 21000, 140, 4700},
	}
	rep := scanWith(t, "utilities.xlsx", "Monthly", rows, Options{Grid: "UK"})
	if rep.Computed != 2 {
		t.Fatalf("computed %d of %d rows; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	for _, w := range rep.Warnings {
		if w.Cell == "D1" && w.Code == CodeNotComputed && strings.Contains(w.Message, "is water, not fuel burned or energy bought") {
			return
		}
	}
	t.Errorf("no note at the water column; findings: %s", listFindings(rep))
}
