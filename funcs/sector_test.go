package funcs

import (
	"strings"
	"testing"
)

// sectorTable is IPCC 2006 Guidelines Vol 2 Ch 2 Tables 2.3 (manufacturing industries and
// construction), 2.4 (commercial/institutional) and 2.5 (residential and
// agriculture/forestry/fishing): kg CH4 and kg N2O per TJ NCV by fuel group (values from
// memory, as in the pack).
var sectorTable = map[string]map[string][2]float64{
	"oil":  {"manufacturing": {3, 0.6}, "commercial": {10, 0.6}, "residential": {10, 0.6}},
	"gas":  {"manufacturing": {1, 0.1}, "commercial": {5, 0.1}, "residential": {5, 0.1}},
	"coal": {"manufacturing": {10, 1.5}, "commercial": {10, 1.5}, "residential": {300, 1.5}},
	"peat": {"manufacturing": {2, 1.5}, "commercial": {10, 1.4}, "residential": {300, 1.4}},
	"wood": {"manufacturing": {30, 4}, "commercial": {300, 4}, "residential": {300, 4}},
}

// sectorGroup is the row of Tables 2.3-2.5 each fuel id reads (LPG, refinery gas and
// landfill gas share the natural gas values; biogasoline and biodiesels the oil values).
var sectorGroup = map[string]string{
	"crude_oil": "oil", "motor_gasoline": "oil", "jet_kerosene": "oil", "other_kerosene": "oil", "gas_diesel_oil": "oil",
	"residual_fuel_oil": "oil", "petroleum_coke": "oil", "aviation_gasoline": "oil", "lubricants": "oil", "ethanol": "oil", "biodiesel": "oil",
	"naphtha": "oil", "bitumen": "oil", "other_petroleum_products": "oil", "ethane": "gas", "biogas": "gas",
	"lpg": "gas", "natural_gas": "gas", "refinery_gas": "gas", "landfill_gas": "gas",
	"anthracite": "coal", "coking_coal": "coal", "other_bituminous_coal": "coal", "sub_bituminous_coal": "coal", "lignite": "coal", "coal_coke": "coal",
	"peat": "peat", "wood": "wood",
}

// TestSectorRows checks every per-sector row of ipcc2006 against Tables 2.3-2.5.
func TestSectorRows(t *testing.T) {
	e := newTestEngine(t)
	for id, group := range sectorGroup {
		for sec, want := range sectorTable[group] {
			ch4 := e.packs.lookup("ipcc2006", id, "ch4_ef_"+sec)
			n2o := e.packs.lookup("ipcc2006", id, "n2o_ef_"+sec)
			if ch4 == nil || n2o == nil {
				t.Errorf("%s %s: missing row", id, sec)
				continue
			}
			if ch4.Value != want[0] || n2o.Value != want[1] || ch4.Unit != "kg CH4/TJ" || n2o.Unit != "kg N2O/TJ" {
				t.Errorf("%s %s: %v %s, %v %s; want %v, %v per TJ (IPCC 2006 Vol 2 Ch 2 Tables 2.3-2.5)", id, sec, ch4.Value, ch4.Unit, n2o.Value, n2o.Unit, want[0], want[1])
			}
			table := map[string]string{"manufacturing": "Table 2.3", "commercial": "Table 2.4", "residential": "Table 2.5"}[sec]
			if !strings.Contains(ch4.Source, table) || !ch4.FromMemory {
				t.Errorf("%s %s: source %q, from memory %v", id, sec, ch4.Source, ch4.FromMemory)
			}
		}
	}
}

// TestSectorWorked computes CO2e per TJ by hand for each sector (GWP AR5: CH4 28, N2O 265).
func TestSectorWorked(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		expr  string
		want  float64
		table string
	}{
		// 56100 kg CO2 + 1 x 28 + 0.1 x 265 = 56154.5 kg
		{`fuel_co2e("natural_gas", 1, "TJ", "ar5", "ipcc2006", "energy")`, 56.1545, "Table 1.4; Table 2.2"},
		// 56100 + 1 x 28 + 0.1 x 265 = 56154.5 kg
		{`fuel_co2e("natural_gas", 1, "TJ", "ar5", "ipcc2006", "manufacturing")`, 56.1545, "Table 1.4; Table 2.3"},
		// 56100 + 5 x 28 + 0.1 x 265 = 56266.5 kg
		{`fuel_co2e("natural_gas", 1, "TJ", "ar5", "ipcc2006", "commercial")`, 56.2665, "Table 1.4; Table 2.4"},
		{`fuel_co2e("natural_gas", 1, "TJ", "ar5", "ipcc2006", "residential")`, 56.2665, "Table 1.4; Table 2.5"},
		// 94600 + 300 x 28 + 1.5 x 265 = 103397.5 kg
		{`fuel_co2e("coal", 1, "TJ", "ar5", "ipcc2006", "residential")`, 103.3975, "Table 1.4; Table 2.5"},
		{`fuel_co2e("coal", 1, "TJ", "ar5", "ipcc2006", "agriculture")`, 103.3975, "Table 1.4; Table 2.5 (agriculture/forestry/fishing)"},
		// 94600 + 10 x 28 + 1.5 x 265 = 95277.5 kg
		{`fuel_co2e("coal", 1, "TJ", "ar5", "ipcc2006", "manufacturing")`, 95.2775, "Table 1.4; Table 2.3"},
		// 74100 + 10 x 28 + 0.6 x 265 = 74539 kg
		{`fuel_co2e("diesel", 1, "TJ", "ar5", "ipcc2006", "commercial")`, 74.539, "Table 1.4; Table 2.4"},
		// wood: biogenic CO2 left out; 300 x 27.0 (non-fossil, AR6) + 4 x 273 = 9192 kg
		{`fuel_co2e("wood", 1, "TJ", "ar6", "ipcc2006", "residential")`, 9.192, "Table 2.5; AR6 WG1 Table 7.15"},
		// peat: 106000 + 300 x 28 + 1.4 x 265 = 114771 kg
		{`fuel_co2e("peat", 1, "TJ", "ar5", "ipcc2006", "Residential ")`, 114.771, "Table 1.4; Table 2.5"},
	} {
		r := call(t, e, c.expr)
		if !near(r.Value, c.want, 1e-12) || r.Unit != "t CO2e" {
			t.Errorf("%s = %v %s, want %v (IPCC 2006 Vol 2 Ch 1-2 %s)", c.expr, r.Value, r.Unit, c.want, c.table)
		}
		if !hasNote(r, "CH4 and N2O of stationary combustion in") {
			t.Errorf("%s: no sector note in %q", c.expr, r.Notes)
		}
	}
}

// TestSectorDefaultUnchanged: without a sector, fuel_co2e gives the Table 2.2 results it
// gave before sectors existed, and names the default sector.
func TestSectorDefaultUnchanged(t *testing.T) {
	e := newTestEngine(t)
	for expr, want := range map[string]float64{
		`fuel_co2e("natural_gas", 1, "TJ", "ar4")`:           56.1548, // 56100 + 1 x 25 + 0.1 x 298
		`fuel_co2e("other_bituminous_coal", 1, "TJ", "ar5")`: 95.0255, // 94600 + 1 x 28 + 1.5 x 265
		`fuel_co2e("gas_diesel_oil", 1, "TJ", "ar6")`:        74.3532, // 74100 + 3 x 29.8 + 0.6 x 273
		`fuel_co2e("wood", 1, "TJ", "ar6")`:                  1.902,   // 30 x 27.0 + 4 x 273
	} {
		r := call(t, e, expr)
		if !near(r.Value, want, 1e-12) {
			t.Errorf("%s = %v, want %v (IPCC 2006 Vol 2 Ch 1 Table 1.4, Ch 2 Table 2.2)", expr, r.Value, want)
		}
		if !hasNote(r, "energy industries (sector energy, the default)") {
			t.Errorf("%s: default sector not named: %q", expr, r.Notes)
		}
		named := call(t, e, strings.TrimSuffix(expr, ")")+`, "ipcc2006", "energy")`)
		if named.Value != r.Value || !hasNote(named, "(sector energy)") {
			t.Errorf("%s with sector energy: %v %q", expr, named.Value, named.Notes)
		}
	}
}

// TestSectorOnePerFuel: the Hub's Table 1 has one CH4 and N2O value per fuel; every sector
// gets it, and the note says so.
func TestSectorOnePerFuel(t *testing.T) {
	e := newTestEngine(t)
	base := call(t, e, `fuel_co2e("natural_gas", 1000, "MMBtu HHV", "ar5", "epa2025")`)
	// 1000 MMBtu x (53.06 kg CO2 + 1 g CH4 x 28 + 0.1 g N2O x 265) = 53060 + 28 + 26.5 kg (Hub Table 1)
	if !near(base.Value, 53.1145, 1e-12) || !hasNote(base, "pack epa2025 has one CH4 and one N2O value per fuel for every sector") {
		t.Errorf("epa2025 default: %v %q", base.Value, base.Notes)
	}
	for _, sec := range []string{"manufacturing", "commercial", "residential", "agriculture"} {
		r := call(t, e, `fuel_co2e("natural_gas", 1000, "MMBtu HHV", "ar5", "epa2025", "`+sec+`")`)
		if r.Value != base.Value || !hasNote(r, "(sector "+sec+"): pack epa2025 has one CH4 and one N2O value per fuel") {
			t.Errorf("epa2025 %s: %v %q", sec, r.Value, r.Notes)
		}
	}
}

func TestSectorErrors(t *testing.T) {
	e := newTestEngine(t)
	for expr, want := range map[string]string{
		`fuel_co2e("coal", 1, "TJ", "ar5", "ipcc2006", "households")`:               `fuel_co2e: sector: unknown sector "households": accepted are energy, manufacturing, commercial, residential, agriculture`,
		`fuel_co2e("coal", 1, "TJ", "ar5", "ipcc2006", "comercial")`:                `fuel_co2e: sector: unknown sector "comercial": accepted are energy, manufacturing, commercial, residential, agriculture (did you mean commercial?)`,
		`fuel_co2e("blast_furnace_gas", 1, "TJ", "ar5", "ipcc2006", "residential")`: `fuel_co2e: sector: pack ipcc2006 has no CH4 and N2O factors for blast_furnace_gas in sector residential (residential): pass sector energy, or a pack that has them`,
	} {
		_, err := evalExpr(e, expr)
		if err == nil || !strings.HasPrefix(err.Error(), want) {
			t.Errorf("%s: %v\nwant %s", expr, err, want)
		}
	}
	r, err := e.Call("fuel_co2e", map[string]string{"fuel": "lpg", "amount": "1", "unit": "TJ", "sector": "residential"})
	// 63100 + 5 x 28 + 0.1 x 265 = 63266.5 kg (IPCC 2006 Vol 2 Ch 1 Table 1.4, Ch 2 Table 2.5)
	if err != nil || !near(r.Value, 63.2665, 1e-12) {
		t.Errorf("Call with sector: %v %v", r.Value, err)
	}
}
