package units

import (
	"math/big"
	"slices"
	"strings"
)

// catalog is the unit table with its lookup maps. It is built once, when the package is
// initialised, and never written after.
type catalog struct {
	units   []Unit     // index 0 is the zero Unit
	si      []*big.Rat // exact factor to the SI base, by unit id
	siFloat []float64  // si times each magnitude, rounded once: [id*numScales+scale]
	exact   []string   // si as an exact decimal string (a fraction when it has no finite decimal)
	ref     []string   // gas reference conditions, by unit id (see Unit.Reference)
	spell   [][]string // other accepted spellings, by unit id
	pos     []int      // position of the unit within its dimension
	dimLen  [numDims]int
	ratio   [numDims][]float64 // ratio[d][pos(from)*dimLen[d]+pos(to)] = Factor(from, to)
	order   []uint16           // ids sorted by dimension, then factor (for List)

	exactMap map[string]uint16     // every spelling as written
	foldMap  map[string]uint16     // lower-cased spellings that are unique
	ambig    map[string]*ambiguity // lower-cased ambiguous spellings
	suggest  []candidate           // spellings offered as "did you mean"

	prefixes   []prefix             // written magnitude words ("thousand", "'000")
	siPrefixes []siPrefix           // SI prefixes, for readSI
	siBases    []prefixBase         // SI symbols, for readSI
	siByLast   [256][]uint8         // indexes into siBases by the last byte of the symbol
	notes      map[string]string    // lower-cased spellings read by convention: their note
	scaled     map[scaledKey]uint16 // declared units equal to a magnitude times another unit (kgal)
}

// candidate is a lower-cased spelling considered for suggestions.
type candidate struct {
	fold   []rune
	id     uint16
	symbol bool // the spelling is the unit's symbol
}

// table is the package's constant unit table.
var table = build(unitDefs(), ambiguities())

// build turns the declarations into a catalog. It panics on an inconsistent table: that is a
// programming error, caught by the tests.
func build(defs []unitDef, ambs []ambiguity) *catalog {
	c := &catalog{
		units:      []Unit{{}},
		si:         []*big.Rat{nil},
		siFloat:    make([]float64, numScales),
		exact:      []string{""},
		ref:        []string{""},
		spell:      [][]string{nil},
		pos:        []int{0},
		exactMap:   map[string]uint16{},
		foldMap:    map[string]uint16{},
		ambig:      map[string]*ambiguity{},
		prefixes:   magnitudePrefixes(),
		siPrefixes: siPrefixes(),
		siBases:    prefixBases(),
		notes:      map[string]string{},
		scaled:     map[scaledKey]uint16{},
	}
	foldIDs := map[string][]uint16{}
	addSpelling := func(s string, id uint16, fold, symbol bool) {
		if _, dup := c.exactMap[s]; dup {
			panic("units: duplicate spelling " + s)
		}
		c.exactMap[s] = id
		if !fold {
			return
		}
		k := strings.ToLower(s)
		if !slices.Contains(foldIDs[k], id) {
			foldIDs[k] = append(foldIDs[k], id)
		}
		c.suggest = append(c.suggest, candidate{fold: []rune(k), id: id, symbol: symbol})
	}
	for _, d := range defs {
		f, ok := parseFactor(d.factor)
		if !ok || f.Sign() <= 0 || !d.dim.valid() || d.ref != "" && d.dim != Volume {
			panic("units: bad factor or dimension for " + d.sym)
		}
		if d.of != "" {
			base, ok := c.exactMap[d.of]
			if !ok || c.units[base].Dim != d.dim || c.units[base].Symbol != d.of {
				panic("units: " + d.sym + " refers to unknown unit " + d.of)
			}
			f.Mul(f, c.si[base])
		}
		id := uint16(len(c.units))
		c.units = append(c.units, Unit{Symbol: d.sym, Name: d.name, Dim: d.dim, Usual: d.usual, Source: d.source, id: id})
		c.si = append(c.si, f)
		for scale := uint8(0); scale < numScales; scale++ {
			_, exp := magnitudeWord(scale)
			fl, _ := new(big.Rat).Mul(f, pow10(exp)).Float64()
			c.siFloat = append(c.siFloat, fl)
		}
		if d.of != "" {
			c.addScaled(id, d)
		}
		c.exact = append(c.exact, exactString(f))
		c.ref = append(c.ref, d.ref)
		c.spell = append(c.spell, append(slices.Clone(d.spell), d.exactOnly...))
		c.pos = append(c.pos, c.dimLen[d.dim])
		c.dimLen[d.dim]++
		addSpelling(d.sym, id, !d.symExact, true)
		for _, s := range d.spell {
			addSpelling(s, id, true, false)
		}
		for _, s := range d.exactOnly {
			addSpelling(s, id, false, false)
		}
	}
	for i := range ambs {
		a := &ambs[i]
		for _, s := range a.spell {
			if _, clash := c.exactMap[s]; clash {
				panic("units: spelling is both a unit and ambiguous: " + s)
			}
			c.ambig[strings.ToLower(s)] = a
		}
	}
	for k, ids := range foldIDs {
		switch {
		case c.ambig[k] != nil:
			// declared ambiguous: the exact spellings still work
		case len(ids) == 1:
			c.foldMap[k] = ids[0]
		default:
			// two units differ only by case ("mL", "ML"): the folded spelling names both
			a := &ambiguity{}
			for _, id := range ids {
				a.alts = append(a.alts, alt{c.units[id].Symbol, c.units[id].Name})
			}
			c.ambig[k] = a
		}
	}
	for i := range ambs {
		for _, al := range ambs[i].alts {
			if id, ok := c.exactMap[al.sym]; ok && c.units[id].Symbol == al.sym {
				continue
			}
			if u, _, ok := c.resolveScaled(al.sym); !ok || u.Symbol != al.sym {
				panic("units: ambiguity names unknown symbol " + al.sym)
			}
		}
	}
	for _, sn := range spellingNotes() {
		for _, sp := range sn.spell {
			if _, ok := c.exactMap[sp]; !ok || strings.ToLower(sp) != strings.Map(asciiLower, sp) {
				panic("units: note for unknown or non-ASCII spelling " + sp)
			}
			c.notes[strings.ToLower(sp)] = sn.note
		}
	}
	c.indexSIBases()
	c.buildRatios()
	c.order = make([]uint16, 0, len(c.units)-1)
	for id := 1; id < len(c.units); id++ {
		c.order = append(c.order, uint16(id))
	}
	slices.SortStableFunc(c.order, func(a, b uint16) int {
		if da, db := c.units[a].Dim, c.units[b].Dim; da != db {
			return int(da) - int(db)
		}
		return c.si[a].Cmp(c.si[b])
	})
	return c
}

// buildRatios fills the per-dimension matrices of float64 factors, each rounded once from the
// exact ratio.
func (c *catalog) buildRatios() {
	for d := range c.ratio {
		c.ratio[d] = make([]float64, c.dimLen[d]*c.dimLen[d])
	}
	exactFloat := make([]bool, len(c.units))
	for id := 1; id < len(c.units); id++ {
		_, exactFloat[id] = c.si[id].Float64()
	}
	q := new(big.Rat)
	for a := 1; a < len(c.units); a++ {
		d := c.units[a].Dim
		n := c.dimLen[d]
		for b := 1; b < len(c.units); b++ {
			if c.units[b].Dim != d {
				continue
			}
			var r float64
			if exactFloat[a] && exactFloat[b] {
				// both operands exact: IEEE division rounds the exact quotient once
				r = c.siFloat[a*numScales] / c.siFloat[b*numScales]
			} else {
				r, _ = q.Quo(c.si[a], c.si[b]).Float64()
			}
			c.ratio[d][c.pos[a]*n+c.pos[b]] = r
		}
	}
}

// addScaled records a declared unit that is a power of ten of 1000 times the unit it is
// defined from (kgal = 1e3 gal), so that "thousand gallons" resolves to it.
func (c *catalog) addScaled(id uint16, d unitDef) {
	base := c.exactMap[d.of]
	for scale := uint8(1); scale < numScales; scale++ {
		_, exp := magnitudeWord(scale)
		if f, ok := parseFactor(d.factor); ok && f.Cmp(pow10(exp)) == 0 {
			if _, dup := c.scaled[scaledKey{base, scale}]; !dup {
				c.scaled[scaledKey{base, scale}] = id
			}
		}
	}
}

// known reports whether u is a unit of the table or a magnitude word before one (not the
// zero Unit, nor one made by hand). It does not allocate.
func (c *catalog) known(u Unit) bool {
	if u.id == 0 || int(u.id) >= len(c.units) || int(u.scale) >= numScales {
		return false
	}
	base := c.units[u.id].Symbol
	if u.scale == 0 {
		return u.Symbol == base
	}
	w, _ := magnitudeWord(u.scale)
	return len(u.Symbol) == len(w)+1+len(base) && strings.HasPrefix(u.Symbol, w) &&
		u.Symbol[len(w)] == ' ' && strings.HasSuffix(u.Symbol, base)
}

// parseFactor reads an exact decimal ("3.785411784", "1e6") or a ratio of two exact decimals
// ("288.15/273.15").
func parseFactor(s string) (*big.Rat, bool) {
	num, den, isRatio := strings.Cut(s, "/")
	f, ok := new(big.Rat).SetString(num)
	if !ok || !isRatio {
		return f, ok
	}
	d, ok := new(big.Rat).SetString(den)
	if !ok || d.Sign() == 0 {
		return nil, false
	}
	return f.Quo(f, d), true
}

// exactString writes r exactly: as a decimal number without exponent when r has a finite
// decimal expansion ("0.003785411784"), else as a reduced fraction ("5763/5463").
func exactString(r *big.Rat) string {
	num := new(big.Int).Abs(r.Num())
	ten := big.NewInt(10)
	rem := new(big.Int)
	for n := 0; n <= 64; n++ {
		if rem.Rem(num, r.Denom()).Sign() == 0 {
			return r.FloatString(n)
		}
		num.Mul(num, ten)
	}
	return r.String()
}
