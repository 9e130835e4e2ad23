package funcs

import (
	"math"
	"strings"
	"testing"
)

// TestLeakRates checks the operation emission factors of IPCC 2006 Guidelines Vol 3 Ch 7
// Table 7.9 (% of initial charge per year; recalled, not read).
func TestLeakRates(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		equipment string
		low, high float64
	}{
		{"domestic_refrigeration", 0.001, 0.005}, {"standalone_commercial", 0.01, 0.15},
		{"commercial_refrigeration", 0.10, 0.35}, {"transport_refrigeration", 0.15, 0.50},
		{"industrial_refrigeration", 0.07, 0.25}, {"chillers", 0.02, 0.15},
		{"air_conditioning", 0.01, 0.10}, {"mobile_air_conditioning", 0.10, 0.20},
	} {
		hi, err1 := e.CallValues("refrigerant_leak_rate", c.equipment)
		lo, err2 := e.CallValues("refrigerant_leak_rate", c.equipment, "low")
		if err1 != nil || err2 != nil || hi.Value != c.high || lo.Value != c.low {
			t.Errorf("%s: %v..%v (%v, %v), want %v..%v (Table 7.9)", c.equipment, lo.Value, hi.Value, err1, err2, c.low, c.high)
		}
	}
	if got := e.leakEquipment(); len(got) != 8 {
		t.Errorf("equipment %v", got)
	}
}

// TestFugitiveScreening works the screening method by hand.
func TestFugitiveScreening(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		expr, working string
		want          float64
	}{
		// 200 kg R-404A in a supermarket system, 35 %/yr (Table 7.9 high end), AR5 3942.8
		{`fugitive_co2e("R-404A", 200, "kg", refrigerant_leak_rate("commercial_refrigeration"))`, "0.2 t x 0.35 x 3942.8 = 275.996", 275.996},
		// 12 lb R-410A heat pump, 10 %/yr, AR6 0.5 x 771 + 0.5 x 3740 = 2255.5; lb = 0.45359237 kg
		{`fugitive_co2e("R410A", 12, "lb", refrigerant_leak_rate("Air-Conditioning"), "ar6")`, "0.00544310844 t x 0.1 x 2255.5", 1.227693108642},
		// an own leak rate of 2 % on 1.5 t of HFC-134a, AR4 1430
		{`fugitive_co2e("HFC-134a", 1.5, "t", 0.02, "ar4")`, "1.5 x 0.02 x 1430 = 42.9", 42.9},
		{`fugitive_co2e("R-404A", 200, "kg", 0)`, "no leaks", 0},
	} {
		r, err := evalExpr(e, c.expr)
		if err != nil {
			t.Errorf("%s: %v", c.expr, err)
			continue
		}
		if math.Abs(r.Value-c.want) > 1e-12*c.want || r.Unit != "t CO2e/yr" {
			t.Errorf("%s = %v %s, want %v (%s)", c.expr, r.Value, r.Unit, c.want, c.working)
		}
	}
	r, _ := evalExpr(e, `fugitive_co2e("R-404A", 200, "kg", 0.35)`)
	if !strings.Contains(strings.Join(r.Notes, "|"), "screening estimate: 200 kg charge x 0.35 lost per year x GWP-100 AR5 3942.8; operating leaks only") {
		t.Errorf("notes %q", r.Notes)
	}
	for _, c := range []struct{ expr, code, msg string }{
		{`fugitive_co2e("R-404A", 200, "kg", 35)`, CodeBadArgument, `fugitive_co2e: leak_rate: must lie in [0, 1] (a fraction of the charge per year, 0.15 for 15 %), got 35 (character 1)`},
		{`fugitive_co2e("R-404A", -1, "kg", 0.1)`, CodeBadArgument, `fugitive_co2e: charge: must not be negative, got -1 (character 1)`},
		{`refrigerant_leak_rate("chiller")`, CodeBadArgument, `refrigerant_leak_rate: equipment: unknown equipment "chiller" (did you mean chillers?): accepted are air_conditioning, chillers, commercial_refrigeration, domestic_refrigeration, industrial_refrigeration, mobile_air_conditioning, standalone_commercial, transport_refrigeration (character 23)`},
		{`refrigerant_leak_rate("chillers", "mid")`, CodeBadArgument, `refrigerant_leak_rate: bound: unknown bound "mid": accepted are low, high (character 35)`},
	} {
		_, err := evalExpr(e, c.expr)
		fe, ok := AsError(err)
		if !ok || fe.Code != c.code || fe.Headline() != c.msg {
			t.Errorf("%s:\n got: %v\nwant: %s", c.expr, err, c.msg)
		}
	}
}
