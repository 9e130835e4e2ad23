package units

import (
	"math/big"
	"strings"
)

// A case-insensitive match must never change the meaning of an SI prefix: "mWh" is a milliwatt
// hour as written, not the megawatt hour "mwh" folds to. So a spelling matched only after case
// folding is refused when, as written, it is an SI prefix on a unit ("mWh", "pJ", "nm3") or an
// SI unit ("T", the tesla) that means something else than the unit found. A spelling that is
// no SI symbol ("mwh", "Gj", "KWH") folds as before, and one whose SI reading is the unit found
// ("kl", kilolitre = kL) is accepted.

// siPrefix is an SI prefix symbol with its power of ten (SI Brochure, 9th edition, Table 7).
type siPrefix struct {
	sym, name string
	exp       int
}

// siPrefixes lists the SI prefixes; "u" is the ASCII form of µ.
func siPrefixes() []siPrefix {
	return []siPrefix{
		{"Q", "quetta", 30}, {"R", "ronna", 27}, {"Y", "yotta", 24}, {"Z", "zetta", 21},
		{"E", "exa", 18}, {"P", "peta", 15}, {"T", "tera", 12}, {"G", "giga", 9}, {"M", "mega", 6},
		{"k", "kilo", 3}, {"h", "hecto", 2}, {"da", "deca", 1}, {"d", "deci", -1}, {"c", "centi", -2},
		{"m", "milli", -3}, {"µ", "micro", -6}, {"μ", "micro", -6}, {"u", "micro", -6}, {"n", "nano", -9},
		{"p", "pico", -12}, {"f", "femto", -15}, {"a", "atto", -18}, {"z", "zepto", -21},
		{"y", "yocto", -24}, {"r", "ronto", -27}, {"q", "quecto", -30},
	}
}

// prefixBase is a unit symbol an SI prefix may stand before. unit is the table unit it equals
// ("" for an SI unit the table does not have, such as the tesla), times 10^shift; power is 2 or
// 3 for a square or cubic unit, whose prefix is raised to that power (km2 = 10^6 m2). A
// prefix is named before name, after pre: "cubic " + "nano" + "metre".
type prefixBase struct {
	sym, pre, name, unit string
	shift, power         int
}

// prefixBases lists the symbols whose prefixed forms are checked: every table unit an SI
// prefix is written on (the e, p and th suffixes of power units included; cal is kcal/1000),
// and the other SI units (base and derived units with special names, SI Brochure Tables 2 and
// 4) whose symbols, bare or prefixed, could fold to a spelling of the table ("T", "GT", "hA").
func prefixBases() []prefixBase {
	return []prefixBase{
		{sym: "J", name: "joule", unit: "J"}, {sym: "Wh", name: "watt hour", unit: "Wh"},
		{sym: "Wyr", name: "watt year", unit: "Wyr"}, {sym: "W", name: "watt", unit: "W"},
		{sym: "We", name: "watt", unit: "W"}, {sym: "Wp", name: "watt", unit: "W"},
		{sym: "Wth", name: "watt", unit: "W"}, {sym: "cal", name: "calorie", unit: "kcal", shift: -3},
		{sym: "toe", name: "tonne of oil equivalent", unit: "toe"},
		{sym: "tce", name: "tonne of coal equivalent", unit: "tce"},
		{sym: "g", name: "gram", unit: "g"}, {sym: "t", name: "tonne", unit: "t"},
		{sym: "L", name: "litre", unit: "L"}, {sym: "l", name: "litre", unit: "L"},
		{sym: "m3", pre: "cubic ", name: "metre", unit: "m3", power: 3}, {sym: "m³", pre: "cubic ", name: "metre", unit: "m3", power: 3},
		{sym: "Sm3", name: "-Sm3", unit: "Sm3"}, {sym: "Nm3", name: "-Nm3", unit: "Nm3"},
		{sym: "m2", pre: "square ", name: "metre", unit: "m2", power: 2}, {sym: "m²", pre: "square ", name: "metre", unit: "m2", power: 2},
		{sym: "m", name: "metre", unit: "m"}, {sym: "s", name: "second", unit: "s"},
		{sym: "A", name: "ampere"}, {sym: "K", name: "kelvin"}, {sym: "mol", name: "mole"},
		{sym: "cd", name: "candela"}, {sym: "N", name: "newton"}, {sym: "Pa", name: "pascal"},
		{sym: "V", name: "volt"}, {sym: "C", name: "coulomb"}, {sym: "F", name: "farad"},
		{sym: "S", name: "siemens"}, {sym: "T", name: "tesla"}, {sym: "H", name: "henry"},
		{sym: "Hz", name: "hertz"}, {sym: "Wb", name: "weber"},
	}
}

// siReading is what a spelling means as an SI symbol.
type siReading struct {
	prefix *siPrefix // nil without a prefix
	base   *prefixBase
}

// name is the reading in words: "milliwatt hour", "cubic nanometre", "milli-Nm3", "tesla".
func (r siReading) name() string {
	if r.prefix == nil {
		return r.base.pre + r.base.name
	}
	return r.base.pre + r.prefix.name + r.base.name
}

// readSI reads s as an SI symbol: one of prefixBases, with or without an SI prefix. ok is
// false when s is none. It does not allocate.
func (c *catalog) readSI(s string) (r siReading, ok bool) {
	if s == "" {
		return siReading{}, false
	}
	for _, i := range c.siByLast[s[len(s)-1]] {
		b := &c.siBases[i]
		if !strings.HasSuffix(s, b.sym) {
			continue
		}
		head := s[:len(s)-len(b.sym)]
		if head == "" {
			return siReading{base: b}, true
		}
		for j := range c.siPrefixes {
			if c.siPrefixes[j].sym == head {
				return siReading{prefix: &c.siPrefixes[j], base: b}, true
			}
		}
	}
	return siReading{}, false
}

// sameAs reports whether the reading is the table unit id: same dimension, same exact factor.
func (r siReading) sameAs(c *catalog, id uint16) bool {
	if r.base.unit == "" {
		return false
	}
	bid := c.exactMap[r.base.unit]
	if c.units[bid].Dim != c.units[id].Dim {
		return false
	}
	exp := r.base.shift
	if r.prefix != nil {
		exp += r.prefix.exp * max(r.base.power, 1)
	}
	f := new(big.Rat).Set(c.si[bid])
	if exp >= 0 {
		f.Mul(f, pow10(exp))
	} else {
		f.Quo(f, pow10(-exp))
	}
	return f.Cmp(c.si[id]) == 0
}

// prefixTrap returns the refusal of spelling n, which folds to the unit id but is, as
// written, an SI symbol for something else ("mWh" folds to MWh); nil when n may fold to id.
func (c *catalog) prefixTrap(n string, id uint16) *ambiguity {
	r, ok := c.readSI(n)
	if !ok || r.sameAs(c, id) {
		return nil
	}
	u := c.units[id]
	return &ambiguity{refused: r.name(), alts: []alt{{u.Symbol, u.Name}}}
}

// indexSIBases fills c.siByLast: the indexes into c.siBases by the last byte of the symbol.
func (c *catalog) indexSIBases() {
	for i, b := range c.siBases {
		last := b.sym[len(b.sym)-1]
		c.siByLast[last] = append(c.siByLast[last], uint8(i))
	}
}
