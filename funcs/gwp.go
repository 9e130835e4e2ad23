package funcs

import (
	"math/big"
	"sort"
	"strings"
)

// gwpSets lists the GWP sets present in the loaded packs (ar4, ar5, ar6 and
// any a user pack adds), sorted, as a new slice.
func (e *Engine) gwpSets() []string {
	if e.gases != nil {
		return append([]string(nil), e.gases.sets...)
	}
	return gwpSetsOf(e.packs)
}

func gwpSetsOf(ps *packSet) []string {
	seen := map[string]bool{}
	for _, p := range ps.packs {
		for k := range p.rows {
			if set, ok := strings.CutPrefix(k.quantity, "gwp100_"); ok {
				seen[set] = true
			}
		}
	}
	out := make([]string, 0, len(seen))
	for s := range seen {
		out = append(out, s)
	}
	sort.Strings(out)
	return out
}

// resolveGWPSet accepts "ar5", "AR5", " Ar5 "; "" means the default set.
func (e *Engine) resolveGWPSet(s string) (string, error) {
	set := strings.ToLower(strings.TrimSpace(s))
	if set == "" {
		return DefaultGWPSet, nil
	}
	sets := e.gwpSets()
	for _, known := range sets {
		if set == known {
			return set, nil
		}
	}
	msg := "unknown GWP set " + quote(s) + ": accepted are " + strings.Join(sets, ", ")
	if sug := suggestFrom(set, sets); sug != "" {
		msg += " (did you mean " + sug + "?)"
	}
	return "", &Error{Code: CodeBadArgument, Param: "gwp_set", Msg: msg}
}

// gasGWP is the GWP-100 of a gas or blend in a set, exactly, with the factor rows used and notes
// saying how a blend's value was formed. A blend's value is the sum of mass fraction x component
// GWP; a component without a value in the set (the hydrocarbons in every set, the HFOs in AR4) is
// counted as 0 and named in a note with its value in the other sets. A row for the blend's own id
// (from a user pack) replaces the computed value. A pure gas without a row, or a blend none of
// whose components has one, is an *Error of code CodeMissingFactor.
func (e *Engine) gasGWP(g *gasEntry, set string) (*big.Rat, []*Factor, []string, error) {
	if f := e.packs.lookup(CommonPack, g.info.ID, "gwp100_"+set); f != nil {
		return f.exact, []*Factor{f}, boundNote(g, set, f), nil
	}
	if g.parts == nil {
		return nil, nil, nil, e.missingGasGWP(g, set)
	}
	sum := new(big.Rat)
	var used []*Factor
	var terms, notes []string
	for _, p := range g.parts {
		f := e.packs.lookup(CommonPack, p.gas.info.ID, "gwp100_"+set)
		if f == nil {
			terms = append(terms, p.text+" x 0")
			notes = append(notes, p.gas.info.Name+" ("+p.percent()+" of "+g.info.Name+") has no GWP-100 in "+set+
				" (the table does not list it) and is counted as 0"+e.otherSets(p.gas, set))
			continue
		}
		used = append(used, f)
		terms = append(terms, p.text+" x "+FormatNumber(f.Value))
		notes = append(notes, boundNote(p.gas, set, f)...)
		sum.Add(sum, new(big.Rat).Mul(p.frac, f.exact))
	}
	if len(used) == 0 {
		return nil, nil, nil, e.missingGasGWP(g, set)
	}
	notes = append([]string{g.composition(), "GWP-100 " + strings.ToUpper(set) + " of " + g.info.Name + " = " +
		strings.Join(terms, " + ") + " = " + FormatNumber(ratFloat(sum))}, notes...)
	return sum, used, notes, nil
}

// boundNote says when a row holds the bound of a value the table gives as "<1" (low 0, value =
// high).
func boundNote(g *gasEntry, set string, f *Factor) []string {
	if f.Low != nil && f.High != nil && *f.Low == 0 && f.Value == *f.High {
		return []string{"GWP-100 " + strings.ToUpper(set) + " of " + g.info.Name + " is given as <" + FormatNumber(f.Value) +
			" in its table; the bound " + FormatNumber(f.Value) + " is used"}
	}
	return nil
}

// otherSets lists the values of g in the sets other than set: "; ar5: 1, ar6: 0.501".
func (e *Engine) otherSets(g *gasEntry, set string) string {
	var with []string
	for _, s := range e.gwpSets() {
		if f := e.packs.lookup(CommonPack, g.info.ID, "gwp100_"+s); f != nil && s != set {
			with = append(with, s+": "+FormatNumber(f.Value))
		}
	}
	if len(with) == 0 {
		return ""
	}
	return "; " + strings.Join(with, ", ")
}

// missingGasGWP is the error for a gas without a GWP-100 in set: the sets that have one, or, when
// none has, that the IPCC tables give none and a user pack row can.
func (e *Engine) missingGasGWP(g *gasEntry, set string) error {
	var with []string
	for _, s := range e.gwpSets() {
		if e.packs.lookup(CommonPack, g.info.ID, "gwp100_"+s) != nil {
			with = append(with, s)
		}
	}
	if len(with) > 0 {
		return &Error{Code: CodeMissingFactor, Param: "gwp_set", Msg: "GWP set " + set + " has no value for " + g.info.Name + "; sets with it: " + strings.Join(with, ", ")}
	}
	return &Error{Code: CodeMissingFactor, Param: "gas", Msg: "no GWP-100 for " + g.info.Name + " in any set: the IPCC tables do not list it; " +
		"a factor row common," + g.info.ID + ",gwp100_" + set + ",<value>,1,... in a user pack gives one"}
}

// checkGas is the compile-time check of a literal gas argument.
func checkGas(e *Engine, s string) error {
	_, _, err := e.gases.resolve(s)
	return err
}

// gwpKey identifies a GWP look-up by its arguments exactly as given, so that a repeated call
// skips resolving and summing.
type gwpKey struct{ gas, set string }

// gwpPlan is a cached GWP look-up: the gas, the set, the value and how it was formed.
type gwpPlan struct {
	gas     *gasEntry
	set     string
	exact   *big.Rat
	value   float64
	factors []*Factor
	notes   []string // how the name was read, a blend's composition and sum
}

// gwpPlan resolves the set, then the gas, and returns their GWP-100, cached. Errors are those of
// resolveGWPSet, gasIndex.resolve and gasGWP.
func (e *Engine) gwpPlan(gasArg, setArg string) (*gwpPlan, error) {
	key := gwpKey{gasArg, setArg}
	if p, ok := e.plans.Load(key); ok {
		return p.(*gwpPlan), nil
	}
	set, err := e.resolveGWPSet(setArg)
	if err != nil {
		return nil, err
	}
	g, note, err := e.gases.resolve(gasArg)
	if err != nil {
		return nil, err
	}
	v, fs, notes, err := e.gasGWP(g, set)
	if err != nil {
		return nil, err
	}
	if note != "" {
		notes = append([]string{note}, notes...)
	}
	p := &gwpPlan{gas: g, set: set, exact: v, value: ratFloat(v), factors: fs, notes: notes}
	e.cachePlan(key, p)
	return p, nil
}

// cachePlan stores a computed plan under key while the cache is below its bound.
func (e *Engine) cachePlan(key, p any) {
	if e.planCount.Load() < maxCachedPlans {
		if _, loaded := e.plans.LoadOrStore(key, p); !loaded {
			e.planCount.Add(1)
		}
	}
}

func callGWP(e *Engine, c *callCtx, a argList) (float64, string, error) {
	gasArg, err := a.str(0)
	if err != nil {
		return 0, "", err
	}
	setArg, err := a.optStr(1, "")
	if err != nil {
		return 0, "", err
	}
	p, err := e.gwpPlan(gasArg, setArg)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	c.use(p.factors...)
	c.note(p.notes...)
	return p.value, "", nil
}
