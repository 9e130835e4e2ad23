package funcs

import (
	"strings"
	"testing"
	"time"
)

// TestRecordFuelNames: fuel names as fuel-card exports, utility bills, benchmarking files
// and statistics tables write them (data/fuel_names.csv names each row's source).
func TestRecordFuelNames(t *testing.T) {
	e := newTestEngine(t)
	tests := map[string]string{
		// retail gasoline grades; "Gas" stays natural gas
		"Unleaded": "motor_gasoline", "Regular": "motor_gasoline", "Regular Unleaded": "motor_gasoline",
		"Mid-grade": "motor_gasoline", "Premium": "motor_gasoline", "Super Unleaded": "motor_gasoline",
		"Unl": "motor_gasoline", "UNL": "motor_gasoline", "Gasoline": "motor_gasoline",
		"Unleaded Gasoline": "motor_gasoline", "Reg Unleaded": "motor_gasoline", "Gas": "natural_gas",
		"Ethanol": "ethanol", "E100": "ethanol",
		// diesel grades
		"Diesel #1": "gas_diesel_oil", "#2 Diesel": "gas_diesel_oil", "Diesel No. 2": "gas_diesel_oil",
		"Diesel No.2": "gas_diesel_oil", "ULSD": "gas_diesel_oil", "Ultra Low Sulfur Diesel": "gas_diesel_oil",
		"Clear Diesel": "gas_diesel_oil", "Dyed Diesel": "gas_diesel_oil", "Off-road Diesel": "gas_diesel_oil",
		"Red diesel": "gas_diesel_oil", "DERV": "gas_diesel_oil", "B100": "biodiesel", "Biodiesel": "biodiesel",
		"Renewable Diesel": "renewable_diesel", "HVO": "renewable_diesel",
		// fuel oils (US EIA-923: No. 1, 2, 4 distillate; No. 5, 6, Bunker C residual)
		"Fuel Oil #2": "gas_diesel_oil", "#2 Fuel Oil": "gas_diesel_oil", "Oil #2": "gas_diesel_oil",
		"No. 2 Oil": "gas_diesel_oil", "Heating Oil": "gas_diesel_oil", "Home heating oil": "gas_diesel_oil",
		"Fuel Oil #4": "gas_diesel_oil", "Fuel Oil #5": "residual_fuel_oil", "Fuel Oil #6": "residual_fuel_oil",
		"No. 6 Oil": "residual_fuel_oil", "Bunker C": "residual_fuel_oil",
		// kerosene
		"Heating Kerosene": "other_kerosene", "Burning Oil": "other_kerosene", "K-1": "other_kerosene",
		"Kerosene": "other_kerosene", "Jet A": "jet_kerosene",
		// LPG
		"LP": "lpg", "LP Gas": "lpg", "LPG": "lpg", "Propane (bulk)": "propane", "Propane (cylinder)": "propane",
		"Bulk Propane": "propane", "Propane Cylinder": "propane", "Autogas": "lpg", "Butane": "lpg",
		// natural gas
		"Natural Gas": "natural_gas", "Nat Gas": "natural_gas", "Gas Firm": "natural_gas", "Firm Gas": "natural_gas",
		"Interruptible Gas": "natural_gas", "Gas Interruptable": "natural_gas", "Gas Bundled": "natural_gas",
		"Utility Gas": "natural_gas", "Pipeline Natural Gas": "natural_gas", "CNG": "natural_gas",
		"Compressed Natural Gas": "natural_gas", "LNG": "natural_gas",
		// coal
		"Bituminous Coal": "other_bituminous_coal", "Sub-bituminous Coal": "sub_bituminous_coal",
		"Lignite": "lignite", "Anthracite": "anthracite", "Coal (steam)": "other_bituminous_coal",
		// wood, aviation
		"Wood": "wood", "Wood Pellets": "wood", "Wood chips": "wood",
		"Aviation Gasoline": "aviation_gasoline", "Avgas": "aviation_gasoline", "100LL": "aviation_gasoline",
		// qualifiers and footnotes
		"Diesel - gallons": "gas_diesel_oil", "Propane delivered": "propane", "Natural Gas¹": "natural_gas",
		"Coal (3)": "other_bituminous_coal", "Natural Gas Fuel": "natural_gas",
		// US EIA-860/923 energy source codes
		"BIT": "other_bituminous_coal", "SUB": "sub_bituminous_coal", "LIG": "lignite", "ANT": "anthracite",
		"DFO": "gas_diesel_oil", "dfo": "gas_diesel_oil", "RFO": "residual_fuel_oil", "JF": "jet_kerosene",
		"KER": "other_kerosene", "PG": "propane", "NG": "natural_gas", "PC": "petroleum_coke", "WDS": "wood",
	}
	for name, id := range tests {
		f, alias, err := e.ResolveFuel(name)
		if err != nil || f.ID != id || !alias {
			t.Errorf("ResolveFuel(%q) = %q, alias %v, %v; want %s", name, f.ID, alias, err, id)
		}
		if m, ok := e.LookupFuel(name); !ok || m.Fuel.ID != id {
			t.Errorf("LookupFuel(%q) = %+v, %v; want %s", name, m, ok, id)
		}
	}
}

// TestNotFuels: codes and names of energy that is not burned, or of fuels without an id,
// never resolve, and the message says what they are.
func TestNotFuels(t *testing.T) {
	e := newTestEngine(t)
	for name, want := range map[string]string{
		"SUN":            `"SUN" (solar (US EIA code)) is not a fuel`,
		"WND":            `"WND" (wind (US EIA code)) is not a fuel`,
		"NUC":            `"NUC" (nuclear (US EIA code)) is not a fuel`,
		"WAT":            `"WAT" (water (hydroelectric; US EIA code)) is not a fuel`,
		"Electric":       `"Electric" (electricity) is not a fuel`,
		"Chilled Water":  `"Chilled Water" (chilled water) is not a fuel`,
		"WO":             `"WO" (waste or other oil (US EIA code)) is a fuel fluecell has no id for`,
		"Black Liquor":   `"Black Liquor" (black liquor) is a fuel fluecell has no id for`,
		"Gas Fuel Cell":  `unknown fuel "Gas Fuel Cell"`,
		"Cogen Electric": `unknown fuel "Cogen Electric"`,
	} {
		if _, ok := e.LookupFuel(name); ok {
			t.Errorf("LookupFuel(%q) resolved", name)
		}
		_, _, err := e.ResolveFuel(name)
		if fe, ok := AsError(err); !ok || fe.Code != CodeUnknownFuel || !strings.HasPrefix(fe.Msg, want) {
			t.Errorf("ResolveFuel(%q) = %v\nwant %s...", name, err, want)
		}
	}
}

// TestFuelSuggestions: short codes get no suggestion (DFO was suggested residual fuel oil, LIG
// LPG); a suggestion stays within the fuel families the name's words belong to.
func TestFuelSuggestions(t *testing.T) {
	e := newTestEngine(t)
	for name, want := range map[string]string{
		"DFX":         "",               // three letters: exact codes only
		"LIGN":        "",               // four letters
		"disel":       "gas_diesel_oil", // a typo
		"natral gas":  "natural_gas",
		"Diesl Oil":   "gas_diesel_oil",
		"diesel coal": "", // two families: no guess
		"coal oil x":  "",
		"lignit coal": "lignite",
	} {
		if got := e.fuels.suggest(name); got != want {
			t.Errorf("suggest(%q) = %q, want %q", name, got, want)
		}
	}
	// "oil gas" words: oil and gas families; coal is never offered
	if got := e.fuels.suggest("heavy oil gass"); got != "" && e.fuels.byID[got].Family == "coal" {
		t.Errorf("suggest crosses families: %s", got)
	}
}

// TestFuelLookupIsCheap: a miss builds no message, and a very long cell fails fast.
func TestFuelLookupIsCheap(t *testing.T) {
	e := newTestEngine(t)
	long := strings.Repeat("diesel and gasoline and coal ", 5000)
	start := time.Now()
	for range 100 {
		if _, ok := e.LookupFuel(long); ok {
			t.Fatal("a paragraph resolved")
		}
		if _, _, err := e.ResolveFuel(long); err == nil {
			t.Fatal("a paragraph resolved")
		}
	}
	if d := time.Since(start); d > 2*time.Second {
		t.Errorf("200 misses of %d bytes took %v", len(long), d)
	}
	if n := testing.AllocsPerRun(100, func() { e.LookupFuel("Premium") }); n != 0 {
		t.Errorf("LookupFuel of a listed name allocates %v times", n)
	}
}

// TestLookupFuelDetails: blends, codes and dropped qualifiers are reported.
func TestLookupFuelDetails(t *testing.T) {
	e := newTestEngine(t)
	m, ok := e.LookupFuel("E85")
	if !ok || m.Fuel.ID != "motor_gasoline" || m.Kind != "blend" || m.FossilShare != 0.15 || m.BioFuel != "ethanol" ||
		!strings.Contains(m.Source, "ASTM D5798") {
		t.Errorf("E85: %+v", m)
	}
	if m, _ := e.LookupFuel("B20"); m.FossilShare != 0.8 || m.BioFuel != "biodiesel" {
		t.Errorf("B20: %+v", m)
	}
	if m, _ := e.LookupFuel("DFO"); m.Kind != "code" || !strings.Contains(m.Source, "EIA-923") {
		t.Errorf("DFO: %+v", m)
	}
	if m, _ := e.LookupFuel("Propane (bulk)"); strings.Join(m.Dropped, ",") != "bulk" || m.FossilShare != 1 {
		t.Errorf("Propane (bulk): %+v", m)
	}
	if m, _ := e.LookupFuel("natural_gas"); m.Alias || m.Kind != "id" {
		t.Errorf("natural_gas: %+v", m)
	}
}

// TestBlends: the fossil share of a blend is computed as its base fuel; the biogenic part's
// CO2 is a memo item in a note (IPCC 2006 Vol 2 Ch 2 section 2.3.3.4).
func TestBlends(t *testing.T) {
	e := newTestEngine(t)
	// 100 gal E85, epa2025: 15 gal x 0.125 MMBtu/gal x 70.22 kg/MMBtu (EPA Hub Table 1);
	// memo 85 gal x 0.084 x 68.44 (40 CFR 98 Table C-1 ethanol, from memory) = 488.6616 kg
	r := call(t, e, `fuel_co2("E85", 100, "gal", "epa2025")`)
	if !near(r.Value, 0.1316625, 1e-12) ||
		!hasNote(r, `"E85": 15 % fossil by volume; 85 % ethanol is biogenic, its CO2 (0.4886616 t) is a memo item, not in this result`) ||
		!hasNote(r, "ASTM D5798 allows 51-83 % ethanol") {
		t.Errorf("E85: %v %q", r.Value, r.Notes)
	}
	// 1000 L E10, ipcc2006: 900 L x 0.7475 kg/L (EN 228 midpoint) x 44.3 MJ/kg x 69.3 kg/GJ
	r = call(t, e, `fuel_co2("E10", 1000, "L")`)
	if !near(r.Value, 2.0653357725, 1e-12) || !hasNote(r, "its CO2 (0.15082524 t)") {
		t.Errorf("E10: %v %q", r.Value, r.Notes)
	}
	// 100 gal B20, AR5, epa2025: 80 gal x 0.138 x (73.96 + 3e-3 x 28 + 0.6e-3 x 265) kg
	// + 20 gal x 0.128 x (1.1e-3 x 28 + 0.11e-3 x 265) kg (Table C-2 biomass, from memory)
	r = call(t, e, `fuel_co2e("B20", 100, "gal", "ar5", "epa2025")`)
	if !near(r.Value, 0.819354592, 1e-12) || !hasNote(r, "plus CH4 and N2O of the 20 % biodiesel") {
		t.Errorf("B20 CO2e: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `fuel_energy("B20", 100, "gal", "MMBtu HHV", "epa2025")`)
	if !near(r.Value, 80*0.138+20*0.128, 1e-12) {
		t.Errorf("B20 energy: %v", r.Value)
	}
	r = call(t, e, `fuel_co2("B7", 1, "GJ")`)
	if !hasNote(r, "applied to an amount in GJ as an approximation") {
		t.Errorf("B7 GJ: %q", r.Notes)
	}
	// Pure biofuels are biogenic like wood: fuel_co2 returns the memo CO2 with a note.
	r = call(t, e, `fuel_co2("B100", 1, "TJ")`)
	if !near(r.Value, 70.8, 1e-12) || !hasNote(r, "CO2 from biodiesel is biogenic (all of it)") {
		t.Errorf("B100: %v %q", r.Value, r.Notes)
	}
}

// TestPropaneWithinLPG: IPCC 2006 has no propane row; ipcc2006 lends propane its LPG rows.
func TestPropaneWithinLPG(t *testing.T) {
	e := newTestEngine(t)
	r := call(t, e, `fuel_co2("propane", 1, "TJ")`)
	if !near(r.Value, 63.1, 1e-12) || !hasNote(r, "pack ipcc2006 has no co2_ef for propane: the lpg rows are used") {
		t.Errorf("propane TJ: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `fuel_co2("propane", 1, "gal", "epa2025")`)
	if hasNote(r, "lpg rows") {
		t.Errorf("epa2025 has propane rows: %q", r.Notes)
	}
}
