package funcs

import (
	"sort"
	"strings"
)

// gwpSets lists the GWP sets present in the loaded packs (ar4, ar5, ar6 and
// any a user pack adds), sorted.
func (e *Engine) gwpSets() []string {
	seen := map[string]bool{}
	for _, p := range e.packs.packs {
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
	for _, known := range e.gwpSets() {
		if set == known {
			return set, nil
		}
	}
	msg := "unknown GWP set " + quote(s) + ": accepted are " + strings.Join(e.gwpSets(), ", ")
	if sug := suggestFrom(set, e.gwpSets()); sug != "" {
		msg += " (did you mean " + sug + "?)"
	}
	return "", &Error{Code: CodeBadArgument, Param: "gwp_set", Msg: msg}
}

// canonicalGas folds spellings such as "CH4", "ch4-fossil", "CH4 non-fossil".
func canonicalGas(s string) string {
	g := strings.ToLower(strings.TrimSpace(s))
	g = strings.NewReplacer("-", "_", " ", "_", "₄", "4", "₂", "2").Replace(g)
	switch g {
	case "ch4_non_fossil", "ch4_biogenic":
		return "ch4_nonfossil"
	}
	return g
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
	set, err := e.resolveGWPSet(setArg)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	gas := canonicalGas(gasArg)
	allowed := a.fn.Params[0].Allowed
	known := false
	for _, g := range allowed {
		known = known || g == gas
	}
	if !known {
		msg := "unknown gas " + quote(gasArg) + ": accepted are " + strings.Join(allowed, ", ")
		if sug := suggestFrom(gas, allowed); sug != "" {
			msg += " (did you mean " + sug + "?)"
		}
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "gas", Msg: msg}
	}
	f := e.packs.lookup(CommonPack, gas, "gwp100_"+set)
	if f == nil {
		return 0, "", withFunc(e.missingGWP(set, gas), a.fn.Name)
	}
	c.use(f)
	return f.Value, "", nil
}
