package funcs

import (
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"
)

// gwpCalls gives, for every catalog function with a gwp_set parameter, a call
// that leaves gwp_set out and the same call written out with the defaults of
// the optional parameters before gwp_set and a %s for the set.
var gwpCalls = map[string][2]string{
	"fuel_co2e":               {`fuel_co2e("natural_gas", 1, "TJ")`, `fuel_co2e("natural_gas", 1, "TJ", "%s")`},
	"gwp":                     {`gwp("R-410A")`, `gwp("R-410A", "%s")`},
	"mobile_co2e":             {`mobile_co2e("diesel", 1000, "GJ", "road")`, `mobile_co2e("diesel", 1000, "GJ", "road", "%s")`},
	"refrigerant_co2e":        {`refrigerant_co2e("R-404A", 10, "kg")`, `refrigerant_co2e("R-404A", 10, "kg", "%s")`},
	"fugitive_co2e":           {`fugitive_co2e("R-404A", 200, "kg", 0.35)`, `fugitive_co2e("R-404A", 200, "kg", 0.35, "%s")`},
	"electricity_co2e":        {`electricity_co2e(1000, "MWh", "gb")`, `electricity_co2e(1000, "MWh", "gb", "location", 0, "%s")`},
	"electricity_losses_co2e": {`electricity_losses_co2e(1000, "MWh", "gb")`, `electricity_losses_co2e(1000, "MWh", "gb", 0, "%s")`},
	"heat_co2e":               {`heat_co2e(1000, "MMBtu")`, `heat_co2e(1000, "MMBtu", "steam", "epahub2025", "%s")`},
	"vehicle_co2e":            {`vehicle_co2e(1000, "mi", "us_passenger_car")`, `vehicle_co2e(1000, "mi", "us_passenger_car", "%s")`},
}

func evalGWP(t *testing.T, e *Engine, src string, opts ...CompileOption) Result {
	t.Helper()
	p, err := e.Compile(src, opts...)
	if err != nil {
		t.Fatalf("%s: %v", src, err)
	}
	r, err := p.Eval(nil)
	if err != nil {
		t.Fatalf("%s: %v", src, err)
	}
	return r
}

// TestWithGWPSetEqualsExplicitCall checks, for every function with a gwp_set
// parameter and every set, that the option gives exactly the value, unit,
// factor rows and notes of the call that names the set itself.
func TestWithGWPSetEqualsExplicitCall(t *testing.T) {
	e := newTestEngine(t)
	covered := 0
	for _, f := range e.Functions() {
		if _, ok := f.Param("gwp_set"); !ok {
			continue
		}
		covered++
		calls, ok := gwpCalls[f.Name]
		if !ok {
			t.Errorf("%s has a gwp_set parameter and no case in gwpCalls", f.Name)
			continue
		}
		values := map[string]float64{}
		for _, set := range e.gwpSets() {
			got := evalGWP(t, e, calls[0], WithGWPSet(strings.ToUpper(set)))
			want := evalGWP(t, e, fmt.Sprintf(calls[1], set))
			if got.Value != want.Value || got.Unit != want.Unit ||
				!reflect.DeepEqual(got.FactorKeys(), want.FactorKeys()) || !reflect.DeepEqual(got.Notes, want.Notes) {
				t.Errorf("%s with %s = %v %s %v %q, want %v %s %v %q", calls[0], set,
					got.Value, got.Unit, got.FactorKeys(), got.Notes, want.Value, want.Unit, want.FactorKeys(), want.Notes)
			}
			values[set] = got.Value
		}
		// The set must change the result, or the comparison above proves nothing.
		if values["ar5"] == values["ar6"] {
			t.Errorf("%s: ar5 and ar6 give the same %v; choose a call whose value depends on the set", calls[0], values["ar5"])
		}
		if def := evalGWP(t, e, calls[0]); def.Value != values[DefaultGWPSet] {
			t.Errorf("%s without the option = %v, want the %s value %v", calls[0], def.Value, DefaultGWPSet, values[DefaultGWPSet])
		}
	}
	if covered != len(gwpCalls) {
		t.Errorf("gwpCalls has %d cases, the catalog %d functions with gwp_set", len(gwpCalls), covered)
	}
}

// TestWithGWPSetPublished checks 1 TJ of natural gas burned in the energy
// industries against the published factors: CO2 56 100 kg/TJ (IPCC 2006
// Guidelines Vol 2 Ch 1 Table 1.4), CH4 1 kg/TJ and N2O 0.1 kg/TJ (Vol 2 Ch 2
// Table 2.2), weighted with fossil CH4 29.8 and N2O 273 (IPCC AR6 WG1 Ch 7
// Table 7.15) for ar6 and CH4 28 and N2O 265 (IPCC AR5 WG1 Ch 8 Table 8.7,
// the values of Table 8.A.1 the pack cites) for ar5.
func TestWithGWPSetPublished(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		set      string
		ch4, n2o float64
	}{{"ar6", 29.8, 273}, {"ar5", 28, 265}} {
		want := (56100 + 1*c.ch4 + 0.1*c.n2o) / 1000 // t CO2e
		got := evalGWP(t, e, `fuel_co2e("natural_gas", 1, "TJ")`, WithGWPSet(c.set))
		if math.Abs(got.Value-want) > 1e-9*want {
			t.Errorf("%s: fuel_co2e(natural_gas, 1 TJ) = %.7f t CO2e, want %.7f", c.set, got.Value, want)
		}
	}
}

// TestWithGWPSetCalls checks a call that names its own set, several calls in
// one expression, an empty set and the errors.
func TestWithGWPSetCalls(t *testing.T) {
	e := newTestEngine(t)
	own := evalGWP(t, e, `fuel_co2e("natural_gas", 1, "TJ", "ar4")`)
	if got := evalGWP(t, e, `fuel_co2e("natural_gas", 1, "TJ", "ar4")`, WithGWPSet("ar6")); got.Value != own.Value {
		t.Errorf("a call naming ar4 under ar6 = %v, want its own %v", got.Value, own.Value)
	}
	src := `fuel_co2e(fuel, q, "TJ") + 2 * electricity_co2e(kwh / 1000, "MWh", "gb") - gwp("R-410A", "ar4")`
	vars := map[string]any{"fuel": "diesel", "q": 3.0, "kwh": 5000.0}
	p, err := e.Compile(src, WithVariables("fuel", "q", "kwh"), WithGWPSet("ar6"))
	if err != nil {
		t.Fatal(err)
	}
	got, err := p.Eval(vars)
	if err != nil {
		t.Fatal(err)
	}
	want := evalGWP(t, e, `fuel_co2e("diesel", 3, "TJ", "ar6") + 2 * electricity_co2e(5, "MWh", "gb", "location", 0, "ar6") - gwp("R-410A", "ar4")`)
	if got.Value != want.Value {
		t.Errorf("%s under ar6 = %v, want %v", src, got.Value, want.Value)
	}
	if p.Source() != src {
		t.Errorf("Source() = %q, want the expression as written", p.Source())
	}
	for src, want := range map[string]string{
		`fuel_co2e("natural_gas", 1, "TJ")`:        "ar6",
		`fuel_co2e("natural_gas", 1, "TJ", "ar4")`: "",
		`fuel_co2("natural_gas", 1, "TJ")`:         "",
	} {
		p, err := e.Compile(src, WithGWPSet(" AR6 "))
		if err != nil {
			t.Fatal(err)
		}
		if p.GWPSet() != want {
			t.Errorf("%s: GWPSet() = %q, want %q", src, p.GWPSet(), want)
		}
	}
	for _, blank := range []string{"", "  "} {
		if got := evalGWP(t, e, `fuel_co2e("natural_gas", 1, "TJ")`, WithGWPSet(blank)); got.Value != evalGWP(t, e, `fuel_co2e("natural_gas", 1, "TJ")`).Value {
			t.Errorf("WithGWPSet(%q) changed the value", blank)
		}
	}

	_, err = e.Compile(`fuel_co2e("natural_gas", 1, "TJ")`, WithGWPSet("ar7"))
	fe, ok := AsError(err)
	if !ok || fe.Param != "gwp_set" || !strings.Contains(fe.Msg, "ar4, ar5, ar6") {
		t.Errorf("unknown set: %v, want an *Error on gwp_set listing ar4, ar5, ar6", err)
	}
	_, err = e.Compile(`fuel_co2e("natural_gas", 1, "TJ", "ar9")`, WithGWPSet("ar6"))
	if fe, ok := AsError(err); !ok || fe.Param != "gwp_set" || fe.Position != 35 {
		t.Errorf("a call's own unknown set: %v, want an *Error on gwp_set at column 35", err)
	}
}

// TestGWPFillNoWritableDefault checks the error for a function whose optional
// parameter before gwp_set has a default given only in words.
func TestGWPFillNoWritableDefault(t *testing.T) {
	e := newTestEngine(t)
	gwpSet := optional(paramStr("gwp_set", "set"), DefaultGWPSet).with(kindGWPSet)
	f := &Function{Name: "probe_co2e", Params: []Param{
		paramNum("amount", "t", "amount"),
		optional(paramNum("year", "yr", "data year"), "latest loaded"),
		gwpSet,
	}}
	if _, err := e.gwpFill(f, 1, "ar6"); err == nil {
		t.Fatal("a default in words was written as an argument")
	} else if fe, ok := AsError(err); !ok || fe.Func != "probe_co2e" || fe.Param != "year" {
		t.Errorf("error %v, want one naming probe_co2e and year", err)
	}
	f.Params[1] = f.Params[1].omittedAs("0")
	fill, err := e.gwpFill(f, 1, "ar6")
	if err != nil || len(fill) != 2 || fill[0].String() != "0" || fill[1].String() != `"ar6"` {
		t.Errorf("with an omitted literal: %v %v, want [0 \"ar6\"]", fill, err)
	}
	if fill, err := e.gwpFill(f, 3, "ar6"); err != nil || fill != nil {
		t.Errorf("a call giving gwp_set got %v %v, want nothing added", fill, err)
	}
}
