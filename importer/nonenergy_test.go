package importer

import (
	"strings"
	"testing"
)

// TestNonEnergyProductsNotBurned: a consumption table that lists asphalt and
// lubricants among fuels (as state energy statistics do) computes the fuels
// and leaves the two products out with their reason: they are used as
// materials, and IPCC 2006 Vol 3 Ch 5 reports their use under industrial
// processes and product use, not fuel combustion. Diesel: 1 t x 43 GJ/t
// (Vol 2 Ch 1 Table 1.2) x 74.1 kg CO2/GJ (Table 1.4) = 3.1863 t CO2.
func TestNonEnergyProductsNotBurned(t *testing.T) {
	rep := scanWith(t, "state.xlsx", "Consumption", [][]any{
		{"Product", "Consumption", "Unit"},
		{"Diesel", 1, "t"},
		{"Asphalt and road oil", 5, "t"},
		{"Lubricants", 2, "t"},
	}, Options{})
	if rep.Computed != 1 {
		t.Fatalf("computed %d rows, want 1 (diesel); findings %s", rep.Computed, listFindings(rep))
	}
	if got := rep.Totals.TCO2; !near(got, 3.1863) {
		t.Errorf("total %.6g t CO2, want 3.1863", got)
	}
	found := 0
	for _, w := range rep.Warnings {
		if w.Code == CodeNotComputed && strings.Contains(w.Message, "not burned") && strings.Contains(w.Message, "Vol 3 Ch 5") {
			found++
		}
	}
	if found != 2 {
		t.Errorf("%d rows say they hold a product not burned, want 2; findings %s", found, listFindings(rep))
	}
}
