package funcs

import (
	"github.com/fluecell/fluecell/funcs/units"
)

// Build-outs: what building something puts into the atmosphere before it runs.
// Power plants by technology (life-cycle intensities and their published parts),
// passenger cars with their traction batteries, and stationary batteries. Every
// figure is a screening estimate from published life-cycle studies, with the
// published range kept so that a plan's total can carry one (stat = min, max).

// buildoutQuantities are the quantities of data/buildout.csv.
func buildoutQuantities() map[string]quantitySpec {
	perKWh := quantitySpec{numDim: units.Mass, species: "CO2e", den: []units.Dimension{units.Energy}, perOutput: true}
	part := func(doc string) quantitySpec { s := perKWh; s.doc = doc; return s }
	return map[string]quantitySpec{
		"infrastructure":     part("infrastructure & supply-chain part of a life-cycle intensity, e.g. g CO2e/kWh"),
		"biogenic_albedo":    part("biogenic CO2 and albedo part of a life-cycle intensity, e.g. g CO2e/kWh"),
		"methane":            part("methane part of a life-cycle intensity, e.g. g CO2e/kWh"),
		"battery_production": part("emissions of producing a battery per kWh of capacity, e.g. kg CO2e/kWh"),
		"vehicle_production": {numDim: units.Mass, species: "CO2e", doc: "emissions of producing one vehicle without its traction battery, e.g. t CO2e"},
		"battery_capacity":   {numDim: units.Energy, doc: "usual traction battery capacity of a vehicle class, e.g. kWh"},
		"building_embodied":  {numDim: units.Mass, species: "CO2e", den: []units.Dimension{units.Area}, doc: "embodied emissions of a building per floor area, e.g. kg CO2e/m2"},
	}
}

// ObservedAirborneFraction is the long-run mean share of emitted CO2 that has
// stayed in the atmosphere, about 44 % (Global Carbon Budget, Friedlingstein et
// al.; from memory). Atmosphere functions default to 1 (mass to concentration);
// a planner may pass this value to see what stays.
const ObservedAirborneFraction = 0.44

// Screening is the caution every build-out function states.
const screening = " Screening estimate from published life-cycle studies: real projects differ with materials, supply chains and grids."

// buildoutFunctions declares the build-out functions: life-cycle intensities and
// their parts, embodied emissions of generating capacity, vehicles and batteries.
func buildoutFunctions(e *Engine) []*Function {
	tech := paramStr("tech", "technology", e.technologies()...).with(kindTech)
	stat := optional(paramStr("stat", "statistic of the published range", "min", "median", "max"), "median").with(kindStat)
	cf := optional(paramNum("capacity_factor", "fraction", "average output / rated capacity over a 365-day year, in (0, 1]"), "technology default")
	life := optional(paramNum("lifetime_years", "yr", "economic lifetime in 365-day years"), "technology default")
	part := paramStr("part", "part of the life-cycle intensity (IPCC AR5 WG3 Annex III Table A.III.2 columns)", lifecycleParts()...).checked(checkPart)
	vehicle := paramStr("vehicle", "vehicle class: car_<small|medium|large>_<ice|hev|phev|bev> (internal combustion, hybrid, plug-in hybrid, battery-electric)", e.vehicles()...).checked(checkVehicle)
	building := paramStr("building_type", "building type", e.buildingTypes()...).checked(checkBuilding)
	lifecycle := []string{"IPCC AR5 WG3 Annex III Table A.III.2"}
	cars := []string{"ICCT 2021 (Bieker), A global comparison of the life-cycle GHG emissions of combustion engine and electric passenger cars (from memory)",
		"Argonne GREET vehicle-cycle summaries (from memory)", "IVL report C444 (Emilsson and Dahllof 2019), Lithium-Ion Vehicle Battery Production (from memory)"}
	return []*Function{
		{Name: "lifecycle_intensity", Doc: "Life-cycle greenhouse-gas intensity of electricity from a technology (all parts: direct, infrastructure & supply chain, biogenic/albedo, methane)." + screening,
			ResultUnit: "g CO2e/kWh", Params: []Param{tech, stat},
			Example: `lifecycle_intensity("wind_onshore")`, ExampleResult: 11, Sources: lifecycle, call: callLifecycle},
		{Name: "lifecycle_part", Doc: "One part of the life-cycle intensity of electricity from a technology: direct (combustion at the plant), infrastructure (building the plant and its supply chain: what is embodied), biogenic_albedo, methane (fuel-supply leaks), or total." + screening,
			ResultUnit: "g CO2e/kWh", Params: []Param{tech, part, stat},
			Example: `lifecycle_part("coal_pc", "infrastructure")`, ExampleResult: 12, Sources: lifecycle, call: callLifecyclePart},
		{Name: "embodied_per_mw", Doc: "Embodied emissions of 1 MW of new capacity over its lifetime: the infrastructure & supply-chain intensity (g/kWh) x 1000 x capacity_factor x 8760 h x lifetime / 1e6. Combustion and fuel-supply methane are not embodied (lifecycle_part gives them)." + screening,
			ResultUnit: "t CO2e/MW", Params: []Param{tech, cf, life, stat},
			Example: `embodied_per_mw("wind_onshore", 0.3, 25)`, ExampleResult: 722.7, Sources: lifecycle, call: callEmbodiedPerMW},
		{Name: "embodied", Doc: "Embodied emissions of new generating capacity: embodied_per_mw x capacity." + screening,
			ResultUnit: "t CO2e", Params: []Param{tech, paramNum("capacity", "the unit given in unit", "capacity to build"),
				Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "power unit of capacity (kW, MW, MWp, GW...)", kind: kindPowerUnit}, cf, life, stat},
			Example: `embodied("pv_utility", 100, "MW", 0.2, 25)`, ExampleResult: 48 * 1000 * 0.2 * 8760 * 25 / 1e6 * 100, Sources: lifecycle, call: callEmbodied},
		{Name: "vehicle_embodied", Doc: "Production emissions of new vehicles: count x (vehicle without battery + battery_kwh x battery production per kWh). Use, fuel and end of life are not included." + screening,
			ResultUnit: "t CO2e", Params: []Param{paramNum("count", "vehicles", "number of vehicles"), vehicle,
				optional(paramNum("battery_kwh", "kWh", "traction battery capacity of one vehicle; 0 for internal-combustion cars"), "the class's usual capacity"), stat},
			Example: `vehicle_embodied(10, "car_medium_bev", 60)`, ExampleResult: 10 * (6.5 + 60*83.5/1000), Sources: cars, call: callVehicleEmbodied},
		{Name: "battery_embodied", Doc: "Production emissions of lithium-ion batteries (vehicle or stationary) of a given capacity: capacity x production per kWh." + screening,
			ResultUnit: "t CO2e", Params: []Param{paramNum("capacity", "the unit given in unit", "storage capacity"),
				Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "energy unit of capacity (kWh, MWh...)", kind: kindEnergyUnit}, stat},
			Example: `battery_embodied(100, "MWh")`, ExampleResult: 100 * 1000 * 83.5 / 1000, Sources: cars[2:], call: callBatteryEmbodied},
		{Name: "building_embodied", Doc: "Embodied emissions of new buildings: floor area x emissions per m2 of the building type, whole life without operational energy (EN 15978 modules A1-A5, B1-B5, C1-C4). median is business as usual for new build; min is the publication's 2030 target." + screening,
			ResultUnit: "t CO2e", Params: []Param{paramNum("area", "the unit given in unit", "gross internal floor area"),
				Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "area unit of area (m2, ft2, ha)"}.checked(checkAreaUnit), building, stat},
			Example: `building_embodied(5000, "m2", "office")`, ExampleResult: 5000 * 1400 / 1000.0, Sources: []string{"RIBA 2030 Climate Challenge version 2 (2021) (from memory)"}, call: callBuildingEmbodied},
	}
}
