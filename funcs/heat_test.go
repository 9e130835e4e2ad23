package funcs

import (
	"strings"
	"testing"
)

// TestHeatReference checks heat_co2e against the published defaults.
func TestHeatReference(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct {
		expr, source string
		want         float64
	}{
		// US EPA GHG Emission Factors Hub (2025) Table 7 Steam and Heat: 66.33 kg CO2, 1.250 g CH4,
		// 0.125 g N2O per mmBtu (natural gas boiler at 80 % efficiency), which is 40 CFR 98 Subpart C
		// Table C-1 (53.06 kg CO2/mmBtu) and Table C-2 (1.0 g CH4, 0.10 g N2O per mmBtu) / 0.80.
		{`heat_co2e(1000, "MMBtu")`, "Hub Table 7, AR5 28/265", 66.33 + 1.25*28/1000 + 0.125*265/1000},
		{`heat_co2e(1000, "MMBtu", "hot_water", "epahub2025", "ar4")`, "Hub Table 7, AR4 25/298", 66.33 + 1.25*25/1000 + 0.125*298/1000},
		{`heat_co2e(293.07107017222, "kWh", "steam")`, "Hub Table 7; 1 MMBtu = 293.07107017222 kWh", (66.33 + 1.25*28/1000 + 0.125*265/1000) / 1000},
		// UK GHG Conversion Factors 2023 flat file v1.1 (rows 3238-3241), Heat and steam: district heat
		// and steam 0.17965 kg CO2e/kWh (AR5 total); CO2 0.17791, CH4 0.00122 and N2O 0.00052 as CO2e.
		{`heat_co2e(1000, "MWh", "heat", "uk2023")`, "UK 2023 district heat and steam", 179.65},
		{`heat_co2e(1000, "MWh", "District heating", "UK2023")`, "UK 2023 district heat and steam", 179.65},
		{`heat_co2e(1000, "MWh", "heat", "uk2023", "ar6")`, "UK 2023 split reweighted to AR6 27.9/273",
			177.91 + 1.22/28*27.9 + 0.52/265*273},
	}
	for _, tc := range tests {
		r, err := evalExpr(e, tc.expr)
		if err != nil {
			t.Errorf("%s: %v", tc.expr, err)
			continue
		}
		if !near(r.Value, tc.want, 1e-12) || r.Unit != "t CO2e" {
			t.Errorf("%s = %v %s, want %v t CO2e (%s)", tc.expr, r.Value, r.Unit, tc.want, tc.source)
		}
	}
	// Each result names its assumption.
	r := call(t, e, `heat_co2e(10, "GJ")`)
	if !hasNote(r, "natural gas at 80 % thermal efficiency") || !hasNote(r, "boiler efficiency 80 %") {
		t.Errorf("EPA steam notes %q", r.Notes)
	}
	r = call(t, e, `heat_co2e(10, "GJ", "heat", "uk2023")`)
	if !hasNote(r, "Heat and steam: District heat and steam") || !hasNote(r, "as its publication states it") {
		t.Errorf("UK heat notes %q", r.Notes)
	}
}

// TestHeatUserRow: a chilled-water factor the user loads serves carrier chilled_water.
func TestHeatUserRow(t *testing.T) {
	rows := "pack,id,quantity,value,unit,source\n" +
		"plant2025,chilled_water,heat_co2e,0.12,kg CO2e/kWh,\"district cooling supplier statement 2025 (invented for this test)\"\n"
	e, err := New(WithFactorData("cooling.csv", []byte(rows)))
	if err != nil {
		t.Fatal(err)
	}
	if r := call(t, e, `heat_co2e(1000, "MWh", "cooling", "plant2025")`); !near(r.Value, 120, 1e-12) {
		t.Errorf("chilled water %v", r.Value)
	}
}

// TestHeatBadInputs: messages name the parameter and what is accepted.
func TestHeatBadInputs(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct{ expr, param, msg string }{
		{`heat_co2e(1000, "kWh", "chilled_water")`, "carrier", "set epahub2025 has no factor for chilled_water; no loaded set publishes one: load your own row (id chilled_water, quantity heat_co2e"},
		{`heat_co2e(1000, "kWh", "plasma")`, "carrier", `unknown carrier "plasma": accepted are steam, hot_water, heat, chilled_water`},
		{`heat_co2e(1000, "kWh", "steam", "uk2024")`, "set", `unknown heat set "uk2024": accepted are epahub2025, uk2023 (did you mean uk2023?)`},
		{`heat_co2e(1000, "lb", "steam")`, "unit", `unit "lb" is a mass, but an energy is needed here`},
	}
	for _, tc := range tests {
		_, err := evalExpr(e, tc.expr)
		fe, ok := AsError(err)
		if !ok {
			t.Errorf("%s: error %v, want an *Error", tc.expr, err)
			continue
		}
		if fe.Param != tc.param || !strings.Contains(fe.Error(), tc.msg) {
			t.Errorf("%s:\n got param %s: %s\nwant param %s containing %s", tc.expr, fe.Param, fe.Headline(), tc.param, tc.msg)
		}
	}
}
