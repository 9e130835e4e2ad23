package funcs

import (
	"strings"
	"testing"
)

// TestCatalogExamples evaluates each declared example and compares it with
// the declared result, so that the documentation cannot drift.
func TestCatalogExamples(t *testing.T) {
	e := newTestEngine(t)
	want := []string{"fuel_co2", "fuel_co2e", "fuel_carbon", "fuel_energy", "co2_from_carbon", "carbon_from_co2", "ppm_from_gtc",
		"ppm_from_co2", "gtc_from_ppm", "gwp", "to_unit", "lifecycle_intensity", "lifecycle_part", "embodied_per_mw", "embodied",
		"vehicle_embodied", "battery_embodied", "building_embodied",
		"mobile_co2", "mobile_co2e",
		"refrigerant_co2e", "fugitive_co2e", "refrigerant_leak_rate",
		"electricity_co2e", "electricity_co2", "electricity_losses_co2e", "heat_co2e",
		"vehicle_co2e"}
	var got []string
	for _, f := range e.Functions() {
		got = append(got, f.Name)
		if f.Doc == "" || len(f.Sources) == 0 || f.Example == "" {
			t.Errorf("%s: doc, sources and example are required", f.Name)
		}
		if !strings.HasPrefix(f.Example, f.Name+"(") {
			t.Errorf("%s: example %q does not call it", f.Name, f.Example)
		}
		r, err := evalExpr(e, f.Example)
		if err != nil {
			t.Errorf("%s: example %s: %v", f.Name, f.Example, err)
			continue
		}
		if !near(r.Value, f.ExampleResult, 1e-9) {
			t.Errorf("%s: example %s = %v, declared %v", f.Name, f.Example, r.Value, f.ExampleResult)
		}
		seen := map[string]bool{}
		optional := false
		for _, p := range f.Params {
			if seen[p.Name] {
				t.Errorf("%s: parameter %s twice", f.Name, p.Name)
			}
			seen[p.Name] = true
			if p.Type != typeNumber && p.Type != typeString {
				t.Errorf("%s.%s: type %q", f.Name, p.Name, p.Type)
			}
			if optional && !p.Optional {
				t.Errorf("%s.%s: a required parameter after an optional one", f.Name, p.Name)
			}
			optional = optional || p.Optional
			if p.Optional && p.Default == "" {
				t.Errorf("%s.%s: optional without a stated default", f.Name, p.Name)
			}
		}
	}
	if strings.Join(got, ",") != strings.Join(want, ",") {
		t.Errorf("catalog %v, want %v", got, want)
	}
}

// TestCallMatchesExpression: the named-argument path and the expression
// path give the same number.
func TestCallMatchesExpression(t *testing.T) {
	e := newTestEngine(t)
	r1, err := e.Call("fuel_co2e", map[string]string{"fuel": "lignite", "amount": "12.5", "unit": "kt", "gwp_set": "AR6"})
	if err != nil {
		t.Fatal(err)
	}
	r2 := call(t, e, `fuel_co2e("lignite", 12.5, "kt", "ar6")`)
	if r1.Value != r2.Value || r1.Unit != "t CO2e" || len(r1.Sources) != len(r2.Sources) {
		t.Errorf("Call %v %s %d, expression %v %d", r1.Value, r1.Unit, len(r1.Sources), r2.Value, len(r2.Sources))
	}
	r3, err := e.Call("to_unit", map[string]string{"value": "3", "from": "MWh", "to": "GJ"})
	if err != nil || r3.Value != 10.8 || r3.Unit != "GJ" {
		t.Errorf("to_unit: %v %s %v", r3.Value, r3.Unit, err)
	}
}
