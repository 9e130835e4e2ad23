package funcs

import (
	"testing"
)

// TestBadInputs lists bad calls with the exact first line of their error:
// each names the argument and what would be accepted.
func TestBadInputs(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct {
		expr string
		code string
		want string
	}{
		{`fuel_co2("natral gas", 1, "TJ")`, CodeUnknownFuel, `fuel_co2: fuel: unknown fuel "natral gas": did you mean natural_gas? (character 10)`},
		{`fuel_co2("disel", 1, "L")`, CodeUnknownFuel, `fuel_co2: fuel: unknown fuel "disel": did you mean gas_diesel_oil? (character 10)`},
		{`fuel_co2("", 1, "L")`, CodeBadArgument, `fuel_co2: fuel: empty fuel: give a fuel id such as natural_gas or gas_diesel_oil (list: fluecell factors, or GET /v1/factors) (character 10)`},
		{`fuel_co2("natural_gas", 1, "ton")`, CodeUnit, `fuel_co2: unit: ambiguous unit "ton": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb) (character 28)`},
		{`fuel_co2("natural_gas", 1, "MT")`, CodeUnit, `fuel_co2: unit: ambiguous unit "MT": write t (tonne, 1000 kg) or Mt (megatonne, 1e9 kg) (character 28)`},
		{`fuel_co2("natural_gas", 1, "MBtu")`, CodeUnit, `fuel_co2: unit: ambiguous unit "MBtu": write kBtu (thousand Btu) or MMBtu (million Btu) (character 28)`},
		{`fuel_co2("natural_gas", 1, "kW")`, CodeUnit, `fuel_co2: unit "kW" is a power, but an energy, a mass or a volume is needed here (did you mean kWh?) (character 28)`},
		{`fuel_co2("natural_gas", 1, "kwhh")`, CodeUnit, `fuel_co2: unit: unknown unit "kwhh" (did you mean kWh?) (character 28)`},
		{`fuel_co2("diesel", 1, "L", "ipcc")`, CodeBadArgument, `fuel_co2: pack: unknown pack "ipcc": accepted are epa2025, ipcc2006 (character 28)`},
		{`fuel_co2("peat", 1, "gal")`, CodeMissingFactor, `fuel_co2: unit: pack ipcc2006 cannot turn volume into energy (NCV) for peat: it has no density for peat (its calorific value is per mass); add the missing row with --factors (see fluecell factors peat) (character 1)`},
		{`fuel_co2("HVO", 1, "t")`, CodeMissingFactor, `fuel_co2: fuel: pack ipcc2006 has no co2_ef for renewable_diesel (character 1)`},
		{`fuel_co2("DFO (bulk)", 1, "L")`, CodeUnknownFuel, `fuel_co2: fuel: unknown fuel "DFO (bulk)": accepted fuel ids are anthracite, aviation_gasoline, biodiesel, biogas, bitumen, blast_furnace_gas, coal_coke, coke_oven_gas, coking_coal, crude_oil, ethane, ethanol, gas_diesel_oil, jet_kerosene, landfill_gas, lignite, lpg, lubricants, motor_gasoline, municipal_solid_waste, naphtha, natural_gas, other_bituminous_coal, other_kerosene, other_petroleum_products, peat, petroleum_coke, plastics, propane, refinery_gas, renewable_diesel, residual_fuel_oil, sub_bituminous_coal, tires, waste_oil, wood (aliases: fluecell factors, or GET /v1/factors) (character 10)`},
		{`fuel_co2("SUN", 1, "t")`, CodeUnknownFuel, `fuel_co2: fuel: "SUN" (solar (US EIA code)) is not a fuel: fuel functions cover fuels burned on site; accepted fuel ids are anthracite, aviation_gasoline, biodiesel, biogas, bitumen, blast_furnace_gas, coal_coke, coke_oven_gas, coking_coal, crude_oil, ethane, ethanol, gas_diesel_oil, jet_kerosene, landfill_gas, lignite, lpg, lubricants, motor_gasoline, municipal_solid_waste, naphtha, natural_gas, other_bituminous_coal, other_kerosene, other_petroleum_products, peat, petroleum_coke, plastics, propane, refinery_gas, renewable_diesel, residual_fuel_oil, sub_bituminous_coal, tires, waste_oil, wood (character 10)`},
		{`fuel_co2("LNG", 1, "gal")`, CodeUnit, `fuel_co2: unit: fuel "LNG" (liquefied natural gas) is read as natural_gas only for amounts in energy or mass, not volume (common practice (a volume of LNG is liquid: the gas density does not apply)) (character 1)`},
		{`fuel_co2("lignite", 100, "m3")`, CodeMissingFactor, `fuel_co2: unit: pack ipcc2006 cannot turn volume into energy (NCV) for lignite: it has no density for lignite (its calorific value is per mass); add the missing row with --factors (see fluecell factors lignite) (character 1)`},
		{`fuel_co2("lignite", 100, "m3", "epa2025")`, CodeMissingFactor, `fuel_co2: unit: pack epa2025 cannot turn volume into energy (HHV) for lignite: it has no density for lignite (its calorific value is per mass); add the missing row with --factors (see fluecell factors lignite) (character 1)`},
		{`fuel_co2("diesel", 1, "t", "epa2025")`, CodeMissingFactor, `fuel_co2: unit: pack epa2025 cannot turn mass into energy (HHV) for gas_diesel_oil: it has no density for gas_diesel_oil (its calorific value is per volume); pack ipcc2006 has what this needs (character 1)`},
		{`fuel_energy("wood", 1, "GJ HHV")`, CodeMissingFactor, `fuel_energy: unit: pack ipcc2006 cannot turn energy (HHV) into energy (NCV) for wood: it has no NCV/GCV ratio for wood (fuel family: none) to convert HHV to NCV; add the missing row with --factors (see fluecell factors wood) (character 1)`},
		{`fuel_co2e("diesel", 1, "L", "ar7")`, CodeBadArgument, `fuel_co2e: gwp_set: unknown GWP set "ar7": accepted are ar4, ar5, ar6 (did you mean ar4?) (character 29)`},
		{`fuel_co2("diesel", "abc", "L")`, CodeCompile, `expr: fuel_co2: amount must be a number, not the string "abc" (character 20)`},
		{`fuel_co2(1, 2, "L")`, CodeCompile, `expr: fuel_co2: fuel must be a string (in double quotes), not a number (character 10)`},
		{`fuel_co2("diesel")`, CodeCompile, `expr: fuel_co2 takes 3 to 4 arguments, got 1: fuel_co2(fuel, amount, unit [, pack]) (character 1)`},
		{`ppm_from_gtc(1, 1.5)`, CodeBadArgument, `ppm_from_gtc: airborne_fraction: must lie in (0, 1], got 1.5 (the long-run observed value is about 0.44) (character 1)`},
		{`ppm_from_gtc(1, 0)`, CodeBadArgument, `ppm_from_gtc: airborne_fraction: must lie in (0, 1], got 0 (the long-run observed value is about 0.44) (character 1)`},
		{`ppm_from_co2(1, "GJ")`, CodeUnit, `ppm_from_co2: unit "GJ" is an energy, but a mass is needed here (character 17)`},
		{`gwp("sf7")`, CodeBadArgument, `gwp: gas: unknown gas "sf7" (did you mean SF6?): accepted are IPCC names (HFC-134a, SF6, c-C4F8) and ASHRAE refrigerant numbers (R-134a, R-410A); the doc of the gas parameter (fluecell functions gwp) lists every gas and blend (character 5)`},
		{`gwp("ch4_fossil", "ar4")`, CodeMissingFactor, `gwp: gwp_set: GWP set ar4 has no value for CH4 (fossil); sets with it: ar5, ar6 (character 1)`},
		{`lifecycle_intensity("solar")`, CodeBadArgument, `lifecycle_intensity: tech: ambiguous technology "solar": utility PV, rooftop PV or concentrating solar: write pv_utility, pv_rooftop or csp (character 21)`},
		{`lifecycle_intensity("gas-CT")`, CodeBadArgument, `lifecycle_intensity: tech: no life-cycle row for technology "gas-CT" (gas combustion turbine (simple cycle)), and no other technology stands in for it: accepted are biomass_dedicated, coal_pc, csp, gas_cc, geothermal, hydropower, nuclear, ocean, pv_rooftop, pv_utility, wind_offshore, wind_onshore (character 21)`},
		{`lifecycle_intensity("solar farm")`, CodeBadArgument, `lifecycle_intensity: tech: unknown technology "solar farm": accepted are biomass_dedicated, coal_pc, csp, gas_cc, geothermal, hydropower, nuclear, ocean, pv_rooftop, pv_utility, wind_offshore, wind_onshore (character 21)`},
		{`lifecycle_intensity("wind_onshre")`, CodeBadArgument, `lifecycle_intensity: tech: unknown technology "wind_onshre": did you mean wind_onshore? (accepted: biomass_dedicated, coal_pc, csp, gas_cc, geothermal, hydropower, nuclear, ocean, pv_rooftop, pv_utility, wind_offshore, wind_onshore) (character 21)`},
		{`lifecycle_intensity("coal_pc", "p95")`, CodeBadArgument, `lifecycle_intensity: stat: unknown statistic "p95": accepted are min, median, max (character 32)`},
		{`embodied_per_mw("nuclear", 0)`, CodeBadArgument, `embodied_per_mw: capacity_factor: must lie in (0, 1], got 0 (character 1)`},
		{`embodied_per_mw("nuclear", 1.2)`, CodeBadArgument, `embodied_per_mw: capacity_factor: must lie in (0, 1], got 1.2 (character 1)`},
		{`embodied_per_mw("nuclear", 0.9, -1)`, CodeBadArgument, `embodied_per_mw: lifetime_years: must lie in (0, 200] years, got -1 (character 1)`},
		{`embodied("wind_onshore", 10, "MWh")`, CodeUnit, `embodied: unit "MWh" is an energy, but a power is needed here (did you mean MW?) (character 30)`},
		{`to_unit(1, "GJ HHV", "GJ NCV")`, CodeUnit, `to_unit: to: cannot convert "GJ HHV" to "GJ NCV": converting between HHV and NCV depends on the fuel (use fuel_energy) (character 1)`},
		{`to_unit(1, "kg", "L")`, CodeUnit, `to_unit: to: cannot convert "kg" to "L": "kg" is a mass and "L" is a volume (character 1)`},
		{`1/0`, CodeArithmetic, `expr: division by zero (character 2)`},
		{`fuel_co2("diesel", 1, "L") / (2 - 2)`, CodeArithmetic, `expr: division by zero (character 28)`},
		{`5 % 0`, CodeArithmetic, `expr: division by zero (character 3)`},
		{`2**2000`, CodeArithmetic, `expr: the result is not a finite number (+Inf): check for overflow or an undefined operation`},
		{`fuel_co2("diesel", 1, "L") > 1`, CodeBadArgument, `expr: the expression gives a boolean (false), not a number: wrap it as cond ? a : b`},
		{`"abc"`, CodeBadArgument, `expr: the expression gives the string "abc", not a number`},
		{`x + 1`, CodeVariable, `expr: unknown variable "x"; no variables are given (character 1)`},
		{``, CodeCompile, `expr: empty expression: write one such as fuel_co2("natural_gas", 1000, "GJ")`},
	}
	for _, tt := range tests {
		t.Run(tt.expr, func(t *testing.T) {
			_, err := evalExpr(e, tt.expr)
			if err == nil {
				t.Fatalf("%s: no error", tt.expr)
			}
			fe, ok := AsError(err)
			if !ok {
				t.Fatalf("%s: error %T is not *Error: %v", tt.expr, err, err)
			}
			if fe.Code != tt.code {
				t.Errorf("code %q, want %q", fe.Code, tt.code)
			}
			if got := fe.Headline(); got != tt.want {
				t.Errorf("message\n got: %s\nwant: %s", got, tt.want)
			}
		})
	}
}

// evalExpr compiles src with no variables and evaluates it.
func evalExpr(e *Engine, src string) (Result, error) {
	p, err := e.Compile(src, WithVariables())
	if err != nil {
		return Result{}, err
	}
	return p.Eval(nil)
}

// TestCallErrors covers the named-argument path used by HTTP.
func TestCallErrors(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct {
		name string
		args map[string]string
		code string
		want string
	}{
		{"fuel_co3", nil, CodeUnknownFunction, `unknown function "fuel_co3" (did you mean fuel_co2?); functions are battery_embodied, building_embodied, carbon_from_co2, co2_from_carbon, electricity_co2, electricity_co2e, electricity_losses_co2e, embodied, embodied_per_mw, fuel_carbon, fuel_co2, fuel_co2e, fuel_energy, fugitive_co2e, gtc_from_ppm, gwp, heat_co2e, lifecycle_intensity, lifecycle_part, mobile_co2, mobile_co2e, ppm_from_co2, ppm_from_gtc, refrigerant_co2e, refrigerant_leak_rate, to_unit, vehicle_co2e, vehicle_embodied`},
		{"fuel_co2", map[string]string{"fuel": "diesel", "unit": "L"}, CodeBadArgument, `fuel_co2: amount: missing required parameter amount (number: quantity of fuel used)`},
		{"fuel_co2", map[string]string{"fuel": "diesel", "amount": "1,5", "unit": "L"}, CodeBadArgument, `fuel_co2: amount must be a number with "." as decimal separator, got "1,5"`},
		{"fuel_co2", map[string]string{"fuel": "diesel", "amount": "NaN", "unit": "L"}, CodeBadArgument, `fuel_co2: amount must be a number with "." as decimal separator, got "NaN"`},
		{"fuel_co2", map[string]string{"fuel": "diesel", "amount": "1e999", "unit": "L"}, CodeBadArgument, `fuel_co2: amount 1e999 is beyond the float64 range: give a number between -1.7976931348623157e308 and 1.7976931348623157e308`},
		{"fuel_co2", map[string]string{"fuel": "diesel", "amount": "1", "unit": "L", "amt": "2"}, CodeBadArgument, `fuel_co2: amt: unknown parameter "amt": fuel_co2 takes fuel, amount, unit, pack`},
		{"fuel_co2", map[string]string{"fuel": "diesel", "amount": "1e308", "unit": "t"}, CodeArithmetic, `fuel_co2: amount 1e+308 gives a result beyond the float64 range (+Inf): with the other arguments as given, amount must lie between -5.64e+303 and 5.64e+303`},
		{"ppm_from_gtc", map[string]string{"gtc": "1", "airborne_fraction": "-0.2"}, CodeBadArgument, `ppm_from_gtc: airborne_fraction: must lie in (0, 1], got -0.2 (the long-run observed value is about 0.44)`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := e.Call(tt.name, tt.args)
			fe, ok := AsError(err)
			if !ok {
				t.Fatalf("error %v is not *Error", err)
			}
			if fe.Code != tt.code {
				t.Errorf("code %q, want %q", fe.Code, tt.code)
			}
			if got := fe.Error(); got != tt.want {
				t.Errorf("message\n got: %s\nwant: %s", got, tt.want)
			}
		})
	}
}
