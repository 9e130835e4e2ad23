package importer

import (
	"path/filepath"
	"testing"

	"github.com/xuri/excelize/v2"
)

// writeMessy writes the invented workbook of "Tarnside Freight", with the
// mistakes real workbooks have: title rows above the header, a merged title
// and a site merged down its rows, a number stored as text, ambiguous units
// (ton, MT, MBtu), a power where an energy is needed, MWh and GJ mixed in
// one column, a declared HHV, a credit note, an extra-zero outlier, a
// misspelt fuel, aliases, a formula without a cached value, a reported tCO2
// off by more than 2 %, a total row; a wide monthly table with an ambiguous
// header unit and a purchased-electricity column; a build plan; and a sheet
// of notes without a table.
func writeMessy(t testing.TB, dir string) string {
	t.Helper()
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, [][]any{
		{"Tarnside Freight Ltd - fuel and energy purchases FY2025"},
		{"Prepared by finance from supplier invoices; quantities as invoiced"},
		{},
		{"Date", "Site", "Fuel", "Quantity", "Unit", "Supplier", "Reported tCO2", "Notes"},
		{45658, "Harbour depot", "Diesel", 1000, "L", "Fenwick Oils", 2.65},
		{45659, nil, "diesel", "1,250.5", "L", "Fenwick Oils", 3.32},
		{45660, nil, "Natural gas", 50, "MWh", "Brackwater Energy"},
		{45661, nil, "Natural gas", 180, "GJ", "Brackwater Energy"},
		{45662, "Moor Lane yard", "Coal", 5, "ton", "Tolland Fuels"},
		{45663, "Moor Lane yard", "Gasoline", 40, "MT", "Tolland Fuels"},
		{45664, "Moor Lane yard", "Natural gas", 100, "MBtu", "Brackwater Energy"},
		{45665, "Moor Lane yard", "Diesel", 30, "kW", "Fenwick Oils", nil, "generator"},
		{45666, "Moor Lane yard", "natural gas", 20, "MMBtu HHV", "Brackwater Energy"},
		{45667, "Harbour depot", "Diesel", -150, "L", "Fenwick Oils", nil, "credit note"},
		{45668, "Harbour depot", "Diesel", 118000, "L", "Fenwick Oils"},
		{45669, "Harbour depot", "Disel", 200, "L", "Fenwick Oils"},
		{45670, "Harbour depot", "Diesel", 900, "L", "Fenwick Oils", 2.0},
		{45671, "Harbour depot", "Diesel", formula("D17+100"), "L", "Fenwick Oils"},
		{45672, "Harbour depot", "Gas oil", 1100, "L", "Fenwick Oils"},
		{"Total", nil, nil, formula("SUM(D5:D19)")},
	})
	must(t, f.MergeCell("Fuel log", "A1", "H1"))
	must(t, f.MergeCell("Fuel log", "B5", "B8"))
	style, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true}, Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"DDEBF7"}}})
	must(t, err)
	must(t, f.SetCellStyle("Fuel log", "A4", "H4", style))
	dateStyle, err := f.NewStyle(&excelize.Style{NumFmt: 14})
	must(t, err)
	must(t, f.SetCellStyle("Fuel log", "A5", "A19", dateStyle))
	must(t, f.SetColWidth("Fuel log", "A", "A", 12))
	must(t, f.SetColWidth("Fuel log", "F", "F", 20))

	addSheet(t, f, "Monthly energy")
	setRows(t, f, "Monthly energy", 1, [][]any{
		{"Ostmere warehouse - metered energy 2025"},
		{"Month", "Natural gas (kWh)", "Gas oil [L]", "LPG (kg)", "Electricity (kWh)", "Coal (ton)"},
		{"Jan", 42000, 1200, 300, 18000, 2},
		{"Feb", 39000, nil, 280, 17500, 2},
		{"Mar", 31000, 900, "-", 17900, 1},
		{"Apr", 22000, 950, 250, 16800, nil},
	})
	addSheet(t, f, "Build plan")
	setRows(t, f, "Build plan", 1, [][]any{
		{"Capacity additions 2026-2030 (planning case)"},
		{},
		{"Project", "Technology", "Capacity", "Unit", "Capacity factor", "Lifetime (years)"},
		{"Fellside array", "pv_utility", 40, "MW", 0.21, 30},
		{"Skerry offshore", "wind_offshore", 300, "MW", nil, nil},
		{"Tarn roofs", "pv_rooftop", 900, "kW", 0.11, 25},
		{"Brackwater CCGT", "gas_cc", 0.4, "GW", 0.55, 30},
		{"Harbour store", "battery", 20, "MW", 0.2, 15},
	})
	addSheet(t, f, "Notes")
	setRows(t, f, "Notes", 1, [][]any{
		{"Quantities are as invoiced; see the finance folder for the scans."},
		{"Contact: finance team"},
	})
	must(t, f.SetDefinedName(&excelize.DefinedName{Name: "FuelRange", RefersTo: "'Fuel log'!$A$4:$H$19"}))
	return save(t, f, filepath.Join(dir, "tarnside-fy2025.xlsx"))
}

func must(t testing.TB, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}
