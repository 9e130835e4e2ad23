package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// Purchased energy (Scope 2): electricity, steam, hot water and cooling
// bought rather than burned on site. A wide table's column of it
// ("Electricity (kWh)") gets the role purchased-energy and its own rule
// column; a long table's rows of it (a fuel column saying "Electricity"
// among fuels) get rules of their own (rowRules). Electricity needs a grid
// (grid.go); without one, one finding says how to give it and every such
// row or column says why it is not computed.

// heatFunc is the catalog function of purchased steam, heat and cooling.
const heatFunc = "heat_co2e"

// scope2Column is the rule column of a wide table's purchased energy, kept
// apart from the fuels burned on site (Scope 1) in the same rows.
const scope2Column = "tCO2e_scope2"

// assignScope2 gives the role purchased-energy to the columns whose header
// names electricity, steam, hot water or cooling with an energy unit (or a
// power, which the unit check then reports as a rate), in a table without
// a quantity column.
func (d *detector) assignScope2(t *tableSpec) {
	if t.qty != nil || t.rateTitle != "" || t.fuel != nil {
		return
	}
	for _, c := range t.cols {
		if c.role != roleNone || c.st.nonEmpty > 0 && !c.numeric || c.hdr.UnitText == "" || c.sameAs != nil {
			continue
		}
		h := c.st.hint
		if h.Any(tables.HintRate|tables.HintCount|tables.HintOutput|tables.HintTotal) && !h.Any(tables.HintQty) || moneyHeader(c.hdr.Text) {
			continue
		}
		switch {
		case c.hdr.UnitErr != nil:
		case c.hdr.Unit.Dim == units.Energy:
			if t.output && electricOutput(c.hdr.Unit.Symbol) {
				continue // a title about generation: electricity made, not bought
			}
		case c.hdr.Unit.Dim == units.Power && h.Any(tables.HintQty):
		default:
			continue
		}
		cr := d.lx.carrierOf(c.hdr.Base)
		if cr == carrierNone {
			continue
		}
		// The same purchase again in another unit ("Electricity Use (kWh)"
		// then "Electricity Use (kBtu)"): counted once, from its first column.
		if first := sameCarrier(t.scope2, c, cr); first != nil {
			c.carrier, c.sameAs = cr, first
			continue
		}
		c.role, c.carrier = roleCarrier, cr
		t.scope2 = append(t.scope2, c)
		// The workbook's own carbon figures then mix Scope 1 and 2, on a
		// grid factor of their own: they are not compared (checkExisting).
		t.partial = true
	}
}

// sameCarrier returns the column of taken that gives carrier cr under the
// same header words as c in another unit, or nil.
func sameCarrier(taken []*column, c *column, cr carrier) *column {
	for _, x := range taken {
		if x.carrier == cr && !strings.EqualFold(x.hdr.UnitText, c.hdr.UnitText) && tables.Phrase(x.hdr.Base) == tables.Phrase(c.hdr.Base) {
			return x
		}
	}
	return nil
}

// hasCarriers reports a table with purchased energy: its columns, or fuel
// names of electricity or heat among its sampled rows.
func (t *tableSpec) hasCarriers() bool {
	return len(t.scope2) > 0 || t.fuel != nil && t.fuel.st.notFuel > 0
}

// findGridCol gives the role grid to the column whose header names a
// country or region and whose sampled values are mostly grids the engine
// knows, in a table with purchased energy.
func (d *detector) findGridCol(t *tableSpec) {
	if !t.hasCarriers() {
		return
	}
	var best *column
	bestShare := 0.0
	for _, c := range t.cols {
		if c.role != roleNone && c.role != roleGroup || !c.st.hint.Any(tables.HintArea) || c.st.text == 0 || len(c.st.distinct) == 0 {
			continue
		}
		n := 0
		for s := range c.st.distinct {
			if d.lx.gridName(s) != "" {
				n++
			}
		}
		if share := frac(n, len(c.st.distinct)); share >= 0.6 && share > bestShare {
			best, bestShare = c, share
		}
	}
	if best == nil {
		return
	}
	if t.group == best {
		t.group = nil
	}
	best.role, t.gridCol = roleGrid, best
	if t.group == nil {
		t.group = best // totals by grid region, as by any grouping column
	}
}

// titleGrid reads a grid named in a title above the table or after a
// comma in a purchased-energy header ("Electricity use, Germany"); the
// evidence must be a whole phrase that the engine resolves as a grid.
func (d *detector) titleGrid(t *tableSpec, titles []string) {
	if !t.hasCarriers() {
		return
	}
	var cands, from []string
	for _, c := range t.scope2 {
		cands, from = append(cands, c.hdr.Base), append(from, "the header "+quoteText(c.hdr.Text))
	}
	for _, s := range titles {
		cands, from = append(cands, s), append(from, "the title "+quoteText(s))
	}
	for k, s := range cands {
		for _, sep := range []string{",", " - ", " – ", ":", "(", " in "} {
			i := strings.LastIndex(s, sep)
			if i < 0 {
				continue
			}
			tail := strings.Trim(strings.TrimSpace(s[i+len(sep):]), "()")
			if id := d.lx.gridName(tail); tail != "" && len(words(tail)) <= 3 && id != "" {
				t.ctxGrid, t.ctxGridFrom = id, from[k]
				return
			}
		}
	}
}

// scope2Terms are the calls of a wide table's purchased-energy columns,
// summed into one rule; none for electricity without a grid.
func (sc *scanCtx) scope2Terms(t *tableSpec) []string {
	var out []string
	for _, c := range t.scope2 {
		if c.hdr.UnitErr != nil || c.unitIdent == "" || c.hdr.Unit.Dim != units.Energy {
			continue // (a power, "kW" for kWh: said at the header, the column left out)
		}
		if call := sc.carrierCall(t, c.carrier, scaled(c), c.unitIdent, "co2e"); call != "" {
			out = append(out, call)
		}
	}
	return out
}

// carrierCall is the call computing an amount of purchased energy:
// electricity through the table's grid, heat through its carrier; "" when
// it cannot be computed (no grid, or no such function in this build); gas
// is "co2e" or "co2", the column it fills.
// Only CO2e is computed: the grid sets publish CO2 alone for some grids
// only, so a tCO2 column leaves purchased energy out.
func (sc *scanCtx) carrierCall(t *tableSpec, c carrier, amount, unit, gas string) string {
	switch {
	case gas != "co2e":
		return ""
	case c == carrierElectricity:
		if _, ok := sc.e.Function(gridFunc); !ok || !t.grid.known() {
			return ""
		}
		return gridFunc + "(" + amount + ", " + unit + ", " + t.grid.arg() + ")"
	default:
		if !sc.heatFactor(c) {
			return ""
		}
		return heatFunc + "(" + amount + ", " + unit + ", " + quoteRuleString(c.heatArg()) + ")"
	}
}

// heatFactor reports whether the engine has a default factor for purchased
// heat of carrier c (none is published for cooling in the default set).
func (sc *scanCtx) heatFactor(c carrier) bool {
	if ok, seen := sc.heatOK[c]; seen {
		return ok
	}
	_, err := sc.e.CallValues(heatFunc, 1.0, "MMBtu", c.heatArg())
	if sc.heatOK == nil {
		sc.heatOK = map[carrier]bool{}
	}
	sc.heatOK[c] = err == nil
	return err == nil
}

// scope2Findings records, at the header of each purchased-energy column,
// how it is read: with which grid or carrier, or why it is left out.
func (sc *scanCtx) scope2Findings(t *table) {
	spec := t.spec
	for _, c := range spec.scope2 {
		if c.hdr.UnitErr != nil || c.unitIdent == "" {
			continue
		}
		hr := spec.headerRow
		if c.hdr.Unit.Dim != units.Energy {
			msg := "a power, not an energy"
			if _, err := units.ParseAs(c.hdr.UnitText, units.Energy); err != nil {
				msg = err.Error()
			}
			sc.warn.add(spec.sheet, c.col, hr, SevError, units.CodeDimension, msg+" (in the header "+quoteText(c.hdr.Text)+
				"): purchased energy is an amount of energy, such as kWh; the column is left out of the totals")
			continue
		}
		switch {
		case c.carrier == carrierElectricity && !spec.grid.known():
			at := sc.gridUnknown(spec.sheet, c.col, hr, quoteText(c.hdr.Text))
			sc.warn.add(spec.sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+
				" is purchased electricity and no grid is given: the column is not computed (see the grid-unknown finding at "+at+")")
		case sc.carrierCall(spec, c.carrier, c.ident, c.unitIdent, "co2e") == "":
			sc.warn.add(spec.sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+" is purchased "+c.carrier.String()+
				" (Scope 2), and this build has no factor for it: the column is left out of the totals")
		default:
			onsite := ""
			if c.carrier == carrierElectricity && withOnsite(words(c.hdr.Text)) {
				onsite = "; the header counts electricity generated on site too, which has no Scope 2 emissions: where part of these amounts is on-site generation, the figure is an upper bound (give the grid purchase alone in a mapping's column if the workbook has it)"
			}
			sc.warn.add(spec.sheet, c.col, hr, SevInfo, CodeReadAs, quoteText(c.hdr.Text)+" read as purchased "+c.carrier.String()+
				" (Scope 2, "+sc.carrierBasis(spec, c.carrier)+"), computed in the column "+scope2Column+", apart from fuels burned on site"+onsite)
		}
	}
}

// carrierBasis says which factor a carrier's rows use, for the findings.
func (sc *scanCtx) carrierBasis(t *tableSpec, c carrier) string {
	if c != carrierElectricity {
		return "the default factor of purchased " + c.String() + " (see " + SheetSources + ")"
	}
	if t.grid.col != nil {
		return "location-based, the grid of each row from " + t.grid.from
	}
	return "location-based, grid " + t.grid.name + " from " + t.grid.from
}

// scope2Key is the key of a wide table's purchased energy in the totals by
// fuel: its carrier when it has one kind, else all of them together.
func scope2Key(t *tableSpec) string {
	if len(t.scope2) == 0 {
		return "Scope 2"
	}
	c := t.scope2[0].carrier
	for _, x := range t.scope2[1:] {
		if x.carrier != c {
			return "Scope 2: purchased energy"
		}
	}
	return c.byTotal()
}
