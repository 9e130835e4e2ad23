package main

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/atomicfile"
	"github.com/fluecell/fluecell/importer/regfile"
	"github.com/fluecell/fluecell/importer/safetext"
)

// exitFailOn is the exit code when --fail-on finds warnings of that
// severity (the output is written all the same).
const exitFailOn = 3

func cmdAnnotate(ctx context.Context, s stdio, args []string) int {
	fs := newFlags("annotate", "annotate IN.xlsx|IN.xlsm|IN.xls|IN.csv [-o OUT] [--rule 'COLUMN = EXPR']... [--sheet S] [--report R.json] [--pack P] [--grid G] [--gwp-set SET] [--factors F]... [--layout inline|side] [--fail-on warning|error] [--uncertainty approach1|approach2 [--seed N] [--draws N]]", s.err, true)
	out := fs.String("o", "", "write the annotated workbook to `OUT` (default: IN with .carbon before the extension; a legacy .xls, read through LibreOffice, gives .carbon.xlsx)")
	report := fs.String("report", "", "also write the report as JSON to `R.json` (- for standard output)")
	failOn := fs.String("fail-on", "", "exit with code 3 when a finding of this `severity` or worse exists: warning or error (the output is still written)")
	var af annotateFlags
	af.register(fs)
	var uf uncertaintyFlags
	uf.register(fs)
	pos, code, ok := parseArgs(fs, args)
	if !ok {
		return code
	}
	if len(pos) != 1 {
		fmt.Fprintln(s.err, "fluecell annotate: give exactly one input workbook, e.g. fluecell annotate fuel-log.xlsx")
		return 2
	}
	ivOpt, err := uf.options()
	if err != nil {
		fmt.Fprintf(s.err, "fluecell annotate: %v\n", err)
		return 2
	}
	switch *failOn {
	case "", importer.SevWarning, importer.SevError:
	default:
		fmt.Fprintf(s.err, "fluecell annotate: --fail-on %q: accepted are warning and error\n", *failOn)
		return 2
	}
	in := pos[0]
	dst := *out
	if dst == "" {
		dst = importer.DefaultOutput(in)
	}
	if err := regfile.Check(in); err != nil {
		return fail(s, "annotate", err)
	}
	e, err := af.engine()
	if err != nil {
		return fail(s, "annotate", err)
	}
	opt := af.options()
	opt.Uncertainty = ivOpt
	rep, err := importer.Annotate(ctx, e, in, dst, opt)
	if err != nil {
		return fail(s, "annotate", err)
	}
	// With --report -, standard output carries the JSON alone (so it can be
	// piped to a JSON tool); the human summary goes to standard error.
	human := s.out
	if *report == "-" {
		human = s.err
	}
	printReport(human, rep)
	if *report != "" {
		if err := writeReport(*report, s.out, rep); err != nil {
			return fail(s, "annotate", err)
		}
	}
	if err := totalsError(rep.Totals); err != nil {
		return fail(s, "annotate", fmt.Errorf("%s: %v; the annotated output %s and the report were written", safetext.Name(in), err, safetext.Name(rep.Output)))
	}
	switch {
	case *failOn == importer.SevError && rep.Count(importer.SevError) > 0,
		*failOn == importer.SevWarning && rep.Count(importer.SevError)+rep.Count(importer.SevWarning) > 0:
		fmt.Fprintf(s.err, "fluecell annotate: --fail-on %s: %s and %s, listed %s\n", *failOn,
			count(rep.Count(importer.SevError), "error"), count(rep.Count(importer.SevWarning), "warning"), findingsWhere(rep))
		return exitFailOn
	}
	return 0
}

// printReport writes the short human summary of an annotation.
func printReport(w io.Writer, rep *importer.Report) {
	fmt.Fprintf(w, "wrote %s (%s; %d of %d rows computed)\n", safetext.Name(rep.Output), rep.Layout, rep.Computed, rep.Rows)
	if rep.PageFileError != "" {
		fmt.Fprintf(w, "note: %s\n", safetext.Line(rep.PageFileError))
	}
	fmt.Fprintln(w, "rules:")
	for _, r := range rep.Rules {
		fmt.Fprintf(w, "  %s\n", safetext.Line(r))
	}
	if rep.Totals.NotComputable != "" {
		fmt.Fprintf(w, "total: %s\n", notComputableText)
	} else {
		fmt.Fprintf(w, "total: %s tCO2, %s tCO2e%s (Scope 1, fossil: fuels burned and gases released)\n", totalText(rep.Totals.TCO2, funcs.FormatNumber),
			totalText(rep.Totals.TCO2e, funcs.FormatNumber), intervalText(rep.Totals.TotalInterval))
	}
	if lines := kindLines(rep, funcs.FormatNumber); len(lines) > 0 {
		fmt.Fprintln(w, "totals by kind (never added together):")
		for _, l := range lines {
			fmt.Fprintf(w, "  %s\n", l)
		}
	}
	if u := rep.Uncertainty; u != nil && (rep.Totals.HasInterval() || hasInterval(rep.ByKind)) {
		fmt.Fprintln(w, safetext.Line("95 % intervals: "+u.Method+"; activity data "+activityText(u)))
	}
	nErr, nWarn, nInfo := rep.Count(importer.SevError), rep.Count(importer.SevWarning), rep.Count(importer.SevInfo)
	fmt.Fprintf(w, "findings: %s (rows not computed), %s, %s; all %s\n", count(nErr, "error"), count(nWarn, "warning"), count(nInfo, "note"), findingsWhere(rep))
	shown := 0
	for _, x := range rep.Warnings {
		if x.Severity == importer.SevInfo {
			continue
		}
		if shown == 10 {
			fmt.Fprintf(w, "  ... and %d more\n", nErr+nWarn-shown)
			break
		}
		fmt.Fprintln(w, safetext.Line(fmt.Sprintf("  %s!%s %s %s: %s", x.Sheet, x.Cell, x.Severity, x.Code, x.Message)))
		shown++
	}
}

// findingsWhere says where the full list of findings is.
func findingsWhere(rep *importer.Report) string {
	if strings.EqualFold(filepath.Ext(rep.Output), ".csv") {
		return "in the report (--report)"
	}
	return "in the " + importer.SheetWarnings + " sheet"
}

func count(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

func round3(x float64) float64 { return math.Round(x*1000) / 1000 }

// writeReport writes the report JSON to path (through a temporary file and
// a rename), or to out for "-".
func writeReport(path string, out io.Writer, rep *importer.Report) error {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	if err := enc.Encode(rep); err != nil {
		return err
	}
	if path == "-" {
		_, err := out.Write(buf.Bytes())
		return err
	}
	if err := atomicfile.Write(path, func(w io.Writer) error { _, err := w.Write(buf.Bytes()); return err }); err != nil {
		return fmt.Errorf("--report %s: %v", path, err)
	}
	return nil
}

// annotateFlags are the flags of the commands that annotate workbooks:
// factor packs, rules, the sheet to read and the mapping (whose engine
// method, in mapping.go, also loads the mapping).
type annotateFlags struct {
	engineFlags
	mappingFlag
	gwpSetFlag
	rules  listFlag
	sheet  string
	grid   string
	layout layoutFlag
}

func (f *annotateFlags) register(fs *flag.FlagSet) {
	f.engineFlags.register(fs)
	fs.Var(&f.rules, "rule", "compute a column: `'COLUMN = EXPR'` over the header identifiers, e.g. 'tCO2e = fuel_co2e(fuel, quantity, unit)'; repeatable (default: rules proposed from each table's columns)")
	fs.StringVar(&f.sheet, "sheet", "", "look for tables on sheet `S` only")
	fs.StringVar(&f.grid, "grid", "", "electricity `GRID` of purchased electricity rows and columns (Scope 2, location-based) where no column or mapping names one: a country or grid id, e.g. DE, Germany, UK, CAMX (see fluecell functions electricity_co2e)")
	fs.Var(&f.layout, "layout", "where computed columns go: `inline` (beside each table, at any size; the default) or side (a \"Carbon columns\" sheet, row for row, each table's sheet left untouched)")
	f.mappingFlag.register(fs)
	f.gwpSetFlag.register(fs)
}

// layoutFlag is --layout: inline or side.
type layoutFlag string

func (l *layoutFlag) String() string { return string(*l) }

func (l *layoutFlag) Set(v string) error {
	switch strings.ToLower(strings.TrimSpace(v)) {
	case "inline":
		*l = importer.LayoutInline
	case "side", "side-sheet":
		*l = importer.LayoutSideSheet
	default:
		return fmt.Errorf("%q is not a layout: use inline or side", v)
	}
	return nil
}

// options are the importer options the flags give.
func (f *annotateFlags) options() importer.Options {
	return importer.Options{Rules: f.rules, Sheet: f.sheet, Pack: f.pack, Grid: f.grid, GWPSet: f.gwpSet, FactorFiles: append([]string{}, f.factors...), Mapping: f.loaded,
		Layout: string(f.layout)}
}
