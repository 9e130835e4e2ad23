package funcs

import (
	"errors"
	"strconv"
	"strings"
	"unicode"

	"github.com/expr-lang/expr"
	"github.com/expr-lang/expr/ast"
	"github.com/expr-lang/expr/file"
	"github.com/expr-lang/expr/parser"
)

// Expression limits.
const (
	MaxExprLength = 4096 // characters of source
	MaxExprNodes  = 400  // syntax-tree nodes
)

// runVar is the hidden variable through which catalog functions reach the
// state of the run that calls them; user names may not start with "__".
const runVar = "__run"

// CompileOption configures Compile.
type CompileOption func(*compileConfig)

type compileConfig struct {
	vars     map[string]bool // nil: any variable name is accepted
	list     []string
	maxLen   int    // 0: MaxExprLength
	maxNodes int    // 0: MaxExprNodes
	gwpSet   string // "": each call's own gwp_set or its default (see WithGWPSet)
}

// WithSizeLimit raises the length and syntax-tree limits for an expression a
// program writes itself (the importer's rule for a table with one column per
// period sums a call per column); user expressions keep MaxExprLength and
// MaxExprNodes. Values below the defaults are ignored.
func WithSizeLimit(chars, nodes int) CompileOption {
	return func(c *compileConfig) {
		c.maxLen, c.maxNodes = max(chars, MaxExprLength), max(nodes, MaxExprNodes)
	}
}

func (c *compileConfig) limits() (chars, nodes int) {
	chars, nodes = MaxExprLength, MaxExprNodes
	if c.maxLen > 0 {
		chars = c.maxLen
	}
	if c.maxNodes > 0 {
		nodes = c.maxNodes
	}
	return chars, nodes
}

// WithVariables declares the variables rows will provide; Compile then
// rejects any other name, with the column and a suggestion.
func WithVariables(names ...string) CompileOption {
	return func(c *compileConfig) {
		if c.vars == nil {
			c.vars = map[string]bool{}
		}
		for _, n := range names {
			if !c.vars[n] {
				c.vars[n] = true
				c.list = append(c.list, n)
			}
		}
	}
}

// Compile checks an expression against the allow-list and compiles it once.
// Allowed are the catalog functions, arithmetic (+ - * / % **), comparisons,
// and, or, not, the ternary operator, number, string and boolean literals and
// variables. Anything else (expr's builtins and predicates, member access,
// arrays, maps, ranges, let, matches, pipes) is refused. Errors are *Error
// with the column of the offending token; Error() shows it with a caret.
func (e *Engine) Compile(src string, opts ...CompileOption) (*Program, error) {
	var cfg compileConfig
	for _, o := range opts {
		o(&cfg)
	}
	if err := e.resolveCompileGWPSet(&cfg); err != nil {
		return nil, err
	}
	maxLen, maxNodes := cfg.limits()
	if n := len([]rune(src)); n > maxLen {
		return nil, &Error{Code: CodeLimit, Param: "expr", Msg: "expression is " + strconv.Itoa(n) + " characters long; the limit is " + strconv.Itoa(maxLen)}
	}
	if strings.TrimSpace(src) == "" {
		return nil, &Error{Code: CodeCompile, Param: "expr", Msg: "empty expression: write one such as fuel_co2(\"natural_gas\", 1000, \"GJ\")"}
	}
	tree, err := parser.Parse(src)
	if err != nil {
		return nil, e.parseError(src, err)
	}
	c := &checker{e: e, src: src, cfg: &cfg, seen: map[string]bool{}}
	if err := c.check(tree.Node); err != nil {
		return nil, err
	}
	// Variables stay undeclared for expr: their types are only known per row,
	// and the checker above has already vetted every name.
	options := []expr.Option{
		expr.Env(map[string]any{runVar: (*runState)(nil)}),
		expr.AllowUndefinedVariables(),
		expr.DisableAllBuiltins(),
		expr.MaxNodes(uint(4 * maxNodes)),
		expr.Patch(gwpPatcher{e: e, set: cfg.gwpSet}),
		expr.Patch(runPatcher{e: e}),
		expr.Function(divFunc, checkedDiv),
		expr.Function(modFunc, checkedMod),
	}
	for _, f := range e.catalog.list {
		options = append(options, expr.Function(f.Name, e.exprFunc(f)))
	}
	prog, err := expr.Compile(src, options...)
	if err != nil {
		return nil, e.parseError(src, err)
	}
	return &Program{e: e, src: src, prog: prog, vars: c.vars, unit: e.staticUnit(tree.Node), signs: e.callSigns(tree.Node),
		gwpSet: e.appliedGWPSet(tree.Node, cfg.gwpSet)}, nil
}

func (e *Engine) parseError(src string, err error) error {
	var fe *file.Error
	if errors.As(err, &fe) {
		return &Error{Code: CodeCompile, Param: "expr", Msg: lowerFirst(fe.Message), Position: fe.From + 1, Source: src, Err: err}
	}
	return &Error{Code: CodeCompile, Param: "expr", Msg: err.Error(), Err: err}
}

func lowerFirst(s string) string {
	for i, r := range s {
		return string(unicode.ToLower(r)) + s[i+len(string(r)):]
	}
	return s
}

// checker walks the syntax tree with an explicit allow-list.
type checker struct {
	e     *Engine
	src   string
	cfg   *compileConfig
	nodes int
	vars  []string
	seen  map[string]bool
}

func (c *checker) fail(n ast.Node, msg string) error {
	return &Error{Code: CodeCompile, Param: "expr", Msg: msg, Position: n.Location().From + 1, Source: c.src}
}

func (c *checker) check(n ast.Node) error {
	c.nodes++
	if _, maxNodes := c.cfg.limits(); c.nodes > maxNodes {
		return &Error{Code: CodeLimit, Param: "expr", Msg: "expression has more than " + strconv.Itoa(maxNodes) + " parts; split it into several rules", Position: n.Location().From + 1, Source: c.src}
	}
	switch n := n.(type) {
	case *ast.IntegerNode, *ast.FloatNode, *ast.StringNode, *ast.BoolNode:
		return nil
	case *ast.IdentifierNode:
		return c.variable(n)
	case *ast.UnaryNode:
		switch n.Operator {
		case "-", "+", "!", "not":
			return c.check(n.Node)
		}
		return c.fail(n, "operator "+quote(n.Operator)+" is not allowed")
	case *ast.BinaryNode:
		switch n.Operator {
		case "+", "-", "*", "/", "%", "**", "^", "==", "!=", "<", ">", "<=", ">=", "and", "or", "&&", "||":
		default:
			return c.fail(n, "operator "+quote(n.Operator)+" is not allowed: use arithmetic (+ - * / % **), comparisons, and, or, not")
		}
		if err := c.check(n.Left); err != nil {
			return err
		}
		return c.check(n.Right)
	case *ast.ConditionalNode:
		if !n.Ternary {
			return c.fail(n, "if/else is not allowed: write cond ? a : b")
		}
		for _, m := range []ast.Node{n.Cond, n.Exp1, n.Exp2} {
			if err := c.check(m); err != nil {
				return err
			}
		}
		return nil
	case *ast.CallNode:
		return c.call(n)
	case *ast.BuiltinNode:
		return c.fail(n, n.Name+"() is not available: expressions may call only the catalog functions ("+strings.Join(c.e.catalog.names(), ", ")+")")
	case *ast.PredicateNode, *ast.PointerNode:
		return c.fail(n, "predicates are not allowed")
	case *ast.MemberNode, *ast.ChainNode:
		return c.fail(n, "member access (a.b, a[i]) is not allowed")
	case *ast.SliceNode:
		return c.fail(n, "slices are not allowed")
	case *ast.ArrayNode, *ast.MapNode, *ast.PairNode:
		return c.fail(n, "arrays and maps are not allowed")
	case *ast.VariableDeclaratorNode:
		return c.fail(n, "let is not allowed: use the columns' variables directly")
	case *ast.SequenceNode:
		return c.fail(n, "several expressions separated by ; are not allowed: write one expression")
	case *ast.NilNode:
		return c.fail(n, "nil is not allowed")
	}
	return c.fail(n, "this construct is not allowed")
}

func (c *checker) variable(n *ast.IdentifierNode) error {
	name := n.Value
	if strings.HasPrefix(name, "__") || strings.HasPrefix(name, "$") {
		return c.fail(n, "name "+quote(name)+" is reserved")
	}
	if _, isFn := c.e.catalog.byName[name]; isFn {
		return c.fail(n, name+" is a function: call it with arguments, e.g. "+c.e.catalog.byName[name].Example)
	}
	if c.cfg.vars != nil && !c.cfg.vars[name] {
		msg := "unknown variable " + quote(name)
		if s := suggestFrom(name, c.cfg.list); s != "" {
			msg += " (did you mean " + s + "?)"
		}
		if len(c.cfg.list) > 0 {
			msg += "; known variables: " + strings.Join(c.cfg.list, ", ")
		} else {
			msg += "; no variables are given"
		}
		return &Error{Code: CodeVariable, Param: "expr", Msg: msg, Position: n.Location().From + 1, Source: c.src}
	}
	if !c.seen[name] {
		c.seen[name] = true
		c.vars = append(c.vars, name)
	}
	return nil
}

func (c *checker) call(n *ast.CallNode) error {
	id, ok := n.Callee.(*ast.IdentifierNode)
	if !ok {
		return c.fail(n, "only catalog functions can be called")
	}
	f, ok := c.e.catalog.byName[id.Value]
	if !ok {
		msg := "unknown function " + quote(id.Value)
		if s := suggestFrom(id.Value, c.e.catalog.names()); s != "" {
			msg += " (did you mean " + s + "?)"
		} else {
			msg += "; functions are " + strings.Join(c.e.catalog.names(), ", ")
		}
		return &Error{Code: CodeUnknownFunction, Param: "expr", Msg: msg, Position: n.Location().From + 1, Source: c.src}
	}
	if len(n.Arguments) < f.MinArgs() || len(n.Arguments) > len(f.Params) {
		return c.fail(n, f.Name+" takes "+arity(f)+", got "+strconv.Itoa(len(n.Arguments))+": "+f.Name+"("+signature(f)+")")
	}
	if err := c.gwpCheck(f, n); err != nil {
		return err
	}
	for i, arg := range n.Arguments {
		if err := c.check(arg); err != nil {
			return err
		}
		if err := c.literal(f, f.Params[i], arg); err != nil {
			return err
		}
	}
	return nil
}

// literal checks constant arguments now, so that a misspelt unit or fuel is
// reported at its column before any row runs.
func (c *checker) literal(f *Function, p Param, arg ast.Node) error {
	switch a := arg.(type) {
	case *ast.StringNode:
		if p.Type == typeNumber {
			if _, ok := ParseNumber(a.Value); !ok {
				return c.fail(arg, f.Name+": "+p.Name+" must be a number, not the string "+quote(a.Value))
			}
			return nil
		}
		if err := c.e.checkConstant(f, p, a.Value); err != nil {
			fe, _ := AsError(err)
			out := *fe
			out.Func, out.Position, out.Source = f.Name, arg.Location().From+1, c.src
			return &out
		}
	case *ast.IntegerNode, *ast.FloatNode:
		if p.Type == typeString {
			return c.fail(arg, f.Name+": "+p.Name+" must be a string (in double quotes), not a number")
		}
	case *ast.BoolNode:
		return c.fail(arg, f.Name+": "+p.Name+" must be a "+p.Type+", not a boolean")
	}
	return nil
}

func arity(f *Function) string {
	lo, hi := f.MinArgs(), len(f.Params)
	if lo == hi {
		return strconv.Itoa(lo) + " arguments"
	}
	return strconv.Itoa(lo) + " to " + strconv.Itoa(hi) + " arguments"
}

// signature writes "fuel, amount, unit [, pack]".
func signature(f *Function) string {
	var b strings.Builder
	opened := 0
	for i, p := range f.Params {
		if p.Optional {
			if i > 0 {
				b.WriteString(" [, ")
			} else {
				b.WriteString("[")
			}
			opened++
		} else if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(p.Name)
	}
	b.WriteString(strings.Repeat("]", opened))
	return b.String()
}

// runPatcher passes the run state to every catalog call and routes / and %
// through checked functions, so that division by zero is an error.
type runPatcher struct{ e *Engine }

const (
	divFunc = "__div"
	modFunc = "__mod"
)

func (p runPatcher) Visit(node *ast.Node) {
	switch n := (*node).(type) {
	case *ast.CallNode:
		id, ok := n.Callee.(*ast.IdentifierNode)
		if !ok {
			return
		}
		if _, isFn := p.e.catalog.byName[id.Value]; isFn {
			n.Arguments = append([]ast.Node{&ast.IdentifierNode{Value: runVar}}, n.Arguments...)
		}
	case *ast.BinaryNode:
		var name string
		switch n.Operator {
		case "/":
			name = divFunc
		case "%":
			name = modFunc
		default:
			return
		}
		call := &ast.CallNode{Callee: &ast.IdentifierNode{Value: name},
			Arguments: []ast.Node{n.Left, n.Right, &ast.IntegerNode{Value: n.Location().From + 1}}}
		call.SetLocation(n.Location())
		ast.Patch(node, call)
	}
}
