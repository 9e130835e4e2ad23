package funcs

import (
	"encoding/binary"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs/uncertainty"
)

// TotalModel is the uncertainty model of a total over many results (the rows of a workbook):
// a sum of terms, each an amount times factor rows times the uncertainty of the records the
// amount comes from. Memory is bounded by the distinct products, not by the rows: terms with
// the same factors are one term whose value is the sum of theirs, which is exact for both
// approaches (a shared factor multiplies their sum). A factor row used by many rows is one
// quantity (fully correlated); different rows are independent. The records of one group (a
// table) and kind share one activity quantity (see NewTotalModel). A TotalModel is not safe
// for concurrent use.
type TotalModel struct {
	m     uncertainty.Model
	ids   []factorID       // per factor of m: what it is
	index map[factorID]int // its index in m.Factors
	terms map[string]int   // the signature of a term's uses -> its index in m.Terms
	cache map[cacheKey][]int
	buf   []byte
	uses  []uncertainty.Use
	// activity gives the uncertainty of a group's records of a kind, in per cent.
	activity func(group, kind string) float64
	skipped  int    // results that could not be modelled
	why      string // the first reason
	results  int    // results added
}

// factorID is a factor row, or the activity quantity of a group's records of a kind.
type factorID struct {
	f            *Factor
	group, kind  string
	activityOnly bool
}

type cacheKey struct {
	iv  *planInterval
	act int
}

// maxTermCache bounds the cache of term indices per plan (beyond it, terms are found by their
// signature: the same result, a little slower).
const maxTermCache = 4096

// NewTotalModel returns an empty model. activity gives the 95 % half-width, in per cent, of the
// amounts of kind (ActivityStationaryFuel ...) recorded in group (a table); nil means amounts
// are exact. The amounts of one group and kind are one quantity: a table's records share how
// they were kept (the same meters, invoices and data entry), and the default uncertainties
// are published for the statistics of a whole category, not for one record, so their errors do
// not average out over the rows (IPCC 2006 Vol 1 Ch 3 on correlated inputs, from memory).
func NewTotalModel(activity func(group, kind string) float64) *TotalModel {
	return &TotalModel{index: map[factorID]int{}, terms: map[string]int{}, cache: map[cacheKey][]int{}, activity: activity}
}

// RunTracked is Run that also keeps how the result is built from factor rows, for AddTo.
func (r *Runner) RunTracked(vars map[string]any) (Result, error) {
	r.st.ctx.track = true
	return r.run(vars)
}

// AddTo adds the result of the last RunTracked to tm, its amounts recorded in group. A result
// that is not a call or a sum or difference of calls of functions that model their factors
// is counted as not modelled, with the reason: tm then gives no interval.
func (r *Runner) AddTo(tm *TotalModel, group string) {
	c := &r.st.ctx
	tm.results++
	switch {
	case len(c.untracked) > 0:
		tm.skip("the factor ranges are not propagated through " + strings.Join(c.untracked, ", "))
		return
	case len(c.contribs) == 0:
		return
	case r.p.signs == nil || len(r.p.signs) != len(c.contribs):
		tm.skip("a rule is not a call, or a sum or difference of calls")
		return
	}
	for i, k := range c.contribs {
		if k.why != "" {
			tm.skip(k.why)
			return
		}
		tm.addContrib(k, r.p.signs[i], group)
	}
}

func (tm *TotalModel) skip(why string) {
	if tm.skipped == 0 {
		tm.why = why
	}
	tm.skipped++
}

// factorIndex returns the index of id in the model, adding it on first use.
func (tm *TotalModel) factorIndex(id factorID) int {
	if i, ok := tm.index[id]; ok {
		return i
	}
	i := len(tm.m.Factors)
	var f uncertainty.Factor
	if id.activityOnly {
		p := 0.0
		if tm.activity != nil {
			p = tm.activity(id.group, id.kind)
		}
		f = uncertainty.Factor{Name: "activity data " + id.kind + " of " + id.group, Value: 1, Low: 1 - p/100, High: 1 + p/100, HasRange: p > 0}
	} else {
		f, _ = modelFactor(id.f)
	}
	tm.m.Factors = append(tm.m.Factors, f)
	tm.ids = append(tm.ids, id)
	tm.index[id] = i
	return i
}

// activityIndex is the activity quantity of group's records of kind, or -1 when they are exact.
func (tm *TotalModel) activityIndex(group, kind string) int {
	if kind == "" || tm.activity == nil {
		return -1
	}
	id := factorID{group: group, kind: kind, activityOnly: true}
	i := tm.factorIndex(id)
	if !tm.m.Factors[i].HasRange {
		return -1
	}
	return i
}

func (tm *TotalModel) addContrib(k contrib, sign float64, group string) {
	act := tm.activityIndex(group, k.activity)
	a := sign * k.amount
	if k.iv != nil {
		key := cacheKey{k.iv, act}
		idx, ok := tm.cache[key]
		if !ok {
			idx = make([]int, len(k.terms))
			for j, t := range k.terms {
				idx[j] = tm.termIndex(t.uses, act)
			}
			if len(tm.cache) < maxTermCache {
				tm.cache[key] = idx
			}
		}
		for j, t := range k.terms {
			tm.m.Terms[idx[j]].Value += a * t.perUnit
		}
		return
	}
	for _, t := range k.terms {
		tm.m.Terms[tm.termIndex(t.uses, act)].Value += a * t.perUnit
	}
}

// termIndex finds or adds the term of the factor rows uses times the activity quantity act.
func (tm *TotalModel) termIndex(uses []factorUse, act int) int {
	tm.uses = tm.uses[:0]
	for _, u := range uses {
		tm.uses = append(tm.uses, uncertainty.Use{Factor: tm.factorIndex(factorID{f: u.f}), Power: u.pow})
	}
	if act >= 0 {
		tm.uses = append(tm.uses, uncertainty.Use{Factor: act, Power: 1})
	}
	return tm.termOf(tm.uses)
}

// termOf finds or adds the term with exactly these uses (model indices).
func (tm *TotalModel) termOf(uses []uncertainty.Use) int {
	tm.buf = tm.buf[:0]
	for _, u := range uses {
		tm.buf = binary.AppendUvarint(tm.buf, uint64(u.Factor))
		tm.buf = append(tm.buf, byte(u.Power+1))
	}
	if i, ok := tm.terms[string(tm.buf)]; ok {
		return i
	}
	i := len(tm.m.Terms)
	tm.m.Terms = append(tm.m.Terms, uncertainty.Term{Uses: append([]uncertainty.Use(nil), uses...)})
	tm.terms[string(tm.buf)] = i
	return i
}

// Merge adds the terms of o to tm: a factor row or activity quantity in both is one quantity.
func (tm *TotalModel) Merge(o *TotalModel) {
	if o == nil {
		return
	}
	tm.results += o.results
	if o.skipped > 0 {
		if tm.skipped == 0 {
			tm.why = o.why
		}
		tm.skipped += o.skipped
	}
	remap := make([]int, len(o.ids))
	for i, id := range o.ids {
		j, ok := tm.index[id]
		if !ok {
			j = len(tm.m.Factors)
			tm.m.Factors = append(tm.m.Factors, o.m.Factors[i])
			tm.ids = append(tm.ids, id)
			tm.index[id] = j
		}
		remap[i] = j
	}
	var uses []uncertainty.Use
	for _, t := range o.m.Terms {
		uses = uses[:0]
		for _, u := range t.Uses {
			uses = append(uses, uncertainty.Use{Factor: remap[u.Factor], Power: u.Power})
		}
		tm.m.Terms[tm.termOf(uses)].Value += t.Value
	}
}

// Terms is the number of terms the model holds (bounded by the distinct products, not the rows).
func (tm *TotalModel) Terms() int { return len(tm.m.Terms) }

// TotalInterval is the 95 % interval of a total, or why it has none.
type TotalInterval struct {
	Interval *Interval // nil when there is none; Note says why
	Note     string
	// NoRange lists the factor rows used that publish no range (they add nothing).
	NoRange []string
}

// Interval computes the 95 % interval of the total by opt's approach.
func (tm *TotalModel) Interval(opt IntervalOptions) TotalInterval {
	var out TotalInterval
	for i, id := range tm.ids {
		if !id.activityOnly && !tm.m.Factors[i].HasRange {
			out.NoRange = append(out.NoRange, id.f.Key())
		}
	}
	switch {
	case tm.skipped > 0:
		out.Note = "no 95 % interval: " + strconv.Itoa(tm.skipped) + " of " + strconv.Itoa(tm.results) + " results could not be modelled (" + tm.why + ")"
		return out
	case len(tm.m.Terms) == 0:
		out.Note = "no 95 % interval: no result was modelled"
		return out
	}
	ranged := false
	for _, f := range tm.m.Factors {
		ranged = ranged || f.HasRange
	}
	if !ranged {
		out.Note = noRangeNote(out.NoRange) + " and the amounts are taken as exact"
		return out
	}
	var iv Interval
	if opt.Approach == Approach2 {
		draws := opt.Draws
		if draws == 0 {
			draws = DefaultDraws
		}
		u, err := uncertainty.MonteCarlo(tm.m, opt.Seed, draws)
		if err != nil {
			out.Note = "no 95 % interval: " + err.Error()
			return out
		}
		iv = Interval{Low: u.Low, High: u.High, Mean: round12(u.Mean), Approach: Approach2, Draws: draws, Seed: opt.Seed}
	} else {
		u, err := uncertainty.Propagate(tm.m, uncertainty.RuleSeparate)
		if err != nil {
			out.Note = "no 95 % interval: " + err.Error()
			return out
		}
		iv = Interval{Low: u.Low, High: u.High, Approach: Approach1}
	}
	iv.Low, iv.High = round12(iv.Low), round12(iv.High)
	out.Interval = &iv
	return out
}
