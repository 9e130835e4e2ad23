package importer

import "github.com/fluecell/fluecell/importer/tables"

// gasUnits are the units only natural gas is billed and reported in:
// therms and dekatherms, and standard cubic feet by the hundred, thousand,
// million (common practice of North American gas bills and statistics).
var gasUnits = map[string]bool{"therm": true, "Dth": true, "scf": true, "ccf": true, "Mcf": true, "MMcf": true, "Bcf": true, "Tcf": true}

// unitFuel reads natural gas from a column whose header names no fuel,
// only usage words, and whose unit is one only natural gas is billed in
// ("Total Usage (Therms)" of a utility's billing export). ok false for any
// other column. The column's header finding says how it was read.
func (d *detector) unitFuel(c *column) (fuelRef, bool) {
	if c.hdr.UnitErr != nil || !gasUnits[c.hdr.Unit.Symbol] {
		return fuelRef{}, false
	}
	ws := words(c.hdr.Base)
	if len(d.lx.vocab.Strip(ws, tables.HintQty|tables.HintTotal|tables.HintPeriod)) != 0 {
		return fuelRef{}, false // other words: a name the lexicon may not know
	}
	f := d.lx.fuel("natural_gas")
	if f.err != nil {
		return fuelRef{}, false
	}
	return fuelRef{kind: nameFuel, name: "natural gas", id: f.id, alias: true}, true
}

// unitFuelNote is the header finding of a column read as natural gas from
// its unit.
func unitFuelNote(c *column) string {
	return quoteText(c.hdr.Text) + " names no fuel; read as natural gas, the fuel " + c.hdr.UnitText +
		" are billed in (common practice); if it is another fuel, say so in a mapping"
}

// sameUnitBeside reports a per-fuel or purchased-energy column of t in c's
// unit: a total column beside them ("Total Usage (kWh)" after "On Peak
// (kWh)", "Off Peak (kWh)") adds them up.
func sameUnitBeside(t *tableSpec, c *column) bool {
	for _, x := range append(append([]*column(nil), t.wide...), t.scope2...) {
		if x != c && x.hdr.UnitErr == nil && c.hdr.UnitErr == nil && x.hdr.Unit.Symbol == c.hdr.Unit.Symbol {
			return true
		}
	}
	return false
}
