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
		// 0.125 g N2O per mmBtu (natural gas boiler at 80 % efficiency).
		{`heat_co2e(1000, "MMBtu")`, "Hub Table 7, AR5 28/265", 66.33 + 1.25*28/1000 + 0.125*265/1000},
		{`heat_co2e(1000, "MMBtu", "hot_water", "epahub2025", "ar4")`, "Hub Table 7, AR4 25/298", 66.33 + 1.25*25/1000 + 0.125*298/1000},
		{`heat_co2e(293.07107017222, "kWh", "steam")`, "Hub Table 7; 1 MMBtu = 293.07107017222 kWh", (66.33 + 1.25*28/1000 + 0.125*265/1000) / 1000},
		// UK GHG Conversion Factors 2025, Heat and steam: district heat and steam 0.17529 kg CO2e/kWh.
		{`heat_co2e(1000, "MWh", "heat", "uk2025")`, "UK 2025 district heat and steam", 175.29},
		{`heat_co2e(1000, "MWh", "District heating", "UK2025")`, "UK 2025 district heat and steam", 175.29},
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
	r = call(t, e, `heat_co2e(10, "GJ", "heat", "uk2025")`)
	if !hasNote(r, "Heat and steam: district heat and steam") || !hasNote(r, "as its publication states it") {
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
		{`heat_co2e(1000, "kWh", "steam", "uk2024")`, "set", `unknown heat set "uk2024": accepted are epahub2025, uk2025 (did you mean uk2025?)`},
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
