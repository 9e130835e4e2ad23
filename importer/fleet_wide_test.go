package importer

import (
	"strings"
	"testing"
)

// TestWideFuelColumnNamingVehiclesIsNoFleet: a national statistics table
// whose per-fuel columns name their consumers ("Natural Gas Deliveries to
// Commercial Consumers (Including Vehicle Fuel...)", the US EIA's monthly
// natural gas consumption table) is stationary combustion, not a vehicle
// fleet: a column of amounts naming vehicles among its consumers is no
// fleet record. The amounts are invented.
func TestWideFuelColumnNamingVehiclesIsNoFleet(t *testing.T) {
	rows := [][]any{
		{"Date", "U.S. Natural Gas Residential Consumption (MMcf)",
			"Natural Gas Deliveries to Commercial Consumers (Including Vehicle Fuel through 1996) in the U.S. (MMcf)",
			"U.S. Natural Gas Industrial Consumption (MMcf)"},
		{"Jan-1995", 900000, 500000, 800000},
		{"Feb-1995", 850000, 480000, 790000},
	}
	rep := scanWith(t, "gas.xlsx", "Data 1", rows, Options{})
	if rep.Computed != 2 {
		t.Fatalf("computed %d of %d rows; findings: %s", rep.Computed, rep.Rows, listFindings(rep))
	}
	if len(rep.ByKind) != 1 || rep.ByKind[0].Kind != KindStationary {
		t.Errorf("kinds %+v, want stationary combustion alone", rep.ByKind)
	}
	for _, w := range rep.Warnings {
		if strings.Contains(w.Message, "vehicle fleet") {
			t.Errorf("%s: %s", w.Cell, w.Message)
		}
	}
	for _, r := range rep.Rules {
		if strings.Contains(r, "mobile_co2") {
			t.Errorf("rule %q uses road factors", r)
		}
	}
}
