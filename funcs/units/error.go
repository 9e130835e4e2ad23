package units

import (
	"strconv"
	"strings"
)

// Error codes. They match the warning codes of workbook annotation.
const (
	CodeUnknown    = "unit-unknown"
	CodeAmbiguous  = "unit-ambiguous"
	CodeDimension  = "unit-dimension"
	CodeBasis      = "unit-basis"
	CodeNotANumber = "value-not-number"
)

const emptyUnitAdvice = "give a unit such as GJ, kWh, t or L"

// Error is the error type of this package. Every error returned by Parse, ParseAs, Factor,
// Ratio and Convert is an *Error.
type Error struct {
	// Input is the string as given. For Factor, Ratio and Convert it is the source unit's
	// String(); for a value error it is the value formatted with strconv.FormatFloat.
	Input        string
	Code         string   // "unit-unknown", "unit-ambiguous", "unit-dimension", "unit-basis", "value-not-number"
	Msg          string   // full message (Error() returns it)
	Alternatives []string // for unit-ambiguous: the symbols the user could mean
	Suggestion   string   // for unit-unknown: closest known symbol, if any (edit distance), else ""
}

// Error returns the message.
func (e *Error) Error() string { return e.Msg }

func quote(s string) string { return strconv.Quote(s) }

func errEmpty(input string) *Error {
	return &Error{Input: input, Code: CodeUnknown, Msg: "empty unit: " + emptyUnitAdvice}
}

// errUnknown reports an unknown unit; name is the (normalised) part that was not found and
// want the dimensions a suggestion may have (any when empty).
func errUnknown(input, name string, want []Dimension, suggest bool) *Error {
	e := &Error{Input: input, Code: CodeUnknown}
	if suggest {
		e.Suggestion = table.suggestFor(name, want)
	}
	if e.Suggestion != "" {
		e.Msg = "unknown unit " + quote(name) + " (did you mean " + e.Suggestion + "?)"
	} else {
		e.Msg = "unknown unit " + quote(name) + ": accepted units are listed by 'fluecell units'"
	}
	return e
}

func errAmbiguous(input, name string, a *ambiguity) *Error {
	if a.refused != "" {
		al := a.alts[0]
		return &Error{Input: input, Code: CodeAmbiguous, Alternatives: []string{al.sym},
			Msg: "unit " + quote(name) + " reads as " + a.refused + ", which is not accepted: for " +
				al.desc + " write " + al.sym}
	}
	var b strings.Builder
	b.WriteString("ambiguous unit ")
	b.WriteString(quote(name))
	b.WriteString(": ")
	if a.note != "" {
		b.WriteString(a.note)
		b.WriteString("; ")
	}
	b.WriteString("write ")
	alts := make([]string, len(a.alts))
	for i, al := range a.alts {
		alts[i] = al.sym
		if i > 0 {
			if i == len(a.alts)-1 {
				b.WriteString(" or ")
			} else {
				b.WriteString(", ")
			}
		}
		b.WriteString(al.sym)
		b.WriteString(" (")
		b.WriteString(al.desc)
		b.WriteString(")")
	}
	return &Error{Input: input, Code: CodeAmbiguous, Msg: b.String(), Alternatives: alts}
}

// errBasisNotEnergy reports a basis written after a unit that is not an energy unit.
func errBasisNotEnergy(input, tok, name string) *Error {
	return &Error{Input: input, Code: CodeBasis,
		Msg: "basis " + quote(tok) + " applies only to energy units, not to " + quote(name)}
}

func errTwoBases(input, name string) *Error {
	return &Error{Input: input, Code: CodeBasis,
		Msg: "unit " + quote(name) + " declares two bases: give one of HHV (= GCV) or NCV (= LHV)"}
}

// errDimension reports a unit of the wrong dimension for ParseAs.
func errDimension(input, name string, u Unit, want []Dimension) *Error {
	msg := "unit " + quote(name) + " is " + u.Dim.article() + ", but " + dimList(want) + " is needed here"
	if hint := dimensionHint(u, want); hint != "" {
		msg += " (did you mean " + hint + "?)"
	}
	return &Error{Input: input, Code: CodeDimension, Msg: msg}
}

// dimList writes "an energy", "an energy or a volume", "an energy, a mass or a volume".
func dimList(ds []Dimension) string {
	var b strings.Builder
	for i, d := range ds {
		if i > 0 {
			if i == len(ds)-1 {
				b.WriteString(" or ")
			} else {
				b.WriteString(", ")
			}
		}
		b.WriteString(d.article())
	}
	return b.String()
}

// dimensionHint proposes the energy unit for a power unit written where energy is needed
// (kW -> kWh), and the power unit for an energy unit written where power is needed (MWh -> MW).
func dimensionHint(u Unit, want []Dimension) string {
	for _, d := range want {
		switch {
		case d == Energy && u.Dim == Power:
			if id, ok := table.exactMap[u.Symbol+"h"]; ok && table.units[id].Dim == Energy {
				return table.units[id].Symbol
			}
		case d == Power && u.Dim == Energy && strings.HasSuffix(u.Symbol, "Wh"):
			if id, ok := table.exactMap[strings.TrimSuffix(u.Symbol, "h")]; ok && table.units[id].Dim == Power {
				return table.units[id].Symbol
			}
		}
	}
	return ""
}

// errConvert reports a conversion between units that cannot convert.
func errConvert(code string, from, to Unit, why string) *Error {
	return &Error{Input: from.String(), Code: code,
		Msg: "cannot convert " + quote(from.String()) + " to " + quote(to.String()) + ": " + why}
}

// errUnitValue reports a Unit that did not come from this package (the zero Unit, or one
// built by hand).
func errUnitValue(u Unit) *Error {
	if u.Symbol == "" {
		return errEmpty("")
	}
	return &Error{Input: u.String(), Code: CodeUnknown,
		Msg: "unit " + quote(u.Symbol) + " was not made by this package: get units from Parse, ParseAs or List"}
}
