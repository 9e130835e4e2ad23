package funcs

import (
	"errors"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/expr-lang/expr/ast"
	"github.com/fluecell/fluecell/funcs/units"
)

// Call evaluates one catalog function with arguments by parameter name, as
// strings (an HTTP query, a CLI flag): numbers are read as plain decimals
// with a "." separator. Unknown names, missing required parameters and bad
// values are *Error values naming the parameter and what is accepted; an
// unknown function is CodeUnknownFunction.
func (e *Engine) Call(name string, args map[string]string) (Result, error) {
	return e.call(name, args, nil)
}

// CallInterval is Call with the 95 % interval of the result (Result.Interval)
// computed as opt says, where the function has a model of its factors (the
// fuel functions); a note says why when it has none.
func (e *Engine) CallInterval(name string, args map[string]string, opt IntervalOptions) (Result, error) {
	return e.call(name, args, &opt)
}

func (e *Engine) call(name string, args map[string]string, opt *IntervalOptions) (Result, error) {
	f, ok := e.catalog.byName[name]
	if !ok {
		msg := "unknown function " + quote(name)
		if s := suggestFrom(name, e.catalog.names()); s != "" {
			msg += " (did you mean " + s + "?)"
		}
		msg += "; functions are " + strings.Join(e.catalog.names(), ", ")
		return Result{}, &Error{Code: CodeUnknownFunction, Msg: msg}
	}
	var unknown []string
	for k := range args {
		if _, ok := f.Param(k); !ok {
			unknown = append(unknown, k)
		}
	}
	if len(unknown) > 0 {
		sort.Strings(unknown)
		names := make([]string, len(f.Params))
		for i, p := range f.Params {
			names[i] = p.Name
		}
		msg := "unknown parameter " + quote(unknown[0]) + ": " + f.Name + " takes " + strings.Join(names, ", ")
		if s := suggestFrom(unknown[0], names); s != "" {
			msg += " (did you mean " + s + "?)"
		}
		return Result{}, &Error{Code: CodeBadArgument, Func: f.Name, Param: unknown[0], Msg: msg}
	}
	vals := make([]any, len(f.Params))
	for i, p := range f.Params {
		s, given := args[p.Name]
		if !given || (p.Optional && strings.TrimSpace(s) == "") {
			if !p.Optional {
				return Result{}, &Error{Code: CodeBadArgument, Func: f.Name, Param: p.Name,
					Msg: "missing required parameter " + p.Name + " (" + p.Type + ": " + p.Doc + ")"}
			}
			continue
		}
		if p.Type == typeNumber {
			v, ok := ParseNumber(s)
			if !ok {
				msg := p.Name + " must be a number with \".\" as decimal separator, got " + quote(s)
				if beyondRange(s) {
					msg = p.Name + " " + strings.TrimSpace(s) + " is beyond the float64 range: give a number " + float64Range
				}
				return Result{}, &Error{Code: CodeBadArgument, Func: f.Name, Param: p.Name, Msg: msg}
			}
			vals[i] = v
		} else {
			vals[i] = s
		}
	}
	return e.callValues(f, vals, opt)
}

// CallValues evaluates a catalog function with positional arguments
// (float64 for numbers, string for strings; nil or fewer values leave
// optional parameters out).
func (e *Engine) CallValues(name string, args ...any) (Result, error) {
	f, ok := e.catalog.byName[name]
	if !ok {
		return Result{}, &Error{Code: CodeUnknownFunction, Msg: "unknown function " + quote(name)}
	}
	if len(args) > len(f.Params) {
		return Result{}, &Error{Code: CodeBadArgument, Func: f.Name, Msg: f.Name + " takes " + arity(f) + ", got " + strconv.Itoa(len(args))}
	}
	vals := make([]any, len(f.Params))
	copy(vals, args)
	for i, p := range f.Params {
		if !p.Optional && vals[i] == nil {
			return Result{}, &Error{Code: CodeBadArgument, Func: f.Name, Param: p.Name, Msg: "missing required parameter " + p.Name}
		}
	}
	return e.callValues(f, vals, nil)
}

func (e *Engine) callValues(f *Function, vals []any, opt *IntervalOptions) (Result, error) {
	var c callCtx
	c.track = opt != nil
	v, unit, err := e.invoke(f, &c, argList{fn: f, vals: vals})
	if err != nil {
		return Result{}, err
	}
	if v == 0 {
		v = 0 // no negative zero in answers
	}
	if unit == "" {
		unit = f.staticUnit(vals)
	}
	res := Result{Value: v, Unit: unit, Sources: c.factors, Notes: c.notes}
	if opt != nil {
		c.interval(&res, []float64{1}, *opt)
	}
	return res, nil
}

// invoke runs f with the arguments a. It adds the notes the arguments call for (see
// argList.notes) and turns a result that is not a finite number into an error naming the
// argument to blame and the range it accepts (see overflow). Every call of a catalog
// function, from Call, CallValues or an expression, goes through it.
func (e *Engine) invoke(f *Function, c *callCtx, a argList) (float64, string, error) {
	recorded := len(c.contribs)
	v, unit, err := f.call(e, c, a)
	if err != nil {
		return 0, "", withFunc(err, f.Name)
	}
	if c.track && len(c.contribs) == recorded && !slices.Contains(c.untracked, f.Name) {
		c.untracked = append(c.untracked, f.Name)
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, "", e.overflow(f, a, v)
	}
	a.addNotes(c)
	return v, unit, nil
}

// overflow is the error of a call of f whose result v is not a finite number. When one
// numeric argument is to blame (the result is finite with it set to 1, sign kept), the error
// names it and the largest magnitude that gives a finite result with the other arguments as
// given, found by bisection over the float64 values between 1 and the argument. Otherwise the
// error says that an argument is too large.
func (e *Engine) overflow(f *Function, a argList, v float64) error {
	for i, p := range f.Params {
		if p.Type != typeNumber || !a.given(i) {
			continue
		}
		x, ok := toNumber(a.vals[i])
		if !ok || math.IsNaN(x) || math.Abs(x) <= 1 {
			continue
		}
		vals := make([]any, len(a.vals))
		finite := func(y float64) bool {
			copy(vals, a.vals)
			vals[i] = math.Copysign(y, x)
			r, _, err := f.call(e, &callCtx{}, argList{fn: f, vals: vals})
			return err == nil && !math.IsNaN(r) && !math.IsInf(r, 0)
		}
		if !finite(1) {
			continue
		}
		// Positive float64 values are ordered as their bit patterns.
		lo, hi := math.Float64bits(1), math.Float64bits(math.Abs(x))
		for hi-lo > 1 {
			mid := lo + (hi-lo)/2
			if finite(math.Float64frombits(mid)) {
				lo = mid
			} else {
				hi = mid
			}
		}
		limit := FormatNumber(roundDown3(math.Float64frombits(lo)))
		return &Error{Code: CodeArithmetic, Func: f.Name, Param: p.Name,
			Msg: p.Name + " " + FormatNumber(x) + " gives a result beyond the float64 range (" + FormatNumber(v) +
				"): with the other arguments as given, " + p.Name + " must lie between -" + limit + " and " + limit}
	}
	return &Error{Code: CodeArithmetic, Func: f.Name,
		Msg: "the result is not a finite number (" + FormatNumber(v) + "): an argument is too large"}
}

// roundDown3 rounds a positive x down to three significant digits.
func roundDown3(x float64) float64 {
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'e', 2, 64), 64)
	if err != nil || r <= x {
		return r
	}
	// rounded up: step the third digit down
	exp := math.Floor(math.Log10(r))
	step := math.Pow(10, exp-2)
	r, _ = strconv.ParseFloat(strconv.FormatFloat(r-step, 'e', 2, 64), 64)
	return r
}

// float64Range is the range of finite float64 values, as an error message states it.
const float64Range = "between -1.7976931348623157e308 and 1.7976931348623157e308"

// beyondRange reports whether s is a plain decimal number too large for a float64 ("1e999").
func beyondRange(s string) bool {
	s = strings.TrimSpace(s)
	if _, ok := ParseNumber(s); ok || s == "" || strings.ContainsAny(s, "nNiI") {
		return false
	}
	_, err := strconv.ParseFloat(s, 64)
	var ne *strconv.NumError
	return errors.As(err, &ne) && ne.Err == strconv.ErrRange && !strings.ContainsAny(s, "xXpP_")
}

// staticUnit is the unit of a call's result from its declaration and, for
// to_unit and fuel_energy, from the unit argument.
func (f *Function) staticUnit(vals []any) string {
	switch f.Name {
	case "to_unit":
		if len(vals) > 2 {
			if s, ok := vals[2].(string); ok {
				if u, err := units.Parse(s); err == nil {
					return u.String()
				}
			}
		}
		return ""
	case "fuel_energy":
		if len(vals) > 3 {
			if s, ok := vals[3].(string); ok {
				if u, err := units.Parse(s); err == nil {
					return u.String()
				}
			}
		}
		return "GJ"
	case "co2_from_carbon", "carbon_from_co2":
		return ""
	}
	return f.ResultUnit
}

// staticUnit infers the unit of an expression: a call's result unit, kept
// through unary minus, sums and differences of one unit, and ternaries whose
// branches agree. Anything else (products, quotients) has no known unit.
func (e *Engine) staticUnit(n ast.Node) string {
	switch n := n.(type) {
	case *ast.CallNode:
		id, ok := n.Callee.(*ast.IdentifierNode)
		if !ok {
			return ""
		}
		f, ok := e.catalog.byName[id.Value]
		if !ok {
			return ""
		}
		vals := make([]any, len(n.Arguments))
		for i, a := range n.Arguments {
			if s, ok := a.(*ast.StringNode); ok {
				vals[i] = s.Value
			}
		}
		if f.Name == "to_unit" || f.Name == "fuel_energy" {
			// the unit argument must be a literal for the unit to be known
			idx := 2
			if f.Name == "fuel_energy" {
				idx = 3
			}
			if idx < len(n.Arguments) {
				if _, lit := n.Arguments[idx].(*ast.StringNode); !lit {
					return ""
				}
			}
		}
		return f.staticUnit(vals)
	case *ast.UnaryNode:
		if n.Operator == "-" || n.Operator == "+" {
			return e.staticUnit(n.Node)
		}
	case *ast.BinaryNode:
		if n.Operator == "+" || n.Operator == "-" {
			l, r := e.staticUnit(n.Left), e.staticUnit(n.Right)
			if l == r {
				return l
			}
		}
	case *ast.ConditionalNode:
		a, b := e.staticUnit(n.Exp1), e.staticUnit(n.Exp2)
		if a == b {
			return a
		}
	}
	return ""
}
