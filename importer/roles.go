package importer

import (
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
)

// frac is a/b, 0 when b is 0.
func frac(a, b int) float64 {
	if b == 0 {
		return 0
	}
	return float64(a) / float64(b)
}

func isQuantityDim(u units.Unit) bool {
	return u.Dim == units.Energy || u.Dim == units.Mass || u.Dim == units.Volume
}

// assignRoles gives each column at most one role, from the evidence of its
// header words (tables.Vocab) and of its sampled values together: a fuel
// column mostly holds names that resolve to fuels, a quantity column mostly
// numbers, a unit column units; rates, prices, counts, years and 0/1 flags
// are never quantities, whatever their header says.
func (d *detector) assignRoles(t *tableSpec) {
	taken := func(c *column) bool { return c.role != roleNone }
	rows := t.sampled
	// Existing carbon columns first: "CO2 (kg)" must not read as a quantity.
	for _, c := range t.cols {
		if cc, ok := parseCarbonHeader(c.hdr.Text); ok && (c.numeric || c.st.nonEmpty == 0) {
			c.role, c.carbon = roleExisting, cc
			t.existing = append(t.existing, c)
		}
	}
	textual := func(c *column) bool { return c.st.text > 0 && 2*c.st.text >= c.st.nonEmpty }
	// Fuel: values that name fuels (or energy carriers), weighted by how
	// full the column is; a header that says "fuel" helps, "type" a little.
	var best *column
	bestScore := 0.0
	for _, c := range t.cols {
		if taken(c) || !textual(c) {
			continue
		}
		h := c.st.hint
		share := frac(c.st.fuel, c.st.text)
		carriers := frac(c.st.fuel+c.st.notFuel, c.st.text)
		score := 3*share + carriers + c.st.fill(rows)
		switch {
		case h.Any(tables.HintFuel):
			score += 2
		case h.Any(tables.HintFuelWeak):
			score += 0.5
		case share < 0.4 && frac(c.st.notFuel, c.st.text) < 0.6:
			continue // (a column of energy carriers, electricity among them, is a utility log's)
		}
		if h.Any(tables.HintRate|tables.HintGroup|tables.HintKey) && !h.Any(tables.HintFuel) {
			score -= 2
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	if best != nil && (bestScore >= 2 || best.st.hint.Any(tables.HintFuel)) && best.st.fuel+best.st.notFuel > 0 &&
		(best.st.text < 3 || frac(best.st.fuel+best.st.notFuel, best.st.text) >= 0.2) &&
		(len(best.st.distinct) < 20 || frac(best.st.fuel+best.st.notFuel, best.st.text) >= 0.5) {
		// (Fuel types repeat; a column of mostly different names, a few of
		// which hold a fuel word, is names of sites or firms.)
		best.role, t.fuel = roleFuel, best
	}
	// Technology.
	best, bestScore = nil, 0
	for _, c := range t.cols {
		if taken(c) || !textual(c) || c.st.hint.Any(tables.HintFuel) || c.st.fill(rows) < 0.5 && !c.st.hint.Any(tables.HintTech) {
			continue // a fuel column, or a column mostly blank, is no technology
		}
		ws := words(c.hdr.Base)
		score := 2*frac(c.st.tech, c.st.text) + c.st.fill(rows)
		if c.st.hint.Any(tables.HintTech) || len(ws) == 1 && ws[0] == "type" {
			if frac(c.st.tech, c.st.text) < 0.5 {
				continue
			}
			score += 3
		} else if frac(c.st.tech, c.st.text) < 0.6 {
			continue
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	if best != nil {
		best.role, t.tech = roleTech, best
	}
	// Unit column: values that are units (a column headed "Unit" counts even
	// when its sampled cells are empty or are prices and counts).
	best, bestScore = nil, 0
	for _, c := range t.cols {
		h := c.st.hint
		if taken(c) || !textual(c) && !(c.st.nonEmpty == 0 && h.Any(tables.HintUnit)) {
			continue
		}
		score := 2*frac(c.st.unitLike, c.st.text) + 0.5*frac(c.st.rate, c.st.text)
		if h.Any(tables.HintUnit) && !h.Any(tables.HintGroup|tables.HintKey) {
			if c.st.text >= 3 && frac(c.st.unitLike+c.st.rate, c.st.text) < 0.3 {
				continue // "Boiler/Generator/Committed Unit": headed unit, holding no units
			}
			score += 3
		} else if frac(c.st.unitLike, c.st.text) < 0.6 {
			continue
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	if best != nil {
		best.role, t.unit = roleUnit, best
	}
	// The date or period of each row of a long table.
	for _, c := range t.cols {
		if !taken(c) && c.st.hint.Any(tables.HintPeriod) && c.st.nonEmpty > 0 {
			c.role, t.when = roleWhen, c
			break
		}
	}
	// Build-plan numbers.
	for _, c := range t.cols {
		if taken(c) || !c.numeric {
			continue
		}
		ws := words(c.hdr.Base)
		switch {
		case t.cf == nil && (hasPhrase(ws, "capacity factor", "load factor", "utilisation factor", "utilization factor") || hasWord(ws, "cf", "utilisation", "utilization")):
			c.role, t.cf = roleCF, c
		case t.life == nil && (hasWord(ws, "lifetime", "life", "lifespan") || hasPhrase(ws, "operating years") || c.hdr.Unit.Dim == units.Time && !hasWord(ws, "hours", "date", "year", "month")):
			c.role, t.life = roleLifetime, c
		case t.capacity == nil && t.tech != nil && c.st.hint.Any(tables.HintCapacity|tables.HintQty) && c.hdr.UnitText == "" || t.capacity == nil && t.tech != nil && c.hdr.Unit.Dim == units.Power:
			if !c.st.hint.Any(tables.HintRate) {
				c.role, t.capacity = roleCapacity, c
			}
		}
	}
	// Quantity: a numeric column whose header names an amount or a unit of
	// energy, mass or volume, and whose values are plausible amounts.
	best, bestScore = nil, 0
	for _, c := range t.cols {
		if taken(c) {
			continue
		}
		score, ok := d.quantityScore(t, c)
		if ok && score > bestScore {
			best, bestScore = c, score
		}
	}
	// Without a fuel column, per-fuel columns (a fuel named in each header)
	// win over one amount column read with the title's fuel.
	if best != nil && (t.fuel != nil || t.ctxFuel != "" && !d.hasWideCandidate(t)) && t.rateTitle == "" {
		best.role, t.qty = roleQuantity, best
		if t.fuel == nil {
			d.splitByColumns(t)
		}
	}
	// One column per fuel: the header names a fuel (around usage words:
	// "Natural Gas Use (therms)", "FuelOil2_gal") and a unit, here or in a
	// units row or title.
	if t.qty == nil && t.rateTitle == "" {
		for _, c := range t.cols {
			if taken(c) || c.st.nonEmpty > 0 && !c.numeric {
				continue
			}
			if c.hdr.Flow && t.when == nil {
				continue // a flow per day with no dates: a rate
			}
			if c.st.hint.Any(tables.HintCount) && !c.st.hint.Any(tables.HintQty) || c.st.hint.Any(tables.HintRate) && !c.hdr.Flow || moneyHeader(c.hdr.Text) {
				continue
			}
			f := d.lx.headerFuel(c.hdr.Base)
			fromUnit := false
			if f.kind != nameFuel {
				if f, fromUnit = d.unitFuel(c); !fromUnit {
					continue
				}
			}
			if c.hdr.Unit.Dim == units.Energy && electricOutput(c.hdr.Unit.Symbol) && (c.st.hint.Any(tables.HintOutput) || t.output) {
				continue // electricity generated from the fuel, not the fuel burned
			}
			if c.st.nonEmpty == 0 && t.sampled > 0 && len(t.wide) > 0 && t.wide[len(t.wide)-1].hdr.Text == c.hdr.Text {
				continue // an empty column under the same name as the one before it (footnote marks, spacing)
			}
			if d.lx.fuel(f.id).bio {
				c.biogenic = true
				continue // wood, biodiesel: biogenic CO2 is a memo item, never in the fossil totals
			}
			if c.hdr.UnitText == "" && c.hdr.UnitErr == nil {
				continue
			}
			if c.hdr.UnitErr == nil && !isQuantityDim(c.hdr.Unit) {
				continue
			}
			c.role, c.fuelID, c.fuelAlias, c.fromUnit = roleWideFuel, f.id, f.alias || f.name != c.hdr.Base, fromUnit
			t.wide = append(t.wide, c)
		}
		t.wide = dropParts(t.wide)
	}
	// A fuel per row and a period per column: Fuel | Unit | Jan | Feb ...
	if t.qty == nil && len(t.wide) == 0 && t.fuel != nil {
		var ps []*column
		for _, c := range t.cols {
			if !taken(c) && (c.numeric || c.st.nonEmpty == 0) && tables.PeriodHeader(c.hdr.Text) {
				ps = append(ps, c)
			}
		}
		if len(ps) >= 2 {
			for _, c := range ps {
				c.role = rolePeriod
			}
			t.periods = ps
		}
	}
	// Purchased energy (electricity, steam) and the grid of its rows.
	d.assignScope2(t)
	d.findGridCol(t)
	// Refrigerant logs: gas names and a mass added or lost.
	d.assignRefrigerant(t)
	d.assignDistance(t)
	d.findSectorCol(t)
	// Amount columns left out (steam in pounds, unknown names with a unit).
	for _, c := range t.cols {
		if !taken(c) && c.numeric && c.hdr.UnitText != "" && isQuantityDim(c.hdr.Unit) && !c.st.hint.Any(tables.HintRate|tables.HintCount) {
			t.partial = true
		}
	}
	if t.fuel != nil && t.fuel.st.notFuel > 0 {
		t.partial = true
	}
	// Grouping column: a site, region, department...
	for _, c := range t.cols {
		if taken(c) || !textual(c) {
			continue
		}
		if c.st.hint.Any(tables.HintGroup) {
			c.role, t.group = roleGroup, c
			break
		}
	}
}

// quantityScore rates c as the amount column of a fuel log; ok is false
// when its header or values rule it out.
func (d *detector) quantityScore(t *tableSpec, c *column) (float64, bool) {
	h := c.st.hint
	ws := words(c.hdr.Base)
	if c.hdr.Flow {
		if t.when == nil {
			return 0, false // a flow per day with no dates: a rate
		}
		h &^= tables.HintRate // "per Day" over dated rows is an amount
	}
	if h.Any(tables.HintRate|tables.HintCount|tables.HintKey|tables.HintPeriod|tables.HintGroup) && !h.Any(tables.HintQty) {
		return 0, false
	}
	if h.Any(tables.HintRate) || moneyHeader(c.hdr.Text) || strings.Contains(c.hdr.Text, "/") && !c.hdr.Flow {
		return 0, false
	}
	// An engine size, a tank or a vehicle's capacity in litres is not fuel.
	if hasWord(ws, "engine", "displacement", "tank", "size", "capacity", "cylinder", "cylinders", "model") {
		return 0, false
	}
	if c.st.nonEmpty > 0 && !c.numeric {
		// Text where amounts belong ("n/a", "1200 GJ"): the column is still
		// the amount when its header says so and its texts name nothing
		// else, so that each such cell gets its finding.
		if !h.Any(tables.HintQty) || c.st.fuel+c.st.unitLike+c.st.tech+c.st.notFuel > 0 || t.fuel == nil || c.st.text > max(2, c.st.nonEmpty/5) ||
			c.st.text == 0 || c.st.text+c.st.num < c.st.nonEmpty {
			return 0, false
		}
		return 0.25, true
	}
	if c.st.num > 0 && (c.st.years*10 >= c.st.num*9 || c.st.flags == c.st.num && c.st.num >= 3) {
		return 0, false // years, or a 0/1 flag
	}
	if c.hdr.Unit.Dim == units.Energy && electricOutput(c.hdr.Unit.Symbol) && (h.Any(tables.HintOutput) || t.output) {
		return 0, false // electricity generated ("2014 Power generation (MWh)"), not fuel burned
	}
	hasUnit := c.hdr.UnitText != "" && (isQuantityDim(c.hdr.Unit) || c.hdr.UnitErr != nil)
	if c.hdr.UnitText != "" && !hasUnit {
		if c.hdr.Unit.Dim == units.Power && h.Any(tables.HintQty) {
			return 0.25, true // "Consumption (kW)": a power written for an energy, flagged at the header
		}
		return 0, false // a time, a percentage
	}
	score := 0.0
	if h.Any(tables.HintQty) {
		score += 3
	}
	if hasUnit {
		score += 2
		if c.hdr.Base == "" || c.hdr.Base == c.hdr.Text {
			score += 0.5 // the header is the unit itself: "Gallons", "mmbtu"
		}
	}
	if t.fuel == nil && c.hdr.UnitText != "" && d.lx.fuelName(c.hdr.Base).kind == nameFuel && !h.Any(tables.HintFuel) {
		return 0, false // "Diesel (L)": a column per fuel
	}
	if fuelHeader(ws) && hasUnit {
		score += 1 // "Fuel (L)", "Fuel used, kWh"
	}
	if h.Any(tables.HintUnit) && t.unit != nil && t.unit != c && c.numeric && c.st.nonEmpty > 0 && !c.st.hint.Any(tables.HintRate) {
		score += 2.5 // "Units" holding numbers beside "Unit of Measure": how many units
	}
	if score == 0 && t.unit != nil && t.unit.st.hint.Any(tables.HintUnit) && frac(t.unit.st.unitLike, t.unit.st.text) >= 0.5 &&
		c.numeric && c.st.nonEmpty > 0 && !h.Any(tables.HintTotal) && !tables.PeriodHeader(c.hdr.Text) {
		score = 0.5 // the only numbers beside a unit column: "Value"
	}
	if score == 0 {
		return 0, false
	}
	if !hasUnit && c.hdr.UnitErr == nil && t.unit == nil && t.ctxUnit == "" {
		score -= 2.5 // no unit anywhere: a column with one is better
	}
	if t.unit != nil && !hasUnit && h.Any(tables.HintQty) {
		score += 1 // "Fuel Use" beside "Fuel Unit": the amount the unit column is for
	}
	if h.Any(tables.HintTotal) {
		score -= 1 // "Total Fuel MMBtu": a sum beside the amounts
	}
	score += c.st.fill(t.sampled) - 0.1*float64(c.col-t.firstCol)/float64(max(1, t.lastCol-t.firstCol))
	return score, score > 0
}

// dropParts marks, of several per-fuel columns of one fuel, the parts of
// the one whose header says total ("U.S. Natural Gas Total Consumption"
// beside its parts): a total is never added to its parts (subtotals.go
// uses the parts only where the total is empty). Of one fuel given in two
// units it keeps the first.
func dropParts(wide []*column) []*column {
	byFuel := map[string][]*column{}
	for _, c := range wide {
		byFuel[c.fuelID] = append(byFuel[c.fuelID], c)
	}
	var out []*column
	for _, c := range wide {
		same := byFuel[c.fuelID]
		var total *column
		for _, x := range same {
			if hasWord(words(x.hdr.Base), "total", "all") {
				total = x
				break
			}
		}
		if len(same) > 1 && total != nil && c != total && strings.EqualFold(c.hdr.UnitText, total.hdr.UnitText) {
			c.partOf = total // kept: used in the rows where the total is empty (subtotals.go)
			out = append(out, c)
			continue
		}
		// The same fuel again in another unit (Trillion Btu, then Billion
		// gallons): counted once, from its first column.
		if first := same[0]; total == nil && c != first && !strings.EqualFold(c.hdr.UnitText, first.hdr.UnitText) {
			c.role, c.sameAs = roleNone, first
			continue
		}
		out = append(out, c)
	}
	return out
}

func fuelHeader(ws []string) bool {
	if hasWord(ws, qtyWords...) {
		return false
	}
	return hasWord(ws, "fuel", "fuels", "commodity", "carrier", "product", "material", "combustible") ||
		hasPhrase(ws, "energy source", "energy type", "source of energy", "type of fuel", "energy carrier")
}

// decideKind names the table's kind; false when it is not a table fluecell
// can use (no roles, and no user rule whose variables it has).
func (d *detector) decideKind(t *tableSpec) bool {
	switch {
	case t.vehicle != nil && t.qty != nil:
		t.kind = kindDistance
		if t.unit == nil && t.qty.hdr.UnitText == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.qty.col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for " + quoteText(t.qty.hdr.Text) + ": add a unit column or write the unit in the header, e.g. " + quoteText(t.qty.hdr.Base+" (km)") + "; no row is computed"}
		}
	case t.gas != nil && t.qty != nil:
		t.kind = kindRefrigerant
		if t.unit == nil && t.qty.hdr.UnitText == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.qty.col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for " + quoteText(t.qty.hdr.Text) + ": add a unit column or write the unit in the header, e.g. " + quoteText(t.qty.hdr.Base+" (kg)") + "; no row is computed"}
		}
	case t.gas != nil && t.charge != nil:
		t.kind = kindCharge // gases held: nothing released to compute
	case (t.fuel != nil || t.ctxFuel != "") && t.qty != nil:
		t.kind = kindFuelLog
		if t.unit == nil && t.qty.hdr.UnitText == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.qty.col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for " + quoteText(t.qty.hdr.Text) + ": add a unit column or write the unit in the header, e.g. " + quoteText(t.qty.hdr.Base+" (L)") + "; no row is computed"}
		}
	case len(t.periods) > 0:
		t.kind = kindPeriods
		if t.unit == nil && t.ctxUnit == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.periods[0].col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for the amounts by period: add a unit column (L, kWh, t...) beside " + quoteText(t.fuel.hdr.Text) + "; no row is computed"}
		}
	case len(t.wide) > 0 || len(t.scope2) > 0:
		t.kind = kindWide
	case t.tech != nil && t.capacity != nil:
		t.kind = kindBuildPlan
		if t.unit == nil && t.capacity.hdr.UnitText == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.capacity.col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for " + quoteText(t.capacity.hdr.Text) + ": add a unit column or write it in the header, e.g. " + quoteText(t.capacity.hdr.Base+" (MW)") + "; no row is computed"}
		}
	default:
		t.kind = kindCustom
	}
	if len(d.sc.userRules) > 0 {
		return d.sc.rulesFit(t)
	}
	return t.kind != kindCustom
}

// quoteText quotes a cell text for a message, shortened.
func quoteText(s string) string {
	s = strings.ReplaceAll(s, "\n", " ")
	if r := []rune(s); len(r) > 60 {
		s = string(r[:57]) + "..."
	}
	return "\"" + s + "\""
}

// whyNot says why a header with columns but no usable roles is not a table
// fluecell computes: prices or rates, emission factors, carbon figures
// already computed, no fuel, no amount.
func whyNot(t *tableSpec) string {
	at := t.sheet + "!" + cellRef(t.firstCol, t.headerRow)
	var rates, factors, numeric []string
	for _, c := range t.cols {
		if !c.numeric {
			continue
		}
		numeric = append(numeric, c.hdr.Text)
		low := strings.ToLower(c.hdr.Text)
		switch {
		case reSpecies.MatchString(c.hdr.Text) && (strings.Contains(low, "/") || c.st.hint.Any(tables.HintRate)):
			factors = append(factors, c.hdr.Text)
		case c.st.hint.Any(tables.HintRate|tables.HintCount) || moneyHeader(c.hdr.Text) || tables.RateText(c.hdr.Text):
			rates = append(rates, c.hdr.Text)
		}
	}
	switch {
	case t.rateTitle != "":
		return "a table of prices or rates at " + at + " (the title says " + quoteText(strings.TrimSpace(t.rateTitle)) + "): no amounts of fuel to compute"
	case len(factors) > 0:
		return "a table of emission factors at " + at + " (" + quoteText(factors[0]) + "): factors, not amounts of fuel; nothing to compute"
	case len(numeric) > 0 && len(rates) == len(numeric):
		return "a table of prices, rates or counts at " + at + " (" + quoteText(rates[0]) + "): no amounts of fuel to compute"
	case len(t.existing) > 0 && t.qty == nil && len(t.wide) == 0:
		return "carbon figures already computed at " + at + " (" + quoteText(t.existing[0].hdr.Text) + ") and no amounts of fuel beside them"
	case t.fuel == nil && t.ctxFuel == "" && len(t.wide) == 0 && len(numeric) > 0:
		return "no fuel named for the amounts at " + at + ": no column of fuel names, and no fuel in the headers, title rows, sheet or file name (name it in a mapping: fluecell inspect --write-mapping)"
	}
	return noTableHint
}

// electricOutput reports a watt-hour unit (Wh to TWh), the unit of
// electricity generated or sold rather than of fuel burned.
func electricOutput(sym string) bool { return strings.HasSuffix(sym, "Wh") }

// hasWideCandidate reports a numeric column, not taken, whose header names
// a fuel and a unit of energy, mass or volume.
func (d *detector) hasWideCandidate(t *tableSpec) bool {
	for _, c := range t.cols {
		if c.role != roleNone || c.st.nonEmpty > 0 && !c.numeric || c.hdr.UnitText == "" || !isQuantityDim(c.hdr.Unit) {
			continue
		}
		if d.lx.headerFuel(c.hdr.Base).kind == nameFuel {
			return true
		}
	}
	return false
}

// splitByColumns turns the amount of a table without a fuel column into
// one column per part when the header gives the title's fuel by parts
// under one name ("Total consumption (GWh): Domestic | Non-Domestic | All
// meters"): each is a column of the title's fuel, and subtotals.go counts
// each row's total, never its parts as well.
func (d *detector) splitByColumns(t *tableSpec) {
	q := t.qty
	lead := func(c *column) string {
		ws := words(c.hdr.Base)
		if len(ws) > 2 {
			ws = ws[:2]
		}
		return strings.Join(ws, " ")
	}
	var same []*column
	for _, c := range t.cols {
		if c == q || c.role != roleNone || !strings.EqualFold(c.hdr.UnitText, q.hdr.UnitText) || c.hdr.Scale != q.hdr.Scale || lead(c) != lead(q) {
			continue
		}
		if _, ok := d.quantityScore(t, c); ok {
			same = append(same, c)
		}
	}
	if len(same) == 0 {
		return
	}
	t.qty = nil
	for _, c := range append([]*column{q}, same...) {
		c.role, c.fuelID, c.fuelAlias = roleWideFuel, t.ctxFuel, true
		t.wide = append(t.wide, c)
	}
	sort.Slice(t.wide, func(i, j int) bool { return t.wide[i].col < t.wide[j].col })
}
