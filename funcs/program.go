package funcs

import (
	"errors"
	"math"
	"strconv"
	"sync"

	"github.com/expr-lang/expr/file"
	"github.com/expr-lang/expr/vm"
)

// Program is a compiled expression. It is immutable and safe for concurrent
// use; each goroutine evaluates it through its own Runner (or Eval).
type Program struct {
	e    *Engine
	src  string
	prog *vm.Program
	vars []string // variables in first-use order
	unit string   // result unit when it follows from the expression, else ""
	// signs are the signs of the catalog calls in evaluation order when the
	// expression is a sum or difference of calls and numbers; nil otherwise.
	signs []float64
	// gwpSet is the set WithGWPSet wrote into at least one call; "" when none.
	gwpSet string
	pool   sync.Pool
}

// Source is the expression as compiled.
func (p *Program) Source() string { return p.src }

// Variables lists the variables the expression reads, in first-use order.
func (p *Program) Variables() []string { return append([]string(nil), p.vars...) }

// Unit is the unit of the result where it follows from the expression (a
// catalog call, or sums and choices between calls of one unit), else "".
func (p *Program) Unit() string { return p.unit }

// runState is what catalog functions see of the run calling them.
type runState struct {
	ctx callCtx
}

// Runner evaluates one Program for many sets of variables. A Runner is not
// safe for concurrent use: give each goroutine its own.
type Runner struct {
	p   *Program
	vm  vm.VM
	env map[string]any
	st  runState
}

// NewRunner returns a Runner for p.
func (p *Program) NewRunner() *Runner {
	r := &Runner{p: p, env: make(map[string]any, len(p.vars)+1)}
	r.st.ctx.spell, r.st.ctx.plans = new(spellCache), map[planKey]*plan{}
	r.env[runVar] = &r.st
	return r
}

// Run evaluates the program with vars, which must hold every variable of
// the expression (numbers as float64, int or json.Number; strings; booleans).
// The Result's Sources and Notes are reused by the next Run of the same
// Runner: copy them (Result.Clone) to keep them longer.
func (r *Runner) Run(vars map[string]any) (Result, error) {
	r.st.ctx.track = false
	return r.run(vars)
}

// RunInterval is Run with the 95 % interval of the result (Result.Interval)
// computed as opt says, when the expression is a call or a sum or difference of
// calls of functions that model their factors; a note says why otherwise.
func (r *Runner) RunInterval(vars map[string]any, opt IntervalOptions) (Result, error) {
	r.st.ctx.track = true
	res, err := r.run(vars)
	if err != nil {
		return res, err
	}
	r.st.ctx.interval(&res, r.p.signs, opt)
	r.st.ctx.notes = res.Notes
	return res, nil
}

func (r *Runner) run(vars map[string]any) (Result, error) {
	for _, name := range r.p.vars {
		v, ok := vars[name]
		if !ok {
			return Result{}, &Error{Code: CodeVariable, Param: name, Msg: "variable " + quote(name) + " has no value"}
		}
		switch x := v.(type) {
		case float64, string, bool:
		default:
			if f, ok := toNumber(x); ok {
				v = f
			} else if v == nil {
				return Result{}, &Error{Code: CodeVariable, Param: name, Msg: "variable " + quote(name) + " is empty"}
			}
		}
		r.env[name] = v
	}
	r.st.ctx.reset()
	out, err := r.vm.Run(r.p.prog, r.env)
	if err != nil {
		return Result{}, r.p.runError(err)
	}
	var value float64
	switch x := out.(type) {
	case float64:
		value = x
	case int:
		value = float64(x)
	case bool:
		return Result{}, &Error{Code: CodeBadArgument, Param: "expr", Msg: "the expression gives a boolean (" + strconv.FormatBool(x) + "), not a number: wrap it as cond ? a : b"}
	case string:
		return Result{}, &Error{Code: CodeBadArgument, Param: "expr", Msg: "the expression gives the string " + quote(x) + ", not a number"}
	default:
		if f, ok := toNumber(x); ok {
			value = f
		} else {
			return Result{}, &Error{Code: CodeBadArgument, Param: "expr", Msg: "the expression does not give a number"}
		}
	}
	if math.IsNaN(value) || math.IsInf(value, 0) {
		return Result{}, &Error{Code: CodeArithmetic, Param: "expr", Msg: "the result is not a finite number (" + FormatNumber(value) + "): check for overflow or an undefined operation"}
	}
	if value == 0 {
		value = 0 // no negative zero in answers
	}
	return Result{Value: value, Unit: r.p.unit, Sources: r.st.ctx.factors, Notes: r.st.ctx.notes}, nil
}

// Eval evaluates the program once with vars; the Result is the caller's.
// Safe for concurrent use.
func (p *Program) Eval(vars map[string]any) (Result, error) {
	r, _ := p.pool.Get().(*Runner)
	if r == nil {
		r = p.NewRunner()
	}
	res, err := r.Run(vars)
	res = res.Clone()
	p.put(r)
	return res, err
}

// EvalInterval is Eval with the 95 % interval of the result (see
// Runner.RunInterval). Safe for concurrent use.
func (p *Program) EvalInterval(vars map[string]any, opt IntervalOptions) (Result, error) {
	r, _ := p.pool.Get().(*Runner)
	if r == nil {
		r = p.NewRunner()
	}
	res, err := r.RunInterval(vars, opt)
	res = res.Clone()
	p.put(r)
	return res, err
}

func (p *Program) put(r *Runner) {
	clear(r.env)
	r.env[runVar] = &r.st
	p.pool.Put(r)
}

// runError turns a VM error into an *Error, keeping the character position of the call
// that failed.
func (p *Program) runError(err error) error {
	var fe *file.Error
	col := 0
	if errors.As(err, &fe) {
		col = fe.From + 1
	}
	if e, ok := AsError(err); ok {
		c := *e
		if c.Position == 0 && col > 0 {
			c.Position = col
		}
		if c.Position > 0 && c.Source == "" {
			c.Source = p.src
		}
		return &c
	}
	msg := err.Error()
	if fe != nil {
		msg = lowerFirst(fe.Message)
	}
	return &Error{Code: CodeBadArgument, Param: "expr", Msg: msg, Position: col, Source: p.src, Err: err}
}

// exprFunc adapts a catalog function to the expression VM. The first
// argument is the run state the patcher inserted.
func (e *Engine) exprFunc(f *Function) func(params ...any) (any, error) {
	return func(params ...any) (any, error) {
		st, ok := params[0].(*runState)
		if !ok || st == nil {
			return nil, &Error{Code: CodeCompile, Func: f.Name, Msg: "internal: run state missing"}
		}
		v, _, err := e.invoke(f, &st.ctx, argList{fn: f, vals: params[1:]})
		if err != nil {
			return nil, err
		}
		return v, nil
	}
}

func arith(params []any, op string) (a, b float64, col int, err error) {
	col, _ = params[2].(int)
	var ok bool
	if a, ok = toNumberStrict(params[0]); !ok {
		return 0, 0, col, &Error{Code: CodeBadArgument, Param: "expr", Msg: "left side of " + op + " is " + describe(params[0]) + ", not a number"}
	}
	if b, ok = toNumberStrict(params[1]); !ok {
		return 0, 0, col, &Error{Code: CodeBadArgument, Param: "expr", Msg: "right side of " + op + " is " + describe(params[1]) + ", not a number"}
	}
	if b == 0 {
		return 0, 0, col, &Error{Code: CodeArithmetic, Param: "expr", Msg: "division by zero", Position: col}
	}
	return a, b, col, nil
}

// toNumberStrict is toNumber without strings: arithmetic on text is an error.
func toNumberStrict(v any) (float64, bool) {
	if _, isStr := v.(string); isStr {
		return 0, false
	}
	return toNumber(v)
}

func checkedDiv(params ...any) (any, error) {
	a, b, _, err := arith(params, "/")
	if err != nil {
		return nil, err
	}
	return a / b, nil
}

func checkedMod(params ...any) (any, error) {
	a, b, _, err := arith(params, "%")
	if err != nil {
		return nil, err
	}
	return math.Mod(a, b), nil
}
