package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// Rows of a long table that are not fuels burned on site get rules of
// their own: a row whose fuel cell names electricity, steam, hot water or
// cooling is computed with electricity_co2e or heat_co2e into the same
// columns (tCO2, tCO2e). The proposed rules list them too.

// ruleSet is the rules one row runs: at[k] is the index among t.rules of
// the column rules[k] fills (a column it has no rule for stays empty).
type ruleSet struct {
	rules []*rule
	at    []int
	binds []*binding
	key   string // the key of its rows in the totals by fuel; "" = the fuel's
}

// newRuleSet lists the variables of rules, each once.
func newRuleSet(rules []*rule, at []int, key string) *ruleSet {
	rs := &ruleSet{rules: rules, at: at, key: key}
	seen := map[string]bool{}
	for _, r := range rules {
		for _, b := range r.vars {
			if !seen[b.name] {
				seen[b.name] = true
				rs.binds = append(rs.binds, b)
			}
		}
	}
	return rs
}

// mainRules is the rule set of the ordinary rows.
func (t *table) mainRules() *ruleSet {
	at := make([]int, len(t.rules))
	for i := range at {
		at[i] = i
	}
	return newRuleSet(t.rules, at, "")
}

// compileRowRules compiles the rules of a fuel log's rows of purchased
// energy, one set per carrier that can be computed (t.alts).
func (sc *scanCtx) compileRowRules(t *table) error {
	spec := t.spec
	if len(sc.userRules) > 0 || spec.kind != kindFuelLog || spec.fuel == nil || len(t.rules) == 0 {
		return nil
	}
	unit := fuelLogUnit(spec)
	for _, c := range []carrier{carrierElectricity, carrierSteam, carrierHeat, carrierCooling} {
		var rules []*rule
		var at []int
		for ri, main := range t.rules {
			gas := map[int]string{1: "co2", 2: "co2e"}[main.total]
			if gas == "" {
				continue
			}
			call := sc.carrierCall(spec, c, scaled(spec.qty), unit, gas)
			if call == "" {
				continue
			}
			r, err := sc.compileRowRule(t, main, call)
			if err != nil {
				return err
			}
			rules, at = append(rules, r), append(at, ri)
		}
		if len(rules) > 0 {
			if t.alts == nil {
				t.alts = map[carrier]*ruleSet{}
			}
			t.alts[c] = newRuleSet(rules, at, c.byTotal())
		}
	}
	return sc.compileModeRules(t)
}

// compileRowRule compiles call as the rule of main's column for some rows.
func (sc *scanCtx) compileRowRule(t *table, main *rule, call string) (*rule, error) {
	spec := t.spec
	p, err := sc.e.Compile(call, funcs.WithVariables(identList(spec)...), sc.withGWPSet())
	if err != nil {
		return nil, &Error{Code: ErrRule, Path: sc.path, Err: err,
			Msg: "rule " + quoteText(main.column+" = "+call) + " for the table at " + spec.sheet + "!" + cellRef(spec.firstCol, spec.headerRow) + ": " + err.Error()}
	}
	r := &rule{column: main.column, src: ruleText(main.column, call, p), prog: p, run: p.NewRunner(), paramVar: paramVars(sc.e, call), total: main.total}
	for _, v := range p.Variables() {
		r.vars = append(r.vars, t.bind(v))
	}
	return r, nil
}

// rowCarrier reads the purchased energy a fuel log's row names, cached
// per text; carrierNone for fuels and for tables without row rules.
func (sc *scanCtx) rowCarrier(t *table, i int) carrier {
	spec := t.spec
	if spec.kind != kindFuelLog || spec.fuel == nil || len(sc.userRules) > 0 || len(t.rules) == 0 {
		return carrierNone
	}
	v := t.val(i, t.slotOf[spec.fuel.col])
	if v.kind != kText {
		return carrierNone
	}
	if fr := sc.fuelName(v.text); fr.kind != nameNotFuel {
		return carrierNone
	}
	return sc.carrierOf(v.text)
}

// rowRules picks the rules of row i: its carrier's, or the table's own.
// skip is true for a row of purchased energy that cannot be computed (no
// grid, or no factor in this build): it has its findings.
func (sc *scanCtx) rowRules(t *table, main *ruleSet, i int) (rs *ruleSet, skip bool) {
	c := sc.rowCarrier(t, i)
	if c == carrierNone {
		if rs := sc.rowMode(t, i); rs != nil {
			return rs, false
		}
		return main, false
	}
	if rs := t.alts[c]; rs != nil {
		if !t.noted[c] {
			if t.noted == nil {
				t.noted = map[carrier]bool{}
			}
			t.noted[c] = true
			f := t.spec.fuel
			sc.warn.add(t.spec.sheet, f.col, t.rowNum(i), SevInfo, CodeReadAs, quoteText(t.val(i, t.slotOf[f.col]).text)+
				" is purchased "+c.String()+" (Scope 2): its rows are computed with "+sc.carrierBasis(t.spec, c)+", as \""+ruleCalls(rs)+"\"")
		}
		return rs, false
	}
	f := t.spec.fuel
	rowNum := t.rowNum(i)
	text := quoteText(t.val(i, t.slotOf[f.col]).text)
	if c == carrierElectricity && !t.spec.grid.known() {
		at := sc.gridUnknown(t.spec.sheet, f.col, rowNum, text+" ("+t.spec.sheet+"!"+cellRef(f.col, rowNum)+")")
		sc.warn.add(t.spec.sheet, f.col, rowNum, SevInfo, CodeNotComputed, text+" is purchased electricity and no grid is given; row not computed (see the grid-unknown finding at "+at+")")
		return nil, true
	}
	sc.warn.add(t.spec.sheet, f.col, rowNum, SevInfo, CodeNotComputed, text+" is purchased "+c.String()+" (Scope 2), and this build has no factor for it; row not computed")
	return nil, true
}

// ruleCalls is the right-hand sides of a rule set, for a finding.
func ruleCalls(rs *ruleSet) string {
	var out []string
	for _, r := range rs.rules {
		out = append(out, r.src)
	}
	return strings.Join(out, "; ")
}

// allRules lists the table's rules, then those its rows of purchased
// energy used (by carrier), for the report.
func (t *table) allRules() []*rule {
	out := append([]*rule(nil), t.rules...)
	for _, c := range []carrier{carrierElectricity, carrierSteam, carrierHeat, carrierCooling} {
		if rs := t.alts[c]; rs != nil && t.noted[c] {
			out = append(out, rs.rules...)
		}
	}
	for _, m := range []string{roadModeGasoline, stationaryMode} {
		if rs := t.modes[m]; rs != nil && t.modeNoted[m] {
			out = append(out, rs.rules...)
		}
	}
	return out
}
