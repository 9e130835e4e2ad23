package importer

import (
	"math"

	"github.com/fluecell/fluecell/funcs"
)

// Options configures Scan and Annotate. The zero value is usable.
type Options struct {
	// Rules are "COLUMN = EXPR" over the header identifiers of a table, e.g.
	// `tCO2e = fuel_co2e(fuel, quantity, quantity_unit)`. Without rules,
	// fluecell proposes them from the detected roles (Report.Rules says which).
	Rules []string
	// Sheet restricts detection to one sheet ("" = every sheet).
	Sheet string
	// Mapping, when not nil, says how tables are read (LoadMapping): on each
	// sheet it names, only its header rows are headers, and their columns
	// get the roles, units and fuels it gives; its names are read before
	// the engine's. A workbook that no longer fits it is an error.
	Mapping *Mapping
	// Grid is the electricity grid of purchased electricity rows and
	// columns (Scope 2, location-based) where neither a column of the
	// table nor the mapping names one: a country or grid id accepted by
	// electricity_co2e ("DE", "Germany", "UK", an eGRID subregion such as
	// "CAMX"). "" = none: such rows are not computed, and a finding of
	// code grid-unknown at the first of them says how to choose one.
	Grid string
	// Pack is the factor pack used by calls that name none ("" = the
	// engine's default pack).
	Pack string
	// GWPSet is the IPCC assessment whose GWP-100 values weight CH4 and N2O in
	// every call of the rules (proposed or given) that names no gwp_set: ar4,
	// ar5 or ar6, case-insensitive ("" = the mapping's gwp_set, else
	// funcs.DefaultGWPSet). A mapping naming another set is an error.
	GWPSet string
	// FactorFiles are the user factor files the engine was built with
	// (funcs.WithFactorFiles). They are needed only when Annotate must build
	// a derived engine: for a Pack other than the engine's default, or for a
	// workbook with its own "Carbon factors" sheet, which is layered over
	// them. When nil, the user files are taken from e.Packs().
	FactorFiles []string

	// Layout is where computed columns go: "" or LayoutInline, beside
	// each table in its own sheet, at any size (a table whose columns
	// cannot go there, its rows reaching the sheet's last columns, gets
	// them in a side sheet with a columns-moved finding);
	// LayoutSideSheet, always in a side sheet "Carbon columns", row for
	// row, each table's sheet left untouched.
	Layout string
	// InlineMaxCells, when positive, is the largest sheet (cells with a
	// value or formula) that gets its computed columns written beside the
	// table; a larger one is left untouched and the columns go to a side
	// sheet. 0 means no limit; a negative value always uses side sheets
	// (as Layout LayoutSideSheet does).
	InlineMaxCells int
	// MaxUnzippedBytes bounds the total uncompressed size of a workbook
	// (zip-bomb protection) and the size of a CSV file. 0 means
	// DefaultMaxUnzippedBytes.
	MaxUnzippedBytes int64
	// MaxWarningsPerColumn bounds the warnings listed one by one for one
	// code in one column; the rest are counted in one summary warning. 0
	// means DefaultMaxWarningsPerColumn; negative means no limit.
	MaxWarningsPerColumn int
	// PageBudget bounds the memory the rows of a workbook's tables take
	// (their stored cells, results and checks' samples), in bytes: beyond
	// it, pages of rows go to a temporary file (in TMPDIR) and are read
	// back when used, with the same results. 0 means DefaultPageBudget;
	// negative keeps every row in memory.
	PageBudget int64
	// pageShift, in tests, makes pages of 1<<pageShift rows (0: the
	// default), so that small workbooks exercise the temporary file.
	pageShift uint
	// evalAsync, in tests, runs every table's rules in a goroutine of their
	// own in batches of evalAsync rows (> 0) or in place (-1); 0 decides by
	// the table's size (evalpipe.go).
	evalAsync int
	// Uncertainty chooses how the 95 % intervals of the totals are computed:
	// Approach 1 (the zero value) or Approach 2 with its seed and draws.
	Uncertainty funcs.IntervalOptions
}

// Defaults of Options.
const (
	// DefaultInlineMaxCells bounds the sheets whose formulas excelize
	// evaluates (formulaeval.go): excelize loads a whole sheet at about
	// 800 bytes per cell (measured), so 200 000 cells cost about 160 MB.
	// It no longer bounds where computed columns go: sheets are rewritten
	// as streams (importer/bookio) at any size.
	DefaultInlineMaxCells       = 200_000
	DefaultMaxUnzippedBytes     = 1 << 30 // 1 GB
	DefaultMaxWarningsPerColumn = 100
)

// limits are the resolved size limits.
type limits struct {
	maxUnzipped int64
	maxParts    int
	maxRatio    int
	inlineCells int // formulas: the sheets excelize evaluates (DefaultInlineMaxCells when not set)
	layoutCells int // the largest sheet with computed columns in place: math.MaxInt for any, -1 for none
	maxWarn     int
}

func (o *Options) limits() limits {
	l := limits{maxUnzipped: o.MaxUnzippedBytes, maxParts: 10_000, maxRatio: 500, inlineCells: o.InlineMaxCells, maxWarn: o.MaxWarningsPerColumn}
	if l.maxUnzipped <= 0 {
		l.maxUnzipped = DefaultMaxUnzippedBytes
	}
	switch {
	case o.Layout == LayoutSideSheet || o.InlineMaxCells < 0:
		l.layoutCells = -1
	case o.InlineMaxCells > 0:
		l.layoutCells = o.InlineMaxCells
	default:
		l.layoutCells = math.MaxInt
	}
	if l.inlineCells == 0 {
		l.inlineCells = DefaultInlineMaxCells
	}
	if l.maxWarn == 0 {
		l.maxWarn = DefaultMaxWarningsPerColumn
	}
	return l
}
