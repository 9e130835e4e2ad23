package importer

import "testing"

// TestDataRowIsNoHeaderUnderBanner: a site fuel log whose first data row
// names a site word and a unit ("Farm | Red diesel | 2400 | litres", two
// role words) under "Site | Fuel type | Quantity | Unit" (four): the header
// is the header, not a banner over the data row. Before, no table was found
// and nothing computed. UK fuel names as farms write them all read (the
// sites and amounts are invented): 2,400 L red diesel is gas/diesel oil.
func TestDataRowIsNoHeaderUnderBanner(t *testing.T) {
	rows := [][]any{
		{"Site", "Fuel type", "Quantity", "Unit"},
		{"Farm", "Red diesel", 2400, "litres"},
		{"Farm", "Burning oil", 1800, "Litres"},
		{"House", "Kerosene (28 sec)", 900, "litres"},
		{"Yard", "Gas oil", 500, "litres"},
		{"Yard", "Bottled LPG", 47, "kg"},
		{"Yard", "Coal (industrial)", 2, "tonnes"},
	}
	rep := scanWith(t, "farm.xlsx", "Fuel", rows, Options{})
	if rep.Computed != 6 || rep.Rows != 6 {
		t.Fatalf("computed %d of %d rows, want 6 of 6; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	e := testEngine(t)
	r, err := e.CallValues("fuel_co2", "gas_diesel_oil", 2900.0, "L")
	if err != nil {
		t.Fatal(err)
	}
	if got := rep.ByFuel["gas_diesel_oil"].TCO2; !near(got, r.Value) {
		t.Errorf("gas/diesel oil %.9g t CO2, want %.9g (2,400 + 500 L)", got, r.Value)
	}
}
