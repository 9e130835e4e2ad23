package importer

import "github.com/fluecell/fluecell/funcs/units"

// wideColumnNotes says, at the header of each numeric column of a wide
// table that computes nothing, why: a distance with no vehicle type, a
// total of the columns beside it, purchased energy, an energy total or a
// rate, or a name that is no known fuel (a warning).
func (sc *scanCtx) wideColumnNotes(t *table) {
	spec := t.spec
	sheet, hr := spec.sheet, spec.headerRow
	for _, c := range spec.cols {
		if c.role == roleNone && c.numeric && hasWord(words(c.hdr.Base), "water", "wastewater", "sewer", "sewage") {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+
				" is water, not fuel burned or energy bought: not computed (its supply and treatment emissions are outside these functions)")
			continue
		}
		if c.role == roleNone && c.numeric && c.hdr.UnitErr == nil && c.hdr.Unit.Dim == units.Length {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+
				" is a distance driven with no vehicle type: not computed (vehicle_co2e needs the vehicle type, which a mapping can give; the fuel bought, where known, is the better basis)")
			continue
		}
		if c.role != roleNone || !c.numeric || c.hdr.UnitText == "" || !isQuantityDim(c.hdr.Unit) || c.sameAs != nil || c.biogenic || c.partOf != nil {
			continue
		}
		ws := words(c.hdr.Base)
		if hasWord(ws, "total", "totals", "sum", "all") && sameUnitBeside(spec, c) {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+
				" is a total: left out, so that the amounts of the columns beside it are not counted twice")
			continue
		}
		if hasWord(ws, "total", "totals", "sum", "all", "month", "year", "period") {
			continue
		}
		if hasWord(ws, "electricity", "electric", "grid", "power", "heat", "steam", "cooling") {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeFuelUnknown, quoteText(c.hdr.Text)+
				" is purchased energy, not a fuel burned on site (Scope 2, which needs the supplier's or the grid's factor): the column is left out of the totals")
			continue
		}
		if what := notOneFuel(sc.vocab, ws); what != "" {
			sc.warn.add(sheet, c.col, hr, SevInfo, CodeNotComputed, quoteText(c.hdr.Text)+" is "+what+
				", not an amount of one fuel: the column is left out of the totals")
			continue
		}
		msg := "column " + quoteText(c.hdr.Text) + " has a unit but names no known fuel"
		if f := sc.fuel(c.hdr.Base); f.err != nil {
			msg = sc.fuelMessage(c.hdr.Base)
		}
		sc.warn.add(sheet, c.col, hr, SevWarning, CodeFuelUnknown, msg+"; the column is left out of the totals")
	}
}
