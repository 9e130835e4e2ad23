package funcs

import (
	"strings"
	"testing"
)

// TestLifecyclePartsReference checks the parts against IPCC AR5 WG3 Annex III
// Table A.III.2 (columns: direct emissions, infrastructure & supply chain
// emissions, biogenic CO2 emissions and albedo effect, methane emissions,
// life-cycle emissions; min/median/max in g CO2eq/kWh). The breakdown columns are
// from memory (see data/buildout.csv).
func TestLifecyclePartsReference(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct {
		expr string
		want float64
	}{
		// Table A.III.2, Coal—PC: infrastructure & supply chain 9.6/12/14; direct 670/760/870; life-cycle 740/820/910
		{`lifecycle_part("coal_pc", "infrastructure")`, 12},
		{`lifecycle_part("coal_pc", "infrastructure", "min")`, 9.6},
		{`lifecycle_part("coal_pc", "infrastructure", "max")`, 14},
		{`lifecycle_part("coal_pc", "direct")`, 760},
		{`lifecycle_part("coal_pc", "direct", "min")`, 670},
		{`lifecycle_part("coal_pc", "total", "max")`, 910},
		{`lifecycle_part("coal_pc", "biogenic_albedo")`, 0},
		// Table A.III.2, Gas—Combined Cycle: infrastructure & supply chain 1.6/1.7/1.9; direct 350/370/490
		{`lifecycle_part("gas_cc", "infrastructure")`, 1.7},
		{`lifecycle_part("gas_cc", "infrastructure", "max")`, 1.9},
		{`lifecycle_part("gas_cc", "direct", "max")`, 490},
		// Table A.III.2, Hydropower: infrastructure 1.0/6.2/11; biogenic CO2 and albedo 0/18/2200; life-cycle 1/24/2200
		{`lifecycle_part("hydropower", "infrastructure")`, 6.2},
		{`lifecycle_part("hydropower", "biogenic_albedo", "max")`, 2200},
		{`lifecycle_part("hydropower", "direct")`, 0},
		{`lifecycle_part("hydropower", "total")`, 24},
		// Table A.III.2, Nuclear: infrastructure & supply chain 3.7/12/110, nothing else
		{`lifecycle_part("nuclear", "infrastructure", "max")`, 110},
		{`lifecycle_part("nuclear", "methane")`, 0},
		// Table A.III.2, Solar PV—utility 18/48/180; Wind onshore 7.0/11/56; Ocean 5.6/17/28
		{`lifecycle_part("pv_utility", "infrastructure", "min")`, 18},
		{`lifecycle_part("wind_onshore", "infrastructure", "max")`, 56},
		{`lifecycle_part("ocean", "infrastructure")`, 17},
		// names from the technology vocabulary work here too
		{`lifecycle_part("NGCC", "infrastructure")`, 1.7},
	}
	for _, tt := range tests {
		r, err := evalExpr(e, tt.expr)
		if err != nil {
			t.Errorf("%s: %v", tt.expr, err)
			continue
		}
		if !near(r.Value, tt.want, 1e-12) {
			t.Errorf("%s = %v, want %v (IPCC AR5 WG3 Annex III Table A.III.2)", tt.expr, r.Value, tt.want)
		}
	}
}

// TestLifecyclePartsAddUp: where Table A.III.2 gives no direct, biogenic or
// methane emissions, the infrastructure column is the whole life-cycle column,
// bound for bound; where it gives them, no part exceeds the total.
func TestLifecyclePartsAddUp(t *testing.T) {
	e := newTestEngine(t)
	for _, tech := range e.technologies() {
		total := e.packs.lookup(CommonPack, tech, "lifecycle")
		infra := e.packs.lookup(CommonPack, tech, "infrastructure")
		if infra == nil {
			if tech != "biomass_dedicated" {
				t.Errorf("%s: no infrastructure row", tech)
			}
			continue
		}
		others := 0.0
		complete := true
		for _, q := range []string{"direct", "biogenic_albedo", "methane"} {
			f := e.packs.lookup(CommonPack, tech, q)
			if f == nil {
				complete = false
				continue
			}
			others += f.Value
			if f.Value > total.Value {
				t.Errorf("%s: %s %v exceeds the life-cycle median %v", tech, q, f.Value, total.Value)
			}
		}
		if infra.Value > total.Value || *infra.High > *total.High {
			t.Errorf("%s: infrastructure %v (max %v) exceeds the life-cycle %v (max %v)", tech, infra.Value, *infra.High, total.Value, *total.High)
		}
		if complete && others == 0 && (infra.Value != total.Value || *infra.Low != *total.Low || *infra.High != *total.High) {
			t.Errorf("%s: nothing but infrastructure, yet %v (%v-%v) differs from the life-cycle %v (%v-%v)",
				tech, infra.Value, *infra.Low, *infra.High, total.Value, *total.Low, *total.High)
		}
	}
}

// TestEmbodiedWorkedExample: 100 MW of onshore wind at capacity factor 0.3 for 25
// years, by hand from the infrastructure & supply-chain column of IPCC AR5 WG3
// Annex III Table A.III.2 (wind onshore 7.0/11/56 g CO2eq/kWh):
// 11 g/kWh x 100 000 kW x 0.3 x 8760 h x 25 yr = 7.227e10 g = 72 270 t CO2e.
func TestEmbodiedWorkedExample(t *testing.T) {
	e := newTestEngine(t)
	for _, tt := range []struct {
		expr string
		want float64
	}{
		{`embodied("wind_onshore", 100, "MW", 0.3, 25)`, 72270},
		{`embodied("wind_onshore", 100, "MW", 0.3, 25, "min")`, 7.0 * 100000 * 0.3 * 8760 * 25 / 1e6},
		{`embodied("wind_onshore", 100, "MW", 0.3, 25, "max")`, 56.0 * 100000 * 0.3 * 8760 * 25 / 1e6},
		// a coal plant's embodied emissions are its infrastructure (12 g/kWh), not
		// life-cycle minus direct (820 - 760 = 60 g/kWh, mostly mine methane)
		{`embodied("coal_pc", 1, "GW", 0.8, 40)`, 12.0 * 1e6 * 0.8 * 8760 * 40 / 1e6},
		{`embodied_per_mw("gas_cc", 0.5, 30, "max")`, 1.9 * 1000 * 0.5 * 8760 * 30 / 1e6},
	} {
		r, err := evalExpr(e, tt.expr)
		if err != nil {
			t.Errorf("%s: %v", tt.expr, err)
			continue
		}
		if !near(r.Value, tt.want, 1e-12) {
			t.Errorf("%s = %v, want %v", tt.expr, r.Value, tt.want)
		}
	}
	r := call(t, e, `embodied("coal_pc", 1, "GW", 0.8, 40)`)
	if !hasNote(r, "fuel-supply methane are not embodied") || len(r.Sources) == 0 || r.Sources[0].Key() != "common/coal_pc/infrastructure" {
		t.Errorf("coal notes %q, sources %v", r.Notes, r.FactorKeys())
	}
}

// TestVehicleEmbodied: production of cars and batteries, by hand from the rows
// of data/buildout.csv (battery: IVL report C444, 61-106 kg CO2e per kWh).
func TestVehicleEmbodied(t *testing.T) {
	e := newTestEngine(t)
	for _, tt := range []struct {
		expr string
		want float64
	}{
		// 10 x (6.5 t + 60 kWh x 83.5 kg/kWh) = 10 x 11.51 t
		{`vehicle_embodied(10, "car_medium_bev", 60)`, 115.1},
		{`vehicle_embodied(10, "car_medium_bev")`, 115.1}, // the class's usual 60 kWh
		{`vehicle_embodied(1, "Car Medium BEV", 75)`, 6.5 + 75*0.0835},
		// min: 5 t + 60 kWh x 61 kg/kWh; max: 8.5 t + 60 kWh x 106 kg/kWh (IVL C444 range)
		{`vehicle_embodied(1, "car_medium_bev", 60, "min")`, 5 + 60*0.061},
		{`vehicle_embodied(1, "car_medium_bev", 60, "max")`, 8.5 + 60*0.106},
		{`vehicle_embodied(1000, "car_medium_ice")`, 7000},
		{`vehicle_embodied(1000, "car_medium_ice", 0)`, 7000},
		{`vehicle_embodied(2, "car_small_hev")`, 2 * (6 + 1*0.0835)},
		{`vehicle_embodied(0, "car_large_phev")`, 0},
		// IVL report C444: 61-106 kg CO2e per kWh of NMC battery capacity
		{`battery_embodied(1, "kWh", "min") * 1000`, 61},
		{`battery_embodied(1, "kWh", "max") * 1000`, 106},
		{`battery_embodied(100, "MWh")`, 8350},
	} {
		r, err := evalExpr(e, tt.expr)
		if err != nil {
			t.Errorf("%s: %v", tt.expr, err)
			continue
		}
		if !near(r.Value, tt.want, 1e-12) {
			t.Errorf("%s = %v, want %v", tt.expr, r.Value, tt.want)
		}
	}
	r := call(t, e, `vehicle_embodied(3, "car_large_bev")`)
	if !hasNote(r, "battery 85 kWh is the usual capacity of car_large_bev") || !hasNote(r, "production only") {
		t.Errorf("notes %q", r.Notes)
	}
	if got := strings.Join(r.FactorKeys(), " "); got != "common/car_large_bev/vehicle_production common/car_large_bev/battery_capacity common/li_ion/battery_production" {
		t.Errorf("sources %s", got)
	}
}

func TestBuildoutBadInputs(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct {
		expr, code, want string
	}{
		{`lifecycle_part("coal_pc", "fuel")`, CodeBadArgument, `lifecycle_part: part: unknown part "fuel": accepted are direct, infrastructure, biogenic_albedo, methane, total (character 27)`},
		{`lifecycle_part("coal_pc", "methane")`, CodeMissingFactor, `lifecycle_part: part: the common pack has no methane part for coal_pc (IPCC AR5 WG3 Annex III Table A.III.2); add the row with --factors, or use lifecycle_intensity for the total (character 1)`},
		{`lifecycle_part("coal_pc", "direct", "p5")`, CodeBadArgument, `lifecycle_part: stat: unknown statistic "p5": accepted are min, median, max (character 37)`},
		{`embodied("biomass_dedicated", 10, "MW")`, CodeMissingFactor, `embodied: tech: no infrastructure & supply-chain intensity for biomass_dedicated in the common pack (IPCC AR5 WG3 Annex III Table A.III.2 gives none here): its life-cycle intensity (lifecycle_intensity) mixes in fuel supply, so it is not used as embodied; add an infrastructure row with --factors (character 1)`},
		{`embodied("wind_onshore", 10, "MW", 0.3, 25, "mean")`, CodeBadArgument, `embodied: stat: unknown statistic "mean": accepted are min, median, max (character 45)`},
		{`vehicle_embodied(1, "car_medum_bev")`, CodeBadArgument, `vehicle_embodied: vehicle: unknown vehicle class "car_medum_bev": did you mean car_medium_bev? (accepted: car_large_bev, car_large_hev, car_large_ice, car_large_phev, car_medium_bev, car_medium_hev, car_medium_ice, car_medium_phev, car_small_bev, car_small_hev, car_small_ice, car_small_phev) (character 21)`},
		{`vehicle_embodied(1, "bus")`, CodeBadArgument, `vehicle_embodied: vehicle: unknown vehicle class "bus": accepted are car_large_bev, car_large_hev, car_large_ice, car_large_phev, car_medium_bev, car_medium_hev, car_medium_ice, car_medium_phev, car_small_bev, car_small_hev, car_small_ice, car_small_phev (character 21)`},
		{`vehicle_embodied(-2, "car_small_ice")`, CodeBadArgument, `vehicle_embodied: count: must not be negative, got -2 (character 1)`},
		{`vehicle_embodied(1, "car_small_ice", 40)`, CodeBadArgument, `vehicle_embodied: battery_kwh: car_small_ice has no traction battery: leave battery_kwh out or give 0, or choose a hybrid, plug-in or battery-electric class (character 1)`},
		{`vehicle_embodied(1, "car_small_bev", -40)`, CodeBadArgument, `vehicle_embodied: battery_kwh: must lie in [0, 10000] kWh, got -40 (character 1)`},
		{`battery_embodied(10, "MW")`, CodeUnit, `battery_embodied: unit "MW" is a power, but an energy is needed here (did you mean MWh?) (character 22)`},
		{`battery_embodied(-10, "MWh")`, CodeBadArgument, `battery_embodied: capacity: must not be negative, got -10 (character 1)`},
	}
	for _, tt := range tests {
		_, err := evalExpr(e, tt.expr)
		fe, ok := AsError(err)
		if !ok {
			t.Errorf("%s: error %v is not *Error", tt.expr, err)
			continue
		}
		if fe.Code != tt.code || fe.Headline() != tt.want {
			t.Errorf("%s:\n got: %s %s\nwant: %s %s", tt.expr, fe.Code, fe.Headline(), tt.code, tt.want)
		}
	}
}

// TestBuildingEmbodied: floor area x kg CO2e per m2, by hand from RIBA 2030
// Climate Challenge version 2 (2021), embodied carbon targets (business as
// usual domestic 1200, office 1400, school 1000; 2030 targets 625, 750, 540
// kg CO2e/m2; from memory).
func TestBuildingEmbodied(t *testing.T) {
	e := newTestEngine(t)
	for _, tt := range []struct {
		expr string
		want float64
	}{
		{`building_embodied(5000, "m2", "office")`, 7000},              // 5000 m2 x 1400 kg/m2
		{`building_embodied(5000, "m2", "office", "min")`, 3750},       // 5000 m2 x 750 kg/m2
		{`building_embodied(120, "m2", "residential")`, 144},           // one 120 m2 home x 1200 kg/m2
		{`building_embodied(1, "ha", "School")`, 10000},                // 10 000 m2 x 1000 kg/m2
		{`building_embodied(10000, "ft2", "residential")`, 1114.83648}, // 929.0304 m2 x 1200 kg/m2
	} {
		r, err := evalExpr(e, tt.expr)
		if err != nil {
			t.Errorf("%s: %v", tt.expr, err)
			continue
		}
		if !near(r.Value, tt.want, 1e-12) {
			t.Errorf("%s = %v, want %v", tt.expr, r.Value, tt.want)
		}
	}
	r := call(t, e, `building_embodied(100, "m2", "school", "min")`)
	if !hasNote(r, "2030 target") {
		t.Errorf("notes %q", r.Notes)
	}
	for _, tt := range []struct{ expr, code, want string }{
		{`building_embodied(100, "m2", "warehouse")`, CodeBadArgument, `building_embodied: building_type: unknown building type "warehouse": accepted are office, residential, school (character 30)`},
		{`building_embodied(100, "m3", "office")`, CodeUnit, `building_embodied: unit "m3" is a volume, but an area is needed here (character 24)`},
		{`building_embodied(-5, "m2", "office")`, CodeBadArgument, `building_embodied: area: must not be negative, got -5 (character 1)`},
		{`building_embodied(100, "m2", "office", "max")`, CodeMissingFactor, `building_embodied: stat: no published maximum for office (character 1)`},
	} {
		_, err := evalExpr(e, tt.expr)
		fe, ok := AsError(err)
		if !ok || fe.Code != tt.code || fe.Headline() != tt.want {
			t.Errorf("%s:\n got: %v\nwant: %s %s", tt.expr, err, tt.code, tt.want)
		}
	}
}
