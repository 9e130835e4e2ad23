package funcs

import (
	"sort"
	"strings"
)

// Fuel describes a canonical fuel id: its display name, the family used for
// heating-value basis conversions, and whether its CO2 is biogenic.
type Fuel struct {
	ID       string   `json:"id"`
	Name     string   `json:"name"`
	Family   string   `json:"family,omitempty"` // coal, oil or gas; "" when no NCV/GCV ratio applies
	Biogenic bool     `json:"biogenic"`         // CO2 is reported separately (memo item), not in totals
	Aliases  []string `json:"aliases,omitempty"`
	Custom   bool     `json:"custom,omitempty"` // defined only by a user pack
}

// builtinFuels lists the canonical fuel ids of the design with their aliases.
// Aliases are matched case- and space-insensitively (see normalizeName).
func builtinFuels() []Fuel {
	return []Fuel{
		{ID: "crude_oil", Name: "crude oil", Family: "oil", Aliases: []string{"crude"}},
		{ID: "motor_gasoline", Name: "motor gasoline", Family: "oil", Aliases: []string{"gasoline", "petrol", "mogas", "motor spirit", "unleaded", "unleaded petrol"}},
		{ID: "jet_kerosene", Name: "jet kerosene", Family: "oil", Aliases: []string{"jet fuel", "jet a", "jet a-1", "jet a1", "avtur", "kerosene-type jet fuel"}},
		{ID: "other_kerosene", Name: "other kerosene", Family: "oil", Aliases: []string{"kerosene", "paraffin", "paraffin oil", "heating kerosene"}},
		{ID: "gas_diesel_oil", Name: "gas/diesel oil", Family: "oil", Aliases: []string{"diesel", "diesel oil", "gas oil", "gasoil", "gas/diesel oil", "red diesel", "heating oil", "distillate", "distillate fuel oil", "distillate fuel oil no. 2", "fuel oil no. 2", "no. 2 fuel oil", "diesel fuel"}},
		{ID: "residual_fuel_oil", Name: "residual fuel oil", Family: "oil", Aliases: []string{"fuel oil", "heavy fuel oil", "hfo", "bunker fuel", "mazut", "residual fuel oil no. 6", "fuel oil no. 6", "no. 6 fuel oil", "residual oil"}},
		{ID: "lpg", Name: "liquefied petroleum gases", Family: "oil", Aliases: []string{"liquefied petroleum gas", "liquefied petroleum gases", "autogas"}},
		{ID: "propane", Name: "propane", Family: "oil"},
		{ID: "natural_gas", Name: "natural gas", Family: "gas", Aliases: []string{"gas", "nat gas", "natgas", "pipeline gas", "ng"}},
		{ID: "anthracite", Name: "anthracite", Family: "coal"},
		{ID: "coking_coal", Name: "coking coal", Family: "coal", Aliases: []string{"metallurgical coal", "met coal"}},
		{ID: "other_bituminous_coal", Name: "other bituminous coal", Family: "coal", Aliases: []string{"coal", "bituminous", "bituminous coal", "hard coal", "steam coal", "thermal coal"}},
		{ID: "sub_bituminous_coal", Name: "sub-bituminous coal", Family: "coal", Aliases: []string{"sub-bituminous", "subbituminous", "subbituminous coal"}},
		{ID: "lignite", Name: "lignite", Family: "coal", Aliases: []string{"brown coal"}},
		{ID: "peat", Name: "peat"},
		{ID: "wood", Name: "wood/wood waste", Biogenic: true, Aliases: []string{"wood waste", "wood/wood waste", "firewood", "wood chips", "wood pellets", "wood residues"}},
		{ID: "petroleum_coke", Name: "petroleum coke", Family: "oil", Aliases: []string{"petcoke", "pet coke"}},
	}
}

// fuelIndex resolves fuel names. It is built once per Engine and never
// written afterwards, so it is safe for concurrent use.
type fuelIndex struct {
	byID    map[string]*Fuel
	exact   map[string]*Fuel // canonical ids and aliases exactly as listed
	folded  map[string]*Fuel // normalizeName of ids and aliases
	ordered []*Fuel
}

func newFuelIndex(fuels []Fuel) *fuelIndex {
	ix := &fuelIndex{byID: map[string]*Fuel{}, exact: map[string]*Fuel{}, folded: map[string]*Fuel{}}
	for i := range fuels {
		f := &fuels[i]
		ix.byID[f.ID] = f
		ix.ordered = append(ix.ordered, f)
		for _, s := range append([]string{f.ID}, f.Aliases...) {
			ix.exact[s] = f
			ix.folded[normalizeName(s)] = f
		}
	}
	sort.Slice(ix.ordered, func(i, j int) bool { return ix.ordered[i].ID < ix.ordered[j].ID })
	return ix
}

// resolve maps a user's fuel name to a canonical fuel. alias is true when the
// name was not the canonical id itself.
func (ix *fuelIndex) resolve(name string) (f *Fuel, alias bool, err error) {
	if f, ok := ix.exact[name]; ok {
		return f, name != f.ID, nil
	}
	if f, ok := ix.folded[normalizeName(name)]; ok {
		return f, true, nil
	}
	if strings.TrimSpace(name) == "" {
		return nil, false, &Error{Code: CodeBadArgument, Param: "fuel", Msg: "empty fuel: give a fuel id such as natural_gas or gas_diesel_oil (list: fluecell factors, or GET /v1/factors)"}
	}
	return nil, false, &Error{Code: CodeUnknownFuel, Param: "fuel", Msg: ix.unknownMessage(name)}
}

func (ix *fuelIndex) unknownMessage(name string) string {
	if s := ix.suggest(name); s != "" {
		return "unknown fuel " + quote(name) + ": did you mean " + s + "?"
	}
	ids := make([]string, 0, len(ix.ordered))
	for _, f := range ix.ordered {
		ids = append(ids, f.ID)
	}
	return "unknown fuel " + quote(name) + ": accepted fuel ids are " + strings.Join(ids, ", ") + " (aliases: fluecell factors, or GET /v1/factors)"
}

// suggest returns the canonical id whose id or alias is closest to name, or ""
// when nothing is close enough to be a plausible typo.
func (ix *fuelIndex) suggest(name string) string {
	n := normalizeName(name)
	best, bestD := "", 1<<30
	for key, f := range ix.folded {
		d := editDistance(n, key)
		if d < bestD || (d == bestD && f.ID < best) {
			best, bestD = f.ID, d
		}
	}
	limit := len(n) / 3
	if limit < 1 {
		limit = 1
	}
	if limit > 4 {
		limit = 4
	}
	if bestD <= limit {
		return best
	}
	return ""
}

// normalizeName folds case, underscores, hyphens, dots and runs of spaces, so
// that "Natural-Gas", "natural_gas" and " natural  gas " are one name.
func normalizeName(s string) string {
	var b strings.Builder
	b.Grow(len(s))
	space := false
	for _, r := range strings.ToLower(strings.TrimSpace(s)) {
		switch r {
		case '_', '-', ' ', '\t', '\u00a0':
			space = true
			continue
		case '.':
			continue
		}
		if space && b.Len() > 0 {
			b.WriteByte(' ')
		}
		space = false
		b.WriteRune(r)
	}
	return b.String()
}

// editDistance is the Levenshtein distance between a and b, counted in runes.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// suggestFrom returns the element of options closest to s by edit distance,
// or "" if none is within a third of the length of s.
func suggestFrom(s string, options []string) string {
	best, bestD := "", 1<<30
	ls := strings.ToLower(s)
	for _, o := range options {
		if d := editDistance(ls, strings.ToLower(o)); d < bestD {
			best, bestD = o, d
		}
	}
	limit := max(1, min(4, len(s)/3))
	if bestD <= limit {
		return best
	}
	return ""
}

func quote(s string) string {
	if len(s) > 80 {
		s = s[:77] + "..."
	}
	return `"` + s + `"`
}
