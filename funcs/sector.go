package funcs

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Stationary combustion emits CH4 and N2O at rates that depend on where the fuel is burned:
// IPCC 2006 Guidelines Vol 2 Ch 2 gives one table of Tier 1 defaults per sector (Tables
// 2.2-2.5). A pack's plain ch4_ef and n2o_ef rows are those of energy industries (Table 2.2);
// rows for the other sectors carry the sector in the quantity name (ch4_ef_residential).
// A pack that publishes one value per fuel for every sector (the US EPA Hub, Table 1) has
// only the plain rows, and a result says that its one value was used for the sector asked.

// DefaultSector is the sector whose CH4 and N2O factors fuel_co2e uses when a call names
// none: energy industries, IPCC 2006 Guidelines Vol 2 Ch 2 Table 2.2, as before sectors
// could be chosen.
const DefaultSector = "energy"

// stationarySector is a sector of IPCC 2006 Vol 2 Ch 2 with its own CH4/N2O defaults.
type stationarySector struct {
	name   string // our name, the value of the sector parameter
	suffix string // appended to ch4_ef and n2o_ef; "" for the plain rows
	title  string // the sector as the table names it
	table  string
}

// stationarySectors lists the sectors in the order of their tables.
func stationarySectors() []stationarySector {
	const ch2 = "IPCC 2006 Guidelines Vol 2 Ch 2 "
	return []stationarySector{
		{name: "energy", title: "energy industries", table: ch2 + "Table 2.2"},
		{name: "manufacturing", suffix: "_manufacturing", title: "manufacturing industries and construction", table: ch2 + "Table 2.3"},
		{name: "commercial", suffix: "_commercial", title: "commercial/institutional", table: ch2 + "Table 2.4"},
		{name: "residential", suffix: "_residential", title: "residential", table: ch2 + "Table 2.5"},
		// Table 2.5 gives one set for residential and agriculture/forestry/fishing/fish farms.
		{name: "agriculture", suffix: "_residential", title: "agriculture/forestry/fishing (stationary)", table: ch2 + "Table 2.5"},
	}
}

func sectorNames() []string {
	var out []string
	for _, s := range stationarySectors() {
		out = append(out, s.name)
	}
	return out
}

// sectorQuantities are the per-sector CH4 and N2O quantities a pack may carry.
func sectorQuantities() map[string]quantitySpec {
	m := map[string]quantitySpec{}
	for _, s := range stationarySectors() {
		if s.suffix == "" {
			continue
		}
		m["ch4_ef"+s.suffix] = quantitySpec{numDim: units.Mass, species: "CH4", den: anyAmount(), doc: "CH4 emission factor of stationary combustion in " + s.title + ", e.g. kg CH4/TJ"}
		m["n2o_ef"+s.suffix] = quantitySpec{numDim: units.Mass, species: "N2O", den: anyAmount(), doc: "N2O emission factor of stationary combustion in " + s.title + ", e.g. kg N2O/TJ"}
	}
	return m
}

// resolveSector reads a sector name, case- and space-insensitively; "" is the default.
func resolveSector(s string) (stationarySector, error) {
	k := strings.ToLower(strings.TrimSpace(s))
	if k == "" {
		k = DefaultSector
	}
	for _, sec := range stationarySectors() {
		if sec.name == k {
			return sec, nil
		}
	}
	msg := "unknown sector " + quote(s) + ": accepted are " + strings.Join(sectorNames(), ", ")
	if g := suggestFrom(k, sectorNames()); g != "" {
		msg += " (did you mean " + g + "?)"
	}
	return stationarySector{}, &Error{Code: CodeBadArgument, Param: "sector", Msg: msg}
}

func checkSector(_ *Engine, s string) error {
	_, err := resolveSector(s)
	return err
}

// sectorGases returns the quantities of CH4 and N2O that fuel_co2e uses for fuel in
// sector, and the note that names the sector (asked: the caller named it). A pack with no
// rows at all for the sector (epa2025) gives its one value per fuel, and the note says so; a
// pack with rows for the sector but none for this fuel is an error naming the sector.
func (e *Engine) sectorGases(packName string, fuel *Fuel, sec stationarySector, asked bool) (ch4, n2o, note string, err error) {
	ch4, n2o = "ch4_ef", "n2o_ef"
	note = "CH4 and N2O of stationary combustion in " + sec.title + " (sector " + sec.name
	if !asked {
		note += ", the default"
	}
	note += ")"
	if sec.suffix != "" && e.fuelRow(packName, fuel, ch4+sec.suffix) != nil && e.fuelRow(packName, fuel, n2o+sec.suffix) != nil {
		return ch4 + sec.suffix, n2o + sec.suffix, note, nil
	}
	one := note + ": pack " + packName + " has one CH4 and one N2O value per fuel for every sector, used here"
	if sec.suffix == "" {
		if e.packHasQuantity(packName, "ch4_ef_residential") {
			return ch4, n2o, note, nil // the plain rows are this pack's energy-industry rows
		}
		return ch4, n2o, one, nil
	}
	if e.packHasQuantity(packName, ch4+sec.suffix) {
		return "", "", "", &Error{Code: CodeMissingFactor, Param: "sector", Msg: "pack " + packName + " has no CH4 and N2O factors for " +
			fuel.ID + " in sector " + sec.name + " (" + sec.title + "): pass sector energy, or a pack that has them"}
	}
	return ch4, n2o, one, nil
}

// packHasQuantity reports whether the pack itself has any row of quantity q.
func (e *Engine) packHasQuantity(packName, q string) bool {
	p := e.packs.packs[packName]
	if p == nil {
		return false
	}
	for k := range p.rows {
		if k.quantity == q {
			return true
		}
	}
	return false
}
