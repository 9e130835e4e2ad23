package funcs

import (
	"math"
	"strings"
	"testing"
)

func call(t *testing.T, e *Engine, src string) Result {
	t.Helper()
	r, err := evalExpr(e, src)
	if err != nil {
		t.Fatalf("%s: %v", src, err)
	}
	return r
}

func near(a, b, rel float64) bool { return math.Abs(a-b) <= rel*math.Max(math.Abs(b), 1e-300) }

func hasNote(r Result, part string) bool {
	for _, n := range r.Notes {
		if strings.Contains(n, part) {
			return true
		}
	}
	return false
}

func TestFuelAliases(t *testing.T) {
	e := newTestEngine(t)
	for name, id := range map[string]string{
		"diesel": "gas_diesel_oil", "DIESEL ": "gas_diesel_oil", "Gas Oil": "gas_diesel_oil", "Natural-Gas": "natural_gas",
		"natural_gas": "natural_gas", "petrol": "motor_gasoline", "gasoline": "motor_gasoline", "kerosene": "other_kerosene",
		"fuel oil": "residual_fuel_oil", "gas": "natural_gas", "coal": "other_bituminous_coal", "Jet A-1": "jet_kerosene",
		"Fuel Oil No. 2": "gas_diesel_oil", "brown coal": "lignite", "Sub-Bituminous": "sub_bituminous_coal", "petcoke": "petroleum_coke",
	} {
		f, alias, err := e.ResolveFuel(name)
		if err != nil || f.ID != id {
			t.Errorf("%q -> %q, %v; want %s", name, f.ID, err, id)
		}
		if alias != (name != id) {
			t.Errorf("%q: alias %v", name, alias)
		}
	}
	r := call(t, e, `fuel_co2("Diesel", 1, "t")`)
	if !hasNote(r, `fuel "Diesel" read as gas_diesel_oil`) {
		t.Errorf("no alias note: %q", r.Notes)
	}
}

// TestBiogenic: IPCC 2006 Vol 2 Ch 2 section 2.3.3.4 - CO2 from biomass is
// reported as an information item, not in the energy-sector total.
func TestBiogenic(t *testing.T) {
	e := newTestEngine(t)
	co2 := call(t, e, `fuel_co2("wood", 1, "TJ")`)
	if co2.Value != 112 || !hasNote(co2, "biogenic") || !hasNote(co2, "fuel_co2e leaves it out") {
		t.Errorf("fuel_co2 wood: %v %q", co2.Value, co2.Notes)
	}
	co2e := call(t, e, `fuel_co2e("wood", 1, "TJ")`)
	// AR5: 30 kg CH4 x 28 + 4 kg N2O x 265 = 1.9 t (Table 2.2 values from memory)
	if !near(co2e.Value, 1.9, 1e-12) || !hasNote(co2e, "excluded from this CO2e") {
		t.Errorf("fuel_co2e wood: %v %q", co2e.Value, co2e.Notes)
	}
}

func TestBasisConversions(t *testing.T) {
	e := newTestEngine(t)
	// 1 MMBtu = 1.05505585262 GJ (NIST SP 811); HHV -> NCV x 0.90 for gas (IPCC 2006 Vol 2 Ch 1 1.4.1, ratio from memory)
	r := call(t, e, `fuel_co2("natural_gas", 1000, "MMBtu HHV")`)
	want := 1.05505585262 * 0.9 * 56.1
	if !near(r.Value, want, 1e-12) || !hasNote(r, "HHV converted to NCV with NCV/GCV = 0.9") {
		t.Errorf("MMBtu HHV: %v want %v, %q", r.Value, want, r.Notes)
	}
	// Without a basis the Btu family is read as HHV (North American practice: US EPA GHG
	// Emission Factors Hub and 40 CFR 98 Subpart C state heat contents on HHV).
	r = call(t, e, `fuel_co2("natural_gas", 1000, "MMBtu")`)
	if !near(r.Value, want, 1e-12) || !hasNote(r, "MMBtu read as HHV (gross), North American practice; write 'MMBtu NCV' to say net") {
		t.Errorf("MMBtu bare: %v want %v, %q", r.Value, want, r.Notes)
	}
	r = call(t, e, `fuel_co2("natural_gas", 1000, "therm NCV")`)
	if !near(r.Value, 1000*0.105505585262*56.1/1000, 1e-12) || hasNote(r, "read as HHV") {
		t.Errorf("therm NCV: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `fuel_co2("natural_gas", 1000, "GJ")`)
	if !near(r.Value, 56.1, 1e-12) || len(r.Notes) != 0 {
		t.Errorf("GJ bare keeps the pack basis: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `fuel_energy("natural_gas", 1000, "scf", "MMBtu", "epa2025")`)
	if !near(r.Value, 1.026, 1e-12) || !hasNote(r, "energy on an HHV basis: MMBtu read as HHV (gross)") {
		t.Errorf("fuel_energy to MMBtu: %v %q", r.Value, r.Notes)
	}
	// EPA factors are per MMBtu HHV: an NCV energy is divided by 0.90.
	r = call(t, e, `fuel_co2("natural_gas", 1, "MMBtu NCV", "epa2025")`)
	if !near(r.Value, 53.06/0.9/1000, 1e-12) || !hasNote(r, "NCV converted to HHV") {
		t.Errorf("EPA NCV: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `fuel_co2("natural_gas", 1, "GJ", "epa2025")`)
	if !hasNote(r, "GJ without a stated basis read as HHV") {
		t.Errorf("EPA GJ: %q", r.Notes)
	}
	r = call(t, e, `fuel_energy("natural_gas", 1000, "scf", "MMBtu HHV", "epa2025")`)
	if !near(r.Value, 1.026, 1e-12) || r.Unit != "MMBtu HHV" {
		t.Errorf("EPA heat content: %v %s", r.Value, r.Unit)
	}
}

// TestVolumePaths: liquids by volume through density (IPCC pack) or the
// EPA heat content per gallon.
func TestVolumePaths(t *testing.T) {
	e := newTestEngine(t)
	// 1000 L x 0.8325 kg/L (EN 590 midpoint, from memory) x 43.0 TJ/Gg x 74 100 kg/TJ
	r := call(t, e, `fuel_co2("diesel", 1000, "L")`)
	if !near(r.Value, 0.8325*43.0*74.1/1000, 1e-12) || !hasNote(r, "density 832.5 kg/m3") {
		t.Errorf("diesel L: %v %q", r.Value, r.Notes)
	}
	// EPA Hub per-unit value for distillate: 10.21 kg CO2/gal
	r = call(t, e, `fuel_co2("diesel", 1, "gal", "epa2025")`)
	if !near(r.Value, 0.01021, 5e-4) {
		t.Errorf("diesel gal EPA: %v", r.Value)
	}
	keys := strings.Join(r.FactorKeys(), ",")
	if keys != "epa2025/gas_diesel_oil/gcv,epa2025/gas_diesel_oil/co2_ef" {
		t.Errorf("sources %s", keys)
	}
}

func TestCarbonAndGWP(t *testing.T) {
	e := newTestEngine(t)
	r := call(t, e, `fuel_carbon("natural_gas", 1, "MMBtu", "epa2025")`)
	if !near(r.Value, 53.06/1000*12/44, 1e-12) || !hasNote(r, "x 12/44") {
		t.Errorf("EPA carbon: %v %q", r.Value, r.Notes)
	}
	// AR6 splits CH4 by origin (Table 7.15): fossil 29.8 for coal.
	r = call(t, e, `fuel_co2e("coal", 1, "TJ", "ar6")`)
	if !near(r.Value, 94.6+1*29.8/1000+1.5*273/1000, 1e-12) || !hasNote(r, "fossil CH4 29.8") {
		t.Errorf("AR6 coal: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `fuel_co2e("coal", 1, "TJ")`)
	if !near(r.Value, 94.6+1*28.0/1000+1.5*265/1000, 1e-12) || !hasNote(r, "GWP-100 AR5: CH4 28, N2O 265") {
		t.Errorf("AR5 default: %v %q", r.Value, r.Notes)
	}
}

func TestEmbodied(t *testing.T) {
	e := newTestEngine(t)
	// 12 g/kWh infrastructure & supply chain x 1000 x 0.8 x 8760 x 40 / 1e6 (AR5 WG3 Annex III Table A.III.2)
	r := call(t, e, `embodied_per_mw("coal_pc", 0.8, 40)`)
	if !near(r.Value, 12*1000*0.8*8760*40/1e6, 1e-12) || !hasNote(r, "infrastructure & supply-chain intensity 12 g CO2e/kWh") {
		t.Errorf("coal: %v %q", r.Value, r.Notes)
	}
	a := call(t, e, `embodied("pv_utility", 250, "MWp")`)
	b := call(t, e, `embodied_per_mw("pv_utility") * 250`)
	if !near(a.Value, b.Value, 1e-12) || !hasNote(a, "default for pv_utility") {
		t.Errorf("defaults: %v vs %v %q", a.Value, b.Value, a.Notes)
	}
	kw := call(t, e, `embodied("pv_rooftop", 5000, "kW", 0.15, 25)`)
	mw := call(t, e, `embodied("pv_rooftop", 5, "MW", 0.15, 25)`)
	if !near(kw.Value, mw.Value, 1e-12) {
		t.Errorf("kW vs MW: %v %v", kw.Value, mw.Value)
	}
}

func TestPPM(t *testing.T) {
	e := newTestEngine(t)
	// 1 ppm = 2.124 GtC (Global Carbon Budget); 44/12 (IPCC)
	r := call(t, e, `ppm_from_co2(7.788, "Gt", 0.5)`)
	if !near(r.Value, 7.788*12/44*0.5/2.124, 1e-12) || !hasNote(r, "airborne fraction 0.5") {
		t.Errorf("ppm_from_co2: %v %q", r.Value, r.Notes)
	}
	r = call(t, e, `ppm_from_co2(7788, "Mt")`)
	if !near(r.Value, 7.788*12/44/2.124, 1e-12) {
		t.Errorf("Mt: %v", r.Value)
	}
	if r := call(t, e, `gtc_from_ppm(ppm_from_gtc(17.5))`); !near(r.Value, 17.5, 1e-14) {
		t.Errorf("round trip %v", r.Value)
	}
}
