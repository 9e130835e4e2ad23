package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
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

// assignRoles gives each column of t at most one role, from its header and
// the sampled values.
func (d *detector) assignRoles(t *tableSpec) {
	sc := d.sc
	taken := func(c *column) bool { return c.role != roleNone }
	// Existing carbon columns first: "CO2 (kg)" must not read as a quantity.
	for _, c := range t.cols {
		if cc, ok := parseCarbonHeader(c.hdr.text); ok && (c.numeric || c.st.nonEmpty == 0) {
			c.role, c.carbon = roleExisting, cc
			t.existing = append(t.existing, c)
		}
	}
	textual := func(c *column) bool { return c.st.text > 0 && 2*c.st.text >= c.st.nonEmpty }
	// Fuel: a header that says so, or values that are mostly fuel names.
	var best *column
	bestScore := 0.0
	for _, c := range t.cols {
		if taken(c) || !textual(c) {
			continue
		}
		ws := words(c.hdr.base)
		score := 2 * frac(c.st.fuel, c.st.text)
		if fuelHeader(ws) {
			score += 3
		} else if score < 1.2 {
			continue
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	if best != nil {
		best.role, t.fuel = roleFuel, best
	}
	// Technology.
	best, bestScore = nil, 0
	for _, c := range t.cols {
		if taken(c) || !textual(c) {
			continue
		}
		ws := words(c.hdr.base)
		score := 2 * frac(c.st.tech, c.st.text)
		if hasWord(ws, techWords...) || hasPhrase(ws, "generation type", "plant type", "asset type") || len(ws) == 1 && ws[0] == "type" {
			if score < 1 {
				continue
			}
			score += 3
		} else if score < 1.2 {
			continue
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	if best != nil {
		best.role, t.tech = roleTech, best
	}
	// Unit column (a column headed "Unit" counts even when its sampled
	// cells are empty).
	best, bestScore = nil, 0
	for _, c := range t.cols {
		ws := words(c.hdr.base)
		if taken(c) || !textual(c) && !(c.st.nonEmpty == 0 && hasWord(ws, unitWords...)) {
			continue
		}
		score := 2 * frac(c.st.unitLike, c.st.text)
		if hasWord(ws, unitWords...) && !hasWord(ws, groupWords...) || hasPhrase(ws, "unit of measure", "unit of measurement") {
			score += 3
		} else if score < 1.2 {
			continue
		}
		if score > bestScore {
			best, bestScore = c, score
		}
	}
	if best != nil {
		best.role, t.unit = roleUnit, best
	}
	// Build-plan numbers.
	for _, c := range t.cols {
		if taken(c) || !c.numeric {
			continue
		}
		ws := words(c.hdr.base)
		switch {
		case t.cf == nil && (hasPhrase(ws, "capacity factor", "load factor", "utilisation factor", "utilization factor") || hasWord(ws, "cf", "utilisation", "utilization")):
			c.role, t.cf = roleCF, c
		case t.life == nil && (hasWord(ws, "lifetime", "life", "lifespan") || hasPhrase(ws, "operating years") || c.hdr.unit.Dim == units.Time && !hasWord(ws, "hours", "date", "year", "month")):
			c.role, t.life = roleLifetime, c
		case t.capacity == nil && t.tech != nil && (hasWord(ws, capacityWords...) || c.hdr.unit.Dim == units.Power):
			c.role, t.capacity = roleCapacity, c
		}
	}
	// Quantity: a numeric column whose header names an amount or a unit;
	// failing that, a column so headed whose cells are not numbers (they
	// get warnings).
	best, bestScore = nil, 0
	for pass := 0; pass < 2 && best == nil; pass++ {
		for _, c := range t.cols {
			if taken(c) || moneyHeader(c.hdr.text) || pass == 0 && !c.numeric || pass == 1 && (c.numeric || !hasWord(words(c.hdr.base), qtyWords...)) {
				continue
			}
			ws := words(c.hdr.base)
			if hasWord(ws, notQtyWords...) {
				continue
			}
			if c.hdr.unitTxt != "" && sc.fuel(c.hdr.base).err == nil && !hasWord(ws, qtyWords...) && !fuelHeader(ws) {
				continue // "Diesel (L)": a column per fuel
			}
			score := 0.0
			if hasWord(ws, qtyWords...) {
				score += 3
			}
			if c.hdr.unitTxt != "" && (isQuantityDim(c.hdr.unit) || c.hdr.unitErr != nil) {
				score += 2
			}
			if fuelHeader(ws) && c.hdr.unitTxt != "" {
				score += 1 // "Fuel (L)", "Fuel used, kWh"
			}
			if score == 0 {
				continue
			}
			if score > bestScore {
				best, bestScore = c, score
			}
		}
	}
	if best != nil && t.fuel != nil {
		best.role, t.qty = roleQuantity, best
	}
	// One column per fuel.
	if t.qty == nil {
		for _, c := range t.cols {
			if taken(c) || c.st.nonEmpty > 0 && !c.numeric {
				continue
			}
			f := sc.fuel(c.hdr.base)
			if f.err != nil || c.hdr.unitTxt == "" && c.hdr.unitErr == nil {
				continue
			}
			if c.hdr.unitErr == nil && !isQuantityDim(c.hdr.unit) {
				continue
			}
			c.role, c.fuelID, c.fuelAlias = roleWideFuel, f.id, f.alias
			t.wide = append(t.wide, c)
		}
	}
	// A fuel per row and a period per column: Fuel | Unit | Jan | Feb ...
	if t.qty == nil && len(t.wide) == 0 && t.fuel != nil {
		var ps []*column
		for _, c := range t.cols {
			if !taken(c) && (c.numeric || c.st.nonEmpty == 0) && periodHeader(c.hdr.text) {
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
	// Grouping column: a site, region, department...
	for _, c := range t.cols {
		if taken(c) || !textual(c) {
			continue
		}
		if hasWord(words(c.hdr.base), groupWords...) {
			c.role, t.group = roleGroup, c
			break
		}
	}
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
	case t.fuel != nil && t.qty != nil:
		t.kind = kindFuelLog
		if t.unit == nil && t.qty.hdr.unitTxt == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.qty.col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for " + quoteText(t.qty.hdr.text) + ": add a unit column or write the unit in the header, e.g. " + quoteText(t.qty.hdr.base+" (L)") + "; no row is computed"}
		}
	case len(t.periods) > 0:
		t.kind = kindPeriods
		if t.unit == nil {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.periods[0].col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for the amounts by period: add a unit column (L, kWh, t...) beside " + quoteText(t.fuel.hdr.text) + "; no row is computed"}
		}
	case len(t.wide) > 0:
		t.kind = kindWide
	case t.tech != nil && t.capacity != nil:
		t.kind = kindBuildPlan
		if t.unit == nil && t.capacity.hdr.unitTxt == "" {
			t.headerErr = &Warning{Sheet: t.sheet, Cell: cellRef(t.capacity.col, t.headerRow), Severity: SevError, Code: CodeUnitUnknown,
				Message: "no unit for " + quoteText(t.capacity.hdr.text) + ": add a unit column or write it in the header, e.g. " + quoteText(t.capacity.hdr.base+" (MW)") + "; no row is computed"}
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

// periodHeader recognises a column per period: month names (Jan, January,
// Jan-25, 2025-01), quarters and halves (Q1, H2 2025), years (2024, FY2025)
// and dates stored as numbers (Excel serials of 1955 to 2118).
func periodHeader(text string) bool {
	ws := words(text)
	if len(ws) == 0 || len(ws) > 3 {
		return false
	}
	months := []string{"jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "sept", "oct", "nov", "dec",
		"january", "february", "march", "april", "june", "july", "august", "september", "october", "november", "december"}
	for _, w := range ws {
		switch {
		case hasWord([]string{w}, months...):
		case len(w) == 2 && (w[0] == 'q' && w[1] >= '1' && w[1] <= '4' || w[0] == 'h' && (w[1] == '1' || w[1] == '2')):
		case strings.HasPrefix(w, "fy") && allDigits(w[2:]) && (len(w) == 4 || len(w) == 6):
		case allDigits(w) && (len(w) == 2 || len(w) == 4 && w >= "1990" && w <= "2100"):
		case allDigits(w) && len(w) == 5 && w >= "20000" && w <= "80000" && len(ws) == 1:
		default:
			return false
		}
	}
	return true
}

func allDigits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return s != ""
}
