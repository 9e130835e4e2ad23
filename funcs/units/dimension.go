package units

import "strconv"

// Dimension is what a unit measures.
type Dimension uint8

// The dimensions, each with its SI base unit.
const (
	Energy Dimension = iota + 1 // SI base: J
	Mass                        // kg
	Volume                      // m3
	Power                       // W
	Time                        // s
	Length                      // m
	Area                        // m2
)

// lastDim is the largest Dimension; numDims is one more, for arrays indexed by Dimension.
const (
	lastDim = Area
	numDims = int(lastDim) + 1
)

// String returns "energy", "mass", "volume", "power", "time", "length" or "area";
// "Dimension(n)" for other values.
func (d Dimension) String() string {
	switch d {
	case Energy:
		return "energy"
	case Mass:
		return "mass"
	case Volume:
		return "volume"
	case Power:
		return "power"
	case Time:
		return "time"
	case Length:
		return "length"
	case Area:
		return "area"
	}
	return "Dimension(" + strconv.Itoa(int(d)) + ")"
}

// article returns the dimension with its indefinite article: "an energy", "a mass", "an area".
func (d Dimension) article() string {
	if d == Energy || d == Area {
		return "an " + d.String()
	}
	return "a " + d.String()
}

// valid reports whether d is one of the declared dimensions.
func (d Dimension) valid() bool { return d >= Energy && d <= lastDim }

// Basis is the heating-value basis an energy figure is stated on.
type Basis uint8

// The bases. GCV is written HHV and LHV is written NCV.
const (
	NoBasis Basis = iota
	NCV           // net calorific value = LHV
	HHV           // gross calorific value = GCV = HHV
)

// String returns "", "NCV" or "HHV"; "Basis(n)" for other values.
func (b Basis) String() string {
	switch b {
	case NoBasis:
		return ""
	case NCV:
		return "NCV"
	case HHV:
		return "HHV"
	}
	return "Basis(" + strconv.Itoa(int(b)) + ")"
}

// basisOf reads a basis token: HHV or GCV, LHV or NCV, in any case.
func basisOf(tok string) (Basis, bool) {
	if len(tok) != 3 && len(tok) != 5 {
		return NoBasis, false
	}
	for _, c := range [...]struct {
		tok string
		b   Basis
	}{{"HHV", HHV}, {"GCV", HHV}, {"NCV", NCV}, {"LHV", NCV}, {"GROSS", HHV}, {"NET", NCV}} {
		if equalFoldASCII(tok, c.tok) {
			return c.b, true
		}
	}
	return NoBasis, false
}

// equalFoldASCII compares s and upper (all upper-case ASCII letters) ignoring ASCII case.
func equalFoldASCII(s, upper string) bool {
	if len(s) != len(upper) {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if 'a' <= c && c <= 'z' {
			c -= 'a' - 'A'
		}
		if c != upper[i] {
			return false
		}
	}
	return true
}
