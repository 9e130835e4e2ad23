package importer

import (
	"context"
	"strings"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/units"
	"github.com/fluecell/fluecell/importer/tables"
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
	mapRun    *mappingRun // what the scan did with opt.Mapping (mappingapply.go)
	provenance

	fuels map[string]fuelRes
	units map[string]unitRes
	techs map[string]techRes
	hdrs  map[string]headerInfo
	names map[string]fuelRef
	// scanned lists the sheets looked at, in order; skipWhy says why a
	// sheet without a table has none.
	scanned []string
	skipWhy map[string]string
	vocab   *tables.Vocab
}

// formulaCalc evaluates the formula in a cell; ok is false when it cannot.
type formulaCalc interface {
	calc(sheet, cell string) (string, bool)
}

type fuelRes struct {
	id    string
	alias bool
	bio   bool // biogenic: its CO2 is a memo item, never in the fossil totals
	err   error
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
	vocab, err := tables.NewVocab()
	if err != nil {
		panic(err) // the embedded vocabulary is malformed: a build defect, caught by the tables tests
	}
	sc := &scanCtx{ctx: ctx, e: e, opt: opt, lim: opt.limits(), path: path,
		fuels: map[string]fuelRes{}, units: map[string]unitRes{}, techs: map[string]techRes{}, hdrs: map[string]headerInfo{}, sheetOrd: map[string]int{},
		names: map[string]fuelRef{}, vocab: vocab, skipWhy: map[string]string{}}
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

// fuel resolves a fuel name through the engine, cached.
func (sc *scanCtx) fuel(s string) fuelRes {
	if r, ok := sc.fuels[s]; ok {
		return r
	}
	var r fuelRes
	if m, ok := sc.e.LookupFuel(s); ok {
		r = fuelRes{id: m.Fuel.ID, alias: m.Alias, bio: m.Fuel.Biogenic}
	} else {
		r.err = errNotAFuel // the message is built only for a cell that reports it (fuelMessage)
	}
	if len(sc.fuels) < maxCache {
		sc.fuels[s] = r
	}
	return r
}

// errNotAFuel marks a name that resolves to no fuel; fuelMessage explains it.
var errNotAFuel = &funcs.Error{Code: funcs.CodeUnknownFuel, Param: "fuel", Msg: "not a fuel name"}

// fuelMessage explains why s names no fuel (with a suggestion where one is
// close), for a finding at the cell.
func (sc *scanCtx) fuelMessage(s string) string {
	if strings.TrimSpace(s) == "" {
		return "no fuel given: write the fuel, e.g. natural_gas or diesel"
	}
	_, _, err := sc.e.ResolveFuel(s)
	fe, ok := funcs.AsError(err)
	if ok && !strings.Contains(fe.Msg, "did you mean") {
		// "Natral Gas Deliveries": a suggestion for the name without its
		// usage words.
		if core := strings.Join(sc.vocab.Strip(words(s), tables.HintQty|tables.HintTotal), " "); core != "" && core != strings.ToLower(s) {
			if _, _, err2 := sc.e.ResolveFuel(core); err2 != nil {
				if fe2, ok2 := funcs.AsError(err2); ok2 && strings.Contains(fe2.Msg, "did you mean") {
					return strings.Replace(fe2.Msg, quoteText(core), quoteText(s), 1)
				}
			}
		}
	}
	if ok {
		return fe.Msg
	}
	return "unknown fuel " + quoteText(s)
}

// unit parses a unit string (any dimension), cached.
func (sc *scanCtx) unit(s string) unitRes {
	if r, ok := sc.units[s]; ok {
		return r
	}
	var r unitRes
	u, err := units.Lookup(s) // most texts counted are no units: no suggestion work here (see unitMessage)
	if err != nil {
		ue, ok := err.(*units.Error)
		if !ok {
			ue = &units.Error{Input: s, Code: units.CodeUnknown, Msg: err.Error()}
		}
		r.err = ue
	} else {
		r.u = u
	}
	r.notAmount = tables.NotAmountUnit(s)
	if len(sc.units) < maxCache {
		sc.units[s] = r
	}
	return r
}

// notAmount says why a unit cell names no amount of fuel (a price or rate,
// a count), cached with the unit.
func (sc *scanCtx) notAmount(s string) string { return sc.unit(s).notAmount }

// tech resolves a technology name through lifecycle_intensity, cached.
func (sc *scanCtx) tech(s string) techRes {
	if r, ok := sc.techs[s]; ok {
		return r
	}
	var r techRes
	res, err := sc.e.CallValues("lifecycle_intensity", s)
	if err != nil {
		r.err = err
	} else if len(res.Sources) > 0 {
		r.id = res.Sources[0].ID
	} else {
		r.id = s
	}
	if len(sc.techs) < maxCache {
		sc.techs[s] = r
	}
	return r
}

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

// header is parseHeader, cached.
func (sc *scanCtx) header(s string) headerInfo {
	if h, ok := sc.hdrs[s]; ok {
		return h
	}
	h := parseHeader(s)
	if len(sc.hdrs) < maxCache {
		sc.hdrs[s] = h
	}
	return h
}

// unitLike reports a text that parses as a unit (or a known ambiguous one).
func (sc *scanCtx) unitLike(s string) bool {
	u := sc.unit(s)
	return u.err == nil || u.err.Code != units.CodeUnknown
}

// unitMessage is the message for a unit that cannot be used, with the
// spelling suggestion that the cached lookup leaves out.
func (sc *scanCtx) unitMessage(s string, e *units.Error) string {
	if e.Code == units.CodeUnknown {
		if _, err := units.Parse(s); err != nil {
			if ue, ok := err.(*units.Error); ok {
				return ue.Msg
			}
		}
	}
	return e.Msg
}
