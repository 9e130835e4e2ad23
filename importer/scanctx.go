package importer

import (
	"context"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
)

// scanCtx is the state of one Scan: the engine, the options, the caches of
// resolved fuels, units and technologies, and the warnings. It belongs to
// one goroutine.
type scanCtx struct {
	ctx       context.Context
	e         *funcs.Engine
	opt       Options
	lim       limits
	path      string
	pages     *pageSet // the per-row columns of the tables (pages.go)
	csv       bool
	packName  string
	packBasis units.Basis
	userRules []*userRule
	warn      *warnSink
	calc      formulaCalc // evaluates formulas without a cached value; may be nil
	tables    []*table
	sheetOrd  map[string]int
	missed    []string // identifiers of a header that lacked a rule's variables
	missedAt  string
	mapRun    *mappingRun      // what the scan did with opt.Mapping (mappingapply.go)
	gridAt    string           // the cell of the grid-unknown finding, once per scan (grid.go)
	heatOK    map[carrier]bool // whether heat_co2e has a default for a carrier (scope2.go)
	delivered bool             // the row being read is purchased energy: its units have no basis
	provenance
	memoNotes lastTexts[float64] // biogenic CO2 read from notes (kinds.go)

	*lexicon // how texts read (fuels, units, technologies, headers)
	// scanned lists the sheets looked at, in order; skipWhy says why a
	// sheet without a table has none.
	scanned []string
	skipWhy map[string]string
}

// formulaCalc evaluates the formula in a cell; ok is false when it cannot.
type formulaCalc interface {
	calc(sheet, cell string) (string, bool)
}

type fuelRes struct {
	id    string
	alias bool
	bio   bool // biogenic: its CO2 is a memo item, never in the fossil totals
	// nonEnergy: a product used as a material (lubricants, bitumen), not a fuel burned
	nonEnergy bool
	err       error
}

type unitRes struct {
	u         units.Unit
	err       *units.Error
	notAmount string // why the text names no amount of fuel (a price, a count); "" otherwise
}

type techRes struct {
	id  string
	err error
}

const maxCache = 20_000

func newScanCtx(ctx context.Context, e *funcs.Engine, path string, opt Options) *scanCtx {
	lx, err := newLexicon(e)
	if err != nil {
		panic(err) // the embedded vocabulary is malformed: a build defect, caught by the tables tests
	}
	sc := &scanCtx{ctx: ctx, e: e, opt: opt, lim: opt.limits(), path: path, pages: newPageSet(opt.PageBudget, opt.pageShift), lexicon: lx,
		sheetOrd: map[string]int{}, skipWhy: map[string]string{}}
	sc.packName = e.DefaultPackName()
	for _, p := range e.Packs() {
		if p.Name == sc.packName {
			switch p.Basis {
			case "NCV":
				sc.packBasis = units.NCV
			case "HHV":
				sc.packBasis = units.HHV
			}
		}
	}
	sc.warn = newWarnSink(sc.lim.maxWarn)
	return sc
}

// errNotAFuel marks a name that resolves to no fuel; fuelMessage explains it.
var errNotAFuel = &funcs.Error{Code: funcs.CodeUnknownFuel, Param: "fuel", Msg: "not a fuel name"}

// isFunction reports whether name is a catalog function (not usable as a
// variable).
func (sc *scanCtx) isFunction(name string) bool {
	_, ok := sc.e.Function(name)
	return ok
}

// cancelled returns the context's error as an *Error.
func (sc *scanCtx) cancelled() error {
	if err := sc.ctx.Err(); err != nil {
		return &Error{Code: ErrCancelled, Path: sc.path, Msg: "stopped: " + err.Error(), Err: err}
	}
	return nil
}
