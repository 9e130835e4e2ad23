package importer

import (
	"path/filepath"
	"testing"
)

// gasGWhT is tonnes of CO2 from natural gas in GWh read as NCV: 1 GWh =
// 3.6 TJ (SI), 56 100 kg CO2/TJ (IPCC 2006 Vol 2 Ch 1 Table 1.4).
func gasGWhT(gwh float64) float64 { return gwh * 3.6 * gasEF / kgPerTonne }

// A statistics sheet gives gas by parts under one name (domestic,
// non-domestic, all meters), with region rows marked "All local
// authorities" above their authorities. Only the authorities' All meters
// count: the region rows are sums of rows, All meters the sum of its
// parts. (Layout as in the UK subnational gas consumption statistics;
// names invented.)
func TestPartsUnderOneNameAndAggregateRows(t *testing.T) {
	rep, _ := scanRows(t, "gas.xlsx", "2021", [][]any{
		{"Subnational gas consumption, 2021"},
		{},
		{"Code", "Region", "Local authority", "Total consumption (GWh): Domestic", "Total consumption (GWh): Non-Domestic", "Total consumption (GWh): All meters"},
		{"R1", "Westmoor", "All local authorities", 300, 100, 400},
		{"A1", "Westmoor", "Carrow", 100, 40, 140},
		{"A2", "Westmoor", "Dunsley", 120, 30, 150},
		{"A3", "Westmoor", "Elbridge", 80, 30, 110},
	})
	tb := oneTable(t, rep)
	if tb.Kind != kindWide || tb.Rows != 3 {
		t.Fatalf("table %+v: want a wide table of 3 authorities", tb)
	}
	wantTCO2(t, "gas", rep.Totals.TCO2, gasGWhT(400))
}

// A regional summary beside the per-site table it sums: counted once,
// from the larger table (names invented).
func TestSummaryBesideDetail(t *testing.T) {
	f := newBook(t, "Sites")
	setRows(t, f, "Sites", 1, [][]any{
		{"Site", "Fuel", "Quantity", "Unit"},
		{"Pell Quay", "diesel", 1000, "L"},
		{"Pell Quay", "diesel", 500, "L"},
		{"Orrin Mill", "diesel", 1500, "L"},
		{"Orrin Mill", "diesel", 1000, "L"},
	})
	addSheet(t, f, "Regions")
	setRows(t, f, "Regions", 1, [][]any{
		{"Region", "Fuel", "Quantity", "Unit"},
		{"North", "diesel", 1500, "L"},
		{"South", "diesel", 2500, "L"},
	})
	rep := scanFile(t, save(t, f, filepath.Join(t.TempDir(), "sites.xlsx")), Options{})
	// 4000 L of diesel: 4 m3 x 832.5 kg/m3 x 43.0 TJ/Gg x 74 100 kg/TJ.
	wantTCO2(t, "diesel", rep.Totals.TCO2, 4*dieselRho/1e6*dieselNCV*dieselEF/kgPerTonne)
	if len(rep.Sheets) != 2 || rep.Sheets[1].Status != StatusNone {
		t.Errorf("sheets %+v: want the regions summary not counted", rep.Sheets)
	}
}
