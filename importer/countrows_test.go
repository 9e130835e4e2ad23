package importer

import (
	"strings"
	"testing"
)

// TestFuelCardCountLines: a fuel card export lists merchandise, services
// and discounts beside the fuel, with the unit "EA" (each) and a product
// class such as "Non-Fuel" (the columns of a US city's fleet card export;
// the amounts here are invented). Those lines are no record of fuel: left
// out with a note at the unit, not an error, and not counted among the rows
// a total misses, so the total is complete. 10 + 12 US gallons of diesel.
func TestFuelCardCountLines(t *testing.T) {
	rows := [][]any{
		{"Transaction Date", "Vehicle ID", "Product Class", "Product Description", "Units", "Unit of Measure", "Unit Cost", "Net Cost"},
		{"10/26/2017", 25, "Non-Fuel", "Discount 2", 1, "EA", -0.02, -0.02},
		{"10/27/2017", 22, "Diesel", "Diesel #2", 10, "GA", 2.8, 28.0},
		{"10/28/2017", 22, "Non-Fuel", "General Merchandise", 22.14, "EA", 2.8, 61.96},
		{"10/29/2017", 31, "Diesel", "Diesel #2", 12, "GA", 2.8, 33.6},
		{"10/30/2017", 31, "Service", "Car Wash", 1, "EA", 8.0, 8.0},
	}
	rep := scanWith(t, "card.xlsx", "Transactions", rows, Options{})
	if rep.Rows != 2 || rep.Computed != 2 || rep.Incomplete {
		t.Fatalf("%d of %d rows computed (incomplete %v), want 2 of 2 and complete; findings: %s", rep.Computed, rep.Rows, rep.Incomplete, listFindings(rep))
	}
	notes := 0
	for _, w := range rep.Warnings {
		if w.Severity == SevError {
			t.Errorf("%s %s: %s (a non-fuel line deserves a note, not an error)", w.Cell, w.Code, w.Message)
		}
		if w.Code == CodeNotComputed && strings.HasPrefix(w.Cell, "F") && strings.Contains(w.Message, "counts items, not an amount of fuel") {
			notes++
		}
	}
	if notes != 3 {
		t.Errorf("%d notes at the EA cells, want 3; findings: %s", notes, listFindings(rep))
	}
}
