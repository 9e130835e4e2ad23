package importer

import (
	"strings"
	"testing"
)

// TestFooterEndsTable: notes, sources and sentences under a table end it;
// a block of rows under the notes is not added to the table above.
func TestFooterEndsTable(t *testing.T) {
	for _, note := range []string{
		"Source: invented supplier statements, compiled by the site team.",
		"Sources: delivery notes",
		"Notes: quantities are as delivered.",
		"Note: see the delivery notes",
		"Quantities were read from the delivery notes of each site",
		"3Deliveries to the depot only.",
	} {
		t.Run(note, func(t *testing.T) {
			rep, _ := scanRows(t, "notes.xlsx", "Log", [][]any{
				{"Fuel", "Quantity", "Unit"},
				{"Diesel", 100, "L"},
				{"Diesel", 200, "L"},
				{note},
				{"Diesel", 5000, "L"},
				{"Diesel", 6000, "L"},
			})
			tb := oneTable(t, rep)
			if tb.Range != "A1:C3" || tb.Rows != 2 {
				t.Errorf("table %s with %d rows, want A1:C3 with 2", tb.Range, tb.Rows)
			}
			wantTCO2(t, "diesel", rep.Totals.TCO2, dieselT(300))
		})
	}
}

// TestSectionAndTotalRows: a row of one label inside a table ("Commercial
// Sector") and a total row are not data rows: each gets a note at its own
// cell and adds nothing.
func TestSectionAndTotalRows(t *testing.T) {
	rep, _ := scanRows(t, "sectors.xlsx", "Sectors", [][]any{
		{"Year", "Coal (Thousand Short Tons)", "Natural Gas (MMcf)"},
		{"Commercial Sector"},
		{2021, 10, 100},
		{2022, 11, 110},
		{"Industrial Sector"},
		{2021, 20, 200},
		{2022, 21, 210},
		{"Total", 62, 620},
	})
	tb := oneTable(t, rep)
	if tb.Rows != 4 || tb.Computed != 4 {
		t.Errorf("computed %d of %d rows, want 4 of 4", tb.Computed, tb.Rows)
	}
	for _, cell := range []string{"A2", "A5"} {
		if w := wantFinding(t, rep, "Sectors", cell, SevInfo, CodeNotComputed); !strings.Contains(w.Message, "section") {
			t.Errorf("%s: %q, want a section label", cell, w.Message)
		}
	}
	if w := wantFinding(t, rep, "Sectors", "A8", SevInfo, CodeNotComputed); !strings.Contains(w.Message, "total") {
		t.Errorf("A8: %q, want a total row", w.Message)
	}
	// 62 thousand short tons of coal and 620 MMcf of gas, the total row left out.
	wantTCO2(t, "coal", rep.ByFuel["other_bituminous_coal"].TCO2, coalT(62e3*kgPerShort))
	wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasVolT(620e6*m3PerCF))
}

// TestAnnualRowsAmongMonthly: statistics give a year's total as month 13
// (YYYYMM 202213) among the months; it is not added.
func TestAnnualRowsAmongMonthly(t *testing.T) {
	rep, _ := scanRows(t, "monthly.xlsx", "Monthly", [][]any{
		{"YYYYMM", "Natural Gas (Billion Btu)"},
		{202211, 100},
		{202212, 100},
		{202213, 1200},
		{202301, 100},
		{202302, 100},
	})
	if w := wantFinding(t, rep, "Monthly", "A4", SevInfo, CodeNotComputed); !strings.Contains(w.Message, "annual") {
		t.Errorf("A4: %q, want an annual total", w.Message)
	}
	// Four months of 100 billion Btu (B = 10^9, common practice), gross.
	wantTCO2(t, "gas", rep.Totals.TCO2, gasGrossT(400e9*jPerBtu))
}
