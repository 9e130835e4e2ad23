package funcs

import (
	"testing"
)

// FuzzCompile: the compiler and a run never panic, and every failure is an
// *Error.
func FuzzCompile(f *testing.F) {
	for _, s := range []string{`fuel_co2("diesel", q, "L")`, `q * 56.1`, `1/0`, `map([1], #)`, `fuel_co2e(fuel, q, unit, "ar6", "epa2025")`,
		`q > 1 ? to_unit(q, "MWh", "GJ") : -q`, `let x = 1; x`, `"a" + 1`, `((((q))))`, `embodied("pv_utility", q, "MW")`, `gwp("ch4")**q`} {
		f.Add(s)
	}
	e := newTestEngine(f)
	vars := map[string]any{"q": 2.5, "fuel": "natural_gas", "unit": "GJ"}
	f.Fuzz(func(t *testing.T, src string) {
		p, err := e.Compile(src)
		if err != nil {
			if _, ok := AsError(err); !ok {
				t.Fatalf("%q: error %T is not *Error: %v", src, err, err)
			}
			return
		}
		for _, v := range p.Variables() {
			if _, ok := vars[v]; !ok {
				vars[v] = 1.0
			}
		}
		if _, err := p.Eval(vars); err != nil {
			if _, ok := AsError(err); !ok {
				t.Fatalf("%q: run error %T is not *Error: %v", src, err, err)
			}
		}
	})
}

// FuzzCall: named string arguments never panic and never give a
// non-finite value.
func FuzzCall(f *testing.F) {
	f.Add("fuel_co2", "diesel", "1000", "L", "")
	f.Add("fuel_co2e", "gas", "1e3", "MMBtu HHV", "epa2025")
	f.Add("embodied", "pv_utility", "-5", "kW", "")
	f.Add("fuel_co2", "E85", "100", "gal", "epa2025")
	f.Add("fuel_co2e", "Propane (bulk)¹", "1", "Thousand Gallons", "ar6")
	f.Add("fuel_energy", "B20", "1", "Mbbl", "MMBtu")
	f.Add("fuel_carbon", "Coal (3)", "1", "Thousand Short Tons", "")
	f.Add("lifecycle_intensity", "Solar PV - Class 3", "max", "", "")
	f.Add("embodied", "wind-ons_3", "100", "MW", "")
	e := newTestEngine(f)
	f.Fuzz(func(t *testing.T, name, a, b, c, d string) {
		fn, ok := e.Function(name)
		if !ok {
			return
		}
		args := map[string]string{}
		for i, v := range []string{a, b, c, d} {
			if i < len(fn.Params) {
				args[fn.Params[i].Name] = v
			}
		}
		r, err := e.Call(name, args)
		if err != nil {
			if _, ok := AsError(err); !ok {
				t.Fatalf("error %T is not *Error: %v", err, err)
			}
			return
		}
		if r.Value != r.Value || r.Value > 1e308 || r.Value < -1e308 {
			t.Fatalf("%s(%q) = %v", name, args, r.Value)
		}
	})
}
