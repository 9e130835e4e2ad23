package importer

import (
	"math"
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// The checks that need whole columns: outliers by fuel and unit (outliers.go), units mixed
// in one column, the workbook's own carbon figures against the computed ones.

// collectSamples keeps positive quantities by fuel and unit for the
// outlier check, and a fuel log's unit prices when it has a cost column
// (outliers.go, prices.go). Every positive amount of the table is kept,
// in pages (samples.go).
func (sc *scanCtx) collectSamples(t *table, i, rowNum int, vars map[string]any, samples *sampleSet) {
	spec := t.spec
	switch spec.kind {
	case kindFuelLog:
		q, ok := vars[spec.qty.ident].(float64)
		if !ok || q <= 0 {
			return
		}
		fs, ok1 := spec.ctxFuel, true
		if spec.fuel != nil {
			fs, ok1 = vars[spec.fuel.ident].(string)
		}
		unit := spec.qty.hdr.UnitText
		if spec.unit != nil {
			us, ok2 := vars[spec.unit.ident].(string)
			if !ok2 {
				return
			}
			unit = us
		}
		if !ok1 {
			return
		}
		// A fuel and unit as written map to one key: worked out once.
		rk := rawSampleKey{col: spec.qty.col, fuel: fs, unit: unit}
		m, seen := samples.memo[rk]
		if !seen {
			m = sc.sampleKeys(t, samples, rk)
			if len(samples.memo) < maxFoldCache {
				samples.memo[rk] = m
			}
		}
		if m.amount < 0 {
			return
		}
		samples.addAt(m.amount, rowNum, spec.qty.col, q, fs, 0)
		t.priceSample(m.price, i, rowNum, q, samples)
		if !seen {
			sc.gasKWh(spec.sheet, spec.qty.col, rowNum, m.fuelID, m.unit)
		}
	case kindPeriods:
		fs, ok1 := vars[spec.fuel.ident].(string)
		us, ok2 := spec.ctxUnit, true
		if spec.unit != nil {
			us, ok2 = vars[spec.unit.ident].(string)
		}
		if !ok1 || !ok2 {
			return
		}
		f, u := sc.fuel(fs), sc.unit(us)
		if f.err != nil || u.err != nil {
			return
		}
		k := spec.sheet + "|" + colName(spec.periods[0].col) + "|" + f.id + "|" + u.u.String()
		for _, c := range spec.periods {
			if q, ok := vars[c.ident].(float64); ok && q > 0 {
				samples.add(k, rowNum, c.col, q, fs, 0)
			}
		}
	case kindWide:
		for _, c := range spec.wide {
			if q, ok := vars[c.ident].(float64); ok && q > 0 {
				k := spec.sheet + "|" + colName(c.col) + "|" + c.fuelID
				samples.add(k, rowNum, c.col, q, "", 0)
			}
		}
	}
}

// sampleKeys works out the sample keys of a fuel and unit as a fuel log
// writes them: the amounts' (sheet, column, fuel id and unit) and the unit
// prices' when the table has a cost column; amount is -1 when the fuel or
// the unit is not known.
func (sc *scanCtx) sampleKeys(t *table, samples *sampleSet, rk rawSampleKey) sampleKeys {
	f, u := sc.fuel(rk.fuel), sc.unit(rk.unit)
	if f.err != nil || u.err != nil {
		return sampleKeys{amount: -1, price: -1}
	}
	spec := t.spec
	k := spec.sheet + "|" + colName(spec.qty.col) + "|" + f.id + "|" + u.u.String()
	m := sampleKeys{amount: samples.keyIndex(k), price: -1, fuelID: f.id, unit: u.u}
	if t.cost != nil {
		m.price = samples.keyIndex(pricePrefix + colName(t.cost.col.col) + "|" + k)
	}
	return m
}

// noteUnitSym counts row r in the unit whose symbol (units.Unit.String) is
// sym, for the mixed-unit check.
func (t *table) noteUnitSym(sym string, r int) {
	if t.unitsSeen == nil {
		t.unitsSeen = map[string]*unitSeen{}
	}
	s := t.unitsSeen[sym]
	if s == nil {
		s = &unitSeen{sym: sym, first: r}
		t.unitsSeen[sym] = s
		t.unitOrder = append(t.unitOrder, sym)
	}
	s.rows++
}

// checkMixed notes once per unit column that it mixes units.
func (sc *scanCtx) checkMixed(t *table) {
	if len(t.unitOrder) < 2 || t.spec.unit == nil {
		return
	}
	list := make([]*unitSeen, 0, len(t.unitOrder))
	for _, s := range t.unitOrder {
		list = append(list, t.unitsSeen[s])
	}
	sort.SliceStable(list, func(i, j int) bool { return list[i].rows > list[j].rows })
	var parts []string
	for _, s := range list {
		parts = append(parts, s.sym+" in "+plural(s.rows, "row"))
	}
	second := list[1]
	for _, s := range list[2:] {
		if s.first < second.first {
			second = s
		}
	}
	c := t.spec.unit
	sc.warn.add(t.spec.sheet, c.col, second.first, SevWarning, CodeUnitMixed, "column "+colName(c.col)+" ("+quoteText(c.hdr.Text)+") mixes units: "+
		strings.Join(parts, ", ")+"; each row is converted from its own unit (first "+second.sym+" here)")
}

// checkExisting compares the workbook's own carbon figures with the
// computed ones (more than 2 % apart is flagged).
//
// A table whose columns fluecell computes only in part (electricity or
// steam beside the fuels, a fuel it cannot read) is not compared: the
// workbook's figure covers more than fluecell's.
func (sc *scanCtx) checkExisting(t *table, i, rowNum int) {
	if t.spec.partial {
		return
	}
	for _, c := range t.spec.existing {
		if c.carbon.unit.Symbol == "" {
			continue
		}
		want := -1
		for ri, r := range t.rules {
			if (c.carbon.species == "CO2" || c.carbon.species == "C") && r.total == 1 || c.carbon.species == "CO2e" && r.total == 2 {
				want = ri
			}
		}
		if want < 0 {
			continue
		}
		ours := t.res[want].at(i)
		if math.IsNaN(ours) {
			continue
		}
		v := t.val(i, t.slotOf[c.col])
		var theirs float64
		switch v.kind {
		case kNumber:
			theirs = v.num
		case kText:
			f, ok, _ := textNumber(v.text)
			if !ok {
				continue
			}
			theirs = f
		default:
			continue
		}
		unitT := c.carbon.unit.SIFloat() / 1000 * c.carbon.scale // tonnes per unit
		theirsT := theirs * unitT
		oursS := ours
		label := "t CO2"
		if t.rules[want].total == 2 {
			label = "t CO2e"
		}
		if c.carbon.species == "C" {
			oursS = ours * 12 / 44
			label = "t C"
		}
		diff := theirsT - oursS
		if math.Abs(diff) <= 0.02*math.Abs(oursS) || oursS == 0 && theirsT == 0 {
			continue
		}
		pct := "n/a"
		if oursS != 0 {
			pct = signed(math.Round(1000*diff/math.Abs(oursS))/10) + " %"
		}
		msg := "the workbook says " + funcs.FormatNumber(theirs) + " " + c.carbon.unit.Symbol + " " + c.carbon.species
		if c.carbon.unit.Symbol != "t" {
			msg += " (" + funcs.FormatNumber(roundSig(theirsT)) + " " + label + ")"
		}
		msg += ", fluecell computes " + funcs.FormatNumber(roundSig(oursS)) + " " + label +
			" with rule " + t.rules[want].column + ": " + pct
		if c.carbon.species == "C" && math.Abs(theirsT-ours) <= 0.02*math.Abs(ours) {
			msg += "; the figure matches CO2, not carbon: is the column mislabelled?"
		}
		sc.warn.add(t.spec.sheet, c.col, rowNum, SevWarning, CodeExistingMismatch, msg)
	}
}

func signed(x float64) string {
	if x > 0 {
		return "+" + funcs.FormatNumber(x)
	}
	return funcs.FormatNumber(x)
}

// roundSig rounds to 6 significant digits for messages.
func roundSig(x float64) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	p := math.Pow(10, 5-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*p) / p
}

// gasKWh notes, once per column, natural gas in watt-hours without a basis:
// gas bills state kWh gross (GCV), while the amount is read on the pack's
// basis. (Gas suppliers in the UK and EU bill kWh computed with the gross
// calorific value: common practice.)
func (sc *scanCtx) gasKWh(sheet string, col, row int, fuelID string, u units.Unit) {
	if fuelID != "natural_gas" || u.Dim != units.Energy || u.Basis != units.NoBasis || !strings.HasSuffix(u.Symbol, "Wh") || sc.packBasis != units.NCV {
		return
	}
	sc.warn.addOnce("gaskwh|"+sheet+"|"+colName(col), sheet, col, row, SevWarning, CodeUnitBasis,
		"natural gas in "+u.Symbol+" without a basis is read as NCV (net), the basis of pack "+sc.packName+
			"; gas bills usually give kWh gross (GCV): write \""+u.Symbol+" GCV\" if these are billed amounts (about 10 % less CO2)")
}
