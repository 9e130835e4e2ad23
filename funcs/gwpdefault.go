package funcs

// One GWP set for a whole expression: WithGWPSet writes the set into every
// call that leaves its gwp_set argument out, by adding literal arguments to
// the syntax tree before it is compiled.

import (
	"strconv"
	"strings"

	"github.com/expr-lang/expr/ast"
)

// WithGWPSet makes every call in the expression to a function with a gwp_set
// parameter (fuel_co2e, mobile_co2e, electricity_co2e, gwp...) that leaves it
// out use set: ar4, ar5, ar6 or a set a user pack adds, case- and
// space-insensitive. A call that gives its own gwp_set keeps it. Optional
// parameters before gwp_set that the call also leaves out are given their
// defaults (fuel_co2e("natural_gas", 1, "TJ") with ar6 computes
// fuel_co2e("natural_gas", 1, "TJ", "ar6")). An empty set changes nothing:
// each call then uses its own set or DefaultGWPSet.
//
// Compile reports an unknown set as an *Error with Param "gwp_set" listing
// the accepted sets, and a call whose earlier optional parameter has no
// default that can be written as a literal as an *Error naming the function
// and that parameter.
func WithGWPSet(set string) CompileOption {
	return func(c *compileConfig) { c.gwpSet = set }
}

// resolveCompileGWPSet replaces the set of WithGWPSet by its canonical name.
func (e *Engine) resolveCompileGWPSet(c *compileConfig) error {
	if strings.TrimSpace(c.gwpSet) == "" {
		c.gwpSet = ""
		return nil
	}
	set, err := e.resolveGWPSet(c.gwpSet)
	if err != nil {
		fe, _ := AsError(err)
		out := *fe
		out.Msg = "the expression's GWP set: " + out.Msg
		return &out
	}
	c.gwpSet = set
	return nil
}

// gwpParamIndex is the position of f's GWP-set parameter, or -1.
func gwpParamIndex(f *Function) int {
	for i, p := range f.Params {
		if p.kind == kindGWPSet {
			return i
		}
	}
	return -1
}

// gwpFill returns the literal arguments that a call of f with the given
// number of arguments needs after them to name set: the defaults of the
// optional parameters it leaves out before gwp_set, then set. It returns none
// when f has no gwp_set parameter or the call gives one. The error is an
// *Error naming f and the parameter whose default cannot be written.
func (e *Engine) gwpFill(f *Function, given int, set string) ([]ast.Node, error) {
	at := gwpParamIndex(f)
	if set == "" || at < 0 || given > at {
		return nil, nil
	}
	fill := make([]ast.Node, 0, at-given+1)
	for _, p := range f.Params[given:at] {
		lit, err := e.defaultLiteral(f, p, set)
		if err != nil {
			return nil, err
		}
		fill = append(fill, lit)
	}
	return append(fill, &ast.StringNode{Value: set}), nil
}

// defaultLiteral is the literal argument that means the same as leaving the
// optional parameter p out: its omitted literal or its Default, as a number
// for a number parameter, as a string the parameter accepts otherwise.
func (e *Engine) defaultLiteral(f *Function, p Param, set string) (ast.Node, error) {
	lit := p.Default
	if p.omitted != "" {
		lit = p.omitted
	}
	fail := func() error {
		return &Error{Code: CodeCompile, Func: f.Name, Param: p.Name,
			Msg: "cannot apply GWP set " + set + " to " + f.Name + ": its parameter " + p.Name + " comes before gwp_set and its default (" +
				quote(p.Default) + ") cannot be written as an argument; give " + p.Name + " in the call, or give gwp_set yourself: " +
				f.Name + "(" + signature(f) + ")"}
	}
	if !p.Optional {
		return nil, fail()
	}
	if p.Type == typeNumber {
		v, ok := ParseNumber(lit)
		if !ok {
			return nil, fail()
		}
		if i, err := strconv.Atoi(strings.TrimSpace(lit)); err == nil {
			return &ast.IntegerNode{Value: i}, nil
		}
		return &ast.FloatNode{Value: v}, nil
	}
	if lit == "" || e.checkConstant(f, p, lit) != nil {
		return nil, fail()
	}
	if len(p.Allowed) > 0 && !containsFold(p.Allowed, lit) {
		return nil, fail()
	}
	return &ast.StringNode{Value: lit}, nil
}

func containsFold(list []string, s string) bool {
	for _, x := range list {
		if strings.EqualFold(strings.TrimSpace(x), strings.TrimSpace(s)) {
			return true
		}
	}
	return false
}

// gwpCheck reports, at the call's column, a call to which the expression's
// GWP set cannot be applied.
func (c *checker) gwpCheck(f *Function, n *ast.CallNode) error {
	if _, err := c.e.gwpFill(f, len(n.Arguments), c.cfg.gwpSet); err != nil {
		fe, _ := AsError(err)
		out := *fe
		out.Position, out.Source = n.Location().From+1, c.src
		return &out
	}
	return nil
}

// gwpPatcher appends the arguments of gwpFill to every catalog call; it runs
// before runPatcher, on calls the checker has already accepted.
type gwpPatcher struct {
	e   *Engine
	set string
}

func (p gwpPatcher) Visit(node *ast.Node) {
	n, ok := (*node).(*ast.CallNode)
	if !ok || p.set == "" {
		return
	}
	id, ok := n.Callee.(*ast.IdentifierNode)
	if !ok {
		return
	}
	f, ok := p.e.catalog.byName[id.Value]
	if !ok {
		return
	}
	fill, err := p.e.gwpFill(f, len(n.Arguments), p.set)
	if err != nil {
		return // reported by checker.gwpCheck before expr compiles
	}
	for _, a := range fill {
		a.SetLocation(n.Location())
	}
	n.Arguments = append(n.Arguments, fill...)
}

// appliedGWPSet is set when gwpPatcher writes it into at least one call of
// the tree, else "".
func (e *Engine) appliedGWPSet(root ast.Node, set string) string {
	if set == "" {
		return ""
	}
	applied := false
	ast.Walk(&root, gwpFinder(func(n *ast.CallNode) {
		if id, ok := n.Callee.(*ast.IdentifierNode); ok {
			if f, ok := e.catalog.byName[id.Value]; ok {
				fill, err := e.gwpFill(f, len(n.Arguments), set)
				applied = applied || (err == nil && len(fill) > 0)
			}
		}
	}))
	if !applied {
		return ""
	}
	return set
}

type gwpFinder func(*ast.CallNode)

func (f gwpFinder) Visit(node *ast.Node) {
	if n, ok := (*node).(*ast.CallNode); ok {
		f(n)
	}
}

// GWPSet is the GWP set that WithGWPSet wrote into at least one call of the
// expression (a call that names none), in its canonical spelling ("ar6"); ""
// when the option was not given or every call names its own set or takes
// none.
func (p *Program) GWPSet() string { return p.gwpSet }

// GWPSets lists the GWP-100 sets the loaded packs hold (ar4, ar5, ar6 and any
// a user pack adds), sorted.
func (e *Engine) GWPSets() []string { return e.gwpSets() }

// ResolveGWPSet maps a GWP set as a person writes it ("AR6", " ar6 ") to its
// canonical name; "" gives DefaultGWPSet. The error is an *Error with Param
// "gwp_set" listing the accepted sets.
func (e *Engine) ResolveGWPSet(s string) (string, error) { return e.resolveGWPSet(s) }
