package main

import (
	"context"
	"fmt"
	"strings"
	"text/tabwriter"

	"github.com/fluecell/fluecell/funcs"
)

// cmdGrids lists the grids the Scope 2 functions accept, or one grid's rows.
func cmdGrids(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("grids", "grids [--json] [GRID]", s.err, true)
	asJSON := fs.Bool("json", false, "print the grids (or the grid's rows) as JSON")
	var ef engineFlags
	ef.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) > 1 {
		fmt.Fprintln(s.err, "fluecell grids: give at most one grid (an id, a country or an eGRID acronym)")
		return 2
	}
	e, err := ef.engine()
	if err != nil {
		return fail(s, "grids", err)
	}
	if len(pos) == 1 {
		return gridRows(s, e, pos[0], *asJSON)
	}
	list := e.Grids()
	if *asJSON {
		if err := writeJSON(s.out, list); err != nil {
			return fail(s, "grids", err)
		}
		return 0
	}
	tw := tabwriter.NewWriter(s.out, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "GRID\tNAME\tYEARS\tMETHODS\tLOSSES\tSOURCES")
	for _, g := range list {
		years := make([]string, len(g.Years))
		for i, y := range g.Years {
			years[i] = fmt.Sprint(y)
		}
		losses := "-"
		if g.Losses {
			losses = "yes"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", g.ID, g.Name, strings.Join(years, ", "), strings.Join(g.Methods, ", "), losses, strings.Join(g.Sources, "; "))
	}
	tw.Flush()
	fmt.Fprintln(s.out)
	fmt.Fprintln(s.out, `A grid may be written as its id, a country name or code ("Germany", "UK", "DEU") or an eGRID acronym ("CAMX", "eGRID SRVC").`)
	fmt.Fprintln(s.out, "Market-based: load a supplier or residual-mix row (quantity market_co2e or market_co2) with --factors; see DEVELOPERS.md.")
	return 0
}

func gridRows(s stdio, e *funcs.Engine, name string, asJSON bool) int {
	g, rows, err := e.GridFactors(name)
	if err != nil {
		return fail(s, "grids", err)
	}
	if asJSON {
		if err := writeJSON(s.out, map[string]any{"grid": g, "factors": rows}); err != nil {
			return fail(s, "grids", err)
		}
		return 0
	}
	fmt.Fprintf(s.out, "%s: %s\n\n", g.ID, g.Name)
	tw := tabwriter.NewWriter(s.out, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "SET\tID\tQUANTITY\tVALUE\tUNIT\tSOURCE")
	for _, f := range rows {
		src := f.Source
		if f.FromMemory {
			src += " (from memory)"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", f.Pack, f.ID, f.Quantity, funcs.FormatNumber(f.Value), f.Unit, src)
	}
	tw.Flush()
	return 0
}
