package funcs

import (
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Fuel describes a canonical fuel id: its display name, the family used for
// heating-value basis conversions, and whether its CO2 is biogenic.
type Fuel struct {
	ID       string `json:"id"`
	Name     string `json:"name"`
	Family   string `json:"family,omitempty"` // coal, oil or gas; "" when no NCV/GCV ratio applies
	Biogenic bool   `json:"biogenic"`         // CO2 is reported separately (memo item), not in totals
	// NonEnergy marks a product used mostly as a material, not burned (lubricants,
	// bitumen): its use is reported under industrial processes and product use
	// (IPCC 2006 Vol 3 Ch 5), so a record of its consumption is no fuel burned.
	NonEnergy bool     `json:"non_energy,omitempty"`
	Aliases   []string `json:"aliases,omitempty"`
	Custom    bool     `json:"custom,omitempty"` // defined only by a user pack
	// within is a fuel this one is a kind of, whose rows a pack without rows of its own
	// lends it (propane within lpg: IPCC 2006 Table 1.2 has no propane row).
	within string
}

// fuelRow is the pack's row of quantity q for fuel, or, when the pack has none, the row of
// the fuel it is within (see Fuel.within); nil if neither.
func (e *Engine) fuelRow(packName string, fuel *Fuel, q string) *Factor {
	if f := e.packs.lookup(packName, fuel.ID, q); f != nil || fuel.within == "" {
		return f
	}
	return e.packs.lookup(packName, fuel.within, q)
}

// lentNote says which rows of a plan came from the fuel that fuel is within; "" if none.
func lentNote(packName string, fuel *Fuel, fs []*Factor) string {
	var qs []string
	for _, f := range fs {
		if fuel.within != "" && f.ID == fuel.within && !slices.Contains(qs, f.Quantity) {
			qs = append(qs, f.Quantity)
		}
	}
	if len(qs) == 0 {
		return ""
	}
	return "pack " + packName + " has no " + strings.Join(qs, ", ") + " for " + fuel.ID + ": the " + fuel.within +
		" rows are used (" + fuel.ID + " is a kind of " + fuel.within + ")"
}

// builtinFuels lists the canonical fuel ids of the design with their aliases.
// Aliases are matched case- and space-insensitively (see fuelKey); more names are in
// data/fuel_names.csv.
func builtinFuels() []Fuel {
	return []Fuel{
		{ID: "crude_oil", Name: "crude oil", Family: "oil", Aliases: []string{"crude"}},
		{ID: "motor_gasoline", Name: "motor gasoline", Family: "oil", Aliases: []string{"gasoline", "petrol", "mogas", "motor spirit", "unleaded", "unleaded petrol"}},
		{ID: "jet_kerosene", Name: "jet kerosene", Family: "oil", Aliases: []string{"jet fuel", "jet a", "jet a-1", "jet a1", "avtur", "kerosene-type jet fuel"}},
		{ID: "other_kerosene", Name: "other kerosene", Family: "oil", Aliases: []string{"kerosene", "paraffin", "paraffin oil", "heating kerosene"}},
		{ID: "gas_diesel_oil", Name: "gas/diesel oil", Family: "oil", Aliases: []string{"diesel", "diesel oil", "gas oil", "gasoil", "gas/diesel oil", "red diesel", "heating oil", "distillate", "distillate fuel oil", "distillate fuel oil no. 2", "fuel oil no. 2", "no. 2 fuel oil", "diesel fuel"}},
		{ID: "residual_fuel_oil", Name: "residual fuel oil", Family: "oil", Aliases: []string{"fuel oil", "heavy fuel oil", "hfo", "bunker fuel", "mazut", "residual fuel oil no. 6", "fuel oil no. 6", "no. 6 fuel oil", "residual oil"}},
		{ID: "lpg", Name: "liquefied petroleum gases", Family: "oil", Aliases: []string{"liquefied petroleum gas", "liquefied petroleum gases", "autogas"}},
		{ID: "propane", Name: "propane", Family: "oil", within: "lpg"},
		{ID: "natural_gas", Name: "natural gas", Family: "gas", Aliases: []string{"gas", "nat gas", "natgas", "pipeline gas", "ng"}},
		{ID: "anthracite", Name: "anthracite", Family: "coal"},
		{ID: "coking_coal", Name: "coking coal", Family: "coal", Aliases: []string{"metallurgical coal", "met coal"}},
		{ID: "other_bituminous_coal", Name: "other bituminous coal", Family: "coal", Aliases: []string{"coal", "bituminous", "bituminous coal", "hard coal", "steam coal", "thermal coal"}},
		{ID: "sub_bituminous_coal", Name: "sub-bituminous coal", Family: "coal", Aliases: []string{"sub-bituminous", "subbituminous", "subbituminous coal"}},
		{ID: "lignite", Name: "lignite", Family: "coal", Aliases: []string{"brown coal"}},
		{ID: "peat", Name: "peat"},
		{ID: "wood", Name: "wood/wood waste", Biogenic: true, Aliases: []string{"wood waste", "wood/wood waste", "firewood", "wood chips", "wood pellets", "wood residues"}},
		{ID: "petroleum_coke", Name: "petroleum coke", Family: "oil", Aliases: []string{"petcoke", "pet coke"}},
		{ID: "aviation_gasoline", Name: "aviation gasoline", Family: "oil"},
		{ID: "ethanol", Name: "ethanol (biogasoline)", Biogenic: true},
		{ID: "biodiesel", Name: "biodiesel", Biogenic: true},
		{ID: "renewable_diesel", Name: "renewable diesel (hydrotreated vegetable oil)", Biogenic: true},
		{ID: "coal_coke", Name: "coke oven coke", Family: "coal", Aliases: []string{"coke oven coke", "metallurgical coke", "lignite coke"}},
		{ID: "lubricants", Name: "lubricants", Family: "oil", NonEnergy: true, Aliases: []string{"lubricating oil", "lube oil"}},
		{ID: "waste_oil", Name: "waste oils", Family: "oil", Aliases: []string{"waste oils", "used oil"}},
		{ID: "refinery_gas", Name: "refinery gas (fuel gas)", Family: "gas", Aliases: []string{"refinery fuel gas", "still gas"}},
		{ID: "blast_furnace_gas", Name: "blast furnace gas", Family: "gas"},
		{ID: "coke_oven_gas", Name: "coke oven gas", Family: "gas"},
		{ID: "landfill_gas", Name: "landfill gas", Family: "gas", Biogenic: true},
		{ID: "municipal_solid_waste", Name: "municipal solid waste"},
		{ID: "naphtha", Name: "naphtha", Family: "oil"},
		{ID: "ethane", Name: "ethane", Family: "gas"},
		{ID: "bitumen", Name: "bitumen (asphalt)", Family: "oil", NonEnergy: true, Aliases: []string{"asphalt", "asphalt and road oil", "road oil"}},
		{ID: "other_petroleum_products", Name: "other petroleum products", Family: "oil", Aliases: []string{"other oil", "other oils"}},
		{ID: "tires", Name: "tires (tire-derived fuel)", Aliases: []string{"tyres", "waste tires", "waste tyres", "tire-derived fuel", "tyre-derived fuel"}},
		{ID: "plastics", Name: "plastics", Aliases: []string{"waste plastics"}},
		{ID: "biogas", Name: "biogas (other biomass gases)", Family: "gas", Biogenic: true, Aliases: []string{"other biogas", "other biomass gases", "digester gas", "sludge gas"}},
	}
}

// FuelMatch is how a fuel name resolved: see Engine.LookupFuel.
type FuelMatch struct {
	Fuel  Fuel // the fuel; for a blend, its fossil base fuel
	Alias bool // the name is not the fuel id itself
	// Kind is "id", "alias", "code" (a statistics code such as DFO) or "blend".
	Kind string
	// FossilShare is the share of an amount that is Fuel: 1, or a blend's nominal share by
	// volume (E10: 0.9). BioFuel is the id of a blend's biogenic part ("ethanol").
	FossilShare float64
	BioFuel     string
	Description string   // what the name means, from the vocabulary ("No. 2 fuel oil"); may be ""
	Source      string   // the vocabulary row's source; "" for ids and built-in aliases
	Dropped     []string // qualifier words and footnote marks that were ignored ("bulk", "(3)")
}

// LookupFuel tells whether name resolves to a fuel, and how. It builds no error message and
// computes no suggestion, so a miss is cheap: use it to classify cells. A name of something
// that is not a fuel (electricity, the EIA code SUN) or of a fuel without an id (landfill gas)
// is a miss; ResolveFuel explains it.
func (e *Engine) LookupFuel(name string) (FuelMatch, bool) {
	m, ok := e.fuels.lookup(name)
	if !ok || m.entry.fuel == nil {
		return FuelMatch{}, false
	}
	return m.public(), true
}

// NotFuelName reports whether name is listed as something that is not a
// fuel burned (electricity, the EIA codes SUN, WND, WAT), with what it is;
// cheap, like LookupFuel.
func (e *Engine) NotFuelName(name string) (desc string, ok bool) {
	m, found := e.fuels.lookup(name)
	if !found || m.entry.kind != nameNotFuel || m.entry.row == nil {
		return "", false
	}
	return m.entry.row.desc, true
}

// quote writes a name from the user for a message: in double quotes, control characters and
// invalid UTF-8 escaped (a newline shows as \n), a name over 80 bytes cut between characters.
func quote(s string) string {
	if len(s) > 80 {
		cut := 77
		for cut > 0 && !utf8.RuneStart(s[cut]) {
			cut--
		}
		s = s[:cut] + "..."
	}
	return strconv.Quote(s)
}
