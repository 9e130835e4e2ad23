package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

func cmdFunctions(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("functions", "functions [--json] [NAME]", s.err, true)
	asJSON := fs.Bool("json", false, "print the catalog as JSON")
	var ef engineFlags
	ef.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	e, err := ef.engine()
	if err != nil {
		return fail(s, "functions", err)
	}
	list := e.Functions()
	if len(pos) == 1 {
		f, found := e.Function(pos[0])
		if !found {
			fmt.Fprintf(s.err, "fluecell functions: unknown function %q; run fluecell functions for the list\n", pos[0])
			return 1
		}
		list = []*funcs.Function{f}
	} else if len(pos) > 1 {
		fmt.Fprintln(s.err, "fluecell functions: give at most one function name")
		return 2
	}
	if *asJSON {
		if err := writeJSON(s.out, list); err != nil {
			return fail(s, "functions", err)
		}
		return 0
	}
	for i, f := range list {
		if i > 0 {
			fmt.Fprintln(s.out)
		}
		unit := f.ResultUnit
		if unit == "" {
			unit = "dimensionless"
		}
		fmt.Fprintf(s.out, "%s(%s) -> %s\n  %s\n", f.Name, paramList(f), unit, f.Doc)
		for _, p := range f.Params {
			line := "    " + p.Name + " (" + p.Type
			if p.Unit != "" {
				line += ", " + p.Unit
			}
			line += ")"
			if p.Optional {
				line += " optional, default " + p.Default
			}
			line += ": " + p.Doc
			if len(p.Allowed) > 0 {
				line += "; one of " + strings.Join(p.Allowed, ", ")
			}
			fmt.Fprintln(s.out, line)
		}
		fmt.Fprintf(s.out, "  example: %s = %s\n", f.Example, funcs.FormatNumber(f.ExampleResult))
		fmt.Fprintf(s.out, "  sources: %s\n", strings.Join(f.Sources, "; "))
	}
	return 0
}

func paramList(f *funcs.Function) string {
	var b strings.Builder
	open := 0
	for i, p := range f.Params {
		switch {
		case p.Optional:
			if i > 0 {
				b.WriteString(" ")
			}
			b.WriteString("[")
			if i > 0 {
				b.WriteString(", ")
			}
			open++
		case i > 0:
			b.WriteString(", ")
		}
		b.WriteString(p.Name)
	}
	b.WriteString(strings.Repeat("]", open))
	return b.String()
}

func cmdFactors(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("factors", "factors [--pack P] [--json] [--factors FILE]... [FUEL]", s.err, true)
	asJSON := fs.Bool("json", false, "print the rows as JSON")
	var ef engineFlags
	ef.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) > 1 {
		fmt.Fprintln(s.err, "fluecell factors: give at most one fuel, e.g. fluecell factors natural_gas")
		return 2
	}
	fuel := ""
	if len(pos) == 1 {
		fuel = pos[0]
	}
	e, err := ef.engine()
	if err != nil {
		return fail(s, "factors", err)
	}
	rows, err := e.Factors(ef.pack, fuel)
	if err != nil {
		return fail(s, "factors", err)
	}
	if *asJSON {
		if err := writeJSON(s.out, rows); err != nil {
			return fail(s, "factors", err)
		}
		return 0
	}
	for _, p := range e.Packs() {
		if p.Name == e.DefaultPackName() || p.Name == funcs.CommonPack || p.Name == ef.pack {
			fmt.Fprintf(s.out, "pack %s (version %s): %s\n", p.Name, p.Version, p.Title)
		}
	}
	if fuel != "" {
		f, alias, _ := e.ResolveFuel(fuel)
		if alias {
			fmt.Fprintf(s.out, "fuel %q is %s\n", fuel, f.ID)
		}
		if len(f.Aliases) > 0 {
			fmt.Fprintf(s.out, "aliases of %s: %s\n", f.ID, strings.Join(f.Aliases, ", "))
		}
	}
	fmt.Fprintln(s.out)
	tw := tabwriter.NewWriter(s.out, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "PACK\tID\tQUANTITY\tVALUE\tUNIT\tRANGE\tBASIS\tSOURCE")
	for _, f := range rows {
		rng := ""
		if f.Low != nil || f.High != nil {
			rng = optStr(f.Low) + "-" + optStr(f.High)
		}
		src := f.Source
		if f.FromMemory && !strings.Contains(strings.ToLower(src), "memory") {
			src += " (from memory)"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", f.Pack, f.ID, f.Quantity, funcs.FormatNumber(f.Value), f.Unit, rng, f.BasisName, src)
	}
	tw.Flush()
	if fuel == "" {
		fmt.Fprintln(s.out)
		fmt.Fprintln(s.out, "Fuels and aliases (matched case- and space-insensitively):")
		for _, f := range e.Fuels() {
			fmt.Fprintf(s.out, "  %s: %s\n", f.ID, strings.Join(f.Aliases, ", "))
		}
	}
	fmt.Fprintln(s.out)
	fmt.Fprintln(s.out, caution)
	return 0
}

func optStr(p *float64) string {
	if p == nil {
		return "?"
	}
	return funcs.FormatNumber(*p)
}

func cmdUnits(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("units", "units [--json]", s.err, false)
	asJSON := fs.Bool("json", false, "print the units as JSON")
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) > 0 {
		fmt.Fprintln(s.err, "fluecell units: takes no arguments")
		return 2
	}
	list := units.List()
	if *asJSON {
		if err := writeJSON(s.out, list); err != nil {
			return fail(s, "units", err)
		}
		return 0
	}
	tw := tabwriter.NewWriter(s.out, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "UNIT\tDIMENSION\tIN SI (J, kg, m3, W, s)\tNAME\tALSO WRITTEN\tSOURCE")
	for _, u := range list {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", u.Symbol, u.Dim, u.Exact, u.Name, strings.Join(u.Spellings, ", "), u.Source)
	}
	tw.Flush()
	fmt.Fprintln(s.out)
	fmt.Fprintln(s.out, `Energy units may carry a basis: "MMBtu HHV", "GJ NCV" (GCV = HHV, LHV = NCV). A year is 365 days.`)
	return 0
}
