package units

import (
	"math/big"
	"strings"
)

// A magnitude word before a unit scales it by a power of ten: "thousand gallons",
// "Million kWh", "Billion Btu", "'000 L". Statistics tables write their units this way (US EIA:
// "Thousand barrels", "Million cubic feet", "Billion Btu"; UK: "'000 tonnes").
//
// The words are short-scale: billion = 10^9, trillion = 10^12, quadrillion = 10^15, the usage
// of US and UK statistics (common practice). When the table declares a unit for the scaled
// unit (thousand gal = kgal, thousand bbl = Mbbl, thousand scf = Mcf, trillion Btu = TBtu,
// thousand t = kt), that unit is returned; otherwise a derived unit whose Symbol shows the
// magnitude as a word: "million kWh", "billion Btu", "thousand short_ton".

// numScales is the number of scales, including none (0).
const numScales = 6

// magnitudeWord returns the canonical word and power of ten of a scale: 1 thousand 10^3,
// 2 million, 3 billion, 4 trillion, 5 quadrillion 10^15; "" and 0 for scale 0.
func magnitudeWord(scale uint8) (word string, exp int) {
	switch scale {
	case 1:
		return "thousand", 3
	case 2:
		return "million", 6
	case 3:
		return "billion", 9
	case 4:
		return "trillion", 12
	case 5:
		return "quadrillion", 15
	}
	return "", 0
}

// magnitudeSource is the Source suffix of a derived unit.
const magnitudeSource = "short-scale number words: thousand 10^3, million 10^6, billion 10^9, trillion 10^12, quadrillion 10^15 (common practice)"

// prefix is a written form of a magnitude word, matched case-insensitively before a space
// (glued forms such as "'000" also without one) and optionally followed by "of".
type prefix struct {
	text  string
	scale uint8
	glued bool
}

// magnitudePrefixes lists the written forms, longer forms first.
func magnitudePrefixes() []prefix {
	return []prefix{
		{"thousands", 1, false}, {"thousand", 1, false}, {"'000s", 1, true}, {"'000", 1, true},
		{"’000s", 1, true}, {"’000", 1, true},
		{"millions", 2, false}, {"million", 2, false}, {"billions", 3, false}, {"billion", 3, false},
		{"trillions", 4, false}, {"trillion", 4, false}, {"quadrillions", 5, false}, {"quadrillion", 5, false},
	}
}

// splitMagnitude splits "Thousand Gallons" into scale 1 and "Gallons". ok is false when n
// does not start with a magnitude word followed by a unit.
func (c *catalog) splitMagnitude(n string) (scale uint8, rest string, ok bool) {
	for _, p := range c.prefixes {
		if len(n) <= len(p.text) || !strings.EqualFold(n[:len(p.text)], p.text) {
			continue
		}
		rest = n[len(p.text):]
		if rest[0] != ' ' && !p.glued {
			continue
		}
		rest = strings.TrimLeft(rest, " ")
		if len(rest) > 3 && strings.EqualFold(rest[:3], "of ") {
			rest = rest[3:]
		}
		if rest == "" {
			return 0, "", false
		}
		return p.scale, rest, true
	}
	return 0, "", false
}

// scaledKey identifies a unit scaled by a magnitude.
type scaledKey struct {
	base  uint16
	scale uint8
}

// resolveScaled resolves "<magnitude> <unit>": the declared unit equal to it when there is
// one, else a derived unit. It returns the ambiguity of the unit part when that is ambiguous,
// and ok=false when n has no magnitude word or the rest is no unit.
func (c *catalog) resolveScaled(n string) (u Unit, amb *ambiguity, ok bool) {
	scale, rest, ok := c.splitMagnitude(n)
	if !ok {
		return Unit{}, nil, false
	}
	id, amb := c.resolve(rest)
	if amb != nil {
		return Unit{}, amb, false
	}
	if id == 0 {
		return Unit{}, nil, false
	}
	if named, ok := c.scaled[scaledKey{id, scale}]; ok {
		return c.units[named], nil, true
	}
	return c.derived(id, scale), nil, true
}

// derived returns the unit base scaled by the magnitude of scale.
func (c *catalog) derived(base uint16, scale uint8) Unit {
	u := c.units[base]
	w, _ := magnitudeWord(scale)
	u.Symbol = w + " " + u.Symbol
	u.Name = w + " " + u.Name
	u.Source = u.Source + "; " + magnitudeSource
	u.scale = scale
	return u
}

// pow10 returns 10^exp exactly.
func pow10(exp int) *big.Rat {
	return new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(exp)), nil))
}
