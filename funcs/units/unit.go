package units

import (
	"math"
	"math/big"
)

// Unit is one unit of the table, as returned by Parse, ParseAs or List. The zero Unit is no
// unit: Factor, Ratio and Convert reject it. Units are comparable with ==.
type Unit struct {
	Symbol string    // canonical symbol: "MWh", "MMBtu", "short_ton", "gal", "m3", "Nm3", "TWyr", "km"
	Name   string    // "megawatt hour"
	Dim    Dimension // what the unit measures
	// Basis is the heating-value basis declared in the parsed string ("GJ NCV"); NoBasis if
	// none was given. Only energy units carry one.
	Basis Basis
	// Usual is the basis conventionally implied by the unit when none is given: HHV for Btu,
	// kBtu, MMBtu, therm, Dth and quad (North American practice: common practice), NoBasis
	// otherwise. Factor does not use it; it is a hint for callers that must pick a basis.
	Usual  Basis
	Source string // where the factor comes from: "SI", "NIST SP 811 (Btu IT)", "IEA (toe)", ...

	id    uint16 // 1-based index into the unit table; 0 for the zero Unit
	scale uint8  // magnitude word before the table unit ("thousand"): see magnitudeWord; 0 if none
}

// String returns the Symbol, followed by " NCV" or " HHV" when a Basis is set. The result
// parses back to the same Unit.
func (u Unit) String() string {
	if u.Basis == NoBasis {
		return u.Symbol
	}
	return u.Symbol + " " + u.Basis.String()
}

// SI returns a fresh copy of the exact factor to the SI unit of the unit's dimension
// (J, kg, m3, W, s, m or m2): 1 u = SI() base units. It returns nil for the zero Unit.
func (u Unit) SI() *big.Rat {
	if !table.known(u) {
		return nil
	}
	r := new(big.Rat).Set(table.si[u.id])
	if u.scale != 0 {
		_, exp := magnitudeWord(u.scale)
		r.Mul(r, pow10(exp))
	}
	return r
}

// SIFloat returns SI() rounded once to float64; NaN for the zero Unit.
func (u Unit) SIFloat() float64 {
	if !table.known(u) {
		return math.NaN()
	}
	return table.siFloat[int(u.id)*numScales+int(u.scale)]
}

// WithBasis returns a copy of u with Basis set to b (NoBasis clears it). A basis applies only to
// energy units: for any other unit, or for a b that is not NoBasis, NCV or HHV, u is returned
// unchanged, so that String() always parses back.
func (u Unit) WithBasis(b Basis) Unit {
	if u.Dim != Energy || b > HHV {
		return u
	}
	u.Basis = b
	return u
}
