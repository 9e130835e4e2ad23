package tables

import (
	"reflect"
	"testing"
)

func TestNewVocab(t *testing.T) {
	if _, err := NewVocab(); err != nil {
		t.Fatal(err)
	}
}

// Header spellings seen in real public workbooks (EIA, city benchmarking
// disclosures, campus fleet exports, UK statistics).
func TestWords(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want []string
	}{
		{"NaturalGasUse_therms", []string{"natural", "gas", "use", "therms"}},
		{"PlantType", []string{"plant", "type"}},
		{"account_fuel", []string{"account", "fuel"}},
		{"Fuel Oil #2 Use (kBtu)", []string{"fuel", "oil", "2", "use", "kbtu"}},
		{"kWh", []string{"kwh"}},
		{"MMBtu", []string{"mmbtu"}},
		{"TBtu", []string{"tbtu"}},
		{"Coal3", []string{"coal"}},
		{"E85", []string{"e85"}},
		{"B20", []string{"b20"}},
		{"CO2e", []string{"co2e"}},
		{"Year 2024", []string{"year", "2024"}},
		{"MWhConsumed", []string{"mwh", "consumed"}},
	} {
		if got := Words(tc.in); !reflect.DeepEqual(got, tc.want) {
			t.Errorf("Words(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestClean(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"Total consumption\n(GWh):\nDomestic", "Total consumption (GWh): Domestic"},
		{"Number of meters\n(thousands):", "Number of meters (thousands)"},
		{"Natural\u00a0Gas¹", "Natural Gas"},
		{"Vehicle(s)", "Vehicle"},
		{"CO₂ (t)", "CO2 (t)"},
	} {
		if got := Clean(tc.in); got != tc.want {
			t.Errorf("Clean(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestHints(t *testing.T) {
	v, err := NewVocab()
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		in   string
		want Hint
		not  Hint
	}{
		{"Gallons", 0, HintRate},
		{"Price ($/gal)", HintRate, HintQty},
		{"Mean consumption (kWh per meter)", HintRate, 0},
		{"Number of meters", HintCount, HintQty},
		{"Fuel Type", HintFuel, 0},
		{"Unit of Measure", HintUnit, 0},
		{"Total consumption", HintTotal | HintQty, 0},
		{"Electricity Use (kWh)", HintNotFuel | HintQty, 0},
		{"PlantType", HintTech, 0},
	} {
		h := v.Hints(Words(tc.in))
		if !h.Has(tc.want) || h.Any(tc.not) {
			t.Errorf("Hints(%q) = %b, want %b and not %b", tc.in, h, tc.want, tc.not)
		}
	}
}
