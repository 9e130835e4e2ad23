package funcs

import (
	"sort"
)

// Param is one parameter of a catalog function.
type Param struct {
	Name     string   `json:"name"`
	Type     string   `json:"type"`           // "number" or "string"
	Unit     string   `json:"unit,omitempty"` // the unit a number is in, or "unit string" for unit parameters
	Doc      string   `json:"doc"`
	Optional bool     `json:"optional"`
	Default  string   `json:"default,omitempty"` // the value used when an optional parameter is left out
	Allowed  []string `json:"allowed,omitempty"` // the accepted values of an enumerated string

	kind  paramKind                       // what a string argument names, for checks at compile time
	check func(e *Engine, s string) error // a check of a literal string argument, for kinds declared outside this file
	// omitted is the literal argument that means the same as leaving the parameter out, for a
	// parameter whose Default describes the default in words (year: "latest loaded for the grid").
	omitted string
}

type paramKind uint8

const (
	kindPlain paramKind = iota
	kindFuel
	kindAmountUnit // energy, mass or volume
	kindEnergyUnit
	kindMassUnit
	kindPowerUnit
	kindAnyUnit
	kindPack
	kindGWPSet
	kindTech
	kindStat
)

func (p Param) with(k paramKind) Param { p.kind = k; return p }

// omittedAs returns p with the literal argument that stands for leaving it out.
func (p Param) omittedAs(lit string) Param { p.omitted = lit; return p }

// checked returns p with a compile-time check of literal string arguments; a
// family of functions in its own file declares its parameter kinds this way.
func (p Param) checked(check func(e *Engine, s string) error) Param { p.check = check; return p }

// Function is the one declaration of a carbon function. The expression
// environment, the HTTP routes, the CLI listing and the OpenAPI contract are
// all derived from it.
type Function struct {
	Name          string   `json:"name"`
	Doc           string   `json:"doc"`
	ResultUnit    string   `json:"result_unit"`
	Params        []Param  `json:"params"`
	Example       string   `json:"example"`
	ExampleResult float64  `json:"example_result"`
	Sources       []string `json:"sources"`

	call func(e *Engine, c *callCtx, a argList) (float64, string, error) // value, unit (if it varies)
}

// MinArgs is the number of required parameters.
func (f *Function) MinArgs() int {
	n := 0
	for _, p := range f.Params {
		if !p.Optional {
			n++
		}
	}
	return n
}

// Param returns the parameter with the given name.
func (f *Function) Param(name string) (Param, bool) {
	for _, p := range f.Params {
		if p.Name == name {
			return p, true
		}
	}
	return Param{}, false
}

const (
	typeNumber = "number"
	typeString = "string"
)

func paramNum(name, unit, doc string) Param {
	return Param{Name: name, Type: typeNumber, Unit: unit, Doc: doc}
}
func paramStr(name, doc string, allowed ...string) Param {
	return Param{Name: name, Type: typeString, Doc: doc, Allowed: allowed}
}
func optional(p Param, def string) Param { p.Optional, p.Default = true, def; return p }

// catalogFamilies are the groups of functions, each declared in its own file,
// in the order the catalog lists them.
func catalogFamilies() []func(e *Engine) []*Function {
	return []func(e *Engine) []*Function{
		coreFunctions,
		buildoutFunctions,
		mobileFunctions,
		refrigerantFunctions,
		fugitiveFunctions,
		gridFunctions,
		vehicleDistanceFunctions,
	}
}

// buildCatalog declares every function. Allowed values that depend on the
// loaded packs (fuels, packs, technologies) are filled from the engine.
func buildCatalog(e *Engine) []*Function {
	var fs []*Function
	for _, family := range catalogFamilies() {
		fs = append(fs, family(e)...)
	}
	return fs
}

// coreFunctions declares the fuel, atmosphere, GWP and unit
// functions of the first release.
func coreFunctions(e *Engine) []*Function {
	packNames := e.PackNames()
	pack := optional(paramStr("pack", "factor pack", packNames...), e.defaultPack).with(kindPack)
	fuel := paramStr("fuel", "fuel id or alias, e.g. natural_gas, diesel (case- and space-insensitive)").with(kindFuel)
	amount := paramNum("amount", "the unit given in unit", "quantity of fuel used")
	amountUnit := Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "unit of amount: energy (GJ, MWh, MMBtu HHV...), mass (t, kg, short_ton...) or volume (L, gal, m3, scf...)", kind: kindAmountUnit}
	gwpSet := optional(paramStr("gwp_set", "IPCC assessment whose GWP-100 values weight CH4 and N2O", e.gwpSets()...), DefaultGWPSet).with(kindGWPSet)
	af := optional(paramNum("airborne_fraction", "fraction", "share of emitted CO2 that stays in the atmosphere, in (0, 1]; 1 converts mass to concentration only; the long-run observed airborne fraction is about 0.44 (Global Carbon Budget)"), "1")
	combustion := []string{"IPCC 2006 Guidelines Vol 2 Ch 1 Tables 1.2-1.4", "IPCC 2006 Guidelines Vol 2 Ch 2 Table 2.2", "US EPA GHG Emission Factors Hub 2025 Table 1"}
	sectors := []string{"IPCC 2006 Guidelines Vol 2 Ch 2 Tables 2.3-2.5"}
	gcb := []string{"Global Carbon Budget (Friedlingstein et al.): 1 ppm CO2 = 2.124 GtC"}

	fs := []*Function{
		{Name: "fuel_co2", Doc: "CO2 from burning a fuel (stationary combustion, Tier 1 default factor). Biogenic CO2 is returned with a note to report it separately.",
			ResultUnit: "t CO2", Params: []Param{fuel, amount, amountUnit, pack},
			Example: `fuel_co2("natural_gas", 1000, "GJ")`, ExampleResult: 56.1, Sources: combustion, call: callFuel(kindCO2, 0, "")},
		{Name: "fuel_co2e", Doc: "CO2e from burning a fuel: CO2 + CH4 x GWP + N2O x GWP (stationary combustion; CH4 and N2O of the sector, energy industries unless sector says otherwise). Biogenic CO2 is excluded.",
			ResultUnit: "t CO2e", Params: []Param{fuel, amount, amountUnit, gwpSet, pack,
				optional(paramStr("sector", "where the fuel is burned, choosing the CH4 and N2O factors: energy (energy industries, IPCC 2006 Vol 2 Ch 2 Table 2.2, the default), manufacturing (industries and construction, Table 2.3), commercial (commercial/institutional, Table 2.4), residential and agriculture (Table 2.5); a pack with one value per fuel (epa2025) uses it for every sector, with a note", sectorNames()...), DefaultSector).checked(checkSector)},
			Example: `fuel_co2e("natural_gas", 1000, "GJ")`, ExampleResult: 56.1545, Sources: append(append(combustion, sectors...), "IPCC AR5 WG1 Ch 8 Table 8.A.1"), call: callFuel(kindCO2e, 3, DefaultGWPSet)},
		{Name: "fuel_carbon", Doc: "Carbon content of a fuel amount (t C), from the pack's carbon content or its CO2 factor x 12/44.",
			ResultUnit: "t C", Params: []Param{fuel, amount, amountUnit, pack},
			Example: `fuel_carbon("natural_gas", 1000, "GJ")`, ExampleResult: 15.3, Sources: combustion[:1], call: callFuel(kindCarbon, 0, "")},
		{Name: "fuel_energy", Doc: "Energy content of a fuel amount, on an NCV basis unless to_unit says HHV.",
			ResultUnit: "GJ", Params: []Param{fuel, amount, amountUnit,
				optional(Param{Name: "to_unit", Type: typeString, Unit: "unit string", Doc: "energy unit of the result, optionally with a basis (\"MMBtu HHV\")", kind: kindEnergyUnit}, "GJ"), pack},
			Example: `fuel_energy("gas_diesel_oil", 1, "t")`, ExampleResult: 43, Sources: combustion, call: callFuel(kindEnergy, 3, "GJ")},
		{Name: "co2_from_carbon", Doc: "Mass of CO2 holding a mass of carbon (x 44/12, the IPCC convention).",
			ResultUnit: "same mass unit", Params: []Param{paramNum("mass", "any mass unit", "mass of carbon")},
			Example: `co2_from_carbon(12)`, ExampleResult: 44, Sources: []string{"IPCC 2006 Guidelines Vol 2 Ch 1 (CO2 = C x 44/12)"}, call: callCO2FromCarbon},
		{Name: "carbon_from_co2", Doc: "Mass of carbon in a mass of CO2 (x 12/44).",
			ResultUnit: "same mass unit", Params: []Param{paramNum("mass", "any mass unit", "mass of CO2")},
			Example: `carbon_from_co2(44)`, ExampleResult: 12, Sources: []string{"IPCC 2006 Guidelines Vol 2 Ch 1 (CO2 = C x 44/12)"}, call: callCarbonFromCO2},
		{Name: "ppm_from_gtc", Doc: "Change in atmospheric CO2 (ppm) from a mass of carbon; the long-run observed airborne fraction is about 0.44.",
			ResultUnit: "ppm", Params: []Param{paramNum("gtc", "GtC", "carbon emitted"), af},
			Example: `ppm_from_gtc(10)`, ExampleResult: 10 / 2.124, Sources: gcb, call: callPPMFromGtC},
		{Name: "ppm_from_co2", Doc: "Change in atmospheric CO2 (ppm) from a mass of CO2 emitted.",
			ResultUnit: "ppm", Params: []Param{paramNum("amount", "the unit given in unit", "CO2 emitted"), Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "mass unit of amount (t, Mt, Gt...)", kind: kindMassUnit}, af},
			Example: `ppm_from_co2(36.6, "Gt")`, ExampleResult: 36.6 * 12 / 44 / 2.124, Sources: gcb, call: callPPMFromCO2},
		{Name: "gtc_from_ppm", Doc: "Mass of carbon (GtC) in a given amount of atmospheric CO2 (ppm).",
			ResultUnit: "GtC", Params: []Param{paramNum("ppm", "ppm", "atmospheric CO2 mole fraction")},
			Example: `gtc_from_ppm(1)`, ExampleResult: 2.124, Sources: gcb, call: callGtCFromPPM},
		{Name: "gwp", Doc: "Global warming potential over 100 years of a gas or refrigerant blend in an IPCC assessment; a blend's is the mass-weighted sum of its components' (ASHRAE Standard 34 compositions).",
			ResultUnit: "", Params: []Param{gasParam(e), gwpSetParam(e, "IPCC assessment whose GWP-100 value is returned")},
			Example: `gwp("R-410A", "ar4")`, ExampleResult: 0.5*675 + 0.5*3500, Sources: []string{"IPCC AR4 WG1 Ch 2 Table 2.14", "IPCC AR5 WG1 Ch 8 Table 8.A.1", "IPCC AR6 WG1 Ch 7 Tables 7.15 and 7.SM.7", "ANSI/ASHRAE Standard 34 (blend compositions)"}, call: callGWP},
		{Name: "to_unit", Doc: "Converts a value between units of one dimension with exact decimal factors (NIST SP 811, IEA).",
			ResultUnit: "the unit given in to", Params: []Param{paramNum("value", "the unit given in from", "value to convert"),
				Param{Name: "from", Type: typeString, Unit: "unit string", Doc: "unit of value", kind: kindAnyUnit}, Param{Name: "to", Type: typeString, Unit: "unit string", Doc: "unit of the result", kind: kindAnyUnit}},
			Example: `to_unit(1, "MMBtu", "GJ")`, ExampleResult: 1.05505585262, Sources: []string{"NIST SP 811 Appendix B", "IEA (toe = 41.868 GJ)"}, call: callToUnit},
	}
	return fs
}

// catalogIndex is the catalog by name, in declaration order.
type catalogIndex struct {
	list   []*Function
	byName map[string]*Function
}

func newCatalogIndex(fs []*Function) *catalogIndex {
	ix := &catalogIndex{list: fs, byName: map[string]*Function{}}
	for _, f := range fs {
		ix.byName[f.Name] = f
	}
	return ix
}

func (ix *catalogIndex) names() []string {
	out := make([]string, 0, len(ix.list))
	for _, f := range ix.list {
		out = append(out, f.Name)
	}
	sort.Strings(out)
	return out
}
