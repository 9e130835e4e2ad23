package funcs

import (
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Scope 2 methods (GHG Protocol Scope 2 Guidance, 2015).
const (
	MethodLocation = "location"
	MethodMarket   = "market"
)

// gridFunctions declares the Scope 2 electricity and purchased-heat functions.
func gridFunctions(e *Engine) []*Function {
	amount := paramNum("amount", "the unit given in unit", "energy delivered (electricity consumed, heat purchased)")
	unit := Param{Name: "unit", Type: typeString, Unit: "unit string", Doc: "energy unit of amount (kWh, MWh, GWh, GJ, MMBtu...)", kind: kindEnergyUnit}
	grid := paramStr("grid", "grid id or name: us, us_camx (eGRID subregion), eu27, de, fr, pl (EU member states), gb, \"Germany\", \"eGRID SRVC\", or the id of a user's supplier or residual-mix row (fluecell grids lists them)").checked(checkGrid)
	method := optional(paramStr("method", "Scope 2 method: location (grid average) or market (supplier or residual-mix row)", MethodLocation, MethodMarket), MethodLocation).checked(checkMethod)
	year := optional(paramNum("year", "yr", "data year of the grid factor; 0 means the latest loaded"), "latest loaded for the grid").omittedAs("0")
	gwpSet := optional(paramStr("gwp_set", "IPCC assessment whose GWP-100 values weight CH4 and N2O", e.gwpSets()...), DefaultGWPSet).with(kindGWPSet)
	carrier := optional(paramStr("carrier", "what was purchased", "steam", "hot_water", "heat", "chilled_water"), "steam").checked(checkCarrier)
	set := optional(paramStr("set", "set of published heat factors", e.grids.heatSets()...), defaultHeatSet).checked(checkHeatSet)
	scope2 := []string{"US EPA eGRID2022, CO2 total output emission rates by subregion",
		"European Environment Agency, CO2 and GHG emission intensity of electricity generation", "UK Government GHG Conversion Factors for Company Reporting 2023",
		"GHG Protocol Scope 2 Guidance (2015)"}
	return []*Function{
		{Name: "electricity_co2e", Doc: "Scope 2 CO2e of electricity consumed: amount x the grid's rate (CO2, plus CH4 and N2O x GWP where the source gives them). Location-based by default; market-based takes a supplier or residual-mix row.",
			ResultUnit: "t CO2e", Params: []Param{amount, unit, grid, method, year, gwpSet},
			Example: `electricity_co2e(1000, "MWh", "gb", "location", 2023)`, ExampleResult: 207.07,
			Sources: scope2, call: callElectricity(true)},
		{Name: "electricity_co2", Doc: "Scope 2 CO2 of electricity consumed: amount x the grid's CO2 rate.",
			ResultUnit: "t CO2", Params: []Param{amount, unit, grid, method, year},
			Example: `electricity_co2(1000, "MWh", "us_camx")`, ExampleResult: 497.443 * 0.45359237, Sources: scope2, call: callElectricity(false)},
		{Name: "electricity_losses_co2e", Doc: "CO2e of the transmission and distribution losses attributable to electricity consumed (reported apart from Scope 2, as Scope 3 category 3): the source's T&D factor, or consumption x loss/(1 - loss) x the grid's rate.",
			ResultUnit: "t CO2e", Params: []Param{amount, unit, grid, year, gwpSet},
			Example: `electricity_losses_co2e(1000, "MWh", "gb", 2023)`, ExampleResult: 17.92, Sources: scope2, call: callLosses},
		{Name: "heat_co2e", Doc: "Scope 2 CO2e of purchased steam, hot water or cooling from a published default, whose assumption (boiler fuel and efficiency) is named in the notes.",
			ResultUnit: "t CO2e", Params: []Param{amount, unit, carrier, set, gwpSet},
			Example: `heat_co2e(1000, "MMBtu")`, ExampleResult: 66.33 + 1.25*28/1000 + 0.125*265/1000,
			Sources: []string{"US EPA GHG Emission Factors Hub (2025) Table 7 Steam and Heat", "UK Government GHG Conversion Factors for Company Reporting 2023, Heat and steam"}, call: callHeat},
	}
}

// checkMethod accepts location and market, in any case.
func checkMethod(_ *Engine, s string) error {
	_, err := parseMethod(s)
	return err
}

func parseMethod(s string) (string, error) {
	switch m := strings.ToLower(strings.TrimSpace(s)); m {
	case MethodLocation, "location-based", "location based", "":
		return MethodLocation, nil
	case MethodMarket, "market-based", "market based":
		return MethodMarket, nil
	}
	return "", &Error{Code: CodeBadArgument, Param: "method", Msg: "unknown method " + quote(s) + ": accepted are location, market"}
}

// energyAmount parses the unit of a delivered-energy amount: energy without a
// heating-value basis.
func energyAmount(fn, s string) (units.Unit, error) {
	u, err := units.ParseAs(s, units.Energy)
	if err != nil {
		return units.Unit{}, withFunc(unitError("unit", err), fn)
	}
	if u.Basis != units.NoBasis {
		return units.Unit{}, &Error{Code: CodeUnit, UnitCode: units.CodeBasis, Func: fn, Param: "unit",
			Msg: "delivered energy has no heating-value basis: write " + quote(u.Symbol) + " without " + u.Basis.String()}
	}
	return u, nil
}

// optYear reads the year argument: 0 when left out or 0 (the latest), else a whole year.
func optYear(a argList, i int) (int, error) {
	v, given, err := a.optNum(i)
	if err != nil || !given || v == 0 {
		return 0, err
	}
	if v != math.Trunc(v) || v < 1900 || v > 2200 {
		return 0, &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "year", Msg: "year must be a whole year such as 2024 (or 0 for the latest), got " + FormatNumber(v)}
	}
	return int(v), nil
}

// pickEdition chooses the edition of grid g for the year (0: the latest) among
// those for which ok holds. what names the data for the error.
func (e *Engine) pickEdition(fn string, g *gridEntry, year int, ok func(*gridEdition) bool, what string) (*gridEdition, []string, error) {
	var cands []*gridEdition
	var years []string
	for _, ed := range g.editions {
		if ok(ed) {
			cands = append(cands, ed)
			if !slices.Contains(years, ed.yearText()) {
				years = append(years, ed.yearText())
			}
		}
	}
	if len(cands) == 0 {
		return nil, nil, &Error{Code: CodeMissingFactor, Func: fn, Param: "grid", Msg: "grid " + g.id + " (" + g.name + ") has no " + what + e.gridsWith(ok)}
	}
	if year == 0 {
		if newest := g.editions[0]; newest.year > cands[0].year {
			return cands[0], []string{"the " + newest.yearText() + " set (" + newest.set + ") gives no " + what + " for " + g.id +
				"; the latest that does is " + cands[0].yearText()}, nil
		}
		return cands[0], nil, nil
	}
	for _, ed := range cands {
		if ed.year == year {
			return ed, nil, nil
		}
	}
	for _, ed := range cands {
		if ed.year == 0 {
			return ed, []string{"the factor of " + g.id + " (" + ed.set + ") states no year; it is used for " + strconv.Itoa(year)}, nil
		}
	}
	return nil, nil, &Error{Code: CodeMissingFactor, Func: fn, Param: "year", Msg: "grid " + g.id + " has no " + what + " for " + strconv.Itoa(year) +
		": available years are " + strings.Join(years, ", ")}
}

// gridsWith lists the grids with an edition for which ok holds.
func (e *Engine) gridsWith(ok func(*gridEdition) bool) string {
	var ids []string
	for _, id := range e.grids.ids {
		for _, ed := range e.grids.grids[id].editions {
			if ok(ed) {
				ids = append(ids, id)
				break
			}
		}
	}
	if len(ids) == 0 {
		return ""
	}
	if len(ids) > 12 {
		ids = append(ids[:12], "...")
	}
	return "; grids with it: " + strings.Join(ids, ", ")
}

// rate is an exact emission rate in kg of a species per joule delivered, with
// the rows and notes behind it.
type rate struct {
	k       *big.Rat
	factors []*Factor
	notes   []string
	terms   []planTerm // how k is built from the rows, in kg per joule (interval_record.go)
}

// tonnes is amount (in unit u) x rate, in tonnes.
func (r rate) tonnes(amount float64, u units.Unit) float64 {
	k := new(big.Rat).Mul(u.SI(), r.k)
	k.Quo(k, big.NewRat(1000, 1))
	if num, den, ok := smallFraction(k); ok {
		return amount * num / den // rounded once, as plan.apply
	}
	return amount * ratFloat(k)
}

// co2Rate is the stream's CO2 rate (stream: grid, market, td or heat).
func co2Rate(ed *gridEdition, stream string) (rate, bool) {
	f := ed.rows[stream+"_co2"]
	if f == nil {
		return rate{}, false
	}
	return rate{k: f.exact, factors: []*Factor{f}, terms: []planTerm{rateTerm(f)}}, true
}

// gasMass is the rate of CH4 or N2O in kg of the gas per joule: its mass row,
// or its CO2e row divided by the GWP the set states it with.
func gasMass(ed *gridEdition, stream, gas string) (*big.Rat, []*Factor, bool) {
	if f := ed.rows[stream+"_"+gas]; f != nil {
		return f.exact, []*Factor{f}, true
	}
	f, g := ed.rows[stream+"_"+gas+"_co2e"], ed.gwp[gas]
	if f == nil || g == nil || g.Value == 0 {
		return nil, nil, false
	}
	return new(big.Rat).Quo(f.exact, g.exact), []*Factor{f, g}, true
}

// gasTerm is a gas's mass rate (its row, or its CO2e row / the source's GWP) times the GWP g.
func gasTerm(mass *big.Rat, fs []*Factor, g *Factor) planTerm {
	uses := []factorUse{{fs[0], 1}}
	if len(fs) > 1 {
		uses = append(uses, factorUse{fs[1], -1})
	}
	return newTerm(new(big.Rat).Mul(mass, g.exact), append(uses, factorUse{g, 1}))
}

// co2eRate is the stream's CO2e rate for a GWP set. With CO2, CH4 and N2O
// given, the gases are weighted by the set, unless the source's own total
// already uses that set; a source that states only a total is used as stated,
// and one that states only CO2 gives CO2 with a note.
func (e *Engine) co2eRate(ed *gridEdition, stream, set string) (rate, error) {
	gCH4 := e.packs.lookup(CommonPack, "ch4", "gwp100_"+set)
	gN2O := e.packs.lookup(CommonPack, "n2o", "gwp100_"+set)
	if gCH4 == nil || gN2O == nil {
		return rate{}, e.missingGWP(set, "ch4 and n2o")
	}
	total := ed.rows[stream+"_co2e"]
	co2, hasCO2 := co2Rate(ed, stream)
	ch4, ch4F, hasCH4 := gasMass(ed, stream, "ch4")
	n2o, n2oF, hasN2O := gasMass(ed, stream, "n2o")
	split := hasCO2 && hasCH4 && hasN2O
	sameSet := ed.gwp["ch4"] != nil && ed.gwp["n2o"] != nil && ed.gwp["ch4"].exact.Cmp(gCH4.exact) == 0 && ed.gwp["n2o"].exact.Cmp(gN2O.exact) == 0
	setName := "GWP-100 " + strings.ToUpper(set) + ": CH4 " + FormatNumber(gCH4.Value) + ", N2O " + FormatNumber(gN2O.Value)
	switch {
	case total != nil && (!split || sameSet):
		r := rate{k: total.exact, factors: []*Factor{total}, terms: []planTerm{rateTerm(total)}}
		if split {
			r.factors = append(r.factors, ed.gwp["ch4"], ed.gwp["n2o"])
			r.notes = append(r.notes, "CO2e as the source totals it, with "+setName)
		} else {
			r.notes = append(r.notes, "CO2e as the source states it (CO2, CH4 and N2O not given apart, so gwp_set cannot reweight them)")
		}
		return r, nil
	case split:
		k := new(big.Rat).Set(co2.k)
		k.Add(k, new(big.Rat).Mul(ch4, gCH4.exact))
		k.Add(k, new(big.Rat).Mul(n2o, gN2O.exact))
		r := rate{k: k, factors: append(append(append(co2.factors, ch4F...), n2oF...), gCH4, gN2O),
			terms: append(co2.terms, gasTerm(ch4, ch4F, gCH4), gasTerm(n2o, n2oF, gN2O))}
		r.notes = append(r.notes, "CO2e = CO2 + CH4 x "+FormatNumber(gCH4.Value)+" + N2O x "+FormatNumber(gN2O.Value)+" ("+setName+")")
		if ed.rows[stream+"_ch4"] == nil && ed.gwp["ch4"] != nil {
			r.notes = append(r.notes, "the source states CH4 and N2O as CO2e with GWP-100 CH4 "+FormatNumber(ed.gwp["ch4"].Value)+", N2O "+FormatNumber(ed.gwp["n2o"].Value)+"; they are converted back to mass and reweighted")
		}
		return r, nil
	case hasCO2:
		co2.notes = append(co2.notes, "the source gives CO2 only: CH4 and N2O are not included")
		return co2, nil
	}
	return rate{}, &Error{Code: CodeMissingFactor, Param: "grid", Msg: "set " + ed.set + " has no " + stream + "_co2e or " + stream + "_co2 row"}
}

// describeEdition is the note naming the grid, method, year and source.
func (e *Engine) describeEdition(g *gridEntry, ed *gridEdition, method string) string {
	return "grid " + g.id + " (" + g.name + "), " + method + "-based, data year " + ed.yearText() + ": " + e.grids.titles[ed.set]
}

func callElectricity(withCO2e bool) func(e *Engine, c *callCtx, a argList) (float64, string, error) {
	return func(e *Engine, c *callCtx, a argList) (float64, string, error) {
		amount, err := a.num(0)
		if err != nil {
			return 0, "", err
		}
		var key electricityKey
		key.fn, key.co2e = a.fn.Name, withCO2e
		if key.unit, err = a.str(1); err != nil {
			return 0, "", err
		}
		if key.grid, err = a.str(2); err != nil {
			return 0, "", err
		}
		if key.method, err = a.optStr(3, MethodLocation); err != nil {
			return 0, "", err
		}
		if key.year, err = optYear(a, 4); err != nil {
			return 0, "", err
		}
		if withCO2e {
			if key.gwp, err = a.optStr(5, DefaultGWPSet); err != nil {
				return 0, "", err
			}
		}
		p, err := e.electricityPlan(key)
		if err != nil {
			return 0, "", err
		}
		c.use(p.factors...)
		c.note(p.notes...)
		c.recordTerms(p.terms, &p.iv, amount, ActivityElectricity)
		return amount * p.num / p.den, p.unit, nil
	}
}

// electricityKey identifies an electricity_co2(e) computation by its
// arguments other than the amount, as given.
type electricityKey struct {
	fn, unit, grid, method, gwp string
	year                        int
	co2e                        bool
}

// electricityPlan is a cached electricity computation: result = amount x
// num / den in unit (num/den exactly when both are integers below 2^53).
type electricityPlan struct {
	num, den float64
	unit     string
	factors  []*Factor
	notes    []string
	terms    []planTerm   // t per unit amount, from the rows (interval_record.go)
	iv       planInterval // the 95 % interval per unit amount, computed once
}

// electricityPlan resolves the grid, method, edition and rate of a call once
// per distinct set of arguments; rows of a workbook then cost one lookup.
func (e *Engine) electricityPlan(key electricityKey) (*electricityPlan, error) {
	if p, ok := e.plans.Load(key); ok {
		return p.(*electricityPlan), nil
	}
	fn, withCO2e := key.fn, key.co2e
	u, err := energyAmount(fn, key.unit)
	if err != nil {
		return nil, err
	}
	id, ok := e.grids.resolve(key.grid)
	if !ok {
		return nil, withFunc(e.unknownGrid(key.grid), fn)
	}
	g := e.grids.grids[id]
	method, err := parseMethod(key.method)
	if err != nil {
		return nil, withFunc(err, fn)
	}
	set := ""
	if withCO2e {
		if set, err = e.resolveGWPSet(key.gwp); err != nil {
			return nil, withFunc(err, fn)
		}
	}
	var pre []string
	if gridKey(key.grid) != strings.ReplaceAll(id, "_", " ") {
		pre = append(pre, "grid "+quote(key.grid)+" read as "+id)
	}
	stream := "grid"
	what := "location-based factor"
	if method == MethodMarket {
		if g.has(func(ed *gridEdition) bool { return ed.has("market") }) {
			stream, what = "market", "market-based factor (supplier or residual mix)"
		} else if g.has(func(ed *gridEdition) bool { return ed.has("grid") }) {
			pre = append(pre, "no market-based factor (a supplier or residual-mix row, quantity market_co2e or market_co2) is loaded for "+id+
				": the location-based grid average is used, the last step of the market-based hierarchy of the GHG Protocol Scope 2 Guidance (2015)")
			method = MethodLocation
		}
	} else if !g.has(func(ed *gridEdition) bool { return ed.has("grid") }) && g.has(func(ed *gridEdition) bool { return ed.has("market") }) {
		return nil, &Error{Code: CodeBadArgument, Func: fn, Param: "method", Msg: "grid " + id + " has market-based rows only (a supplier or residual mix): pass method \"market\""}
	}
	need := func(ed *gridEdition) bool { return ed.has(stream) }
	if !withCO2e {
		what = strings.Replace(what, "factor", "CO2 factor", 1)
		need = func(ed *gridEdition) bool { return ed.rows[stream+"_co2"] != nil }
	}
	ed, notes, err := e.pickEdition(fn, g, key.year, need, what)
	if err != nil {
		if !withCO2e && key.year == 0 && g.has(func(ed *gridEdition) bool { return ed.has(stream) }) {
			return nil, &Error{Code: CodeMissingFactor, Func: fn, Param: "grid", Msg: "grid " + id + " (" + g.name + ") has a CO2e rate only, no CO2 rate: use electricity_co2e"}
		}
		return nil, err
	}
	var r rate
	p := &electricityPlan{unit: "t CO2"}
	if withCO2e {
		if r, err = e.co2eRate(ed, stream, set); err != nil {
			return nil, withFunc(err, fn)
		}
		p.unit = "t CO2e"
	} else {
		r, _ = co2Rate(ed, stream)
	}
	p.factors = r.factors
	p.terms = perAmount(r.terms, u.SI())
	p.iv = newPlanInterval(p.terms)
	p.notes = append(append(append(pre, e.describeEdition(g, ed, method)), notes...), r.notes...)
	k := new(big.Rat).Mul(u.SI(), r.k)
	k.Quo(k, big.NewRat(1000, 1))
	if num, den, ok := smallFraction(k); ok {
		p.num, p.den = num, den // rounded once with the amount, as plan.apply
	} else {
		p.num, p.den = ratFloat(k), 1
	}
	e.cachePlan(key, p)
	return p, nil
}

// has reports whether any edition satisfies ok.
func (g *gridEntry) has(ok func(*gridEdition) bool) bool {
	for _, ed := range g.editions {
		if ok(ed) {
			return true
		}
	}
	return false
}

func callLosses(e *Engine, c *callCtx, a argList) (float64, string, error) {
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
	gs, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	id, ok := e.grids.resolve(gs)
	if !ok {
		return 0, "", withFunc(e.unknownGrid(gs), fn)
	}
	g := e.grids.grids[id]
	year, err := optYear(a, 3)
	if err != nil {
		return 0, "", err
	}
	gw, err := a.optStr(4, DefaultGWPSet)
	if err != nil {
		return 0, "", err
	}
	set, err := e.resolveGWPSet(gw)
	if err != nil {
		return 0, "", withFunc(err, fn)
	}
	need := func(ed *gridEdition) bool {
		return ed.has("td") || (ed.rows["grid_loss_rate"] != nil && ed.has("grid"))
	}
	ed, notes, err := e.pickEdition(fn, g, year, need, "transmission and distribution loss data")
	if err != nil {
		return 0, "", err
	}
	var r rate
	if ed.has("td") {
		if r, err = e.co2eRate(ed, "td", set); err != nil {
			return 0, "", withFunc(err, fn)
		}
	} else {
		gen, err := e.co2eRate(ed, "grid", set)
		if err != nil {
			return 0, "", withFunc(err, fn)
		}
		loss := ed.rows["grid_loss_rate"]
		if loss.Value >= 1 {
			return 0, "", &Error{Code: CodeArithmetic, Func: fn, Param: "grid", Msg: "grid_loss_rate of " + id + " must be below 1"}
		}
		share := new(big.Rat).Quo(loss.exact, new(big.Rat).Sub(big.NewRat(1, 1), loss.exact))
		r = rate{k: new(big.Rat).Mul(gen.k, share), factors: append(gen.factors, loss), notes: gen.notes, terms: scaleTerms(gen.terms, ratFloat(share))}
		r.notes = append(r.notes, "losses = consumption x "+FormatNumber(loss.Value)+" / (1 - "+FormatNumber(loss.Value)+
			") x the grid's generation rate (electricity lost per unit delivered; common practice)")
	}
	c.use(r.factors...)
	c.note(e.describeEdition(g, ed, MethodLocation))
	c.note(notes...)
	c.note(r.notes...)
	c.note("transmission and distribution losses are reported apart from Scope 2 (Scope 3 category 3) by a consumer")
	if c.track {
		c.recordTerms(perAmount(r.terms, u.SI()), nil, amount, ActivityElectricity)
	}
	return r.tonnes(amount, u), "t CO2e", nil
}
