package units

import (
	"strings"
	"unicode"
)

// Parse reads a unit string, e.g. "MWh", "MMBtu HHV", "GJ (NCV)", "short_ton", "m³", "litres".
//
// The exact spelling is tried first; then a case-insensitive match, only where it is unique
// among all spellings and not declared ambiguous ("mwh" is MWh, but "mt" and "MT" could be t or
// Mt, and "ml" could be mL or ML), and only where the spelling as written is not an SI symbol
// of something else: "mWh" is a milliwatt hour, "pJ" a picojoule, "T" the tesla, so they are
// refused with Code "unit-ambiguous" and the unit the case-insensitive match would have given
// (see prefix.go). Leading and trailing white space is ignored and inner runs of
// white space count as one space.
//
// An energy unit may be followed by a basis, HHV, GCV, LHV or NCV (GCV is read as HHV and LHV as
// NCV), after a space or a comma or in parentheses or brackets: "MMBtu HHV", "GJ (NCV)",
// "GJ [LHV]", "MWh, GCV".
//
// A magnitude word before a unit scales it: "Thousand Gallons" is kgal, "Million kWh" is a
// derived unit "million kWh" (see magnitude.go).
//
// Errors are *Error with Code "unit-unknown" (with a Suggestion when a spelling is close),
// "unit-ambiguous" (with the Alternatives) or "unit-basis" (a basis on a unit that is not an
// energy unit, or two bases).
func Parse(s string) (Unit, error) { return parse(s, nil, true) }

// Lookup is Parse without the spelling suggestion of an unknown unit: its
// errors have the same codes, and it costs a map lookup, not an edit
// distance over the table, so it suits classifying many texts (cells,
// header words) that are mostly not units.
func Lookup(s string) (Unit, error) { return parse(s, nil, false) }

// ParseAs is Parse plus a dimension check: the unit must have one of the dimensions in want
// (with no want, any dimension). A unit of another dimension fails with Code "unit-dimension"
// and a message such as
//
//	unit "kW" is a power, but an energy is needed here (did you mean kWh?)
//
// An unknown unit is suggested only units of the dimensions in want.
func ParseAs(s string, want ...Dimension) (Unit, error) {
	u, err := parse(s, want, true)
	if err != nil || len(want) == 0 {
		return u, err
	}
	for _, d := range want {
		if u.Dim == d {
			return u, nil
		}
	}
	return Unit{}, errDimension(s, normalize(s), u, want)
}

// parse is Parse; want restricts the suggestions of an unknown unit to those dimensions, and
// suggest=false leaves them out.
func parse(s string, want []Dimension, suggest bool) (Unit, error) {
	n := normalize(s)
	if n == "" {
		return Unit{}, errEmpty(s)
	}
	if id, ok := table.exactMap[n]; ok {
		return table.units[id], nil
	}
	id, amb := table.lookupFold(n)
	if id != 0 {
		return table.units[id], nil
	}
	if amb != nil {
		return Unit{}, errAmbiguous(s, n, amb)
	}
	if u, amb, ok := table.resolveScaled(n); ok {
		return u, nil
	} else if amb != nil {
		return Unit{}, errAmbiguous(s, n, amb)
	}
	part, tok, b, ok := splitBasis(n)
	if !ok {
		return Unit{}, errUnknown(s, n, want, suggest)
	}
	var u Unit
	if id, amb = table.resolve(part); id != 0 {
		u = table.units[id]
	} else if amb == nil {
		u, amb, _ = table.resolveScaled(part)
	}
	switch {
	case amb != nil:
		return Unit{}, errAmbiguous(s, part, amb)
	case u.id == 0:
		if _, _, _, two := splitBasis(part); two {
			return Unit{}, errTwoBases(s, n)
		}
		return Unit{}, errUnknown(s, part, want, suggest)
	}
	if u.Dim != Energy {
		return Unit{}, errBasisNotEnergy(s, tok, part)
	}
	u.Basis = b
	return u, nil
}

// resolve looks a spelling up exactly, then case-insensitively. It returns the unit id, or the
// ambiguity the spelling falls under, or neither.
func (c *catalog) resolve(n string) (uint16, *ambiguity) {
	if id, ok := c.exactMap[n]; ok {
		return id, nil
	}
	return c.lookupFold(n)
}

// lookupFold looks up the lower-cased spelling; ASCII input is folded on the stack.
func (c *catalog) lookupFold(n string) (uint16, *ambiguity) {
	var buf [64]byte
	if len(n) <= len(buf) {
		ascii := true
		for i := 0; i < len(n); i++ {
			ch := n[i]
			if ch >= 0x80 {
				ascii = false
				break
			}
			if 'A' <= ch && ch <= 'Z' {
				ch += 'a' - 'A'
			}
			buf[i] = ch
		}
		if ascii {
			k := buf[:len(n)]
			if a := c.ambig[string(k)]; a != nil {
				return 0, a
			}
			return c.checkFold(n, c.foldMap[string(k)])
		}
	}
	k := strings.ToLower(n)
	if a := c.ambig[k]; a != nil {
		return 0, a
	}
	return c.checkFold(n, c.foldMap[k])
}

// checkFold refuses the unit id found by folding the case of n when n, as written, is an SI
// symbol of something else (see prefixTrap).
func (c *catalog) checkFold(n string, id uint16) (uint16, *ambiguity) {
	if id == 0 {
		return 0, nil
	}
	if a := c.prefixTrap(n, id); a != nil {
		return 0, a
	}
	return id, nil
}

// normalize trims white space and folds inner runs of white space to one space. It allocates
// only when there is something to fold.
func normalize(s string) string {
	s = strings.TrimSpace(s)
	prevSpace := false
	for _, r := range s {
		if r == ' ' {
			if prevSpace {
				return strings.Join(strings.Fields(s), " ")
			}
			prevSpace = true
			continue
		}
		if unicode.IsSpace(r) {
			return strings.Join(strings.Fields(s), " ")
		}
		prevSpace = false
	}
	return s
}

// splitBasis splits a normalised string into a unit and a trailing basis: "MMBtu HHV",
// "GJ (NCV)", "GJ [LHV]", "MWh, GCV", "MWh,GCV", "GJ(NCV)". tok is the basis as written.
func splitBasis(n string) (part, tok string, b Basis, ok bool) {
	if n == "" {
		return "", "", NoBasis, false
	}
	switch last := n[len(n)-1]; last {
	case ')', ']':
		open := byte('(')
		if last == ']' {
			open = '['
		}
		i := strings.LastIndexByte(n, open)
		if i < 0 {
			return "", "", NoBasis, false
		}
		tok = strings.TrimSpace(n[i+1 : len(n)-1])
		part = strings.TrimRight(n[:i], " ")
	default:
		i := strings.LastIndexAny(n, " ,")
		if i < 0 {
			return "", "", NoBasis, false
		}
		tok = n[i+1:]
		part = strings.TrimRight(n[:i], " ")
		part = strings.TrimRight(strings.TrimSuffix(part, ","), " ")
	}
	b, ok = basisOf(tok)
	if !ok || part == "" {
		return "", "", NoBasis, false
	}
	return part, tok, b, true
}
