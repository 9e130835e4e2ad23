package funcs

import (
	"encoding/json"
	"math"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// argList holds the arguments of one call, positionally, after defaults: a
// nil entry is an optional argument left out.
type argList struct {
	fn   *Function
	vals []any
}

func (a argList) given(i int) bool { return i < len(a.vals) && a.vals[i] != nil }

// num returns argument i as a finite number.
func (a argList) num(i int) (float64, error) {
	p := a.fn.Params[i]
	v, ok := toNumber(a.vals[i])
	if !ok {
		return 0, &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: p.Name, Msg: "expected a number, got " + describe(a.vals[i])}
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, &Error{Code: CodeArithmetic, Func: a.fn.Name, Param: p.Name, Msg: "expected a finite number " + float64Range + ", got " + FormatNumber(v)}
	}
	return v, nil
}

// str returns argument i as a string.
func (a argList) str(i int) (string, error) {
	p := a.fn.Params[i]
	s, ok := a.vals[i].(string)
	if !ok {
		return "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: p.Name, Msg: "expected a string, got " + describe(a.vals[i])}
	}
	return s, nil
}

// optStr returns argument i, or def when it was left out.
func (a argList) optStr(i int, def string) (string, error) {
	if !a.given(i) {
		return def, nil
	}
	return a.str(i)
}

// optNum returns argument i and true, or 0 and false when it was left out.
func (a argList) optNum(i int) (float64, bool, error) {
	if !a.given(i) {
		return 0, false, nil
	}
	v, err := a.num(i)
	return v, err == nil, err
}

// Notes every call carries, from its arguments.
const (
	// NegativeAmountNote is noted when an amount parameter is negative: it is computed as
	// given (a negative emission), which is right for a return or a correction only.
	NegativeAmountNote = "negative amount: a return or correction?"
	// amountParam is the name of the parameter holding a quantity consumed (fuel burned,
	// electricity used) in every function that takes one.
	amountParam = "amount"
	// unitParamUnit is Param.Unit of a parameter that holds a unit string.
	unitParamUnit = "unit string"
)

// addNotes adds to c the notes the arguments call for: the note of a unit string read
// by convention (units.SpellingNote: a bare gallon is the US gallon) for every unit
// parameter, and NegativeAmountNote for a negative amount.
func (a argList) addNotes(c *callCtx) {
	for i, p := range a.fn.Params {
		if !a.given(i) {
			continue
		}
		switch {
		case p.Type == typeString && p.Unit == unitParamUnit:
			if s, ok := a.vals[i].(string); ok {
				if n := c.spell.note(s); n != "" {
					c.note(n)
				}
			}
		case p.Type == typeNumber && p.Name == amountParam:
			if v, ok := toNumber(a.vals[i]); ok && v < 0 {
				c.note(NegativeAmountNote)
			}
		}
	}
}

// spellCache keeps the spelling notes (units.SpellingNote) of the last unit strings a
// Runner read, by length, so that the rows of a table in one unit do not parse it on every
// call. A nil cache works out every note.
type spellCache [8]struct {
	s, note string
	ok      bool
}

func (sc *spellCache) note(s string) string {
	if sc == nil {
		return units.SpellingNote(s)
	}
	e := &sc[len(s)%len(sc)]
	if e.ok && e.s == s {
		return e.note
	}
	n := units.SpellingNote(s)
	e.s, e.note, e.ok = s, n, true
	return n
}

// toNumber accepts the number types a caller may pass (JSON decoding gives
// float64 or json.Number) and strings holding a plain decimal number.
func toNumber(v any) (float64, bool) {
	switch x := v.(type) {
	case float64:
		return x, true
	case float32:
		return float64(x), true
	case int:
		return float64(x), true
	case int64:
		return float64(x), true
	case int32:
		return float64(x), true
	case uint:
		return float64(x), true
	case uint64:
		return float64(x), true
	case json.Number:
		f, err := strconv.ParseFloat(string(x), 64)
		return f, err == nil
	case string:
		return ParseNumber(x)
	}
	return 0, false
}

// ParseNumber reads a plain decimal number such as "12", "-0.5" or "1.2e3"
// (a "." decimal separator, no thousands separators, no hex, no "Inf" or
// "NaN"), surrounding spaces allowed.
func ParseNumber(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	if s == "" || len(s) > 64 {
		return 0, false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= '0' && c <= '9' || c == '.' || c == '-' || c == '+' || c == 'e' || c == 'E') {
			return 0, false
		}
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(f, 0) {
		return 0, false
	}
	return f, true
}

func describe(v any) string {
	switch x := v.(type) {
	case nil:
		return "nothing"
	case string:
		return "the string " + quote(x)
	case bool:
		return "the boolean " + strconv.FormatBool(x)
	}
	if f, ok := toNumber(v); ok {
		return "the number " + FormatNumber(f)
	}
	return "a value of another type"
}

// FormatNumber writes v as the shortest decimal that reads back to the same
// float64, with a "." separator and no exponent for ordinary magnitudes, so
// that a spreadsheet's VALUE() accepts it.
func FormatNumber(v float64) string {
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a >= 1e-7 && a < 1e21 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// callCtx collects the factors and notes of one evaluation, without
// duplicates, in first-use order.
type callCtx struct {
	factors []*Factor
	notes   []string
	// With track set, calls of functions with a plan record themselves in contribs
	// and other catalog calls their names in untracked (see interval.go).
	track     bool
	contribs  []contrib
	untracked []string
	spell     *spellCache       // a Runner's; nil for a single call
	plans     map[planKey]*plan // a Runner's plans (planFor); nil for a single call
}

func (c *callCtx) reset() {
	clear(c.factors)
	c.factors = c.factors[:0]
	c.notes = c.notes[:0]
	clear(c.contribs)
	c.contribs = c.contribs[:0]
	c.untracked = c.untracked[:0]
}

func (c *callCtx) use(fs ...*Factor) {
next:
	for _, f := range fs {
		if f == nil {
			continue
		}
		for _, g := range c.factors {
			if g == f {
				continue next
			}
		}
		c.factors = append(c.factors, f)
	}
}

func (c *callCtx) note(ns ...string) {
next:
	for _, n := range ns {
		for _, m := range c.notes {
			if m == n {
				continue next
			}
		}
		c.notes = append(c.notes, n)
	}
}
