package funcs

import (
	"math/big"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// A fuel amount can be stated as energy (on an NCV or HHV basis), mass or
// volume. Factors are per one of these. convertAmount finds the shortest chain
// of the pack's rows - calorific values, density, NCV/GCV ratio - from the
// amount's state to the factor's, and returns its multiplier in SI units.

type amountState uint8

const (
	stateNone amountState = iota
	stateNCV
	stateHHV
	stateMass
	stateVolume
)

func (s amountState) String() string {
	switch s {
	case stateNCV:
		return "energy (NCV)"
	case stateHHV:
		return "energy (HHV)"
	case stateMass:
		return "mass"
	case stateVolume:
		return "volume"
	}
	return "?"
}

func stateOf(dim units.Dimension, b units.Basis) amountState {
	switch dim {
	case units.Energy:
		switch b {
		case units.NCV:
			return stateNCV
		case units.HHV:
			return stateHHV
		}
		return stateNone
	case units.Mass:
		return stateMass
	case units.Volume:
		return stateVolume
	}
	return stateNone
}

func basisOf(s amountState) units.Basis {
	switch s {
	case stateNCV:
		return units.NCV
	case stateHHV:
		return units.HHV
	}
	return units.NoBasis
}

// edge is one conversion: to = from * mul (SI units).
type edge struct {
	to     amountState
	mul    *big.Rat
	factor *Factor
	pow    int // +1 when mul is the factor, -1 when it is its inverse
	note   string
}

// conversion is the result of convertAmount.
type conversion struct {
	mul     *big.Rat // SI of the target state per SI of the amount's unit
	factors []*Factor
	pows    []int // per factor: +1 multiplies, -1 divides
	notes   []string
}

// edges lists the conversions out of state s that the pack offers for fuel.
func (e *Engine) edges(packName string, fuel *Fuel, s amountState) []edge {
	var out []edge
	cv := func(q string, energy amountState) {
		f := e.fuelRow(packName, fuel, q)
		if f == nil || f.si == 0 {
			return
		}
		carrier := stateOf(f.denDim(), units.NoBasis)
		switch s {
		case carrier:
			out = append(out, edge{to: energy, mul: f.exact, factor: f, pow: 1})
		case energy:
			out = append(out, edge{to: carrier, mul: inv(f.exact), factor: f, pow: -1})
		}
	}
	cv("ncv", stateNCV)
	cv("gcv", stateHHV)
	if d := e.fuelRow(packName, fuel, "density"); d != nil && d.si > 0 {
		note := "volume and mass related by the density " + d.Citation()
		switch s {
		case stateVolume:
			out = append(out, edge{to: stateMass, mul: d.exact, factor: d, pow: 1, note: note})
		case stateMass:
			out = append(out, edge{to: stateVolume, mul: inv(d.exact), factor: d, pow: -1, note: note})
		}
	}
	if s == stateNCV || s == stateHHV {
		if r := e.basisRatio(packName, fuel); r != nil {
			if s == stateHHV {
				out = append(out, edge{to: stateNCV, mul: r.exact, factor: r, pow: 1,
					note: "HHV converted to NCV with NCV/GCV = " + FormatNumber(r.Value) + " for " + ratioSubject(r) + " (" + r.Source + ")"})
			} else {
				out = append(out, edge{to: stateHHV, mul: inv(r.exact), factor: r, pow: -1,
					note: "NCV converted to HHV with NCV/GCV = " + FormatNumber(r.Value) + " for " + ratioSubject(r) + " (" + r.Source + ")"})
			}
		}
	}
	return out
}

func ratioSubject(r *Factor) string {
	switch r.ID {
	case "coal", "oil", "gas":
		return r.ID + " (fuel family)"
	}
	return r.ID
}

// basisRatio is the NCV/GCV ratio for fuel: its own row first, then its family's.
func (e *Engine) basisRatio(packName string, fuel *Fuel) *Factor {
	if f := e.fuelRow(packName, fuel, "ncv_per_gcv"); f != nil {
		return f
	}
	if fuel.Family != "" {
		return e.packs.lookup(packName, fuel.Family, "ncv_per_gcv")
	}
	return nil
}

// convertAmount returns the multiplier from the SI amount in unit u to the SI
// amount in the target dimension and basis (the denominator of a factor).
func (e *Engine) convertAmount(packName string, fuel *Fuel, u units.Unit, target units.Dimension, targetBasis units.Basis) (conversion, error) {
	goal := stateOf(target, targetBasis)
	start := stateOf(u.Dim, u.Basis)
	var notes []string
	if u.Dim == units.Energy && u.Basis == units.NoBasis {
		if u.Usual != units.NoBasis {
			// The Btu family (Btu, kBtu, MMBtu, therm, Dth, quad) is quoted gross in North
			// America: US EPA's Emission Factors Hub and 40 CFR 98 Subpart C state heat
			// contents and factors per MMBtu HHV (common practice).
			start = stateOf(units.Energy, u.Usual)
			notes = append(notes, usualBasisNote(u))
		} else {
			// Any other energy without a stated basis is read on the basis of the factor
			// it meets, or the pack's own basis when the path leaves energy.
			b := targetBasis
			if target != units.Energy {
				b = e.packs.packs[packName].basis
				if b == units.NoBasis {
					b = units.NCV
				}
			}
			start = stateOf(units.Energy, b)
			if b == units.HHV {
				notes = append(notes, u.Symbol+" without a stated basis read as HHV, the basis of pack "+packName+"; write \""+u.Symbol+" NCV\" to convert")
			}
		}
	}
	c, ok := e.findPath(packName, fuel, start, goal)
	if !ok {
		return conversion{}, e.missingPath(packName, fuel, u, start, goal)
	}
	c.notes = append(notes, c.notes...)
	return c, nil
}

// usualBasisNote says which basis a unit without one was read on, and how to say the other:
// "therm read as HHV (gross), North American practice; write 'therm NCV' to say net".
func usualBasisNote(u units.Unit) string {
	if u.Usual == units.NCV {
		return u.Symbol + " read as NCV (net); write '" + u.Symbol + " HHV' to say gross"
	}
	return u.Symbol + " read as HHV (gross), North American practice; write '" + u.Symbol + " NCV' to say net"
}

// findPath is the breadth-first search behind convertAmount.
func (e *Engine) findPath(packName string, fuel *Fuel, start, goal amountState) (conversion, bool) {
	if start == goal {
		return conversion{mul: big.NewRat(1, 1)}, true
	}
	// Breadth-first search over at most four states.
	type visit struct {
		prev  amountState
		via   edge
		known bool
	}
	var seen [5]visit
	seen[start].known = true
	queue := []amountState{start}
	for len(queue) > 0 && !seen[goal].known {
		s := queue[0]
		queue = queue[1:]
		for _, ed := range e.edges(packName, fuel, s) {
			if !seen[ed.to].known {
				seen[ed.to] = visit{prev: s, via: ed, known: true}
				queue = append(queue, ed.to)
			}
		}
	}
	if !seen[goal].known {
		return conversion{}, false
	}
	var path []edge
	for s := goal; s != start; s = seen[s].prev {
		path = append(path, seen[s].via)
	}
	c := conversion{mul: big.NewRat(1, 1)}
	for i := len(path) - 1; i >= 0; i-- {
		c.mul.Mul(c.mul, path[i].mul)
		c.factors = append(c.factors, path[i].factor)
		c.pows = append(c.pows, path[i].pow)
		if path[i].note != "" {
			c.notes = append(c.notes, path[i].note)
		}
	}
	return c, true
}

// missingPath explains which value the pack lacks and which packs have a way.
func (e *Engine) missingPath(packName string, fuel *Fuel, u units.Unit, start, goal amountState) error {
	var what string
	hasCV := func(dim units.Dimension) bool {
		for _, q := range []string{"ncv", "gcv"} {
			if f := e.fuelRow(packName, fuel, q); f != nil && f.denDim() == dim {
				return true
			}
		}
		return false
	}
	hasDensity := e.fuelRow(packName, fuel, "density") != nil
	switch {
	case (start == stateMass || start == stateVolume) && (goal == stateNCV || goal == stateHHV) ||
		(goal == stateMass || goal == stateVolume) && (start == stateNCV || start == stateHHV):
		carrier := start
		if start == stateNCV || start == stateHHV {
			carrier = goal
		}
		other := units.Volume
		if carrier == stateVolume {
			other = units.Mass
		}
		switch {
		case hasCV(other) && !hasDensity:
			what = "no density for " + fuel.ID + " (its calorific value is per " + other.String() + ")"
		case !hasCV(units.Mass) && !hasCV(units.Volume):
			what = "no calorific value (ncv or gcv) for " + fuel.ID
		default:
			what = "no NCV/GCV ratio for " + fuel.ID + " to match the factor's basis"
		}
	case (start == stateMass && goal == stateVolume) || (start == stateVolume && goal == stateMass):
		what = "no density for " + fuel.ID
	default:
		fam := fuel.Family
		if fam == "" {
			fam = "none"
		}
		what = "no NCV/GCV ratio for " + fuel.ID + " (fuel family: " + fam + ") to convert " + basisOf(start).String() + " to " + basisOf(goal).String()
	}
	msg := "pack " + packName + " cannot turn " + start.String() + " into " + goal.String() + " for " + fuel.ID + ": it has " + what
	var others []string
	for _, name := range e.packs.names {
		if name == packName {
			continue
		}
		if p := e.packs.packs[name]; p != nil {
			if _, ok := e.findPath(name, fuel, start, goal); ok {
				others = append(others, name)
			}
		}
	}
	if len(others) > 0 {
		msg += "; pack " + strings.Join(others, ", ") + " has what this needs"
	} else {
		msg += "; add the missing row with --factors (see fluecell factors " + fuel.ID + ")"
	}
	return &Error{Code: CodeMissingFactor, Param: "unit", Msg: msg}
}

// inv is 1/r as a new value (r is never zero: rows with a zero value are not
// offered as edges).
func inv(r *big.Rat) *big.Rat { return new(big.Rat).Inv(r) }
