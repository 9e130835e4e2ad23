package importer

import (
	"github.com/fluecell/fluecell/importer/tables"
	"math"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// The value functions turn a stored cell into the value a rule variable
// gets, and record a warning at the cell when it needs one. ok is false when
// the row cannot be computed from this cell (never a guess).

func (sc *scanCtx) value(t *table, i int, b *binding) (any, bool) {
	if b.days {
		if t.days == nil {
			t.days = t.periodDays()
		}
		if d := t.days.at(i); !math.IsNaN(d) {
			return d, true
		}
		w := t.spec.when
		sc.warn.add(t.spec.sheet, w.col, t.rowNum(i), SevError, CodeValueNotNumber,
			"no date that gives this row's period, so its amounts per day cannot be added up; row not computed")
		return nil, false
	}
	if b.col == nil {
		if b.unitOf != nil && b.unitOf.hdr.UnitErr == nil && !b.unitOf.unitBad {
			return b.constant, true
		}
		return nil, false
	}
	c := b.col
	v := t.val(i, b.slot)
	r := t.rowNum(i)
	switch c.role {
	case roleFuel:
		return sc.fuelValue(t, c, v, r)
	case roleUnit:
		return sc.unitValue(t, c, v, r)
	case roleTech:
		return sc.techValue(t, c, v, r)
	case roleSector:
		return sc.sectorValue(t, c, v, r)
	case roleQuantity, roleWideFuel, rolePeriod, roleCapacity, roleCF, roleLifetime, roleExisting, roleCarrier:
		return sc.numberValue(t, c, v, r)
	}
	if c.numeric {
		return sc.numberValue(t, c, v, r)
	}
	switch v.kind {
	case kNumber:
		return v.num, true
	case kText:
		return v.text, true
	case kEmpty:
		if v.noCache {
			if s, ok := sc.formulaText(t, c, r); ok {
				return s, true
			}
			return nil, false
		}
	}
	sc.warn.add(t.spec.sheet, c.col, r, SevError, CodeValueNotNumber, "empty: no value for "+c.ident+"; row not computed")
	return nil, false
}

func (sc *scanCtx) fuelValue(t *table, c *column, v cellVal, r int) (any, bool) {
	sheet := t.spec.sheet
	var text string
	switch v.kind {
	case kText:
		text = v.text
	case kNumber:
		sc.warn.add(sheet, c.col, r, SevError, CodeFuelUnknown, "the number "+funcs.FormatNumber(v.num)+" is not a fuel name: write the fuel, e.g. natural_gas or diesel; row not computed")
		return nil, false
	case kEmpty:
		if v.noCache {
			s, ok := sc.formulaText(t, c, r)
			if !ok {
				return nil, false
			}
			text = s
		} else {
			sc.warn.add(sheet, c.col, r, SevError, CodeFuelUnknown, "no fuel given: write the fuel, e.g. natural_gas or diesel; row not computed")
			return nil, false
		}
	default:
		sc.warn.add(sheet, c.col, r, SevError, CodeFuelUnknown, "the cell holds "+v.text+", not a fuel name; row not computed")
		return nil, false
	}
	memo := v.kind == kText
	if memo {
		if name, ok := t.fuelMemo(c.col, text); ok {
			return name, true
		}
	}
	fr := sc.fuelName(text)
	switch fr.kind {
	case nameFuel:
	case nameNotFuel, nameAggregate, nameRate:
		sc.warn.add(sheet, c.col, r, SevInfo, CodeNotComputed, quoteText(text)+" is "+fr.why+"; row not computed"+notFuelHint(fr))
		return nil, false
	default:
		sc.warn.add(sheet, c.col, r, SevError, CodeFuelUnknown, notComputed(sc.fuelMessage(text)))
		return nil, false
	}
	if fr.alias && !fr.same {
		sc.warn.addOnce("alias|"+sheet+"|"+colName(c.col)+"|"+strings.ToLower(strings.TrimSpace(text)), sheet, c.col, r, SevInfo, CodeFuelAlias,
			quoteText(text)+" read as "+fr.id+" (here and in every cell of column "+colName(c.col)+" that says so)")
	}
	if memo {
		t.keepFuel(c.col, text, fr.name)
	}
	return fr.name, true
}

// notFuelHint says what to do about a row that names no fuel burned on site.
func notFuelHint(fr fuelRef) string {
	if fr.nonEnergy {
		return " (if some of it was burned as fuel, compute that amount with a rule over fuel_co2 or fuel_co2e)"
	}
	if fr.kind == nameNotFuel {
		return " (electricity, heat and steam bought are Scope 2 and need a grid or supplier factor; fluecell computes fuels burned on site)"
	}
	return ""
}

// unitText is the unit a row states: its unit cell, or the quantity's
// header unit when the cell is empty.
func (sc *scanCtx) unitValue(t *table, c *column, v cellVal, r int) (any, bool) {
	sheet := t.spec.sheet
	var s string
	switch v.kind {
	case kText:
		if m, ok := t.unitMemo(c.col, v.text, sc.delivered); ok {
			t.noteUnitSym(m.sym, r)
			return m.out, true
		}
		s = strings.TrimSpace(v.text)
	case kEmpty:
		if v.noCache {
			x, ok := sc.formulaText(t, c, r)
			if !ok {
				return nil, false
			}
			s = strings.TrimSpace(x)
			break
		}
		if q := t.amountCol(); q != nil && q.hdr.UnitText != "" && q.hdr.UnitErr == nil {
			return q.hdr.UnitText, true
		}
		sc.warn.add(sheet, c.col, r, SevError, CodeUnitUnknown, "no unit: write one such as L, kWh, t, GJ or MMBtu HHV; row not computed")
		return nil, false
	default:
		sc.warn.add(sheet, c.col, r, SevError, CodeUnitUnknown, quoteText(cell{kind: v.kind, num: v.num, text: v.text}.display())+" is not a unit: write one such as L, kWh, t or GJ; row not computed")
		return nil, false
	}
	if why := sc.notAmount(s); why != "" {
		sc.warn.add(sheet, c.col, r, SevInfo, CodeNotComputed, quoteText(s)+" is "+why+", not an amount of fuel; row not computed")
		return nil, false
	}
	u, ok := sc.checkUnit(t, c, s, c.col, r, t.spec.kind == kindBuildPlan)
	if !ok {
		return nil, false
	}
	sym := u.String()
	t.noteUnitSym(sym, r)
	out := sc.gallonUnit(t, c.col, r, s)
	if v.kind == kText {
		t.keepUnit(c.col, v.text, sc.delivered, unitMemo{out: out, sym: sym})
	}
	return out, true
}

// checkUnit parses a unit for a quantity (energy, mass or volume) or, with
// power, a capacity; it records the warnings of the cell (or header) at
// (col, r): unknown, ambiguous or wrong-dimension units, and the basis.
func (sc *scanCtx) checkUnit(t *table, c *column, s string, col, r int, power bool) (units.Unit, bool) {
	sheet := t.spec.sheet
	res := sc.unit(s)
	if res.err != nil {
		sc.warn.add(sheet, col, r, SevError, res.err.Code, notComputed(sc.unitMessage(s, res.err)))
		return units.Unit{}, false
	}
	u := res.u
	want := []units.Dimension{units.Energy, units.Mass, units.Volume}
	switch {
	case power:
		want = []units.Dimension{units.Power}
	case t.spec.kind == kindDistance:
		want = []units.Dimension{units.Length} // km or miles driven
	}
	if _, err := units.ParseAs(s, want...); err != nil {
		msg := err.Error()
		if u.Dim == units.Power && !power {
			msg += ": a power is a rate, so no amount of fuel can be read from it"
		}
		sc.warn.add(sheet, col, r, SevError, units.CodeDimension, notComputed(msg))
		return units.Unit{}, false
	}
	if u.Dim == units.Energy && sc.packBasis != units.NoBasis && !sc.delivered {
		key := "basis|" + sheet + "|" + colName(c.col) + "|" + s
		switch {
		case u.Basis != units.NoBasis && u.Basis != sc.packBasis:
			sc.warn.addOnce(key, sheet, col, r, SevInfo, CodeUnitBasis,
				quoteText(s)+" declares "+u.Basis.String()+"; pack "+sc.packName+" is on an "+sc.packBasis.String()+
					" basis, so the amounts are converted with the pack's NCV/GCV ratio (see Carbon sources)")
		case u.Basis == units.NoBasis && u.Usual != units.NoBasis && u.Usual != sc.packBasis:
			sc.warn.addOnce(key, sheet, col, r, SevInfo, CodeUnitBasis,
				quoteText(s)+" states no basis and is read as "+u.Usual.String()+" (gross), the North American convention for "+u.Symbol+
					"; pack "+sc.packName+" is on an "+sc.packBasis.String()+" basis, so the amounts are converted with its NCV/GCV ratio (see Carbon sources); write \""+
					u.Symbol+" NCV\" if the figures are net")
		}
	}
	return u, true
}

// amountCol is the column whose header unit stands in for an empty unit cell.
func (t *table) amountCol() *column {
	if t.spec.qty != nil {
		return t.spec.qty
	}
	return t.spec.capacity
}

func (sc *scanCtx) techValue(t *table, c *column, v cellVal, r int) (any, bool) {
	sheet := t.spec.sheet
	if v.kind != kText {
		sc.warn.add(sheet, c.col, r, SevError, CodeTechUnknown, quoteText(cell{kind: v.kind, num: v.num, text: v.text}.display())+
			" is not a technology name; row not computed")
		return nil, false
	}
	res := sc.tech(v.text)
	if res.err != nil {
		msg := res.err.Error()
		if fe, ok := funcs.AsError(res.err); ok {
			msg = fe.Msg
		}
		sc.warn.add(sheet, c.col, r, SevError, CodeTechUnknown, notComputed(msg))
		return nil, false
	}
	return v.text, true
}

// numberValue reads a number; text that holds one unambiguously is read
// and flagged, an empty cell of a per-fuel column counts as zero.
func (sc *scanCtx) numberValue(t *table, c *column, v cellVal, r int) (any, bool) {
	sheet := t.spec.sheet
	var x float64
	switch v.kind {
	case kNumber:
		x = v.num
	case kText:
		f, ok, amb := textNumber(v.text)
		if !ok && c.numStyle != styleUnknown {
			f, ok = textNumberIn(v.text, c.numStyle)
			amb = amb && !ok
		}
		switch {
		case ok:
			sev := SevWarning
			if sc.csv {
				sev = SevInfo
			}
			msg := "number stored as text " + quoteText(v.text) + ": read as " + funcs.FormatNumber(f)
			if !sc.csv {
				msg += "; Excel leaves text out of sums: store it as a number"
			}
			sc.warn.add(sheet, c.col, r, sev, CodeValueTextNumber, msg)
			x = f
		case amb:
			sc.warn.add(sheet, c.col, r, SevError, CodeValueNotNumber, quoteText(v.text)+" could be "+
				funcs.FormatNumber(mustThousands(v.text))+" (thousands comma) or "+funcs.FormatNumber(mustDecimalComma(v.text))+
				" (decimal comma): store it as a number; row not computed")
			return nil, false
		default:
			if c.perColumn() && isDash(v.text) {
				return 0.0, true
			}
			if tables.Missing(v.text) {
				if c.perColumn() {
					// One fuel of the row not given: the row's other fuels still count.
					sc.warn.add(sheet, c.col, r, SevInfo, CodeNotComputed, quoteText(v.text)+": the source gives no value here; counted as none of this fuel, the row's other amounts still count")
					return 0.0, true
				}
				sc.warn.add(sheet, c.col, r, SevInfo, CodeNotComputed, quoteText(v.text)+": the source gives no value here; row not computed")
				return nil, false
			}
			msg := quoteText(v.text) + " is not a number; row not computed"
			if num, unit, ok := numberWithUnit(v.text); ok {
				msg = quoteText(v.text) + " holds a number and a unit: write " + num + " here and " + unit + " in the unit column (or the header); row not computed"
			}
			sc.warn.add(sheet, c.col, r, SevError, CodeValueNotNumber, msg)
			return nil, false
		}
	case kEmpty:
		if v.noCache {
			f, ok := sc.formulaNumber(t, c, r)
			if !ok {
				return nil, false
			}
			x = f
			break
		}
		switch c.role {
		case roleWideFuel, rolePeriod, roleCarrier:
			return 0.0, true
		case roleQuantity, roleCapacity:
			sc.warn.add(sheet, c.col, r, SevWarning, CodeValueNotNumber, "no "+strings.ToLower(c.hdr.Base)+" given; row not computed")
		default:
			sc.warn.add(sheet, c.col, r, SevError, CodeValueNotNumber, "empty: no value for "+c.ident+"; row not computed")
		}
		return nil, false
	case kBool:
		sc.warn.add(sheet, c.col, r, SevError, CodeValueNotNumber, v.text+" is a boolean, not a number; row not computed")
		return nil, false
	default:
		sc.warn.add(sheet, c.col, r, SevError, CodeValueNotNumber, "the cell holds the error "+v.text+"; row not computed")
		return nil, false
	}
	if c.hdr.Percent && c.role != roleCF {
		x /= 100
	}
	if x < 0 && (c.role == roleQuantity || c.perColumn() || c.role == roleCapacity) {
		sc.warn.add(sheet, c.col, r, SevWarning, CodeValueNegative, "negative "+strings.ToLower(c.hdr.Base)+" "+funcs.FormatNumber(x)+
			" (a return or a correction?): computed, giving negative emissions")
	}
	return x, true
}

func isDash(s string) bool {
	s = strings.TrimSpace(s)
	return s == "-" || s == "–" || s == "—"
}

func mustThousands(s string) float64 {
	f, _ := textNumberPlain(strings.ReplaceAll(s, ",", ""))
	return f
}

func mustDecimalComma(s string) float64 {
	f, _ := textNumberPlain(strings.ReplaceAll(s, ",", "."))
	return f
}

func textNumberPlain(s string) (float64, bool) {
	f, ok, _ := textNumber(s)
	return f, ok
}

// formulaNumber evaluates a formula that has no cached value.
func (sc *scanCtx) formulaNumber(t *table, c *column, r int) (float64, bool) {
	s, ok := sc.formulaText(t, c, r)
	if !ok {
		return 0, false
	}
	f, isNum, _ := textNumber(s)
	if !isNum {
		sc.warn.add(t.spec.sheet, c.col, r, SevError, CodeFormulaNoCache, "formula without a stored result; fluecell evaluated it to "+quoteText(s)+", which is not a number; row not computed")
		return 0, false
	}
	return f, true
}

// formulaText evaluates a formula without a cached value where it can; the
// warning says that the value is fluecell's, not the workbook's.
func (sc *scanCtx) formulaText(t *table, c *column, r int) (string, bool) {
	sheet := t.spec.sheet
	if sc.calc != nil {
		if s, ok := sc.calc.calc(sheet, cellRef(c.col, r)); ok {
			sc.warn.add(sheet, c.col, r, SevWarning, CodeFormulaNoCache, "formula without a stored result: fluecell evaluated it to "+
				quoteText(s)+"; open and save the workbook in Excel or LibreOffice to store its results")
			return s, true
		}
	}
	sc.warn.add(sheet, c.col, r, SevError, CodeFormulaNoCache, "formula without a stored result, which fluecell cannot evaluate here: open and save the workbook in Excel or LibreOffice, then annotate it again; row not computed")
	return "", false
}

// notComputed ends a message with the consequence for the row.
func notComputed(msg string) string {
	return msg + "; row not computed"
}

// sameName reports a fuel written as its id in other case or with spaces
// ("Natural gas" for natural_gas): not worth a note.
func sameName(text, id string) bool {
	return strings.Join(words(text), "_") == id
}

// numberWithUnit splits "1200 litres" or "3.5t" into a number and a unit.
func numberWithUnit(s string) (num, unit string, ok bool) {
	s = strings.TrimSpace(s)
	i := strings.LastIndexAny(s, "0123456789")
	if i <= 0 || i == len(s)-1 {
		return "", "", false
	}
	num, unit = strings.TrimSpace(s[:i+1]), strings.TrimSpace(s[i+1:])
	if _, isNum, _ := textNumber(num); !isNum {
		return "", "", false
	}
	if _, err := units.Parse(unit); err != nil {
		return "", "", false
	}
	return num, unit, true
}
