package main

import (
	"context"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/uncertainty"
)

func cmdEval(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("eval", "eval [--json] [--uncertainty approach1|approach2 [--seed N] [--draws N]] [--var NAME=VALUE]... [--pack P] [--factors FILE]... EXPR", s.err, true)
	asJSON := fs.Bool("json", false, `print {"value", "low", "high", "interval", "unit", "sources", "notes"} as JSON (low and high: the 95 % interval, by approach1 unless --uncertainty says otherwise)`)
	approach := fs.String("uncertainty", "", "compute the 95 % interval from the factor ranges by `APPROACH`: approach1 (error propagation, IPCC 2006 Vol 1 Ch 3 Eq 3.1/3.2) or approach2 (Monte Carlo)")
	seed := fs.Uint64("seed", 1, "approach2: seed of the Monte Carlo draws (the same seed gives the same interval)")
	draws := fs.Int("draws", funcs.DefaultDraws, "approach2: number of Monte Carlo draws, 1 to 10000000")
	var vars listFlag
	fs.Var(&vars, "var", "set variable `NAME=VALUE` (a number, or else a string); repeatable")
	var ef engineFlags
	ef.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) != 1 {
		fmt.Fprintln(s.err, `fluecell eval: give exactly one expression, e.g. fluecell eval 'fuel_co2("natural_gas", 1000, "GJ")' (quote it for the shell)`)
		return 2
	}
	values := map[string]any{}
	names := []string{}
	for _, v := range vars {
		name, val, found := strings.Cut(v, "=")
		name = strings.TrimSpace(name)
		if !found || name == "" {
			fmt.Fprintf(s.err, "fluecell eval: --var %q: write NAME=VALUE, e.g. --var q=1000\n", v)
			return 2
		}
		if n, isNum := funcs.ParseNumber(val); isNum {
			values[name] = n
		} else {
			values[name] = val
		}
		names = append(names, name)
	}
	var opt *funcs.IntervalOptions
	if *asJSON || *approach != "" {
		a, err := funcs.ParseApproach(*approach)
		if err != nil {
			fmt.Fprintf(s.err, "fluecell eval: --uncertainty %q: accepted are approach1 (error propagation) and approach2 (Monte Carlo)\n", *approach)
			return 2
		}
		if *draws < 1 || *draws > uncertainty.MaxDraws {
			fmt.Fprintf(s.err, "fluecell eval: --draws %d: give 1 to %d\n", *draws, uncertainty.MaxDraws)
			return 2
		}
		opt = &funcs.IntervalOptions{Approach: a, Seed: *seed, Draws: *draws}
	}
	e, err := ef.engine()
	if err != nil {
		return fail(s, "eval", err)
	}
	p, err := e.Compile(pos[0], funcs.WithVariables(names...))
	if err != nil {
		return fail(s, "eval", err)
	}
	var res funcs.Result
	if opt != nil {
		res, err = p.EvalInterval(values, *opt)
	} else {
		res, err = p.Eval(values)
	}
	if err != nil {
		return fail(s, "eval", err)
	}
	if *asJSON {
		enc := json.NewEncoder(s.out)
		enc.SetIndent("", "  ")
		if err := enc.Encode(res); err != nil {
			return fail(s, "eval", err)
		}
		return 0
	}
	line := funcs.FormatNumber(res.Value)
	if res.Unit != "" {
		line += " " + res.Unit
	}
	fmt.Fprintln(s.out, line)
	if iv := res.Interval; iv != nil {
		fmt.Fprintf(s.out, "  95 %% interval: %s to %s (%s)\n", sig4(iv.Low), sig4(iv.High), iv.Approach)
	}
	for _, f := range res.Sources {
		fmt.Fprintf(s.out, "  source: %s = %s\n", f.Key(), f.Citation())
	}
	for _, n := range res.Notes {
		fmt.Fprintf(s.out, "  note: %s\n", n)
	}
	return 0
}

// sig4 writes x to four significant digits, the precision of a factor range.
func sig4(x float64) string {
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 4, 64), 64)
	if err != nil {
		r = x
	}
	return funcs.FormatNumber(r)
}
