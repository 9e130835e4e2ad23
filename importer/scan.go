package importer

import (
	"archive/zip"
	"context"
	"errors"
	"fmt"
	"github.com/fluecell/fluecell/importer/regfile"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/bookio"
)

// Sheet names fluecell writes. A workbook that already has them is an
// annotated output; Scan skips them and Annotate refuses to write over them.
const (
	SheetWarnings = "Carbon warnings"
	SheetSources  = "Carbon sources"
	SheetSummary  = "Carbon summary"
	SheetColumns  = "Carbon columns" // side sheet for large tables; " 2", " 3"... for more
	SheetFactors  = "Carbon factors" // a workbook's own factor rows (read, never written)
)

// ScanResult is what Scan found in a workbook: the report and, for
// Annotate, the computed values of each table.
type ScanResult struct {
	Path   string
	Format string // xlsx, xlsm or csv
	Report *Report

	sc         *scanCtx
	e          *funcs.Engine // the engine used (derived when the workbook has its own factors)
	csv        *csvInput
	sheetCells map[string]int // cells with a value or formula, per scanned sheet
	sheets     []string       // every sheet of the workbook, in order
	layouts    *sheetLayouts  // where each scanned sheet's cells are (placement.go)
}

// Scan reads the workbook or CSV file at path, finds its tables, runs the
// rules (opt.Rules, or rules proposed from the columns' roles) and makes the
// unit-consistency checks. It writes nothing. Errors are *Error: an
// unreadable, encrypted, legacy, corrupt or oversized file, a bad rule, or a
// file without a table. It is safe for concurrent use and honours ctx.
func Scan(ctx context.Context, e *funcs.Engine, path string, opt Options) (res *ScanResult, err error) {
	defer recoverInternal(&err, path)
	return scanAnyFormat(ctx, e, path, opt, nil)
}

// recoverInternal turns a panic (in fluecell or a library, on a malformed
// file) into an *Error, so that no input can crash a server or a batch.
func recoverInternal(err *error, path string) {
	if r := recover(); r != nil {
		*err = panicError(path, r) // an input error naming the malformed part; the stack only in Err
	}
}

func scan(ctx context.Context, e *funcs.Engine, path string, opt Options, calc formulaCalc) (*ScanResult, error) {
	if e == nil {
		return nil, &Error{Code: ErrInput, Msg: "importer: no engine (funcs.New)"}
	}
	if err := ctx.Err(); err != nil {
		return nil, &Error{Code: ErrCancelled, Path: path, Msg: "stopped: " + err.Error(), Err: err}
	}
	f, err := regfile.Open(path) // never a pipe or device, which could block for ever
	if err != nil {
		var re *regfile.Error
		if errors.As(err, &re) {
			return nil, &Error{Code: ErrInput, Path: path, Msg: err.Error(), Err: err}
		}
		return nil, &Error{Code: ErrIO, Path: path, Msg: "cannot open the file: " + err.Error(), Err: err}
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, &Error{Code: ErrIO, Path: path, Msg: err.Error(), Err: err}
	}
	if st.IsDir() {
		return nil, newErr(ErrInput, path, "is a folder, not a workbook")
	}
	kind, err := sniff(path, f, st.Size())
	if err != nil {
		return nil, err
	}
	if opt.GWPSet, err = gwpSetFor(e, opt); err != nil {
		return nil, err
	}
	userRules, err := parseUserRules(e, opt.Rules, funcs.WithGWPSet(opt.GWPSet))
	if err != nil {
		return nil, err
	}
	if _, err := CheckGrid(e, opt.Grid); err != nil {
		return nil, err
	}
	res := &ScanResult{Path: path, sheetCells: map[string]int{}}
	lim := opt.limits()
	if kind == fmtCSV {
		res.Format = "csv"
		in, err := readCSV(path, f, st.Size(), lim)
		if err != nil {
			return nil, err
		}
		eng, err := deriveEngine(e, opt, nil, "")
		if err != nil {
			return nil, err
		}
		sc := newScanCtx(ctx, eng, path, opt)
		sc.csv, sc.userRules = true, userRules
		sheet := csvSheetName(path)
		sc.sheetOrd[sheet] = 0
		sc.scanned = append(sc.scanned, sheet)
		res.sheets = []string{sheet}
		if err := sc.scanCSV(in, sheet); err != nil {
			return nil, err
		}
		res.sc, res.e, res.csv = sc, eng, in
		return res, res.finish()
	}
	res.Format = strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), ".")
	zr, err := openZip(path, f, st.Size(), lim)
	if err != nil {
		return nil, err
	}
	b, err := openBook(zr, lim.maxUnzipped)
	if err != nil {
		return nil, bookError(path, err)
	}
	res.recordLayouts(b)
	res.sheets = b.sheetNames()
	var factorCSV []byte
	if s, ok := b.sheet(SheetFactors); ok {
		if factorCSV, err = b.factorSheetCSV(s); err != nil {
			return nil, bookError(path, err)
		}
	}
	eng, err := deriveEngine(e, opt, factorCSV, filepath.Base(path))
	if err != nil {
		return nil, err
	}
	sc := newScanCtx(ctx, eng, path, opt)
	sc.userRules, sc.calc = userRules, calc
	if calc == nil {
		fe := newFormulaEval(ctx, path, lim)
		sc.calc = fe
		defer fe.close()
	}
	for i, name := range res.sheets {
		sc.sheetOrd[name] = i
	}
	targets, err := scanTargets(b, opt.Sheet, path)
	if err != nil {
		return nil, err
	}
	for _, s := range targets {
		sc.scanned = append(sc.scanned, s.Name)
		n, err := sc.scanSheet(b, s)
		if err != nil {
			return nil, bookError(path, err)
		}
		res.sheetCells[s.Name] = n
	}
	sc.dropCopies()
	sc.dropSummaries()
	res.sc, res.e = sc, eng
	return res, res.finish()
}

// mergesRead is the merged ranges of a sheet, or why they cannot be read.
type mergesRead struct {
	ms  []bookio.Range
	err error
}

// aheadCells bounds the cells read ahead while the merged ranges are
// found (about 6 MB of cells): enough to keep the reading busy through
// that pass on a sheet of 100 000 rows, and no more memory than a few
// pages of rows.
const aheadCells = 128 << 10

// bookError wraps a package read error as a corrupt-file error.
func bookError(path string, err error) error {
	if _, ok := err.(*Error); ok {
		return err
	}
	msg := err.Error()
	code := ErrCorrupt
	if strings.Contains(msg, "zip-bomb") {
		code = ErrTooLarge
	}
	if err == zip.ErrChecksum || strings.Contains(msg, "checksum") {
		msg += " (the file is damaged)"
	}
	return &Error{Code: code, Path: path, Msg: "cannot read the workbook: " + msg, Err: err}
}

// ownSheet reports a sheet fluecell writes or reads as data.
func ownSheet(name string) bool {
	switch name {
	case SheetWarnings, SheetSources, SheetSummary, SheetFactors:
		return true
	}
	return name == SheetColumns || strings.HasPrefix(name, SheetColumns+" ")
}

// scanTargets lists the worksheets to look at.
func scanTargets(b *book, only, path string) ([]sheetRef, error) {
	if only != "" {
		s, ok := b.sheet(only)
		if !ok {
			return nil, newErr(ErrInput, path, "no sheet %q: the sheets are %s", only, quoteList(b.sheetNames()))
		}
		if s.Kind != "worksheet" {
			return nil, newErr(ErrInput, path, "sheet %q is a %s, not a worksheet with cells", only, s.Kind)
		}
		return []sheetRef{s}, nil
	}
	var out []sheetRef
	for _, s := range b.sheets {
		if s.Kind == "worksheet" && !ownSheet(s.Name) {
			out = append(out, s)
		}
	}
	return out, nil
}

func quoteList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = "\"" + n + "\""
	}
	return strings.Join(q, ", ")
}

// scanSheet streams one worksheet through a segmenter; it returns the number
// of cells with a value or formula.
//
// Finding a table needs the sheet's merged ranges, which the part holds
// after its rows: they are found in a pass of their own, in a goroutine,
// while the first rows are read ahead (up to aheadCells cells).
func (sc *scanCtx) scanSheet(b *book, s sheetRef) (int, error) {
	mc := make(chan mergesRead, 1)
	go func() {
		var m mergesRead
		defer func() {
			if r := recover(); r != nil {
				m.err = fmt.Errorf("%s: internal error reading the merged cells: %v", s.Part, r)
			}
			mc <- m
		}()
		m.ms, m.err = b.ReadMerges(s)
	}()
	rd, err := b.openSheetAhead(s, aheadCells)
	if err != nil {
		<-mc
		return 0, err
	}
	defer rd.close()
	m := <-mc
	rd.settle()
	if m.err != nil {
		return 0, m.err
	}
	merges := b.keepMerges(s, m.ms)
	seg := &segmenter{sc: sc, det: &detector{sc: sc, lx: sc.lexicon, sheet: s.Name, merges: merges}, sheet: s.Name, merges: merges}
	cells := 0
	for n := 0; ; n++ {
		if n&4095 == 0 {
			if err := sc.cancelled(); err != nil {
				return 0, err
			}
		}
		r, ok := rd.next()
		if !ok {
			break
		}
		cells += len(r.cells)
		if err := seg.feed(r); err != nil {
			return 0, err
		}
	}
	if rd.err != nil {
		return 0, rd.err
	}
	return cells, seg.finish()
}

// finish builds the report from the tables.
func (res *ScanResult) finish() error {
	sc := res.sc
	rep := &Report{Rules: []string{}, ByFuel: map[string]Totals{}, Warnings: []Warning{}, Tables: []TableInfo{}, Layout: LayoutInline}
	seenRule := map[string]bool{}
	kinds := map[string]*KindTotal{}
	for _, t := range sc.tables {
		spec := t.spec
		info := TableInfo{Sheet: spec.sheet, HeaderRow: spec.headerRow, Kind: spec.kind, Rules: []string{},
			Range: rangeRef{spec.firstCol, spec.headerRow, max(spec.lastCol, spec.firstCol), max(t.lastRow, spec.headerRow)}.String(),
			Rows:  t.dataRows, Computed: t.computed, Layout: res.layoutFor(t)}
		t.layout = info.Layout
		for _, c := range spec.cols {
			info.Columns = append(info.Columns, ColumnInfo{Cell: cellRef(c.col, spec.headerRow), Header: c.hdr.Text, Ident: c.ident,
				HeaderUnit: c.hdr.UnitText, Role: c.role.String()})
		}
		for _, r := range t.allRules() {
			info.Rules = append(info.Rules, r.src)
			if !seenRule[r.src] {
				seenRule[r.src] = true
				rep.Rules = append(rep.Rules, r.src)
			}
		}
		for _, k := range t.fuelOrd {
			s := t.byFuel[k]
			tot := rep.ByFuel[k]
			tot.TCO2 += s.TCO2
			tot.TCO2e += s.TCO2e
			rep.ByFuel[k] = tot
		}
		own := map[string]*KindTotal{}
		t.kindTotals(own)
		t.kindTotals(kinds)
		info.ByKind = byKind(own)
		for _, kt := range info.ByKind {
			if scope1(kt.Kind) {
				info.Totals.TCO2 += kt.TCO2
				info.Totals.TCO2e += kt.TCO2e
			}
			info.Biogenic += kt.Biogenic
		}
		if info.Layout == LayoutSideSheet {
			rep.Layout = LayoutSideSheet
		}
		rep.Rows += t.dataRows
		rep.Computed += t.computed
		info.Status = statusOf(t.dataRows, t.computed)
		info.Reason = "computed " + countOf(t.computed) + " of " + plural(t.dataRows, "row")
		if t.copyOf != nil {
			info.Reason = "repeats the table at " + t.copyOf.spec.sheet + "!" + cellRef(t.copyOf.spec.firstCol, t.copyOf.spec.headerRow) + " (a copy, an extract or a summary of it): not counted twice"
		}
		if t.computed == 0 && t.spec.headerErr != nil {
			info.Reason += ": " + t.spec.headerErr.Message
		}
		rep.Tables = append(rep.Tables, info)
	}
	rep.Sheets = res.sheetInfos(rep.Tables)
	rep.ByKind = byKind(kinds)
	for _, kt := range rep.ByKind {
		if scope1(kt.Kind) {
			rep.Totals.TCO2 += kt.TCO2
			rep.Totals.TCO2e += kt.TCO2e
		}
		rep.Biogenic += kt.Biogenic
		rep.Incomplete = rep.Incomplete || kt.Incomplete
	}
	rep.Totals.TCO2, rep.Totals.TCO2e = cleanZero(rep.Totals.TCO2), cleanZero(rep.Totals.TCO2e)
	rep.GWPSet = sc.gwpSetOrDefault()
	for _, p := range res.e.Packs() {
		rep.Packs = append(rep.Packs, PackVersion{Name: p.Name, Title: p.Title, Basis: p.Basis, Version: p.Version, Rows: p.Rows})
	}
	rep.Warnings = sc.warn.finish(sc.sheetOrd)
	if rep.Warnings == nil {
		rep.Warnings = []Warning{}
	}
	rep.pointLeftOut()
	sc.totalIntervals(rep)
	rep.BuildPlan = res.buildPlanTotal()
	if err := sc.pages.failed; err != nil {
		rep.PageFileError = "the rows past the page budget stayed in memory: the temporary file could not be written (" + err.Error() +
			"); set TMPDIR to a folder that can be written"
	}
	res.Report = rep
	res.checkTotals() // a sum past the float64 range is marked, never +Inf
	if err := res.checkMapping(); err != nil {
		return err
	}
	if len(sc.tables) == 0 && len(sc.userRules) > 0 {
		return res.noTableError()
	}
	return nil
}

// sheetInfos says what happened to every scanned sheet.
func (res *ScanResult) sheetInfos(tables []TableInfo) []SheetInfo {
	sc := res.sc
	out := []SheetInfo{}
	for _, name := range sc.scanned {
		si := SheetInfo{Name: name}
		for _, t := range tables {
			if t.Sheet == name {
				si.Tables++
				si.Rows += t.Rows
				si.Computed += t.Computed
			}
		}
		if si.Tables == 0 {
			si.Status, si.Reason = StatusSkipped, sc.skipWhy[name]
			if si.Reason == "" {
				si.Reason = noTableHint
			}
		} else {
			si.Status = statusOf(si.Rows, si.Computed)
			si.Reason = "computed " + countOf(si.Computed) + " of " + plural(si.Rows, "row") + " in " + plural(si.Tables, "table")
		}
		out = append(out, si)
	}
	return out
}

// noTableHint says what fluecell looks for in a sheet.
const noTableHint = "no table: fluecell looks for a header row naming a fuel and an amount (Fuel | Quantity | Unit), " +
	"one column per fuel with its unit (Month | Diesel (L) | Natural gas (m3)), or a build plan (Technology | Capacity (MW))"

// countOf writes n with thousands separators: 6,504.
func countOf(n int) string {
	s := strconv.Itoa(n)
	for i := len(s) - 3; i > 0 && s[i-1] != '-'; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return s
}

func cleanZero(x float64) float64 {
	if x == 0 || math.IsNaN(x) {
		return 0
	}
	return x
}

// layoutFor decides where a table's computed columns go: beside it, unless
// side sheets are asked for (Options.Layout, Options.InlineMaxCells).
func (res *ScanResult) layoutFor(t *table) string {
	if res.csv != nil {
		return LayoutInline
	}
	lim := res.sc.lim
	if lim.layoutCells < 0 || res.sheetCells[t.spec.sheet] > lim.layoutCells {
		return LayoutSideSheet
	}
	return LayoutInline
}

func (res *ScanResult) noTableError() error {
	sc := res.sc
	if len(sc.userRules) > 0 {
		var vars []string
		seen := map[string]bool{}
		for _, r := range sc.userRules {
			for _, v := range r.vars {
				if !seen[v] {
					seen[v] = true
					vars = append(vars, v)
				}
			}
		}
		msg := "no table has a header with every variable the rules use (" + strings.Join(vars, ", ") + ")"
		if len(sc.missed) > 0 {
			msg += "; the header at " + sc.missedAt + " gives " + strings.Join(sc.missed, ", ")
			for _, r := range sc.userRules {
				if _, err := sc.e.Compile(r.expr, funcs.WithVariables(sc.missed...)); err != nil {
					if fe, ok := funcs.AsError(err); ok && fe.Code == funcs.CodeVariable {
						msg += " (rule " + r.column + ": " + fe.Msg + ")"
						break
					}
				}
			}
		}
		return newErr(ErrNoTable, res.Path, "%s", msg)
	}
	return newErr(ErrNoTable, res.Path, "no table found: fluecell looks for a header row (title rows above it are fine) naming a fuel and a quantity "+
		"(Fuel | Quantity | Unit), one column per fuel with its unit (Month | Diesel (L) | Natural gas (m3)), or a build plan "+
		"(Technology | Capacity (MW)); for other columns pass a rule such as --rule 'tCO2e = fuel_co2e(\"diesel\", litres, \"L\")'")
}
