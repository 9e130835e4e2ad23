package units

import (
	"math"
	"math/big"
	"strconv"
)

// Factor is the exact multiplier from one unit to another of the same dimension, rounded once
// to float64: value_in_to = value_in_from * Factor(from, to).
//
// It fails with Code "unit-dimension" when the dimensions differ, and with Code "unit-basis"
// when both units declare a basis and the bases differ: converting between HHV and NCV depends
// on the fuel (fuel_energy does it). A unit without a declared basis converts freely. Units
// not obtained from this package fail with Code "unit-unknown". It does not allocate, unless
// a unit carries a magnitude word ("thousand MWh"): that factor is computed exactly first.
func Factor(from, to Unit) (float64, error) {
	if err := check(from, to); err != nil {
		return 0, err
	}
	if from.scale != 0 || to.scale != 0 {
		f, _ := exactRatio(from, to).Float64()
		return f, nil
	}
	d := table.units[from.id].Dim
	return table.ratio[d][table.pos[from.id]*table.dimLen[d]+table.pos[to.id]], nil
}

// Ratio is Factor as an exact *big.Rat (a fresh value), with the same errors.
func Ratio(from, to Unit) (*big.Rat, error) {
	if err := check(from, to); err != nil {
		return nil, err
	}
	return exactRatio(from, to), nil
}

// exactRatio is SI(from) / SI(to) for two checked units.
func exactRatio(from, to Unit) *big.Rat {
	r := new(big.Rat).Quo(table.si[from.id], table.si[to.id])
	_, ef := magnitudeWord(from.scale)
	_, et := magnitudeWord(to.scale)
	switch {
	case ef > et:
		r.Mul(r, pow10(ef-et))
	case et > ef:
		r.Quo(r, pow10(et-ef))
	}
	return r
}

// Convert returns v * Factor(from, to). A NaN or infinite v, or a result beyond the float64
// range, fails with Code "value-not-number"; otherwise the errors are those of Factor.
func Convert(v float64, from, to Unit) (float64, error) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		s := strconv.FormatFloat(v, 'g', -1, 64)
		return 0, &Error{Input: s, Code: CodeNotANumber, Msg: "value " + s + " is not a finite number: give a finite number"}
	}
	f, err := Factor(from, to)
	if err != nil {
		return 0, err
	}
	r := v * f
	if math.IsInf(r, 0) {
		s := strconv.FormatFloat(v, 'g', -1, 64)
		return 0, &Error{Input: s, Code: CodeNotANumber,
			Msg: "value " + s + " " + from.String() + " in " + to.String() + " is beyond the float64 range"}
	}
	return r, nil
}

// check validates a conversion from one unit to another. It returns a nil error (not a nil
// *Error) when the conversion is possible.
func check(from, to Unit) error {
	switch {
	case !table.known(from):
		return errUnitValue(from)
	case !table.known(to):
		return errUnitValue(to)
	}
	fd, td := table.units[from.id].Dim, table.units[to.id].Dim
	if fd != td {
		return errConvert(CodeDimension, from, to,
			quote(from.Symbol)+" is "+fd.article()+" and "+quote(to.Symbol)+" is "+td.article())
	}
	if from.Basis != NoBasis && to.Basis != NoBasis && from.Basis != to.Basis {
		return errConvert(CodeBasis, from, to,
			"converting between HHV and NCV depends on the fuel (use fuel_energy)")
	}
	return nil
}
