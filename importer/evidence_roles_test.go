package importer

import (
	"context"
	"strings"
	"testing"
)

// TestRolesFromEvidence: a column's role comes from its header words and
// its values together.
func TestRolesFromEvidence(t *testing.T) {
	cases := []struct {
		name  string
		rows  [][]any
		roles map[string]string // header -> role ("" for none)
		rows2 int               // rows computed
	}{
		{
			name: "Usage of text beside Litres",
			rows: [][]any{
				{"Fuel", "Usage", "Litres"},
				{"Diesel", "Heating", 100},
				{"Diesel", "Fleet", 200},
				{"Propane", "Heating", 300},
			},
			roles: map[string]string{"Fuel": "fuel", "Usage": "", "Litres": "quantity"},
			rows2: 3,
		},
		{
			name: "mmbtu",
			rows: [][]any{
				{"Facility", "Fuel", "mmbtu"},
				{"Plant 1", "Natural gas", 100},
				{"Plant 2", "Natural gas", 200},
				{"Plant 3", "Natural gas", 300},
			},
			roles: map[string]string{"Fuel": "fuel", "mmbtu": "quantity"},
			rows2: 3,
		},
		{
			name: "Primary fuel mostly blank, Natural gas",
			rows: [][]any{
				{"Primary fuel", "Fuel", "Quantity", "Unit"},
				{"Natural gas", "Diesel", 100, "L"},
				{nil, "Diesel", 200, "L"},
				{nil, "Propane", 300, "L"},
				{nil, "Diesel", 200, "L"},
				{nil, "Diesel", 200, "L"},
			},
			roles: map[string]string{"Primary fuel": "", "Fuel": "fuel", "Quantity": "quantity", "Unit": "unit"},
			rows2: 5,
		},
		{
			name: "Primary fuel mostly blank, Coal",
			rows: [][]any{
				{"Primary fuel", "Fuel", "Quantity", "Unit"},
				{"Coal", "Diesel", 100, "L"},
				{nil, "Diesel", 200, "L"},
				{nil, "Propane", 300, "L"},
				{nil, "Diesel", 200, "L"},
				{nil, "Diesel", 200, "L"},
			},
			roles: map[string]string{"Primary fuel": "", "Fuel": "fuel", "Quantity": "quantity", "Unit": "unit"},
			rows2: 5,
		},
		{
			name: "Gallons of 0/1 flags beside Quantity",
			rows: [][]any{
				{"Fuel", "Gallons", "Quantity", "Unit"},
				{"Diesel", 1, 10, "gal"},
				{"Diesel", 0, 20, "gal"},
				{"Propane", 1, 30, "gal"},
				{"Propane", 1, 40, "gal"},
			},
			roles: map[string]string{"Gallons": "", "Quantity": "quantity", "Unit": "unit"},
			rows2: 4,
		},
		{
			name: "Engine size (L) beside Fuel used (L)",
			rows: [][]any{
				{"Vehicle", "Fuel", "Engine size (L)", "Fuel used (L)"},
				{"Van 1", "Diesel", 2.0, 500},
				{"Van 2", "Diesel", 2.2, 600},
				{"Car 1", "Petrol", 1.6, 300},
			},
			roles: map[string]string{"Vehicle": "group", "Engine size (L)": "", "Fuel used (L)": "quantity"},
			rows2: 3,
		},
		{
			name: "Price ($/gal), MPG, kWh per meter and Price beside Gallons",
			rows: [][]any{
				{"Fuel", "Price ($/gal)", "MPG", "Mean use (kWh per meter)", "Price", "Gallons"},
				{"Diesel", 3.5, 25, 300, 12, 100},
				{"Diesel", 3.6, 26, 310, 13, 200},
				{"Gasoline", 3.1, 30, 320, 14, 300},
			},
			roles: map[string]string{"Price ($/gal)": "", "MPG": "", "Mean use (kWh per meter)": "", "Price": "", "Gallons": "quantity"},
			rows2: 3,
		},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rep, _ := scanRows(t, "roles.xlsx", "Log", c.rows)
			tb := oneTable(t, rep)
			for h, want := range c.roles {
				if got := roleOf(t, tb, h); got != want {
					t.Errorf("role of %q = %q, want %q", h, got, want)
				}
			}
			if tb.Kind != kindFuelLog || tb.Computed != c.rows2 {
				t.Errorf("kind %s, computed %d of %d rows, want a fuel-log computing %d", tb.Kind, tb.Computed, tb.Rows, c.rows2)
			}
		})
	}
}

// TestMMBtuHeaderIsTheAmount: the header is the unit itself; MMBtu is read
// as gross (HHV), said at the header.
func TestMMBtuHeaderIsTheAmount(t *testing.T) {
	rep, _ := scanRows(t, "mmbtu.xlsx", "Plants", [][]any{
		{"Facility", "Fuel", "mmbtu"},
		{"Plant 1", "Natural gas", 100},
		{"Plant 2", "Natural gas", 200},
		{"Plant 3", "Natural gas", 300},
	})
	wantTCO2(t, "600 MMBtu of gas", rep.Totals.TCO2, gasGrossT(600e6*jPerBtu))
	wantFinding(t, rep, "Plants", "C1", SevInfo, CodeUnitBasis)
}

// TestNothingToCompute: tables without an amount of fuel compute nothing;
// their sheet is skipped with the reason.
func TestNothingToCompute(t *testing.T) {
	cases := []struct {
		name   string
		rows   [][]any
		reason string
	}{
		{"Engine size (L) only", [][]any{
			{"Vehicle", "Fuel", "Engine size (L)"},
			{"Van 1", "Diesel", 2.0},
			{"Van 2", "Diesel", 2.2},
			{"Car 1", "Petrol", 1.6},
		}, "no table"},
		{"Gallons of 0/1 flags only", [][]any{
			{"Fuel", "Gallons", "Unit"},
			{"Diesel", 1, "gal"},
			{"Diesel", 0, "gal"},
			{"Propane", 1, "gal"},
			{"Propane", 1, "gal"},
		}, "no table"},
		{"Price ($/gal), MPG, kWh per meter and Price", [][]any{
			{"Fuel", "Price ($/gal)", "MPG", "Mean use (kWh per meter)", "Price"},
			{"Diesel", 3.5, 25, 300, 12},
			{"Diesel", 3.6, 26, 310, 13},
			{"Gasoline", 3.1, 30, 320, 14},
		}, "a table of prices, rates or counts at Log!A1"},
		{"(Dollars per Million Btu) title", [][]any{
			{"Table 4. Fuel Prices to Industrial Users, 2019-2021"},
			{"(Dollars per Million Btu)"},
			{"Year", "Coal", "Natural Gas", "Distillate Fuel Oil"},
			{2019, 2.1, 3.5, 18.2},
			{2020, 2.0, 3.1, 14.9},
			{2021, 2.2, 4.4, 19.0},
		}, "a table of prices or rates at Log!A3 (the title says \"(Dollars per Million Btu)\")"},
		{"kg CO2 per mmBtu", [][]any{
			{"Fuel", "kg CO2 per mmBtu", "g CH4 per mmBtu"},
			{"Natural gas", 53.06, 1},
			{"Distillate fuel oil", 73.96, 3},
			{"Propane", 62.87, 3},
		}, "a table of emission factors at Log!A1"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rep, _ := scanRows(t, "none.xlsx", "Log", c.rows)
			if len(rep.Tables) != 0 || rep.Computed != 0 || rep.Totals != (Totals{}) {
				t.Errorf("tables %+v, computed %d, totals %+v: want nothing", rep.Tables, rep.Computed, rep.Totals)
			}
			if len(rep.Sheets) != 1 || rep.Sheets[0].Status != StatusSkipped || !strings.Contains(rep.Sheets[0].Reason, c.reason) {
				t.Errorf("sheets %+v, want Log skipped with a reason containing %q", rep.Sheets, c.reason)
			}
			if n := rep.Count(SevError); n != 0 {
				t.Errorf("%d errors: %s", n, listFindings(rep))
			}
		})
	}
}

// TestFuelName: fuels named inside phrases, aggregates, carriers not burned
// on site, prices, misspellings and hyphen-broken words.
func TestFuelName(t *testing.T) {
	sc := newScanCtx(context.Background(), testEngine(t), "names.xlsx", Options{})
	cases := []struct {
		in   string
		kind nameKind
		id   string
	}{
		{"Coal Consumed by the Residential Sector", nameFuel, "other_bituminous_coal"},
		{"Gas Firm", nameFuel, "natural_gas"},
		{"Natural Gas Consumption (Excluding Supplemental Gaseous Fuels)", nameFuel, "natural_gas"},
		{"Gas-oline", nameFuel, "motor_gasoline"},
		{"Die-sel", nameFuel, "gas_diesel_oil"},
		{"Total Fossil Fuels", nameAggregate, ""},
		{"Combined", nameAggregate, ""},
		{"Electricity", nameNotFuel, ""},
		{"Steam", nameNotFuel, ""},
		{"Crude Oil Price", nameRate, ""},
		{"Natral gas", nameUnknown, ""},
		{"Natral Gas Consumed by the Residential Sector", nameUnknown, ""},
		{"", nameUnknown, ""},
	}
	for _, c := range cases {
		got := sc.fuelName(c.in)
		if got.kind != c.kind || got.id != c.id {
			t.Errorf("fuelName(%q) = kind %d id %q, want kind %d id %q", c.in, got.kind, got.id, c.kind, c.id)
		}
	}
}

// TestFuelRowsNotComputed: in a fuel log, rows of aggregates and of
// electricity without a grid are not computed, with a note at their own
// cell (steam is computed as Scope 2); a misspelt
// fuel is an error with a suggestion, not read as gas.
func TestFuelRowsNotComputed(t *testing.T) {
	rep, _ := scanRows(t, "tariffs.xlsx", "Bills", [][]any{
		{"Service", "Quantity", "Unit"},
		{"Gas Firm", 100, "therms"},
		{"Gas Interruptible", 200, "therms"},
		{"Total Fossil Fuels", 300, "therms"},
		{"Combined", 300, "therms"},
		{"Electricity", 500, "kWh"},
		{"Steam", 50, "MMBtu"},
		{"Natral gas", 70, "therms"},
		{"Gas-oline", 10, "gal"},
	})
	for _, cell := range []string{"A4", "A5", "A6"} {
		wantFinding(t, rep, "Bills", cell, SevInfo, CodeNotComputed)
	}
	wantFinding(t, rep, "Bills", "A7", SevInfo, CodeReadAs) // steam: heat_co2e's default (scope2_test.go)
	if w := wantFinding(t, rep, "Bills", "A6", SevWarning, CodeGridUnknown); !strings.Contains(w.Message, "--grid") {
		t.Errorf("finding at A6 %q, want how to choose a grid", w.Message)
	}
	w := wantFinding(t, rep, "Bills", "A8", SevError, CodeFuelUnknown)
	if !strings.Contains(w.Message, "did you mean natural_gas") {
		t.Errorf("finding at A8 %q, want a suggestion of natural_gas", w.Message)
	}
	// 300 therms of gas (therm = 100 000 Btu, the unit table's definition;
	// gross, so the NCV/GCV ratio applies) and 10 US gallons of gasoline.
	const gasolineRho, gasolineNCV, gasolineEF = 747.5, 44.3, 69300.0 // EN 228 midpoint (from memory); IPCC 2006 Vol 2 Ch 1 Tables 1.2, 1.4
	gasoline := 10 * lPerGal / 1000 * gasolineRho / 1e6 * gasolineNCV * gasolineEF / kgPerTonne
	wantTCO2(t, "natural_gas", rep.ByFuel["natural_gas"].TCO2, gasGrossT(300*1e5*jPerBtu))
	wantTCO2(t, "motor_gasoline", rep.ByFuel["motor_gasoline"].TCO2, gasoline)
	if got, want := rep.ByFuel["Scope 2: steam"].TCO2e, 50*steamTPerMM; !near(got, want) {
		t.Errorf("steam %.9g t CO2e, want %.9g", got, want)
	}
	if len(rep.ByFuel) != 3 {
		t.Errorf("by fuel %v, want natural_gas, motor_gasoline and steam only", rep.ByFuel)
	}
}

// TestFuelPhraseHeaders: one column per fuel whose header is a phrase; a
// misspelt fuel header is left out with a suggestion.
func TestFuelPhraseHeaders(t *testing.T) {
	rep, _ := scanRows(t, "residential.xlsx", "Residential", [][]any{
		{"Month", "Coal Consumed by the Residential Sector (Thousand Short Tons)", "Natural Gas Consumed by the Residential Sector (MMcf)", "Natral Gas (MMcf)"},
		{202301, 10, 100, 7},
		{202302, 11, 110, 8},
		{202303, 12, 120, 9},
	})
	// 33 thousand short tons of coal; 330 MMcf of gas (MM = 10^6: SEC Form
	// 10-K glossaries, as in the unit table).
	wantTCO2(t, "coal", rep.ByFuel["other_bituminous_coal"].TCO2, coalT(33e3*kgPerShort))
	wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasVolT(330e6*m3PerCF))
	w := wantFinding(t, rep, "Residential", "D1", SevWarning, CodeFuelUnknown)
	if !strings.Contains(w.Message, "did you mean natural_gas") {
		t.Errorf("finding at D1 %q, want a suggestion of natural_gas", w.Message)
	}
	t.Run("Natral Gas Deliveries (MMcf)", func(t *testing.T) {
		rep, _ := scanRows(t, "deliveries.xlsx", "Residential", [][]any{
			{"Month", "Coal (Thousand Short Tons)", "Natral Gas Deliveries (MMcf)"},
			{202301, 10, 7},
			{202302, 11, 8},
		})
		w := wantFinding(t, rep, "Residential", "C1", SevWarning, CodeFuelUnknown)
		if !strings.Contains(w.Message, "did you mean natural_gas") {
			t.Errorf("finding at C1 %q, want a suggestion of natural_gas", w.Message)
		}
	})
}

// TestUnitColumnSpellings: units as utilities and statistics write them in
// a unit column, each row checked by hand.
func TestUnitColumnSpellings(t *testing.T) {
	const rfoRho, rfoNCV, rfoEF = 970.0, 40.4, 77400.0 // heavy fuel oil at 15 °C (pack, from memory); IPCC 2006 Vol 2 Ch 1 Tables 1.2, 1.4
	rows := []struct {
		fuel  string
		qty   float64
		unit  string
		want  float64
		gross bool // Btu family: a note that it is read as HHV
	}{
		{"Diesel", 2, "GAL", dieselT(2 * lPerGal), false},
		{"Diesel", 3, "Gals", dieselT(3 * lPerGal), false},
		{"Diesel", 4, "kgal", dieselT(4e3 * lPerGal), false}, // k = 10^3 (common practice)
		{"Natural gas", 5, "CCF", gasVolT(5 * 100 * m3PerCF), false},
		{"Natural gas", 6, "MMcf", gasVolT(6e6 * m3PerCF), false},
		{"Residual fuel oil", 7, "Thousand Barrels", 7e3 * galPerBbl * lPerGal / 1000 * rfoRho / 1e6 * rfoNCV * rfoEF / kgPerTonne, false},
		{"Natural gas", 0.002, "Quadrillion Btu", gasGrossT(0.002e15 * jPerBtu), true},
		{"Natural gas", 9, "Billion Btu", gasGrossT(9e9 * jPerBtu), true},
	}
	sheet := [][]any{{"Fuel", "Quantity", "Unit"}}
	for _, r := range rows {
		sheet = append(sheet, []any{r.fuel, r.qty, r.unit})
	}
	rep, path := scanRows(t, "units.xlsx", "Units", sheet)
	if tb := oneTable(t, rep); tb.Computed != len(rows) {
		t.Fatalf("computed %d of %d rows: %s", tb.Computed, tb.Rows, listFindings(rep))
	}
	got := annotatedColumn(t, path, "Units", "tCO2")
	for i, r := range rows {
		t.Run(r.unit, func(t *testing.T) {
			row := i + 2
			if v, ok := got[row]; !ok || !near(v, r.want) {
				t.Errorf("row %d: %v %s of %s = %v t CO2 (computed %v), want %v", row, r.qty, r.unit, r.fuel, v, ok, r.want)
			}
			_, noted := findingAt(rep, "Units", "C"+itoaT(row), CodeUnitBasis)
			if noted != r.gross {
				t.Errorf("unit-basis note at C%d: %v, want %v", row, noted, r.gross)
			}
		})
	}
}

// TestTextNumbersReadPerColumn: numbers stored as text with comma
// thousands ("20,523") are read in the style of their column: "1,234,567"
// settles it; without such a value the likely reading is said at the
// header.
func TestTextNumbersReadPerColumn(t *testing.T) {
	cases := []struct {
		name   string
		csv    string
		litres float64
		guess  bool // the reading is said at the header
	}{
		{"20,523 beside 1,234,567", "Fuel,Quantity,Unit\nDiesel,\"20,523\",L\nDiesel,\"1,234,567\",L\nDiesel,\"2,000\",L\n", 20523 + 1234567 + 2000, false},
		{"20,523 beside 1,500", "Fuel,Quantity,Unit\nDiesel,\"20,523\",L\nDiesel,\"1,500\",L\n", 20523 + 1500, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rep := scanCSVText(t, "log.csv", c.csv)
			wantTCO2(t, "diesel", rep.Totals.TCO2, dieselT(c.litres))
			w, said := findingAt(rep, "log.csv", "B1", CodeValueTextNumber)
			if said != c.guess || said && w.Severity != SevInfo {
				t.Errorf("note at the header: %v %+v, want %v", said, w, c.guess)
			}
		})
	}
}

// TestSameFuelTwoUnits: natural gas given in Trillion Btu and again in
// Billion Cubic Feet is counted once, from its first column.
func TestSameFuelTwoUnits(t *testing.T) {
	rep, _ := scanRows(t, "two-units.xlsx", "Supply", [][]any{
		{"Year", "Natural Gas (Trillion Btu)", "Natural Gas (Billion Cubic Feet)", "Coal (Thousand Short Tons)"},
		{2021, 10, 9.7, 5},
		{2022, 11, 10.7, 6},
		{2023, 12, 11.6, 7},
	})
	wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasGrossT(33e12*jPerBtu)) // T = 10^12 (common practice)
	wantTCO2(t, "coal", rep.ByFuel["other_bituminous_coal"].TCO2, coalT(18e3*kgPerShort))
	if roleOf(t, oneTable(t, rep), "Natural Gas (Billion Cubic Feet)") != "" {
		t.Errorf("the second gas column has a role")
	}
	wantFinding(t, rep, "Supply", "C1", SevInfo, CodeNotComputed)
	t.Run("no fuel-unknown at C1", func(t *testing.T) {
		if w, ok := findingAt(rep, "Supply", "C1", CodeFuelUnknown); ok {
			t.Errorf("C1: %s %s", w.Severity, w.Message)
		}
	})
}

// TestTotalColumnBesideParts: of a fuel's parts and its total, only the
// total is counted, on either side of its parts and whether or not the
// parts cover all of it; a total column alone is that fuel's amount.
func TestTotalColumnBesideParts(t *testing.T) {
	const res, com, tot = "Natural Gas Residential (MMcf)", "Natural Gas Commercial (MMcf)", "Natural Gas Total Consumption (MMcf)"
	cases := []struct {
		name string
		rows [][]any
		mmcf float64 // the total's amount
	}{
		{"total first, parts summing to it within rounding", [][]any{
			{"Month", tot, res, com},
			{202301, 30.1, 10, 20},
			{202302, 32.1, 11, 21},
			{202303, 34.1, 12, 22},
		}, 96.3},
		{"total last, parts summing to it within rounding", [][]any{
			{"Month", res, com, tot},
			{202301, 10, 20, 30.1},
			{202302, 11, 21, 32.1},
			{202303, 12, 22, 34.1},
		}, 96.3},
		{"total covering sectors not shown", [][]any{
			{"Month", tot, res, com},
			{202301, 50, 10, 20},
			{202302, 52, 11, 21},
			{202303, 54, 12, 22},
		}, 156},
		{"U.S. Natural Gas Total Consumption (MMcf) alone", [][]any{
			{"Month", "U.S. Natural Gas Total Consumption (MMcf)"},
			{202301, 50},
			{202302, 52},
			{202303, 54},
		}, 156},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rep, _ := scanRows(t, "gas.xlsx", "Gas", c.rows)
			// MM = 10^6 (SEC Form 10-K glossaries, as in the unit table).
			wantTCO2(t, "gas", rep.ByFuel["natural_gas"].TCO2, gasVolT(c.mmcf*1e6*m3PerCF))
		})
	}
}

// TestBiogenicColumn: wood is left out of the fossil totals, with a note at
// its header.
func TestBiogenicColumn(t *testing.T) {
	rep, _ := scanRows(t, "bio.xlsx", "Industry", [][]any{
		{"Year", "Wood (Trillion Btu)", "Natural Gas (Trillion Btu)"},
		{2021, 10, 100},
		{2022, 11, 110},
		{2023, 12, 120},
	})
	wantTCO2(t, "total", rep.Totals.TCO2, gasGrossT(330e12*jPerBtu))
	if _, ok := rep.ByFuel["wood"]; ok {
		t.Errorf("wood in the totals: %v", rep.ByFuel)
	}
	w := wantFinding(t, rep, "Industry", "B1", SevInfo, CodeNotComputed)
	if !strings.Contains(w.Message, "biogenic") {
		t.Errorf("note at B1 %q, want it to say biogenic", w.Message)
	}
	t.Run("no fuel-unknown at B1", func(t *testing.T) {
		if w, ok := findingAt(rep, "Industry", "B1", CodeFuelUnknown); ok {
			t.Errorf("B1: %s %s", w.Severity, w.Message)
		}
	})
}
