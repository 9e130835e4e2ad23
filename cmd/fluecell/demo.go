package main

import (
	"context"
	"fmt"
	"path/filepath"

	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/demo"
)

func cmdDemo(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("demo", "demo [DIR]   (default DIR: fluecell-demo)", s.err, true)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) > 1 {
		fmt.Fprintln(s.err, "fluecell demo: give at most one folder")
		return 2
	}
	dir := "fluecell-demo"
	if len(pos) == 1 {
		dir = pos[0]
	}
	e, err := (&engineFlags{}).engine()
	if err != nil {
		return fail(s, "demo", err)
	}
	paths, err := demo.Write(dir)
	if err != nil {
		return fail(s, "demo", err)
	}
	fmt.Fprintf(s.out, "Kestrel Vale Dairy Co-operative (an invented company): a week of fuel invoices, a year of\n")
	fmt.Fprintf(s.out, "monthly energy and the region's 2030 build plan, written to %s and annotated:\n\n", dir)
	for _, in := range paths {
		out := importer.DefaultOutput(in)
		rep, err := importer.Annotate(ctx, e, in, out, importer.Options{})
		if err != nil {
			return fail(s, "demo", err)
		}
		fmt.Fprintf(s.out, "%s\n  -> %s\n", filepath.Base(in), out)
		fmt.Fprintf(s.out, "  %d of %d rows computed: Scope 1 %s tCO2, %s tCO2e; %d errors, %d warnings, %d notes\n",
			rep.Computed, rep.Rows, fmtTonnes(rep.Totals.TCO2), fmtTonnes(rep.Totals.TCO2e),
			rep.Count(importer.SevError), rep.Count(importer.SevWarning), rep.Count(importer.SevInfo))
		for _, l := range kindLines(rep, fmtTonnes) {
			fmt.Fprintf(s.out, "  %s\n", l)
		}
		// The rows that got no number first, then those to check.
		shown := 0
		for _, sev := range []string{importer.SevError, importer.SevWarning} {
			for _, w := range rep.Warnings {
				if w.Severity != sev || shown == 8 {
					continue
				}
				fmt.Fprintf(s.out, "    %s!%s %s %s: %s\n", w.Sheet, w.Cell, w.Severity, w.Code, w.Message)
				shown++
			}
		}
		if n := rep.Count(importer.SevError) + rep.Count(importer.SevWarning); n > shown {
			fmt.Fprintf(s.out, "    ... %d more in the %q sheet\n", n-shown, importer.SheetWarnings)
		}
		fmt.Fprintln(s.out)
	}
	fmt.Fprintln(s.out, "Open the .carbon workbooks: computed columns beside each table, and the sheets")
	fmt.Fprintf(s.out, "%q, %q and %q.\n", importer.SheetWarnings, importer.SheetSources, importer.SheetSummary)
	fmt.Fprintln(s.out)
	fmt.Fprintln(s.out, caution)
	return 0
}
