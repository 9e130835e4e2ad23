package funcs

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

func callIV(t *testing.T, e *Engine, fn string, args map[string]string) Result {
	t.Helper()
	r, err := e.CallInterval(fn, args, IntervalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// embodied of 100 MW of utility-scale PV at capacity factor 0.2 over 25 years: the
// infrastructure & supply-chain intensity of IPCC AR5 WG3 Annex III Table A.III.2 is 48
// g CO2e/kWh (min 18, max 180; buildout.csv row common,pv_utility,infrastructure). By hand:
// 48 x 1000 x 0.2 x 8760 x 25 / 1e6 x 100 = 210 240 t, and the published min and max scale
// it to 210 240 x 18/48 = 78 840 and 210 240 x 180/48 = 788 400 t.
func TestIntervalEmbodiedFromLifecycleRange(t *testing.T) {
	e := newTestEngine(t)
	r := callIV(t, e, "embodied", map[string]string{"tech": "pv_utility", "capacity": "100", "unit": "MW", "capacity_factor": "0.2", "lifetime_years": "25"})
	nearRel(t, "value", r.Value, 210240, 1e-12)
	if r.Interval == nil {
		t.Fatalf("no interval; notes %q", r.Notes)
	}
	nearRel(t, "low", r.Interval.Low, 78840, 1e-12)
	nearRel(t, "high", r.Interval.High, 788400, 1e-12)
	if !ivNote(r, "minimum and maximum of the studies") {
		t.Errorf("no note on what the range is: %q", r.Notes)
	}
	// embodied_per_mw of onshore wind with the default capacity factor and lifetime (rows without
	// a range): 11 g/kWh (7-56) x 1000 x 0.35 x 8760 x 25 / 1e6 = 843.15 t/MW, 536.55..4292.4.
	r = callIV(t, e, "embodied_per_mw", map[string]string{"tech": "wind_onshore"})
	nearRel(t, "per MW", r.Value, 843.15, 1e-12)
	nearRel(t, "per MW low", r.Interval.Low, 843.15*7/11, 1e-12)
	nearRel(t, "per MW high", r.Interval.High, 843.15*56/11, 1e-12)
	if !ivNote(r, "common/wind_onshore/capacity_factor") {
		t.Errorf("the default capacity factor without a range is not named: %q", r.Notes)
	}
	// at a statistic other than the median the result is an end of the range already
	r = callIV(t, e, "embodied", map[string]string{"tech": "pv_utility", "capacity": "100", "unit": "MW", "stat": "max"})
	if r.Interval != nil || !ivNote(r, "stat max is itself an end") {
		t.Errorf("stat max got %+v, notes %q", r.Interval, r.Notes)
	}
}

// mobile_co2 of 1000 GJ of diesel on the road: IPCC 2006 Vol 2 Ch 1 Table 1.4 gas/diesel oil
// 74 100 kg/TJ (72 600-74 800), as Ch 3 Table 3.2.1 repeats it: 74.1 t, 72.6..74.8 t.
func TestIntervalMobile(t *testing.T) {
	e := newTestEngine(t)
	r := callIV(t, e, "mobile_co2", map[string]string{"fuel": "diesel", "amount": "1000", "unit": "GJ", "mode": "road"})
	nearRel(t, "value", r.Value, 74.1, 1e-12)
	if r.Interval == nil {
		t.Fatalf("no interval; notes %q", r.Notes)
	}
	nearRel(t, "low", r.Interval.Low, 72.6, 1e-12)
	nearRel(t, "high", r.Interval.High, 74.8, 1e-12)
}

// Grid, heat, distance and GWP rows publish no range: the result says so, naming the rows.
func TestIntervalRowsWithoutRange(t *testing.T) {
	e := newTestEngine(t)
	cases := []struct {
		fn   string
		args map[string]string
		row  string
	}{
		{"electricity_co2e", map[string]string{"amount": "1000", "unit": "MWh", "grid": "gb", "year": "2023"}, "uk2023/gb/grid_co2e"},
		{"electricity_co2", map[string]string{"amount": "1000", "unit": "MWh", "grid": "gb", "year": "2023"}, "uk2023/gb/grid_co2"},
		{"electricity_losses_co2e", map[string]string{"amount": "1000", "unit": "MWh", "grid": "gb", "year": "2023"}, "uk2023/gb/td_co2e"},
		{"heat_co2e", map[string]string{"amount": "1000", "unit": "MMBtu"}, "steam"},
		{"vehicle_co2e", map[string]string{"distance": "1000", "unit": "mi", "vehicle": "us_passenger_car"}, "common/epa2021_us_passenger_car/co2_per_distance"},
		{"refrigerant_co2e", map[string]string{"gas": "R-404A", "mass": "10", "unit": "kg"}, "gwp100_ar5"},
		{"fugitive_co2e", map[string]string{"gas": "R-134a", "charge": "200", "unit": "kg", "leak_rate": "0.1"}, "common/hfc_134a/gwp100_ar5"},
	}
	for _, c := range cases {
		r := callIV(t, e, c.fn, c.args)
		if r.Interval != nil || !ivNote(r, "none of the rows used publishes a range") || !ivNote(r, c.row) {
			t.Errorf("%s: got %+v, notes %q", c.fn, r.Interval, r.Notes)
		}
	}
}

// A pack row with a range makes an electricity result carry an interval: a user's supplier row
// of 0.2 kg CO2e/kWh (0.18-0.23) on 1000 MWh gives 200 t, 180..230 t.
func TestIntervalElectricityUserRange(t *testing.T) {
	e := engineWithFile(t, "supplier.csv", "pack,id,quantity,value,unit,low,high,basis,source,from_memory\n"+
		"mysupplier,green_tariff,market_co2e,0.2,kg CO2e/kWh,0.18,0.23,,supplier disclosure 2024,false\n")
	r := callIV(t, e, "electricity_co2e", map[string]string{"amount": "1000", "unit": "MWh", "grid": "green_tariff", "method": "market"})
	if r.Interval == nil {
		t.Fatalf("no interval; notes %q", r.Notes)
	}
	nearRel(t, "value", r.Value, 200, 1e-12)
	nearRel(t, "low", r.Interval.Low, 180, 1e-12)
	nearRel(t, "high", r.Interval.High, 230, 1e-12)
	if math.IsNaN(r.Interval.Low) {
		t.Error("NaN")
	}
}

func engineWithFile(t *testing.T, name, text string) *Engine {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(text), 0o600); err != nil {
		t.Fatal(err)
	}
	e, err := New(WithFactorFiles(path))
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// vehicle_embodied of 10 medium battery-electric cars with 60 kWh: per car the vehicle without
// battery 6.5 t (5-8.5; buildout.csv row common,car_medium_bev,vehicle_production) and the
// battery 60 kWh x 83.5 kg/kWh (61-106; row common,li_ion,battery_production). By hand:
// 10 x (6.5 + 5.01) = 115.1 t; the two rows are independent (Equation 3.2): lower
// sqrt(15² + 13.5²), upper sqrt(20² + 13.5²). battery_embodied of 100 MWh: 8350 t, 6100..10 600.
func TestIntervalVehicleAndBatteryEmbodied(t *testing.T) {
	e := newTestEngine(t)
	r := callIV(t, e, "vehicle_embodied", map[string]string{"count": "10", "vehicle": "car_medium_bev", "battery_kwh": "60"})
	nearRel(t, "value", r.Value, 115.1, 1e-12)
	if r.Interval == nil {
		t.Fatalf("no interval; notes %q", r.Notes)
	}
	nearRel(t, "low", r.Interval.Low, 115.1-math.Hypot(15, 13.5), 1e-12)
	nearRel(t, "high", r.Interval.High, 115.1+math.Hypot(20, 13.5), 1e-12)
	r = callIV(t, e, "battery_embodied", map[string]string{"capacity": "100", "unit": "MWh"})
	nearRel(t, "battery", r.Value, 8350, 1e-12)
	nearRel(t, "battery low", r.Interval.Low, 6100, 1e-12)
	nearRel(t, "battery high", r.Interval.High, 10600, 1e-12)
	// the office row gives a low (the 2030 target) but no high: no range to read an interval from
	r = callIV(t, e, "building_embodied", map[string]string{"area": "5000", "unit": "m2", "building_type": "office"})
	if r.Interval != nil || !ivNote(r, "common/office/building_embodied") {
		t.Errorf("building_embodied: %+v, notes %q", r.Interval, r.Notes)
	}
}
