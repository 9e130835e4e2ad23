package importer

import (
	"strings"
	"testing"
)

// TestDistanceRows: a mileage log by vehicle type is computed with
// vehicle_co2e. US EPA GHG Emission Factors Hub (15 September 2021) Table
// 10: passenger car 0.341 kg CO2, 0.009 g CH4 and 0.008 g N2O per mile;
// GWP-100 28 and 265 (IPCC AR5 WG1 Table 8.7).
func TestDistanceRows(t *testing.T) {
	rep := scanWith(t, "mileage.xlsx", "Business travel", [][]any{
		{"Employee", "Vehicle type", "Miles driven"},
		{"A. Tern", "Passenger car", 1200},
		{"B. Wren", "Passenger car", 800},
		{"C. Finch", "Passenger car", 400},
	}, Options{})
	if len(rep.Tables) != 1 || rep.Tables[0].Kind != kindDistance {
		t.Fatalf("tables %+v, want one %s table; findings %s", rep.Tables, kindDistance, listFindings(rep))
	}
	perMile := (0.341 + 0.009e-3*28 + 0.008e-3*265) / 1000
	if got, want := rep.Totals.TCO2e, 2400*perMile; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; rules %v findings %s", got, want, rep.Rules, listFindings(rep))
	}
	if got, want := strings.Join(rep.Rules, "; "), "tCO2e = vehicle_co2e(miles_driven, miles_driven_unit, vehicle_type)"; got != want {
		t.Errorf("rules %q, want %q", got, want)
	}
	wantFinding(t, rep, "Business travel", "C1", SevInfo, CodeReadAs)
}

// TestDistanceUnknownVehicle: a vehicle type the tables do not know is an
// error at its cell naming the accepted types; the fuel-burned tables are
// not read as distances.
func TestDistanceUnknownVehicle(t *testing.T) {
	rep := scanWith(t, "mileage.xlsx", "Trips", [][]any{
		{"Vehicle", "Distance (km)"},
		{"Diesel van", 300},
		{"Medium petrol car", 120},
		{"Hovercraft", 50},
	}, Options{})
	if rep.Computed != 2 {
		t.Errorf("computed %d rows, want 2; findings %s", rep.Computed, listFindings(rep))
	}
	if w := wantFinding(t, rep, "Trips", "A4", SevError, CodeRuleError); !strings.Contains(w.Message, "accepted") {
		t.Errorf("A4: %q", w.Message)
	}
}
