package funcs

import (
	"strings"
	"testing"
)

// distanceReference is every row of data/vehicle_distance.csv with the figure its table prints.
// epa2021: US EPA GHG Emission Factors Hub, edition last modified 15 September 2021, read in the
// Hub workbook (copy kept by the Metropolitan Council, ghg-cprg _meta/data-raw). uk2024: UK
// Government GHG conversion factors for company reporting 2024, from memory, two significant
// figures.
var distanceReference = []struct {
	id, quantity string
	value        float64
	unit, table  string
}{
	{"epa2021_us_passenger_car", "co2_per_distance", 0.341, "kg CO2/mi", "EPA Hub 2021 Table 10, Passenger Car, CO2 kg/vehicle-mile"},
	{"epa2021_us_passenger_car", "ch4_per_distance", 0.009, "g CH4/mi", "EPA Hub 2021 Table 10, Passenger Car, CH4 g/vehicle-mile"},
	{"epa2021_us_passenger_car", "n2o_per_distance", 0.008, "g N2O/mi", "EPA Hub 2021 Table 10, Passenger Car, N2O g/vehicle-mile"},
	{"epa2021_us_light_duty_truck", "co2_per_distance", 0.464, "kg CO2/mi", "EPA Hub 2021 Table 10, Light-Duty Truck"},
	{"epa2021_us_light_duty_truck", "ch4_per_distance", 0.012, "g CH4/mi", "EPA Hub 2021 Table 10, Light-Duty Truck"},
	{"epa2021_us_light_duty_truck", "n2o_per_distance", 0.01, "g N2O/mi", "EPA Hub 2021 Table 10, Light-Duty Truck"},
	{"epa2021_us_motorcycle", "co2_per_distance", 0.189, "kg CO2/mi", "EPA Hub 2021 Table 10, Motorcycle"},
	{"epa2021_us_motorcycle", "ch4_per_distance", 0.07, "g CH4/mi", "EPA Hub 2021 Table 10, Motorcycle"},
	{"epa2021_us_motorcycle", "n2o_per_distance", 0.007, "g N2O/mi", "EPA Hub 2021 Table 10, Motorcycle"},
	{"epa2021_us_medium_heavy_truck", "co2_per_distance", 1.407, "kg CO2/mi", "EPA Hub 2021 Table 8, Medium- and Heavy-Duty Truck, vehicle-mile"},
	{"epa2021_us_medium_heavy_truck", "ch4_per_distance", 0.013, "g CH4/mi", "EPA Hub 2021 Table 8, Medium- and Heavy-Duty Truck, vehicle-mile"},
	{"epa2021_us_medium_heavy_truck", "n2o_per_distance", 0.033, "g N2O/mi", "EPA Hub 2021 Table 8, Medium- and Heavy-Duty Truck, vehicle-mile"},
	{"uk2024_car_petrol_small", "co2e_per_distance", 0.14, "kg CO2e/km", "UK 2024 Cars (by size), Small car, Petrol (from memory)"},
	{"uk2024_car_petrol_medium", "co2e_per_distance", 0.18, "kg CO2e/km", "UK 2024 Cars (by size), Medium car, Petrol (from memory)"},
	{"uk2024_car_petrol_large", "co2e_per_distance", 0.27, "kg CO2e/km", "UK 2024 Cars (by size), Large car, Petrol (from memory)"},
	{"uk2024_car_petrol_average", "co2e_per_distance", 0.16, "kg CO2e/km", "UK 2024 Cars (by size), Average car, Petrol (from memory)"},
	{"uk2024_car_diesel_small", "co2e_per_distance", 0.14, "kg CO2e/km", "UK 2024 Cars (by size), Small car, Diesel (from memory)"},
	{"uk2024_car_diesel_medium", "co2e_per_distance", 0.17, "kg CO2e/km", "UK 2024 Cars (by size), Medium car, Diesel (from memory)"},
	{"uk2024_car_diesel_large", "co2e_per_distance", 0.21, "kg CO2e/km", "UK 2024 Cars (by size), Large car, Diesel (from memory)"},
	{"uk2024_car_diesel_average", "co2e_per_distance", 0.17, "kg CO2e/km", "UK 2024 Cars (by size), Average car, Diesel (from memory)"},
	{"uk2024_car_hybrid_average", "co2e_per_distance", 0.12, "kg CO2e/km", "UK 2024 Cars (by size), Average car, Hybrid (from memory)"},
	{"uk2024_car_bev_small", "co2e_per_distance", 0, "kg CO2e/km", "UK 2024 Cars (by size), Small car, Battery Electric Vehicle: zero tailpipe"},
	{"uk2024_car_bev_medium", "co2e_per_distance", 0, "kg CO2e/km", "UK 2024 Cars (by size), Medium car, Battery Electric Vehicle: zero tailpipe"},
	{"uk2024_car_bev_large", "co2e_per_distance", 0, "kg CO2e/km", "UK 2024 Cars (by size), Large car, Battery Electric Vehicle: zero tailpipe"},
	{"uk2024_car_bev_average", "co2e_per_distance", 0, "kg CO2e/km", "UK 2024 Cars (by size), Average car, Battery Electric Vehicle: zero tailpipe"},
	{"uk2024_motorcycle_small", "co2e_per_distance", 0.083, "kg CO2e/km", "UK 2024 Motorbike, Small (from memory)"},
	{"uk2024_motorcycle_medium", "co2e_per_distance", 0.1, "kg CO2e/km", "UK 2024 Motorbike, Medium (from memory)"},
	{"uk2024_motorcycle_large", "co2e_per_distance", 0.13, "kg CO2e/km", "UK 2024 Motorbike, Large (from memory)"},
	{"uk2024_motorcycle_average", "co2e_per_distance", 0.11, "kg CO2e/km", "UK 2024 Motorbike, Average (from memory)"},
	{"uk2024_van_diesel_class1", "co2e_per_distance", 0.15, "kg CO2e/km", "UK 2024 Vans, Class I (up to 1.305 t), Diesel (from memory)"},
	{"uk2024_van_diesel_class2", "co2e_per_distance", 0.19, "kg CO2e/km", "UK 2024 Vans, Class II (1.305 to 1.74 t), Diesel (from memory)"},
	{"uk2024_van_diesel_class3", "co2e_per_distance", 0.27, "kg CO2e/km", "UK 2024 Vans, Class III (1.74 to 3.5 t), Diesel (from memory)"},
	{"uk2024_van_diesel_average", "co2e_per_distance", 0.25, "kg CO2e/km", "UK 2024 Vans, Average (up to 3.5 t), Diesel (from memory)"},
	{"uk2024_van_bev_average", "co2e_per_distance", 0, "kg CO2e/km", "UK 2024 Vans, Average (up to 3.5 t), Battery Electric Vehicle: zero tailpipe"},
}

// TestVehicleDistanceRows checks every distance row against its table, and that no row is
// without a check here; a row of the uk2024 set says from memory, one of epa2021 does not.
func TestVehicleDistanceRows(t *testing.T) {
	e := newTestEngine(t)
	checked := map[string]bool{}
	for _, r := range distanceReference {
		f := e.packs.lookup(CommonPack, r.id, r.quantity)
		if f == nil {
			t.Errorf("%s/%s missing (%s)", r.id, r.quantity, r.table)
			continue
		}
		checked[f.Key()] = true
		if f.Value != r.value || f.Unit != r.unit {
			t.Errorf("%s/%s = %v %s, %s prints %v %s", r.id, r.quantity, f.Value, f.Unit, r.table, r.value, r.unit)
		}
		if f.FromMemory != strings.HasPrefix(r.id, "uk2024_") {
			t.Errorf("%s/%s: from_memory %v", r.id, r.quantity, f.FromMemory)
		}
	}
	for k, f := range e.packs.packs[CommonPack].rows {
		if _, ok := distanceQuantities()[k.quantity]; ok && !checked[f.Key()] {
			t.Errorf("%s has no reference check", f.Key())
		}
	}
}

// TestVehicleCO2eWorked works examples by hand.
func TestVehicleCO2eWorked(t *testing.T) {
	e := newTestEngine(t)
	for _, tt := range []struct {
		expr string
		want float64
		why  string
	}{
		// 1000 km x 0.18 kg CO2e/km = 180 kg (UK 2024 Medium car, Petrol; from memory)
		{`vehicle_co2e(1000, "km", "Medium petrol car")`, 0.18, "UK 2024 Cars (by size)"},
		// 1000 mi x (0.341 kg CO2 + 0.009 g CH4 x 28 + 0.008 g N2O x 265) = 341 + 0.252 + 2.12 kg
		// (EPA Hub 2021 Table 10, Passenger Car; AR5 WG1 Ch 8 Table 8.A.1)
		{`vehicle_co2e(1000, "mi", "Passenger Car")`, 0.343372, "EPA Hub 2021 Table 10"},
		// the Hub's own GWPs (AR4: 25, 298): 341 + 0.225 + 2.384 kg
		{`vehicle_co2e(1000, "mi", "us_passenger_car", "ar4")`, 0.343609, "EPA Hub 2021 Table 10, AR4"},
		// 500 mi x (1.407 kg + 0.013 g x 27.9 + 0.033 g x 273) = 703.5 + 0.18135 + 4.5045 kg (AR6 WG1 Ch 7)
		{`vehicle_co2e(500, "mi", "us_medium_heavy_truck", "ar6")`, 0.70818585, "EPA Hub 2021 Table 8"},
		// 2000 km in a Class II diesel van x 0.19 kg/km = 380 kg
		{`vehicle_co2e(2000, "km", "Diesel van (Class II)")`, 0.38, "UK 2024 Vans"},
	} {
		r := call(t, e, tt.expr)
		if !near(r.Value, tt.want, 1e-12) || r.Unit != "t CO2e" {
			t.Errorf("%s = %v %s, want %v t CO2e (%s)", tt.expr, r.Value, r.Unit, tt.want, tt.why)
		}
	}
}

// TestVehicleCO2eMilesAndKm: a mile is 1.609344 km exactly (NIST SP 811), whichever basis the
// set prints.
func TestVehicleCO2eMilesAndKm(t *testing.T) {
	e := newTestEngine(t)
	for _, v := range []string{"us_passenger_car", "us_motorcycle", "car_diesel_large", "van_diesel_average"} {
		mi := call(t, e, `vehicle_co2e(250, "mi", "`+v+`")`)
		km := call(t, e, `vehicle_co2e(402.336, "km", "`+v+`")`)
		if !near(mi.Value, km.Value, 1e-12) || mi.Value <= 0 {
			t.Errorf("%s: 250 mi %v, 402.336 km %v", v, mi.Value, km.Value)
		}
	}
}

// TestVehicleCO2eNotes: the result names the set, the vehicle and the basis; a battery-electric
// vehicle says where its electricity goes.
func TestVehicleCO2eNotes(t *testing.T) {
	e := newTestEngine(t)
	r := call(t, e, `vehicle_co2e(100, "mi", "Light-Duty Truck")`)
	if !hasNote(r, `vehicle "Light-Duty Truck" read as us_light_duty_truck (US EPA GHG Emission Factors Hub Table 10 (Light-Duty Truck))`) ||
		!strings.Contains(strings.Join(r.Notes, "|"), "set epa2021 (US EPA GHG Emission Factors Hub (15 September 2021)") ||
		!strings.Contains(strings.Join(r.Notes, "|"), "vehicle us_light_duty_truck, per vehicle-mile") {
		t.Errorf("notes %q", r.Notes)
	}
	b := call(t, e, `vehicle_co2e(100, "km", "car_bev_medium")`)
	if b.Value != 0 || !hasNote(b, "battery-electric: no tailpipe emissions; the electricity it uses is Scope 2, computed with electricity_co2e") ||
		!strings.Contains(strings.Join(b.Notes, "|"), "per vehicle-km") {
		t.Errorf("bev: %v %q", b.Value, b.Notes)
	}
}

// TestResolveVehicle reads names as tables and fleet lists write them.
func TestResolveVehicle(t *testing.T) {
	e := newTestEngine(t)
	for name, want := range map[string]string{
		"Medium petrol car": "car_petrol_medium", "car_petrol_medium": "car_petrol_medium", "Petrol car, medium": "car_petrol_medium",
		"Large diesel car": "car_diesel_large", "Diesel car": "car_diesel_average", "Gasoline car small": "car_petrol_small",
		"Hybrid car": "car_hybrid_average", "Battery electric car (small)": "car_bev_small", "BEV medium car": "car_bev_medium",
		"Diesel van (Class II)": "van_diesel_class2", "Van diesel class 3": "van_diesel_class3", "Diesel van": "van_diesel_average",
		"Electric van": "van_bev_average", "Motorbike": "motorcycle_average", "Small motorbike": "motorcycle_small",
		"Passenger Car": "us_passenger_car", "Light-Duty Truck": "us_light_duty_truck", "Motorcycle": "us_motorcycle",
		"Medium- and Heavy-Duty Truck": "us_medium_heavy_truck", "SUV": "us_passenger_car",
	} {
		v, err := e.ResolveVehicle(name)
		if err != nil || v.ID != want {
			t.Errorf("%q -> %q, %v; want %s", name, v.ID, err, want)
		}
	}
	v, _ := e.ResolveVehicle("us_passenger_car")
	if v.Set != "epa2021" || v.Basis != "vehicle-mile" || v.Alias || v.Note != "" {
		t.Errorf("us_passenger_car: %+v", v)
	}
	v, _ = e.ResolveVehicle("Medium petrol car")
	if v.Set != "uk2024" || v.Basis != "vehicle-km" || !v.Alias {
		t.Errorf("Medium petrol car: %+v", v)
	}
	for name, want := range map[string]string{
		"car":                       `vehicle: ambiguous vehicle "car": petrol, diesel, hybrid or battery-electric, and which table: write e.g. car_petrol_average (UK, per km) or us_passenger_car (US, per mile)`,
		"bus":                       `vehicle: ambiguous vehicle "bus": the tables give buses per passenger-mile or passenger-km, not per vehicle distance: no distance row for a bus`,
		"car_petrl_medium":          `vehicle: unknown vehicle "car_petrl_medium": did you mean car_petrol_medium? (accepted: ` + strings.Join(e.vehNames.ids, ", ") + ")",
		"hovercraft":                `vehicle: unknown vehicle "hovercraft": accepted are ` + strings.Join(e.vehNames.ids, ", "),
		strings.Repeat("car ", 100): `vehicle: unknown vehicle ` + quote(strings.Repeat("car ", 100)) + `: accepted are ` + strings.Join(e.vehNames.ids, ", "),
	} {
		_, err := e.ResolveVehicle(name)
		fe, ok := AsError(err)
		if !ok || fe.Param != "vehicle" || fe.Code != CodeBadArgument || fe.Error() != want {
			t.Errorf("%q:\n got: %v\nwant: %s", name, err, want)
		}
	}
}

// TestVehicleCO2eBadInputs lists bad calls with the first line of their error.
func TestVehicleCO2eBadInputs(t *testing.T) {
	e := newTestEngine(t)
	for _, tt := range []struct{ expr, code, want string }{
		{`vehicle_co2e(100, "L", "car_petrol_medium")`, CodeUnit, `vehicle_co2e: unit "L" is a volume, but a length is needed here: give the distance driven in km or mi; for an amount of fuel burned use mobile_co2e(fuel, amount, unit, mode) (character 19)`},
		{`vehicle_co2e(100, "kWh", "car_bev_medium")`, CodeUnit, `vehicle_co2e: unit "kWh" is an energy, but a length is needed here: give the distance driven in km or mi; for an amount of fuel burned use mobile_co2e(fuel, amount, unit, mode) (character 19)`},
		{`vehicle_co2e(100, "km", "Petrol car XL")`, CodeBadArgument, `vehicle_co2e: vehicle: unknown vehicle "Petrol car XL": accepted are ` + strings.Join(e.vehNames.ids, ", ") + ` (character 25)`},
		{`vehicle_co2e(100, "km", "car_petrol_medium", "ar6")`, CodeBadArgument, `vehicle_co2e: gwp_set: set uk2024 publishes CO2e only, weighted with ar5 GWPs, so it cannot be reweighted with ar6: leave gwp_set out or give ar5 (character 1)`},
		{`vehicle_co2e(100, "km", "car_petrol_medium", "ar5", "epa2021")`, CodeBadArgument, `vehicle_co2e: set: the table of epa2021 has no row for car_petrol_medium, which is in set uk2024: leave set out or choose a vehicle of epa2021 (us_light_duty_truck, us_medium_heavy_truck, us_motorcycle, us_passenger_car) (character 1)`},
		{`vehicle_co2e(100, "km", "us_passenger_car", "ar5", "epa2025")`, CodeBadArgument, `vehicle_co2e: set: unknown set "epa2025": accepted are epa2021, uk2024 (did you mean epa2021?) (character 52)`},
		{`vehicle_co2e(100, "km", "us_passenger_car", "ar7")`, CodeBadArgument, `vehicle_co2e: gwp_set: unknown GWP set "ar7": accepted are ar4, ar5, ar6 (did you mean ar4?) (character 45)`},
	} {
		_, err := evalExpr(e, tt.expr)
		fe, ok := AsError(err)
		if !ok {
			t.Errorf("%s: %v", tt.expr, err)
			continue
		}
		if fe.Code != tt.code || fe.Headline() != tt.want {
			t.Errorf("%s: code %s\n got: %s\nwant: %s", tt.expr, fe.Code, fe.Headline(), tt.want)
		}
	}
	if r := call(t, e, `vehicle_co2e(-10, "km", "car_petrol_medium")`); !near(r.Value, -0.0018, 1e-12) || !hasNote(r, NegativeAmountNote) {
		t.Errorf("negative distance: %v %q", r.Value, r.Notes)
	}
	// a compatible set and GWP set are accepted
	if r := call(t, e, `vehicle_co2e(100, "km", "car_petrol_medium", "AR5", "UK2024")`); !near(r.Value, 0.018, 1e-12) {
		t.Errorf("explicit set: %v", r.Value)
	}
}

// TestVehicleNamesFile: the vocabulary loader refuses rows without a source or with a
// from_memory flag its source contradicts.
func TestVehicleNamesFile(t *testing.T) {
	for data, want := range map[string]string{
		"name,kind,vehicle\n": "f:1: header must be name,kind,vehicle,description,source,from_memory",
		"name,kind,vehicle,description,source,from_memory\nvan,alias,van_diesel_average,x,,false\n":                      "f:2: column source: empty source: every row names its publication and table, or says common practice",
		"name,kind,vehicle,description,source,from_memory\nvan,alias,van_diesel_average,x,a table (from memory),false\n": `f:2: column from_memory: from_memory is "false": a source says "from memory" exactly when from_memory is true`,
		"name,kind,vehicle,description,source,from_memory\nvan,typo,van_diesel_average,x,common practice,false\n":        `f:2: column kind: kind "typo": accepted are alias, word, ambiguous`,
	} {
		_, err := parseVehicleNames([]byte(data), "f")
		if err == nil || err.Error() != want {
			t.Errorf("%q: %v, want %s", data, err, want)
		}
	}
}
