package funcs

import (
	"math"
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
				return Result{}, &Error{Code: CodeBadArgument, Func: f.Name, Param: p.Name, Msg: msg}
			}
			vals[i] = v
		} else {
			vals[i] = s
		}
	}
	return e.callValues(f, vals)
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
	return e.callValues(f, vals)
}

func (e *Engine) callValues(f *Function, vals []any) (Result, error) {
	var c callCtx
	v, unit, err := f.call(e, &c, argList{fn: f, vals: vals})
	if err != nil {
		return Result{}, withFunc(err, f.Name)
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return Result{}, &Error{Code: CodeArithmetic, Func: f.Name, Msg: "the result is not a finite number (" + FormatNumber(v) + "): an argument is too large"}
	}
	if v == 0 {
		v = 0 // no negative zero in answers
	}
	if unit == "" {
		unit = f.staticUnit(vals)
	}
	return Result{Value: v, Unit: unit, Sources: c.factors, Notes: c.notes}, nil
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
