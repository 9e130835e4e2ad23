package funcs

import (
	"strings"
	"testing"
)

// TestMobileRows checks each mode row of ipcc2006 against IPCC 2006 Guidelines Vol 2 Ch 3
// (kg CH4 and kg N2O per TJ NCV; values from memory, as in the pack), through mobile_co2e of
// 1 TJ with AR5 (CH4 28, N2O 265): CO2 per Table 1.4 + CH4 x 28 + N2O x 265.
func TestMobileRows(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		fuel, mode string
		co2        float64 // kg/TJ, Table 1.4 (= the Ch 3 CO2 table)
		ch4, n2o   float64 // kg/TJ
		table      string
	}{
		{"motor_gasoline", "road_uncontrolled", 69300, 33, 3.2, "Table 3.2.2"},
		{"motor_gasoline", "road_oxidation_catalyst", 69300, 25, 8.0, "Table 3.2.2"},
		{"motor_gasoline", "road_low_mileage_1995", 69300, 3.8, 5.7, "Table 3.2.2"},
		{"gas_diesel_oil", "road", 74100, 3.9, 3.9, "Table 3.2.2"},
		{"natural_gas", "road", 56100, 92, 3, "Table 3.2.2"},
		{"lpg", "road", 63100, 62, 0.2, "Table 3.2.2"},
		{"gas_diesel_oil", "offroad_agriculture", 74100, 4.15, 28.6, "Table 3.3.1"},
		{"gas_diesel_oil", "offroad_forestry", 74100, 4.15, 28.6, "Table 3.3.1"},
		{"gas_diesel_oil", "offroad_industry", 74100, 4.15, 28.6, "Table 3.3.1"},
		{"gas_diesel_oil", "offroad_household", 74100, 4.15, 28.6, "Table 3.3.1"},
		{"motor_gasoline", "offroad_agriculture_4stroke", 69300, 80, 2, "Table 3.3.1"},
		{"motor_gasoline", "offroad_industry_4stroke", 69300, 50, 2, "Table 3.3.1"},
		{"motor_gasoline", "offroad_household_4stroke", 69300, 120, 2, "Table 3.3.1"},
		{"motor_gasoline", "offroad_agriculture_2stroke", 69300, 140, 0.4, "Table 3.3.1"},
		{"motor_gasoline", "offroad_forestry_2stroke", 69300, 170, 0.4, "Table 3.3.1"},
		{"motor_gasoline", "offroad_industry_2stroke", 69300, 130, 0.4, "Table 3.3.1"},
		{"motor_gasoline", "offroad_household_2stroke", 69300, 180, 0.4, "Table 3.3.1"},
		{"gas_diesel_oil", "rail", 74100, 4.15, 28.6, "Table 3.4.1"},
		{"sub_bituminous_coal", "rail", 96100, 2, 1.5, "Table 3.4.1"},
		{"residual_fuel_oil", "navigation", 77400, 7, 2, "Table 3.5.3"},
		{"gas_diesel_oil", "navigation", 74100, 7, 2, "Table 3.5.3"},
		{"jet_kerosene", "aviation", 71500, 0.5, 2, "Table 3.6.5"},
		{"aviation_gasoline", "aviation", 70000, 0.5, 2, "Table 3.6.5"},
	} {
		expr := `mobile_co2e("` + c.fuel + `", 1, "TJ", "` + c.mode + `", "ar5")`
		r := call(t, e, expr)
		want := (c.co2 + c.ch4*28 + c.n2o*265) / 1000
		if !near(r.Value, want, 1e-12) || r.Unit != "t CO2e" {
			t.Errorf("%s = %v, want %v (IPCC 2006 Vol 2 Ch 3 %s)", expr, r.Value, want, c.table)
		}
		if !hasNote(r, "mode "+c.mode+": CH4 and N2O of") {
			t.Errorf("%s: mode not named: %q", expr, r.Notes)
		}
		co2 := call(t, e, `mobile_co2("`+c.fuel+`", 1, "TJ", "`+c.mode+`")`)
		if !near(co2.Value, c.co2/1000, 1e-12) || !hasNote(co2, "mode "+c.mode) {
			t.Errorf("mobile_co2 %s %s = %v %q, want %v", c.fuel, c.mode, co2.Value, co2.Notes, c.co2/1000)
		}
	}
}

// TestMobileWorked: 1000 L of diesel in road transport, by hand from IPCC 2006 Vol 2 Ch 1
// Tables 1.2 (NCV 43.0 TJ/Gg), 3.2.1 (74 100 kg CO2/TJ) and 3.2.2 (3.9 kg CH4, 3.9 kg N2O
// per TJ), with the pack's diesel density 832.5 kg/m3 (EN 590 midpoint, from memory):
// 1 m3 x 832.5 kg/m3 = 832.5 kg x 43.0 MJ/kg = 35.7975 GJ;
// CO2 35.7975 x 74.1 = 2652.59475 kg; CH4 and N2O 0.0357975 TJ x 3.9 = 0.13961025 kg each;
// AR5: 2652.59475 + 0.13961025 x (28 + 265) = 2693.50055325 kg.
func TestMobileWorked(t *testing.T) {
	e := newTestEngine(t)
	r := call(t, e, `mobile_co2e("diesel", 1000, "L", "road")`)
	if !near(r.Value, 2.69350055325, 1e-12) {
		t.Errorf("1000 L diesel on road = %v, want 2.69350055325 t CO2e", r.Value)
	}
	for _, n := range []string{"mode road: CH4 and N2O of road vehicles", "Table 3.2.1 gives the same default", "density 832.5 kg/m3"} {
		if !hasNote(r, n) {
			t.Errorf("note %q missing: %q", n, r.Notes)
		}
	}
	// The same fuel in a stationary engine of the energy industries (Table 2.2: 3 kg CH4,
	// 0.6 kg N2O per TJ): 2652.59475 + 0.0357975 x (3 x 28 + 0.6 x 265) = 2652.59475 + 8.6987925 = 2661.2935425 kg.
	if s := call(t, e, `fuel_co2e("diesel", 1000, "L")`); !near(s.Value, 2.6612935425, 1e-12) {
		t.Errorf("stationary diesel = %v", s.Value)
	}
	// Propane is a kind of LPG: the road LPG row (Table 3.2.2: 62 kg CH4, 0.2 kg N2O per TJ).
	p := call(t, e, `mobile_co2e("propane", 1, "TJ", "road", "ar4")`)
	if !near(p.Value, (63100+62*25+0.2*298)/1000.0, 1e-12) || !hasNote(p, "propane is a kind of lpg") {
		t.Errorf("propane road: %v %q", p.Value, p.Notes)
	}
}

// TestMobileHub checks the epa2025 mobile rows against the Hub's printed values.
func TestMobileHub(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		expr, table string
		want        float64
	}{
		// Table 2: kg CO2 per gallon as printed, x 1000 gal
		{`mobile_co2("diesel", 1000, "gal", "road", "epa2025")`, "Table 2, diesel fuel 10.21 kg/gal", 10.21},
		{`mobile_co2("gasoline", 1000, "gal", "road", "epa2025")`, "Table 2, motor gasoline 8.78 kg/gal", 8.78},
		{`mobile_co2("jet fuel", 1000, "gal", "aviation", "epa2025")`, "Table 2, kerosene-type jet fuel 9.75 kg/gal", 9.75},
		{`mobile_co2("avgas", 1000, "gal", "aviation", "epa2025")`, "Table 2, aviation gasoline 8.31 kg/gal", 8.31},
		{`mobile_co2("CNG", 1e6, "scf", "road", "epa2025")`, "Table 2, CNG 0.05444 kg/scf", 54.44},
		// Table 2 CO2 + Table 5 locomotives: 10.21 kg + 0.80 g CH4 x 28 + 0.26 g N2O x 265 per gallon
		{`mobile_co2e("diesel", 1000, "gal", "rail", "ar5", "epa2025")`, "Tables 2 and 5", 10.21 + 0.80*28/1000 + 0.26*265/1000},
		// 9.75 kg + 0 g CH4 + 0.30 g N2O x 298 per gallon
		{`mobile_co2e("jet fuel", 1000, "gal", "aviation", "ar4", "epa2025")`, "Tables 2 and 5", 9.75 + 0.30*298/1000},
		// 8.31 kg + 7.06 g CH4 x 25 + 0.11 g N2O x 298 per gallon
		{`mobile_co2e("avgas", 1000, "gal", "aviation", "ar4", "epa2025")`, "Tables 2 and 5", 8.31 + 7.06*25/1000 + 0.11*298/1000},
	} {
		r := call(t, e, c.expr)
		if !near(r.Value, c.want, 1e-12) {
			t.Errorf("%s = %v, want %v (US EPA GHG Emission Factors Hub 2025 %s)", c.expr, r.Value, c.want, c.table)
		}
	}
	// E10: 90 gal gasoline x 8.78 kg = 790.2 kg fossil CO2; 10 gal ethanol x 5.75 kg = 57.5 kg
	// biogenic, a memo item (Hub Table 2).
	if r := call(t, e, `mobile_co2("E10", 100, "gal", "road", "epa2025")`); !near(r.Value, 0.7902, 1e-12) || !hasNote(r, "its CO2 (0.0575 t) is a memo item") {
		t.Errorf("E10: %v %q", r.Value, r.Notes)
	}
	// Ethanol's CO2 is biogenic: mobile_co2 returns it with the memo note.
	r := call(t, e, `mobile_co2("ethanol", 1000, "gal", "road", "epa2025")`)
	if !near(r.Value, 5.75, 1e-12) || !hasNote(r, "CO2 from ethanol is biogenic") {
		t.Errorf("ethanol: %v %q", r.Value, r.Notes)
	}
}

func TestMobileErrors(t *testing.T) {
	e := newTestEngine(t)
	for expr, want := range map[string]string{
		`mobile_co2e("diesel", 1, "TJ", "aviaton")`:                 `mobile_co2e: mode: unknown mode "aviaton": accepted are road, road_uncontrolled, road_oxidation_catalyst, road_low_mileage_1995, offroad_agriculture, offroad_forestry, offroad_industry, offroad_household, offroad_agriculture_4stroke, offroad_industry_4stroke, offroad_household_4stroke, offroad_agriculture_2stroke, offroad_forestry_2stroke, offroad_industry_2stroke, offroad_household_2stroke, rail, navigation, aviation (did you mean aviation?)`,
		`mobile_co2e("gasoline", 1, "TJ", "road")`:                  `mobile_co2e: mode: pack ipcc2006 has no CH4 and N2O factors for motor_gasoline in mode road (road vehicles, one default per fuel); its modes for motor_gasoline: road_uncontrolled, road_oxidation_catalyst, road_low_mileage_1995,`,
		`mobile_co2e("diesel", 1, "gal", "road", "ar5", "epa2025")`: `mobile_co2e: mode: pack epa2025 has no CH4 and N2O factors for gas_diesel_oil in mode road (road vehicles, one default per fuel); its modes for gas_diesel_oil: rail; pack ipcc2006 has this mode (pass it as pack); the US EPA Hub gives on-road CH4 and N2O per vehicle-mile, not per gallon`,
		`mobile_co2e("wood", 1, "t", "rail")`:                       `mobile_co2e: mode: pack ipcc2006 has no CH4 and N2O factors for wood in mode rail (railway locomotives); it has no mobile CH4 and N2O for wood`,
	} {
		_, err := evalExpr(e, expr)
		if err == nil || !strings.HasPrefix(err.Error(), want) {
			t.Errorf("%s: %v\nwant %s", expr, err, want)
		}
	}
}
