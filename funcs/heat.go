package funcs

import (
	"sort"
	"strings"
)

// defaultHeatSet is the set heat_co2e uses when a call names none.
const defaultHeatSet = "epahub2025"

// heatRowIDs are the row ids that can serve a carrier, in order of
// preference: a set publishes one row for steam and hot water together (the
// EPA Hub's "Steam and Heat", the UK's "district heat and steam") or one per
// carrier (a user's rows).
func heatRowIDs(carrier string) []string {
	switch carrier {
	case "steam":
		return []string{"steam", "steam_heat", "district_heat_steam", "heat"}
	case "hot_water":
		return []string{"hot_water", "heat", "steam_heat", "district_heat_steam"}
	case "heat":
		return []string{"heat", "steam_heat", "district_heat_steam", "hot_water", "steam"}
	case "chilled_water":
		return []string{"chilled_water", "cooling"}
	}
	return nil
}

// parseCarrier folds the spellings of a carrier.
func parseCarrier(s string) (string, error) {
	switch k := gridKey(s); k {
	case "steam", "":
		return "steam", nil
	case "hot water", "hot_water", "hw":
		return "hot_water", nil
	case "heat", "district heat", "district heating", "heating":
		return "heat", nil
	case "chilled water", "cooling", "district cooling", "chw":
		return "chilled_water", nil
	}
	return "", &Error{Code: CodeBadArgument, Param: "carrier", Msg: "unknown carrier " + quote(s) + ": accepted are steam, hot_water, heat, chilled_water"}
}

func checkCarrier(_ *Engine, s string) error {
	_, err := parseCarrier(s)
	return err
}

// heatSets lists the sets with heat rows, sorted.
func (ix *gridIndex) heatSets() []string {
	out := make([]string, 0, len(ix.heat))
	for s := range ix.heat {
		out = append(out, s)
	}
	sort.Strings(out)
	return out
}

func (e *Engine) resolveHeatSet(s string) (string, error) {
	k := strings.ToLower(strings.TrimSpace(s))
	if k == "" {
		k = defaultHeatSet
	}
	if e.grids.heat[k] != nil {
		return k, nil
	}
	if e.grids.heat[s] != nil { // a user file name
		return s, nil
	}
	sets := e.grids.heatSets()
	msg := "unknown heat set " + quote(s) + ": accepted are " + strings.Join(sets, ", ")
	if sug := suggestFrom(k, sets); sug != "" {
		msg += " (did you mean " + sug + "?)"
	}
	return "", &Error{Code: CodeBadArgument, Param: "set", Msg: msg}
}

func checkHeatSet(e *Engine, s string) error {
	_, err := e.resolveHeatSet(s)
	return err
}

func callHeat(e *Engine, c *callCtx, a argList) (float64, string, error) {
	fn := a.fn.Name
	amount, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	us, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	u, err := energyAmount(fn, us)
	if err != nil {
		return 0, "", err
	}
	cs, err := a.optStr(2, "steam")
	if err != nil {
		return 0, "", err
	}
	carrier, err := parseCarrier(cs)
	if err != nil {
		return 0, "", withFunc(err, fn)
	}
	ss, err := a.optStr(3, defaultHeatSet)
	if err != nil {
		return 0, "", err
	}
	set, err := e.resolveHeatSet(ss)
	if err != nil {
		return 0, "", withFunc(err, fn)
	}
	gw, err := a.optStr(4, DefaultGWPSet)
	if err != nil {
		return 0, "", err
	}
	gset, err := e.resolveGWPSet(gw)
	if err != nil {
		return 0, "", withFunc(err, fn)
	}
	var ed *gridEdition
	var rowID string
	for _, id := range heatRowIDs(carrier) {
		if ed = e.grids.heat[set][id]; ed != nil {
			rowID = id
			break
		}
	}
	if ed == nil {
		var with []string
		for _, s := range e.grids.heatSets() {
			for _, id := range heatRowIDs(carrier) {
				if e.grids.heat[s][id] != nil {
					with = append(with, s)
					break
				}
			}
		}
		msg := "set " + set + " has no factor for " + carrier
		if len(with) > 0 {
			msg += "; sets with one: " + strings.Join(with, ", ")
		} else {
			msg += "; no loaded set publishes one: load your own row (id " + carrier + ", quantity heat_co2e, e.g. kg CO2e/kWh) with --factors"
		}
		return 0, "", &Error{Code: CodeMissingFactor, Func: fn, Param: "carrier", Msg: msg}
	}
	r, err := e.co2eRate(ed, "heat", gset)
	if err != nil {
		return 0, "", withFunc(err, fn)
	}
	c.use(r.factors...)
	desc := "purchased " + strings.ReplaceAll(carrier, "_", " ") + ": " + e.grids.titles[ed.set] + ", row " + rowID
	if ed.year != 0 {
		desc += " (" + ed.yearText() + ")"
	}
	c.note(desc)
	if eff := ed.rows["boiler_efficiency"]; eff != nil {
		c.use(eff)
		c.note("assumption of the factor: " + eff.Source + "; boiler efficiency " + FormatNumber(eff.Value*100) + " %")
	} else {
		c.note("assumption of the factor: as its publication states it (" + firstSource(r.factors) + "); no boiler efficiency is given apart")
	}
	c.note(r.notes...)
	if c.track {
		c.recordTerms(perAmount(r.terms, u.SI()), nil, amount, ActivityHeat)
	}
	return r.tonnes(amount, u), "t CO2e", nil
}

func firstSource(fs []*Factor) string {
	for _, f := range fs {
		if f != nil {
			return f.Source
		}
	}
	return ""
}
