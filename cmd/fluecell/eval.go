package main

import (
	"context"
	"encoding/json"
	"fmt"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

func cmdEval(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("eval", "eval [--json] [--var NAME=VALUE]... [--pack P] [--factors FILE]... EXPR", s.err, true)
	asJSON := fs.Bool("json", false, `print {"value", "unit", "sources", "notes"} as JSON`)
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
	e, err := ef.engine()
	if err != nil {
		return fail(s, "eval", err)
	}
	p, err := e.Compile(pos[0], funcs.WithVariables(names...))
	if err != nil {
		return fail(s, "eval", err)
	}
	res, err := p.Eval(values)
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
	for _, f := range res.Sources {
		fmt.Fprintf(s.out, "  source: %s = %s\n", f.Key(), f.Citation())
	}
	for _, n := range res.Notes {
		fmt.Fprintf(s.out, "  note: %s\n", n)
	}
	return 0
}
