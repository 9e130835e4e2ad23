package importer

import (
	"testing"
)

// TestTextNumber: numbers stored as text are read only where one reading
// exists. Separator conventions: common practice (ISO 80000-1 allows a
// space or a thin space between groups of three; "." or "," decimal marks).
func TestTextNumber(t *testing.T) {
	cases := []struct {
		in      string
		want    float64
		ok, amb bool
	}{
		{"1250.5", 1250.5, true, false},
		{"1,250.5", 1250.5, true, false},
		{"1,250,000", 1250000, true, false},
		{"1.250.000", 1250000, true, false},
		{"1.250,5", 1250.5, true, false},
		{"1 250,5", 1250.5, true, false},
		{"1\u00a0250.5", 1250.5, true, false},
		{"1'250.5", 1250.5, true, false},
		{"12,5", 12.5, true, false},
		{"(1,250.5)", -1250.5, true, false},
		{"-42", -42, true, false},
		{"35%", 0.35, true, false},
		{" 7 ", 7, true, false},
		{"1,250", 0, false, true},
		{"1,25,0", 0, false, false},
		{"1.250,5.5", 0, false, false},
		{"12,5,3", 0, false, false},
		{"n/a", 0, false, false},
		{"", 0, false, false},
		{"1e400", 0, false, false},
		{"0x1F", 0, false, false},
		{"Inf", 0, false, false},
		{"--5", 0, false, false},
		{"(-5)", 0, false, false},
	}
	for _, c := range cases {
		v, ok, amb := textNumber(c.in)
		if ok != c.ok || amb != c.amb || ok && v != c.want {
			t.Errorf("textNumber(%q) = %v %v %v, want %v %v %v", c.in, v, ok, amb, c.want, c.ok, c.amb)
		}
	}
}

func TestParseHeader(t *testing.T) {
	cases := []struct {
		in, base, unit string
		bad, pct       bool
		scale          float64
	}{
		{"Quantity ('000 L)", "Quantity", "L", false, false, 1000},
		{"Gas (thousand m3)", "Gas", "m3", false, false, 1000},
		{"Energy (million kWh)", "Energy", "kWh", false, false, 1e6},
		{"Quantity (MWh)", "Quantity", "MWh", false, false, 0},
		{"Diesel [L]", "Diesel", "L", false, false, 0},
		{"Natural gas, m3", "Natural gas", "m3", false, false, 0},
		{"Consumption kWh", "Consumption", "kWh", false, false, 0},
		{"Energy - GJ", "Energy", "GJ", false, false, 0},
		{"Gas (MMBtu, HHV)", "Gas", "MMBtu, HHV", false, false, 0},
		{"Fuel used in litres", "Fuel used", "litres", false, false, 0},
		{"Litres", "Litres", "Litres", false, false, 0},
		{"Quantity\n(t)", "Quantity", "t", false, false, 0},
		{"Coal (ton)", "Coal", "ton", true, false, 0},
		{"Capacity factor (%)", "Capacity factor", "", false, true, 0},
		{"Capacity (MW)", "Capacity", "MW", false, false, 0},
		{"Cost (EUR)", "Cost (EUR)", "", false, false, 0},
		{"Fuel type", "Fuel type", "", false, false, 0},
		{"Year", "Year", "", false, false, 0},
		{"Site", "Site", "", false, false, 0},
	}
	for _, c := range cases {
		h := parseHeader(c.in)
		if c.scale == 0 {
			c.scale = 1
		}
		if h.Base != c.base || h.UnitText != c.unit || (h.UnitErr != nil) != c.bad || h.Percent != c.pct || h.Scale != c.scale {
			t.Errorf("parseHeader(%q) = base %q unit %q err %v pct %v", c.in, h.Base, h.UnitText, h.UnitErr, h.Percent)
		}
	}
}

func TestIdentFor(t *testing.T) {
	for in, want := range map[string]string{
		"Quantity":          "quantity",
		"Fuel type":         "fuel_type",
		"Reported tCO2":     "reported_tco2",
		"CO₂ (kg)":          "co_kg",
		"Énergie consommée": "energie_consommee",
		"2024 total":        "c_2024_total",
		"in":                "in_col",
		"":                  "col_c",
		"--":                "col_c",
	} {
		if got := identFor(in, 3); got != want {
			t.Errorf("identFor(%q) = %q, want %q", in, got, want)
		}
	}
}

func TestCarbonHeader(t *testing.T) {
	cases := []struct {
		in, species, unit string
		ok, bad           bool
	}{
		{"tCO2", "CO2", "t", true, false},
		{"Reported tCO2", "CO2", "t", true, false},
		{"CO2 (kg)", "CO2", "kg", true, false},
		{"kgCO2e", "CO2e", "kg", true, false},
		{"Emissions (t CO2e)", "CO2e", "t", true, false},
		{"Scope 1 (tCO2e)", "CO2e", "t", true, false},
		{"Carbon (t)", "C", "t", true, false},
		{"MT CO2", "CO2", "", true, true},
		{"GHG emissions", "CO2e", "", true, false},
		{"kg CO2/L", "", "", false, false},
		{"Emission factor (kgCO2e/kWh)", "", "", false, false},
		{"Carbon tax (EUR)", "", "", false, false},
		{"Coal (t)", "", "", false, false},
		{"Quantity", "", "", false, false},
	}
	for _, c := range cases {
		got, ok := parseCarbonHeader(c.in)
		if ok != c.ok || ok && (got.species != c.species || got.unit.Symbol != c.unit || (got.unitErr != nil) != c.bad) {
			t.Errorf("parseCarbonHeader(%q) = %+v %v", c.in, got, ok)
		}
	}
}
