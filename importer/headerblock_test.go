package importer

import (
	"strings"
	"testing"
)

// TestParseHeaderSpellings: header spellings of real exports (benchmarking
// disclosures, statistics series, fleet logs), cleaned and split into a
// name and a unit.
func TestParseHeaderSpellings(t *testing.T) {
	cases := []struct {
		in, base, unit string
		scale          float64
	}{
		{"NaturalGasUse_therms", "NaturalGasUse", "therms", 1},
		{"FuelOil2Use_kBtu", "FuelOil2Use", "kBtu", 1},
		{"Fuel Oil #2 Use (kBtu)", "Fuel Oil #2 Use", "kBtu", 1},
		{"Natural\u00a0Gas¹\n(GJ)", "Natural Gas", "GJ", 1},
		{"Coal3 (t)", "Coal3", "t", 1},
		{"Diesel\r\n[L]", "Diesel", "L", 1},
		{"Vehicle(s)", "Vehicle", "", 1}, // a plural marker, not seconds
		{"Site(s) (kWh)", "Site", "kWh", 1},
		{"Colorado Natural Gas Industrial Consumption  Million Cubic Feet", "Colorado Natural Gas Industrial Consumption", "Million Cubic Feet", 1},
		{"Coal Consumed by the Residential Sector, Thousand Short Tons", "Coal Consumed by the Residential Sector", "Short Tons", 1000},
		{"Diesel ('000 L)", "Diesel", "L", 1000},
		{"Gas oil (’000 litres)", "Gas oil", "litres", 1000},
		{"Propane (000s gal)", "Propane", "gal", 1000},
		{"Natural gas (million kWh)", "Natural gas", "kWh", 1e6},
	}
	for _, c := range cases {
		h := parseHeader(c.in)
		if h.Base != c.base || h.UnitText != c.unit || h.Scale != c.scale || h.UnitErr != nil {
			t.Errorf("parseHeader(%q) = base %q unit %q scale %v err %v, want base %q unit %q scale %v",
				c.in, h.Base, h.UnitText, h.Scale, h.UnitErr, c.base, c.unit, c.scale)
		}
	}
}

// TestHeaderSpellingsInTables: the same headers at work in tables, with
// the amounts checked by hand.
func TestHeaderSpellingsInTables(t *testing.T) {
	t.Run("NaturalGasUse_therms and Fuel Oil #2 Use (kBtu)", func(t *testing.T) {
		rep, _ := scanRows(t, "benchmark.xlsx", "Buildings", [][]any{
			{"Building", "NaturalGasUse_therms", "Fuel Oil #2 Use (kBtu)"},
			{"North hall", 1200, 5000},
			{"South hall", 800, 2000},
			{"East hall", 400, 1000},
		})
		tb := oneTable(t, rep)
		if tb.Kind != kindWide || roleOf(t, tb, "NaturalGasUse_therms") != "fuel-column" || roleOf(t, tb, "Fuel Oil #2 Use (kBtu)") != "fuel-column" {
			t.Fatalf("table %+v", tb)
		}
		// therm = 100 000 Btu (the unit table's definition); both gross.
		wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasGrossT(2400*1e5*jPerBtu))
		wantTCO2(t, "fuel oil no. 2", rep.ByFuel["gas_diesel_oil"].TCO2, dieselGrossT(8000*1e3*jPerBtu))
		wantFinding(t, rep, "Buildings", "B1", SevInfo, CodeUnitBasis)
		wantFinding(t, rep, "Buildings", "C1", SevInfo, CodeUnitBasis)
	})
	t.Run("Vehicle(s)", func(t *testing.T) {
		rep, _ := scanRows(t, "fleet.xlsx", "Fleet", [][]any{
			{"Vehicle(s)", "Fuel", "Litres"},
			{"Van 1", "Diesel", 100},
			{"Van 2", "Diesel", 200},
			{"Vans 3 and 4", "Diesel", 300},
		})
		c := columnAt(t, oneTable(t, rep), "A1")
		if c.Header != "Vehicle" || c.HeaderUnit != "" || c.Role != "group" {
			t.Errorf("A1 = %+v, want the group Vehicle without a unit", c)
		}
		wantTCO2(t, "diesel", rep.Totals.TCO2, dieselT(600))
	})
	t.Run("'000 L, footnote mark, NBSP and line break", func(t *testing.T) {
		rep, _ := scanRows(t, "scaled.xlsx", "Depot", [][]any{
			{"Month", "Diesel ('000 L)", "Natural\u00a0Gas¹\n(GJ)"},
			{"Jan", 2, 100},
			{"Feb", 3, 200},
		})
		tb := oneTable(t, rep)
		if c := columnAt(t, tb, "C1"); c.Header != "Natural Gas (GJ)" || c.HeaderUnit != "GJ" || c.Role != "fuel-column" {
			t.Errorf("C1 = %+v", c)
		}
		wantTCO2(t, "diesel", rep.ByFuel["gas_diesel_oil"].TCO2, dieselT(5000))
		wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, 300e9/1e12*gasEF/kgPerTonne)
	})
	t.Run("Million Cubic Feet as the last words", func(t *testing.T) {
		rep := scanCSVText(t, "industrial.csv", "Month,Colorado Natural Gas Industrial Consumption  Million Cubic Feet\nJan 2023,100\nFeb 2023,200\nMar 2023,150\n")
		if c := columnAt(t, oneTable(t, rep), "B1"); c.HeaderUnit != "Million Cubic Feet" || c.Role != "fuel-column" {
			t.Errorf("B1 = %+v", c)
		}
		wantTCO2(t, "gas", rep.Totals.TCO2, gasVolT(450e6*m3PerCF))
	})
}

// aerLike is a statistics table whose header is printed over several rows,
// with footnote digits after the words and the unit in a title row: a
// label over the group labels when top is set, the group labels ("Fossil
// Fuels") when group is set, then between blank rows, then "Natural" over
// "Gas 3". It returns the rows and the header row.
func aerLike(top, group bool, between int) ([][]any, int) {
	rows := [][]any{
		{"Table 9.1  Fuel Consumption by Source: Commercial Sector, 2019-2021"},
		{"(Subset of Table 9.0; Billion Btu)"},
	}
	if top {
		rows = append(rows, []any{nil, "Energy Consumed", nil, nil, nil, nil, nil, "Energy Bought"})
	}
	if group {
		rows = append(rows, []any{"Year", "Fossil Fuels", nil, nil, nil, nil, nil, "Electricity"})
	}
	for i := 0; i < between; i++ {
		rows = append(rows, []any{})
	}
	rows = append(rows,
		[]any{nil, nil, nil, nil, "Natural", nil, nil, "Retail"},
		[]any{"Year", "Coal 1", nil, "Petroleum 2", "Gas 3", nil, "Total", "Electricity Sales 4"},
	)
	hdr := len(rows)
	if group {
		rows[hdr-1][0] = nil // the year's label is in the group row
	}
	return append(rows,
		[]any{2019, 100, nil, 50, 300, nil, 450, 900},
		[]any{2020, 110, nil, 40, 310, nil, 460, 910},
		[]any{2021, 120, nil, 30, 320, nil, 470, 920},
	), hdr
}

// TestHeaderOverRows: "Natural" over "Gas 3" is natural gas, in the title's
// Billion Btu, however many label rows and blank rows are above; a group
// label ("Fossil Fuels") stays off the columns that have labels of their
// own; electricity is left out with a note at its header.
func TestHeaderOverRows(t *testing.T) {
	cases := []struct {
		name       string
		top, group bool
		between    int
	}{
		{"Natural over Gas 3", false, false, 0},
		{"group labels, Natural over Gas 3", false, true, 0},
		{"group labels, blank row, Natural over Gas 3", false, true, 1},
		{"two label rows, two blank rows, Natural over Gas 3", true, true, 2},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rows, want := aerLike(c.top, c.group, c.between)
			rep, _ := scanRows(t, "aer.xlsx", "Commercial", rows)
			tb := oneTable(t, rep)
			if tb.HeaderRow != want || tb.Rows != 3 {
				t.Fatalf("header row %d with %d rows, want row %d with 3", tb.HeaderRow, tb.Rows, want)
			}
			hdr := itoaT(want)
			gas := columnAt(t, tb, "E"+hdr)
			if gas.Header != "Natural Gas 3" || gas.HeaderUnit != "Billion Btu" || gas.Role != "fuel-column" {
				t.Errorf("E%s = %+v, want Natural Gas 3 in Billion Btu", hdr, gas)
			}
			if got := columnAt(t, tb, "D"+hdr).Header; got != "Petroleum 2" {
				t.Errorf("D%s = %q, want Petroleum 2: a group label is carried only over columns without their own", hdr, got)
			}
			if got := columnAt(t, tb, "A"+hdr); got.Header != "Year" || got.Role != "date" {
				t.Errorf("A%s = %+v, want the date column Year", hdr, got)
			}
			// 330 and 930 billion Btu (B = 10^9, common practice), gross.
			wantTCO2(t, "coal", rep.ByFuel["other_bituminous_coal"].TCO2, coalGrossT(330e9*jPerBtu))
			wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasGrossT(930e9*jPerBtu))
			if len(rep.ByFuel) != 2 {
				t.Errorf("by fuel %v, want coal and gas only", rep.ByFuel)
			}
			if w := wantFinding(t, rep, "Commercial", "H"+hdr, SevWarning, CodeGridUnknown); !strings.Contains(w.Message, "--grid") {
				t.Errorf("H%s: %q", hdr, w.Message)
			}
		})
	}
}

// TestGroupLabelOverOwnLabels: a fuel over two sub-columns with labels of
// their own names only the one under it; the other keeps its own label.
func TestGroupLabelOverOwnLabels(t *testing.T) {
	rep, _ := scanRows(t, "supply.xlsx", "Supply", [][]any{
		{"Year", "Natural Gas", nil, "Propane"},
		{nil, "Volume (MMcf)", "Heat content (Billion Btu)", "Volume (Thousand Barrels)"},
		{2021, 10, 10.4, 5},
		{2022, 11, 11.4, 6},
	})
	tb := oneTable(t, rep)
	want := map[string]string{"B2": "Natural Gas Volume (MMcf)", "C2": "Heat content (Billion Btu)", "D2": "Propane Volume (Thousand Barrels)"}
	for cell, h := range want {
		if got := columnAt(t, tb, cell).Header; got != h {
			t.Errorf("%s = %q, want %q", cell, got, h)
		}
	}
	const propaneRho, lpgNCV, lpgEF = 508.0, 47.3, 63100.0 // propane at 15 °C (pack, from memory); IPCC 2006 Vol 2 Ch 1 Tables 1.2, 1.4 (LPG)
	wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasVolT(21e6*m3PerCF))
	wantTCO2(t, "propane", rep.ByFuel["propane"].TCO2, 11e3*galPerBbl*lPerGal/1000*propaneRho/1e6*lpgNCV*lpgEF/kgPerTonne)
}
