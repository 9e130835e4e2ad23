package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// Refrigerant logs: a column of gases (R-410A, HFC-134a, SF6) and a mass
// added or lost (top-up, recharge, leak) give
// tCO2e = refrigerant_co2e(gas, mass, unit). A list of equipment with its
// full charge and no top-up is an inventory of what the equipment holds,
// not an emission: its rows are read and say so, nothing is computed.

// Kinds of refrigerant tables.
const (
	kindRefrigerant = "refrigerant"        // gas and mass released
	kindCharge      = "refrigerant-charge" // gas and charge held: not an emission
)

// refrigerantFunc is the catalog function of released refrigerant.
const refrigerantFunc = "refrigerant_co2e"

// gasName resolves a cell text as a fugitive gas, cached: its id, or ""
// when the text names none (or CO2, which is not a refrigerant release).
func (lx *lexicon) gasName(s string) string {
	s = strings.TrimSpace(s)
	if s == "" || len(s) > 60 {
		return ""
	}
	if id, ok := lx.gases[s]; ok {
		return id
	}
	id := ""
	if g, err := lx.e.ResolveGas(s); err == nil && g.Kind != "co2" && g.Kind != "ch4" && g.Kind != "n2o" {
		id = g.ID
	}
	if len(lx.gases) < maxCache {
		lx.gases[s] = id
	}
	return id
}

// assignRefrigerant finds a refrigerant log in a table that has no fuel,
// amount, per-fuel or technology columns: a column of gas names, and a
// mass added or lost (the quantity), or failing that a charge held.
func (d *detector) assignRefrigerant(t *tableSpec) {
	if t.fuel != nil || len(t.wide) > 0 || t.tech != nil || len(t.scope2) > 0 {
		return
	}
	if _, ok := d.sc.e.Function(refrigerantFunc); !ok {
		return
	}
	var gas *column
	best := 0.0
	for _, c := range t.cols {
		if c.role != roleNone && c.role != roleGroup || c.st.text == 0 || len(c.st.distinct) == 0 || 2*c.st.text < c.st.nonEmpty {
			continue
		}
		n := 0
		for s := range c.st.distinct {
			if d.lx.gasName(s) != "" {
				n++
			}
		}
		share := frac(n, len(c.st.distinct))
		if c.st.hint.Any(tables.HintGas) {
			share += 0.2
		}
		if share >= 0.6 && share > best {
			gas, best = c, share
		}
	}
	if gas == nil {
		return
	}
	if t.group == gas {
		t.group = nil
	}
	gas.role, t.gas = roleGas, gas
	// An amount read with a fuel of the title or sheet ("F-gas log" names
	// gas) is the mass of the gas column's gases.
	t.ctxFuel, t.ctxFrom, t.ctxCol = "", "", 0
	if q := t.qty; q != nil {
		if d.massColumn(t, q) && !chargeHeader(q) {
			return
		}
		q.role, t.qty = roleNone, nil
	}
	// A mass added or lost (top-up, leak), else an amount that is no charge
	// held ("Quantity (kg)").
	for _, h := range []tables.Hint{tables.HintFugitive, tables.HintQty} {
		for _, c := range t.cols {
			if c.role == roleNone && (c.st.nonEmpty == 0 || c.numeric) && c.st.hint.Any(h) && d.massColumn(t, c) && !chargeHeader(c) {
				c.role, t.qty = roleQuantity, c
				return
			}
		}
	}
	d.findCharge(t)
}

// findCharge sets t.charge to the column of the mass each piece of
// equipment holds ("Full charge (kg)"), for a gas table without a mass
// released.
func (d *detector) findCharge(t *tableSpec) {
	for _, c := range t.cols {
		if c.role != roleNone || c.st.nonEmpty > 0 && !c.numeric || !d.massColumn(t, c) {
			continue
		}
		if chargeHeader(c) {
			t.charge = c
			return
		}
	}
}

// chargeHeader reports a header naming the mass equipment holds ("Full
// charge", "Nameplate capacity"), not a mass released ("Recharge" is one
// word, and released).
func chargeHeader(c *column) bool {
	ws := words(c.hdr.Base)
	return hasWord(ws, "charge", "capacity", "nameplate", "holding", "installed", "inventory") && !c.st.hint.Any(tables.HintFugitive)
}

// massColumn reports a column whose amounts are masses: its header unit,
// or else the table's unit column.
func (d *detector) massColumn(t *tableSpec, c *column) bool {
	if c.hdr.UnitText != "" {
		return c.hdr.UnitErr == nil && c.hdr.Unit.Dim == units.Mass
	}
	if t.unit == nil {
		return false
	}
	for s := range t.unit.st.distinct {
		if u := d.lx.unit(s); u.err == nil && u.u.Dim == units.Mass {
			return true
		}
	}
	return false
}

// refrigerantRule is the rule of a refrigerant log; "" when it has no
// unit.
func refrigerantRule(t *tableSpec) string {
	unit := ""
	switch {
	case t.unit != nil:
		unit = t.unit.ident
	case t.qty.unitIdent != "":
		unit = t.qty.unitIdent
	default:
		return ""
	}
	return "tCO2e = " + refrigerantFunc + "(" + t.gas.ident + ", " + scaled(t.qty) + ", " + unit + ")"
}

// chargeReason is the reason of each row of an inventory of charges, and
// the column it is said at.
func chargeReason(t *tableSpec) (string, int) {
	const how = "the emission is the mass topped up or recovered short over the year (add a column such as \"Top-up (kg)\") or an estimate from a leak rate"
	return "not computed: " + quoteText(t.charge.hdr.Text) + " is the refrigerant the equipment holds, not what leaked; " + how, t.charge.col
}
