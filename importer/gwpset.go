package importer

import (
	"strings"

	"github.com/fluecell/fluecell/funcs"
)

// The GWP set of an annotation: the IPCC assessment whose GWP-100 values
// weight CH4 and N2O in every call that names none (Options.GWPSet, the
// mapping's "gwp_set"), written into the rules' calls by funcs.WithGWPSet.

// gwpSetFor is the GWP set opt asks for, canonical ("ar6"): Options.GWPSet,
// else the mapping's gwp_set; "" when neither names one (each call then takes
// funcs.DefaultGWPSet). Both may be given when they agree. Errors are *Error
// of code ErrInput naming the option and the accepted sets.
func gwpSetFor(e *funcs.Engine, opt Options) (string, error) {
	set := ""
	if s := strings.TrimSpace(opt.GWPSet); s != "" {
		r, err := e.ResolveGWPSet(s)
		if err != nil {
			return "", &Error{Code: ErrInput, Msg: "GWP set (--gwp-set, gwp_set) " + quoteText(opt.GWPSet) + ": " + funcsMsg(err), Err: err}
		}
		set = r
	}
	if m := opt.Mapping; m != nil && m.gwpSet != "" {
		if set != "" && set != m.gwpSet {
			return "", &Error{Code: ErrInput, Msg: "the GWP set asked for (--gwp-set, gwp_set) is " + set + " and the mapping " + m.ref.Path +
				" says gwp_set " + m.gwpSet + ": give one of them, or make them agree"}
		}
		set = m.gwpSet
	}
	return set, nil
}

// gwpSet reads the mapping's optional "gwp_set" and checks it through the
// engine; canonical ("ar6"), or "" when absent.
func (p *mapParser) gwpSet(obj map[string]any, at string) (string, error) {
	s, err := p.optStr(obj, "gwp_set", at)
	if err != nil || strings.TrimSpace(s) == "" {
		return "", err
	}
	set, err := p.e.ResolveGWPSet(s)
	if err != nil {
		return "", p.fail(joinPath(at, "gwp_set"), "%s", funcsMsg(err))
	}
	return set, nil
}

// gwpSetOrDefault is the GWP set of the calls of this scan that name none.
func (sc *scanCtx) gwpSetOrDefault() string {
	if sc.opt.GWPSet != "" {
		return sc.opt.GWPSet
	}
	return funcs.DefaultGWPSet
}

// withGWPSet is the compile option giving the rules' calls the scan's GWP set
// (none when the options choose no set).
func (sc *scanCtx) withGWPSet() funcs.CompileOption { return funcs.WithGWPSet(sc.opt.GWPSet) }

// ruleText is a rule as shown to people: "COLUMN = EXPR", and the GWP set
// when the annotation's set was written into its calls:
// "tCO2e = fuel_co2e(fuel, quantity, unit) (GWP set ar6)".
func ruleText(column, expr string, p *funcs.Program) string {
	s := column + " = " + expr
	if set := p.GWPSet(); set != "" {
		s += " (GWP set " + set + ")"
	}
	return s
}
