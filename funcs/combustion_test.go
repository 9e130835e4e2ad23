package funcs

import (
	"math"
	"strings"
	"testing"
)

// TestHubTableRows checks the epa2025 rows added for the rest of the Hub's Table 1 against
// the table's own per-physical-unit columns (US EPA GHG Emission Factors Hub, Table 1, kg CO2,
// g CH4 and g N2O per short ton, scf or gallon, as printed): heat content x factor must round
// to the printed value.
func TestHubTableRows(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		fuel, unit    string
		co2, ch4, n2o float64 // printed per unit: kg CO2, g CH4, g N2O
		decimals      [3]int  // printed decimals of each
	}{
		{"coal_coke", "short_ton", 2819, 273, 40, [3]int{0, 0, 0}},
		{"coking_coal", "short_ton", 2468, 289, 42, [3]int{0, 0, 0}}, // Mixed (Industrial Coking)
		{"municipal_solid_waste", "short_ton", 902, 318, 42, [3]int{0, 0, 0}},
		{"petroleum_coke", "short_ton", 3072, 960, 126, [3]int{0, 0, 0}}, // Petroleum Coke (Solid)
		{"peat", "short_ton", 895, 256, 34, [3]int{0, 0, 0}},
		{"wood", "short_ton", 1640, 126, 63, [3]int{0, 0, 0}}, // Wood and Wood Residuals
		{"blast_furnace_gas", "scf", 0.02524, 0.000002, 0.000009, [3]int{5, 6, 6}},
		{"coke_oven_gas", "scf", 0.02806, 0.000288, 0.00006, [3]int{5, 6, 5}},
		{"refinery_gas", "scf", 0.08189, 0.004164, 0.000833, [3]int{5, 6, 6}}, // Fuel Gas
		{"landfill_gas", "scf", 0.025254, 0.001552, 0.000306, [3]int{6, 6, 6}},
		{"crude_oil", "gal", 10.29, 0.41, 0.08, [3]int{2, 2, 2}},
		{"jet_kerosene", "gal", 9.75, 0.41, 0.08, [3]int{2, 2, 2}}, // Kerosene-Type Jet Fuel
		{"lubricants", "gal", 10.69, 0.43, 0.09, [3]int{2, 2, 2}},
		{"waste_oil", "gal", 10.21, 0.41, 0.08, [3]int{2, 2, 2}}, // Used Oil
		{"naphtha", "gal", 8.50, 0.38, 0.08, [3]int{2, 2, 2}},    // Naphtha (<401 deg F)
		{"ethane", "gal", 4.05, 0.20, 0.04, [3]int{2, 2, 2}},
		{"bitumen", "gal", 11.91, 0.47, 0.09, [3]int{2, 2, 2}},                  // Asphalt and Road Oil
		{"other_petroleum_products", "gal", 10.59, 0.42, 0.08, [3]int{2, 2, 2}}, // Other Oil (>401 deg F)
		{"tires", "short_ton", 2407, 896, 118, [3]int{0, 0, 0}},
		{"plastics", "short_ton", 2850, 1216, 160, [3]int{0, 0, 0}},
		{"biogas", "scf", 0.034106, 0.002096, 0.000413, [3]int{6, 6, 6}}, // Other Biomass Gases
	} {
		r := call(t, e, `fuel_co2("`+c.fuel+`", 1, "`+c.unit+`", "epa2025")`)
		gcv := e.packs.lookup("epa2025", c.fuel, "gcv").Value
		got := [3]float64{r.Value * 1000, gcv * e.packs.lookup("epa2025", c.fuel, "ch4_ef").Value, gcv * e.packs.lookup("epa2025", c.fuel, "n2o_ef").Value}
		want := [3]float64{c.co2, c.ch4, c.n2o}
		for i := range got {
			half := 0.5 * math.Pow(10, -float64(c.decimals[i]))
			if math.Abs(got[i]-want[i]) > half*1.0001 {
				t.Errorf("%s per %s, column %d: %v, Hub Table 1 prints %v", c.fuel, c.unit, i, got[i], want[i])
			}
		}
	}
	// Wood and landfill gas keep their biogenic handling: CO2 is a memo item.
	for _, f := range []string{"wood", "landfill_gas", "biogas"} {
		r := call(t, e, `fuel_co2e("`+f+`", 1, "MMBtu HHV", "ar5", "epa2025")`)
		if !hasNote(r, "CO2 from "+f+" is biogenic") {
			t.Errorf("%s: %q", f, r.Notes)
		}
	}
	// Wood: 7.2 g CH4 x 28 + 3.6 g N2O x 265 per MMBtu = 1155.6 g (Hub Table 1).
	if r := call(t, e, `fuel_co2e("wood", 1000, "MMBtu HHV", "ar5", "epa2025")`); !near(r.Value, 1.1556, 1e-12) {
		t.Errorf("wood CO2e = %v", r.Value)
	}
}

// TestBothPacksAnswer: the fuels of the Hub's Table 1 with an id are answered by both packs.
func TestBothPacksAnswer(t *testing.T) {
	e := newTestEngine(t)
	for _, f := range []string{"jet_kerosene", "crude_oil", "petroleum_coke", "wood", "peat", "coal_coke", "coking_coal", "lubricants",
		"waste_oil", "refinery_gas", "blast_furnace_gas", "coke_oven_gas", "landfill_gas", "naphtha", "ethane", "bitumen", "other_petroleum_products", "biogas"} {
		for _, p := range []string{"ipcc2006", "epa2025"} {
			if _, err := evalExpr(e, `fuel_co2e("`+f+`", 1, "TJ", "ar5", "`+p+`")`); err != nil {
				t.Errorf("%s in %s: %v", f, p, err)
			}
		}
	}
}

// TestNewIPCCRows checks the ipcc2006 rows of the added fuels: the CO2 factor of Table 1.4 is
// the carbon content of Table 1.3 x 44/12 (to the table's three significant figures), and
// fuel_co2 of 1 TJ is the factor.
func TestNewIPCCRows(t *testing.T) {
	e := newTestEngine(t)
	for id, co2 := range map[string]float64{
		"coal_coke": 107000, "lubricants": 73300, "waste_oil": 73300, "refinery_gas": 57600,
		"blast_furnace_gas": 260000, "coke_oven_gas": 44400, "landfill_gas": 54600,
		"naphtha": 73300, "ethane": 61600, "bitumen": 80700, "other_petroleum_products": 73300, "biogas": 54600,
	} {
		cc := e.packs.lookup("ipcc2006", id, "carbon_content").Value
		if math.Abs(cc*44/12*1000-co2)/co2 > 0.005 {
			t.Errorf("%s: carbon %v kg C/GJ x 44/12 = %v, Table 1.4 %v", id, cc, cc*44/12*1000, co2)
		}
		if r := call(t, e, `fuel_co2("`+id+`", 1, "TJ")`); !near(r.Value, co2/1000, 1e-12) {
			t.Errorf("%s: %v t CO2 per TJ, want %v (IPCC 2006 Vol 2 Ch 1 Table 1.4)", id, r.Value, co2/1000)
		}
	}
}

// TestEverydayVolumes: the default pack answers fuels by volume. Liquids through their
// densities (from memory, as the pack says); natural gas through 40 CFR 98 Table C-1's
// 1 026 Btu/scf HHV and NCV = 0.90 x GCV (IPCC 2006 Vol 2 Ch 1 section 1.4.1).
func TestEverydayVolumes(t *testing.T) {
	e := newTestEngine(t)
	for expr, want := range map[string]float64{
		// 540 kg x 47.3 MJ/kg = 25.542 GJ x 63.1 kg/GJ = 1611.7002 kg (Tables 1.2, 1.4)
		`fuel_co2("LPG", 1000, "L")`: 1.6117002,
		// 800 kg x 43.8 MJ/kg = 35.04 GJ x 71.9 kg/GJ = 2519.376 kg
		`fuel_co2("kerosene", 1000, "L")`: 2.519376,
		// 807.5 kg x 44.1 MJ/kg = 35.61075 GJ x 71.5 kg/GJ = 2546.168625 kg
		`fuel_co2("jet fuel", 1000, "L")`: 2.546168625,
		// 970 kg x 40.4 MJ/kg = 39.188 GJ x 77.4 kg/GJ = 3033.1512 kg
		`fuel_co2("heavy fuel oil", 1000, "L")`: 3.0331512,
		// 832.5 kg x 43.0 MJ/kg = 35.7975 GJ x 74.1 kg/GJ = 2652.59475 kg
		`fuel_co2("gas oil", 1000, "L")`: 2.65259475,
		// 508 kg x 47.3 MJ/kg = 24.0284 GJ x 63.1 kg/GJ = 1516.19204 kg
		`fuel_co2("propane", 1000, "L")`: 1.51619204,
	} {
		r := call(t, e, expr)
		if !near(r.Value, want, 1e-12) || !hasNote(r, "volume and mass related by the density") {
			t.Errorf("%s = %v %q, want %v", expr, r.Value, r.Notes, want)
		}
	}
	const scf = 0.028316846592             // m3 (NIST SP 811)
	const mmbtu = 1055.05585262e-3         // GJ per MMBtu (NIST SP 811)
	perSm3 := 0.001026 / scf * mmbtu * 0.9 // GJ NCV per m3 at standard conditions
	sm3 := call(t, e, `fuel_energy("natural_gas", 1000, "Sm3")`)
	if !near(sm3.Value, 1000*perSm3, 1e-12) || hasNote(sm3, "read at standard reference conditions") {
		t.Errorf("1000 Sm3 = %v GJ %q, want %v", sm3.Value, sm3.Notes, 1000*perSm3)
	}
	// Nm3 = 288.15/273.15 Sm3 (ideal gas, 0 °C against 15 °C)
	nm3 := call(t, e, `fuel_energy("natural_gas", 1000, "Nm3")`)
	if !near(nm3.Value, 1000*288.15/273.15*perSm3, 1e-12) {
		t.Errorf("1000 Nm3 = %v GJ, want %v", nm3.Value, 1000*288.15/273.15*perSm3)
	}
	m3 := call(t, e, `fuel_co2e("gas", 1000, "m3")`)
	if !hasNote(m3, "gas volume in m3 read at standard reference conditions") {
		t.Errorf("plain m3 of gas: no note in %q", m3.Notes)
	}
	// 1000 Sm3 x 56.1 kg CO2/GJ (Table 1.4), + 1 kg CH4 x 28 + 0.1 kg N2O x 265 per TJ (Table 2.2)
	if want := perSm3 * (56.1 + 1e-3*28 + 1e-4*265); !near(m3.Value, want, 1e-12) {
		t.Errorf("1000 m3 gas = %v t CO2e, want %v", m3.Value, want)
	}
	if lpg := call(t, e, `fuel_co2("lpg", 1, "m3")`); hasNote(lpg, "gas volume") {
		t.Errorf("LPG is measured as a liquid: %q", lpg.Notes)
	}
	if r := call(t, e, `fuel_co2("natural_gas", 1, "TJ")`); strings.Contains(strings.Join(r.Notes, " "), "reference conditions") {
		t.Errorf("energy amount with a gas note: %q", r.Notes)
	}
}

// TestNonEnergyNote: bitumen and lubricants are mostly used as materials
// (IPCC 2006 Vol 3 Ch 5); a result computed for them says so.
func TestNonEnergyNote(t *testing.T) {
	e := newTestEngine(t)
	for _, fuel := range []string{"asphalt", "lubricants"} {
		r, err := e.CallValues("fuel_co2", fuel, 1.0, "t")
		if err != nil {
			t.Fatal(err)
		}
		ok := false
		for _, n := range r.Notes {
			ok = ok || strings.Contains(n, "mostly used as a product, not burned")
		}
		if !ok {
			t.Errorf("%s: no non-energy note in %q", fuel, r.Notes)
		}
	}
	r, _ := e.CallValues("fuel_co2", "diesel", 1.0, "t")
	for _, n := range r.Notes {
		if strings.Contains(n, "not burned") {
			t.Errorf("diesel got the non-energy note %q", n)
		}
	}
}
