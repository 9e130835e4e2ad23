package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/regfile"
	"github.com/fluecell/fluecell/importer/safetext"
)

func cmdInspect(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("inspect", "inspect IN.xlsx|IN.xlsm|IN.xls|IN.csv [--sheet S] [--mapping M.json] [--write-mapping M.json] [--json] [--rule 'COLUMN = EXPR']... [--pack P] [--gwp-set SET] [--factors F]...", s.err, true)
	write := fs.String("write-mapping", "", "write how the workbook was read to `M.json`: a mapping to check, edit and pass to annotate or batch with --mapping")
	asJSON := fs.Bool("json", false, "print the inspection as JSON")
	var af annotateFlags
	af.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) != 1 {
		fmt.Fprintln(s.err, "fluecell inspect: give exactly one input workbook, e.g. fluecell inspect fuel-log.xlsx")
		return 2
	}
	in := pos[0]
	if *write != "" && samePath(in, *write) {
		fmt.Fprintf(s.err, "fluecell inspect: --write-mapping %s is the input: name another file, e.g. %s\n", *write, strings.TrimSuffix(in, filepath.Ext(in))+".mapping.json")
		return 2
	}
	if err := regfile.Check(in); err != nil {
		return fail(s, "inspect", err)
	}
	e, err := af.engine()
	if err != nil {
		return fail(s, "inspect", err)
	}
	ins, err := importer.Inspect(ctx, e, in, af.options())
	if err != nil {
		return fail(s, "inspect", err)
	}
	if *write != "" {
		mf := ins.MappingFile()
		if err := mf.Write(*write); err != nil {
			return fail(s, "inspect", err)
		}
	}
	totalErr := totalsError(ins.Report.Totals)
	if totalErr != nil {
		totalErr = fmt.Errorf("%s: %v", safetext.Name(in), totalErr)
	}
	if *asJSON {
		if totalErr != nil {
			return fail(s, "inspect", fmt.Errorf("%v; JSON cannot hold it", totalErr))
		}
		enc := json.NewEncoder(s.out)
		enc.SetIndent("", "  ")
		if err := enc.Encode(ins); err != nil {
			return fail(s, "inspect", err)
		}
		return 0
	}
	printInspection(s.out, ins, *write)
	if totalErr != nil {
		return fail(s, "inspect", totalErr)
	}
	return 0
}

// samePath reports whether a and b name the same file (or the same path
// when b does not exist yet).
func samePath(a, b string) bool {
	sa, errA := os.Stat(a)
	sb, errB := os.Stat(b)
	if errA == nil && errB == nil {
		return os.SameFile(sa, sb)
	}
	return filepath.Clean(a) == filepath.Clean(b)
}

// printInspection writes the inspection for a person: per table its place,
// kind and columns with role, unit and reason; the sheets without a table;
// the fuel names that are not fuel ids; the mapping.
func printInspection(w io.Writer, ins *importer.Inspection, wrote string) {
	rep := ins.Report
	fmt.Fprintf(w, "%s: %s on %s; %d of %s computed; %s\n", safetext.Name(filepath.Base(ins.Path)),
		count(len(rep.Tables), "table"), count(len(rep.Sheets), "sheet"), rep.Computed, count(rep.Rows, "row"),
		totalsText(rep.Totals, funcs.FormatNumber))
	for _, l := range kindLines(rep, funcs.FormatNumber) {
		fmt.Fprintf(w, "  %s\n", l)
	}
	for i, t := range rep.Tables {
		fmt.Fprintf(w, "\ntable %d: sheet %q %s, header row %d, %s; %d of %s computed\n", i+1, t.Sheet, t.Range, t.HeaderRow, t.Kind, t.Computed, count(t.Rows, "row"))
		if t.Fuel != "" {
			fmt.Fprintf(w, "  every row is %s (no fuel column)\n", t.Fuel)
		}
		if t.Unit != "" {
			fmt.Fprintf(w, "  amounts without a unit in their header are in %s\n", t.Unit)
		}
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  cell\theader\trole\tunit\twhy")
		for _, c := range t.Columns {
			role := c.Role
			if role == "" {
				role = "-"
			}
			if c.Fuel != "" {
				role += " " + c.Fuel
			}
			fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\n", c.Cell, short(c.Header, 36), role, short(c.HeaderUnit, 16), c.Why)
		}
		tw.Flush()
		for j, r := range t.Rules {
			lead := "  rules: "
			if j > 0 {
				lead = "         "
			}
			fmt.Fprintln(w, lead+r)
		}
		if len(t.Rules) == 0 {
			fmt.Fprintln(w, "  rules: none: "+t.Reason)
		}
	}
	var skipped []importer.SheetInfo
	for _, sh := range rep.Sheets {
		if sh.Tables == 0 {
			skipped = append(skipped, sh)
		}
	}
	if len(skipped) > 0 {
		fmt.Fprintln(w, "\nsheets without a table:")
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		for _, sh := range skipped {
			fmt.Fprintf(tw, "  %s\t%s\n", short(sh.Name, 36), sh.Reason)
		}
		tw.Flush()
	}
	if len(ins.Names) > 0 {
		fmt.Fprintln(w, "\nfuel names read (the mapping's \"names\" can set them):")
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		for _, n := range ins.Names {
			fuel := n.Fuel
			if fuel == "" {
				fuel = "-"
			}
			fmt.Fprintf(tw, "  %s\t%s\t%s\t%s, %s\n", short(fmt.Sprintf("%q", n.Text), 36), fuel, n.Read, n.Cell, count(n.Rows, "row"))
		}
		tw.Flush()
	}
	nErr, nWarn := rep.Count(importer.SevError), rep.Count(importer.SevWarning)
	fmt.Fprintf(w, "\nfindings: %s, %s (fluecell annotate lists them, or --json here)\n", count(nErr, "error"), count(nWarn, "warning"))
	switch {
	case wrote != "":
		fmt.Fprintf(w, "mapping: wrote %s; check and edit it, then: fluecell annotate %s --mapping %s\n", safetext.Name(wrote), safetext.Name(ins.Path), safetext.Name(wrote))
	case rep.Mapping != nil:
		fmt.Fprintf(w, "mapping: read with %s (sha256 %s)\n", safetext.Name(rep.Mapping.Path), rep.Mapping.SHA256[:12])
	default:
		fmt.Fprintln(w, "mapping: none (--write-mapping M.json writes this reading for checking and editing)")
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, caution)
}

// short cuts s to n characters with "..." for a column of text output;
// line breaks become spaces, other control characters are escaped.
func short(s string, n int) string {
	s = safetext.Line(strings.ReplaceAll(s, "\n", " "))
	if r := []rune(s); len(r) > n {
		return string(r[:n-3]) + "..."
	}
	return s
}
