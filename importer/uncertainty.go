package importer

import (
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// The 95 % interval of every workbook total, by IPCC 2006 Vol 1 Ch 3 Approach 1 (error
// propagation, the default) or Approach 2 (Monte Carlo, seeded): each computed row adds the
// terms of its tCO2e rule (its amount times the factor rows used, funcs.TotalModel) to the model
// of its table and kind, and the tables' models are merged into the workbook's totals by kind
// and the Scope 1 total.
//
// What is one quantity and what is independent:
//   - a factor row (a CO2 factor, an NCV, a GWP) is one quantity wherever it is used: the rows
//     of one fuel move together (fully correlated); different rows are independent;
//   - the amounts of one table and kind of record share one activity-data quantity, with the
//     default uncertainty of that kind (funcs.ActivityDefaults) or the mapping's
//     activity_uncertainty for the table. A table's rows come from the same records (the same
//     meters, invoices and data entry), and the default ranges are published for the
//     statistics of a whole category rather than one record, so their errors are not taken to
//     average out over the rows: treating rows as independent would shrink the range by the
//     square root of their number, a precision no record-keeping shows (IPCC 2006 Vol 1 Ch 3
//     on correlated inputs, from memory). Different tables are independent.
//
// Memory is bounded by the distinct products of factor rows, not by the rows (funcs.TotalModel).

// TotalInterval is the 95 % interval of a total's tCO2e, or why it has none.
// Low and High hold it when Approach is set; they are written to JSON as
// tCO2e_low and tCO2e_high by the MarshalJSON of Totals and KindTotal, and
// left out when there is no interval. The struct is comparable (==).
type TotalInterval struct {
	Low      float64 `json:"-"`
	High     float64 `json:"-"`
	Approach string  `json:"approach,omitempty"` // approach1 or approach2 (the report's uncertainty says more); "" = no interval
	// IntervalNote says why there is no interval, or which rows publish no range.
	IntervalNote string `json:"interval_note,omitempty"`
}

// HasInterval reports whether the total has a 95 % interval.
func (ti TotalInterval) HasInterval() bool { return ti.Approach != "" }

// ends are Low and High for JSON: nil when there is no interval.
func (ti TotalInterval) ends() (lo, hi *float64) {
	if !ti.HasInterval() {
		return nil, nil
	}
	return &ti.Low, &ti.High
}

// UncertaintyInfo says how the intervals of a report were computed.
type UncertaintyInfo struct {
	Approach string `json:"approach"` // approach1 (error propagation) or approach2 (Monte Carlo)
	Method   string `json:"method"`   // in words
	Seed     uint64 `json:"seed,omitempty"`
	Draws    int    `json:"draws,omitempty"`
	// Activity is the activity-data uncertainty used for each table and kind of record.
	Activity []ActivityUsed `json:"activity"`
}

// ActivityUsed is the activity-data uncertainty of one table's records of one kind.
type ActivityUsed struct {
	Table   string  `json:"table"`   // "Fuel log!A4", the table's header cell
	Kind    string  `json:"kind"`    // funcs.ActivityStationaryFuel ...
	Percent float64 `json:"percent"` // half-width of the 95 % interval, % of the amount
	From    string  `json:"from"`    // "mapping" or the default's source
}

// tableUnc is a table's uncertainty models, one per kind of total.
type tableUnc struct {
	group    string // the table's header cell, "Fuel log!A4"
	main     string // the kind of its combustion rows (baseKinds)
	scope2   bool
	override *float64 // the mapping's activity_uncertainty, %
	byKind   map[string]*funcs.TotalModel
	used     map[string]bool // kinds of record seen
}

// activityDefaults is the default activity uncertainty by kind of record, read once per scan.
func (sc *scanCtx) activityPercent(tu *tableUnc, kind string) float64 {
	tu.used[kind] = true
	if tu.override != nil {
		return *tu.override
	}
	for _, d := range sc.activityDefaults() {
		if d.Kind == kind {
			return d.Percent
		}
	}
	return 0
}

// activityDefaults reads the embedded defaults; a table that does not read is a build fault,
// caught by the funcs tests, and gives exact amounts here.
func (sc *scanCtx) activityDefaults() []funcs.ActivityDefault {
	ds, _ := funcs.ActivityDefaults()
	return ds
}

// uncFor returns t's models, made on first use.
func (sc *scanCtx) uncFor(t *table) *tableUnc {
	if t.unc == nil {
		main, s2 := t.baseKinds()
		tu := &tableUnc{group: t.spec.sheet + "!" + cellRef(t.spec.firstCol, t.spec.headerRow), main: main, scope2: s2,
			byKind: map[string]*funcs.TotalModel{}, used: map[string]bool{}}
		if run := sc.mapping(); run != nil {
			if k, ok := run.applied[t.spec]; ok {
				tu.override = run.m.tables[k].activity
			}
		}
		t.unc = tu
	}
	return t.unc
}

// runRule runs rule r of rule set rs on row i (its result goes to t.res[ri]) and adds the
// terms of a tCO2e result to the model of the row's kind, as kindTotals adds its value.
func (sc *scanCtx) runRule(t *table, i int, rs *ruleSet, r *rule, ri int, vars map[string]any) (funcs.Result, error) {
	out, err := r.run.RunTracked(vars)
	if err != nil || t.copyOf != nil {
		return out, err
	}
	tu := sc.uncFor(t)
	kind := ""
	switch t.rules[ri].total {
	case 3:
		kind = KindScope2
	case 2:
		kind = tu.main
		switch {
		case rs.key != "":
			kind = KindScope2
		case t.spec.mobile != "" && len(rs.rules) > 0 && strings.Contains(rs.rules[0].src, "= fuel_co2"):
			kind = KindStationary
		}
	}
	if kind == "" {
		return out, nil
	}
	m := tu.byKind[kind]
	if m == nil {
		m = funcs.NewTotalModel(func(_, k string) float64 { return sc.activityPercent(tu, k) })
		tu.byKind[kind] = m
	}
	r.run.AddTo(m, tu.group)
	return out, nil
}

// totalIntervals sets the interval of every total of rep from the tables' models: each
// table's totals by kind and Scope 1 total, the workbook's totals by kind and its Scope 1
// total (rep.Tables[i] is sc.tables[i]).
func (sc *scanCtx) totalIntervals(rep *Report) {
	opt := sc.opt.Uncertainty
	info := &UncertaintyInfo{Approach: approachName(opt.Approach), Method: methodText(opt), Activity: []ActivityUsed{}}
	if opt.Approach == funcs.Approach2 {
		info.Seed, info.Draws = opt.Seed, drawsOf(opt)
	}
	all := map[string]*funcs.TotalModel{}
	for ti, t := range sc.tables {
		tu := t.unc
		if tu == nil || t.copyOf != nil || ti >= len(rep.Tables) {
			continue
		}
		tb := &rep.Tables[ti]
		s1 := funcs.NewTotalModel(nil)
		for k := range tb.ByKind {
			kt := &tb.ByKind[k]
			m := tu.byKind[kt.Kind]
			if m == nil {
				continue
			}
			kt.TotalInterval = intervalOf(m, opt)
			if scope1(kt.Kind) {
				s1.Merge(m)
			}
			if all[kt.Kind] == nil {
				all[kt.Kind] = funcs.NewTotalModel(nil)
			}
			all[kt.Kind].Merge(m)
		}
		if s1.Terms() > 0 {
			tb.Totals.TotalInterval = intervalOf(s1, opt)
		}
		for _, kind := range funcs.ActivityKinds() {
			if !tu.used[kind] {
				continue
			}
			a := ActivityUsed{Table: tu.group, Kind: kind, From: "mapping"}
			if tu.override != nil {
				a.Percent = *tu.override
			} else {
				for _, d := range sc.activityDefaults() {
					if d.Kind == kind {
						a.Percent, a.From = d.Percent, "default: "+d.Basis+" ("+d.Source+")"
					}
				}
			}
			info.Activity = append(info.Activity, a)
		}
	}
	s1 := funcs.NewTotalModel(nil)
	for k := range rep.ByKind {
		kt := &rep.ByKind[k]
		m := all[kt.Kind]
		if m == nil {
			continue
		}
		kt.TotalInterval = intervalOf(m, opt)
		if scope1(kt.Kind) {
			s1.Merge(m)
		}
	}
	if s1.Terms() > 0 {
		rep.Totals.TotalInterval = intervalOf(s1, opt)
	}
	rep.Uncertainty = info
}

// intervalOf is the interval of m's total, with a note naming the rows without a range.
func intervalOf(m *funcs.TotalModel, opt funcs.IntervalOptions) TotalInterval {
	ti := m.Interval(opt)
	out := TotalInterval{IntervalNote: ti.Note}
	if ti.Interval == nil {
		return out
	}
	lo, hi := cleanZero(ti.Interval.Low), cleanZero(ti.Interval.High)
	if !isFinite(lo) || !isFinite(hi) {
		out.IntervalNote = "no 95 % interval: its ends are past the float64 range"
		return out
	}
	out.Low, out.High, out.Approach = lo, hi, ti.Interval.Approach.String()
	if len(ti.NoRange) > 0 {
		out.IntervalNote = "no published range for " + joinMax(ti.NoRange, 6) + ": these rows add nothing to the interval"
	}
	return out
}

// joinMax joins the first n of xs, counting the rest.
func joinMax(xs []string, n int) string {
	s := ""
	for i, x := range xs {
		if i == n {
			return s + " and " + strconv.Itoa(len(xs)-n) + " more"
		}
		if i > 0 {
			s += ", "
		}
		s += x
	}
	return s
}

func approachName(a funcs.Approach) string {
	if a == funcs.Approach2 {
		return funcs.Approach2.String()
	}
	return funcs.Approach1.String()
}

func drawsOf(opt funcs.IntervalOptions) int {
	if opt.Draws == 0 {
		return funcs.DefaultDraws
	}
	return opt.Draws
}

// methodText says in words how the intervals were computed.
func methodText(opt funcs.IntervalOptions) string {
	if opt.Approach == funcs.Approach2 {
		return "IPCC 2006 Vol 1 Ch 3 Approach 2 (Monte Carlo, " + strconv.Itoa(drawsOf(opt)) + " draws, seed " + strconv.FormatUint(opt.Seed, 10) +
			"): each factor row and each table's activity data drawn once per draw; 2.5th and 97.5th percentiles of the totals"
	}
	return "IPCC 2006 Vol 1 Ch 3 Approach 1 (error propagation, Equations 3.1 and 3.2; lower and upper halves of asymmetric ranges combined separately)"
}

// intervalCaption says under the summary's totals how their 95 % intervals were computed.
func intervalCaption(u *UncertaintyInfo) string {
	s := "95 % low and high: " + u.Method + ", from the published ranges of the factor rows and the activity-data uncertainty of each table ("
	var parts []string
	for _, a := range u.Activity {
		parts = append(parts, a.Table+" "+strings.ReplaceAll(a.Kind, "_", " ")+" ±"+strconv.FormatFloat(a.Percent, 'f', -1, 64)+" %")
	}
	if len(parts) == 0 {
		parts = append(parts, "none")
	}
	return s + joinMax(parts, 6) + "; a table's rows share it, tables are independent). Rows without a published range add nothing to the interval."
}
