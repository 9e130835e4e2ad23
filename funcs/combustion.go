package funcs

import (
	"math/big"
	"slices"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// DefaultGWPSet is the GWP-100 set used when a call names none: IPCC AR5, the
// values Parties use under the Paris Agreement transparency framework
// (UNFCCC decision 18/CMA.1, annex, para. 37; from memory).
const DefaultGWPSet = "ar5"

type planKind uint8

const (
	kindCO2 planKind = iota + 1
	kindCO2e
	kindCarbon
	kindEnergy
)

// planKey identifies a fuel computation by the strings exactly as the caller
// gave them, so that a repeated call skips parsing and path finding.
type planKey struct {
	kind                 planKind
	pack, fuel, unit, to string // to: gwp set for CO2e, target unit for energy
	sector               string // stationary sector for CO2e, mode for mobile combustion
}

// plan is a cached fuel computation: result = amount x k.
type plan struct {
	k       float64
	exact   *big.Rat // k exactly
	num     float64  // k = num / den exactly, when both are integers below 2^53;
	den     float64  // otherwise num = k and den = 1
	unit    string
	factors []*Factor
	notes   []string
	// memoK/memoDen is a blend's biogenic CO2 in t per unit amount (a fraction like num/den),
	// stated in a note built per call from memoPrefix and memoSuffix (see blendPlan);
	// memoPrefix is "" for other plans.
	memoK, memoDen         float64
	memoPrefix, memoSuffix string
	// terms is how k is built: a sum of products of factor rows (per unit amount), from
	// which the 95 % interval of a result follows (see interval.go); iv is that interval
	// per unit amount by Approach 1, computed once.
	terms []planTerm
	iv    planInterval
}

const maxCachedPlans = 8192

// runnerPlans is the number of plans a Runner keeps for itself (see planFor).
const runnerPlans = 64

// planFor is fuelPlan through the plans the call's Runner keeps for itself: the rows of a
// table ask for a few plans over and over, and a plain map of the Runner's own finds them
// without the engine's shared map.
func (e *Engine) planFor(c *callCtx, key planKey) (*plan, error) {
	if c.plans != nil {
		if p, ok := c.plans[key]; ok {
			return p, nil
		}
	}
	p, err := e.fuelPlan(key)
	if err == nil && c.plans != nil && len(c.plans) < runnerPlans {
		c.plans[key] = p
	}
	return p, err
}

// fuelPlan returns the plan for key, computing and caching it on first use.
func (e *Engine) fuelPlan(key planKey) (*plan, error) {
	if p, ok := e.plans.Load(key); ok {
		return p.(*plan), nil
	}
	p, err := e.buildPlan(key)
	if err != nil {
		return nil, err
	}
	p.k = ratFloat(p.exact)
	p.num, p.den = p.k, 1
	p.iv = newPlanInterval(p.terms)
	if p.exact != nil {
		if n, d, ok := smallFraction(p.exact); ok {
			p.num, p.den = n, d
		}
	}
	if e.planCount.Load() < maxCachedPlans {
		if _, loaded := e.plans.LoadOrStore(key, p); !loaded {
			e.planCount.Add(1)
		}
	}
	return p, nil
}

func (e *Engine) buildPlan(key planKey) (*plan, error) {
	packName, err := e.resolvePack(key.pack)
	if err != nil {
		return nil, err
	}
	m, err := e.fuels.resolve(key.fuel)
	if err != nil {
		return nil, err
	}
	fuel := m.entry.fuel
	u, err := units.ParseAs(key.unit, units.Energy, units.Mass, units.Volume)
	if err != nil {
		return nil, unitError("unit", err)
	}
	if row := m.entry.row; row != nil && len(row.dims) > 0 && !slices.Contains(row.dims, u.Dim) {
		names := make([]string, len(row.dims))
		for i, d := range row.dims {
			names[i] = d.String()
		}
		return nil, &Error{Code: CodeUnit, UnitCode: units.CodeDimension, Param: "unit", Msg: "fuel " + quote(key.fuel) + " (" + row.desc +
			") is read as " + fuel.ID + " only for amounts in " + strings.Join(names, " or ") + ", not " + u.Dim.String() + " (" + row.source + ")"}
	}
	if m.entry.kind == nameBlend {
		return e.blendPlan(key, m)
	}
	p := &plan{}
	if fuel.NonEnergy {
		p.notes = append(p.notes, nonEnergyNote(fuel))
	}
	if fuel.Family == "gas" {
		if n := units.GasVolumeNote(u); n != "" {
			p.notes = append(p.notes, n)
		}
	}
	if m.alias {
		note := "fuel " + quote(key.fuel) + " read as " + fuel.ID
		if len(m.dropped) > 0 {
			note += " (ignoring " + strings.Join(m.dropped, ", ") + ")"
		}
		p.notes = append(p.notes, note)
	}
	switch key.kind {
	case kindCO2:
		k, fs, uses, notes, err := e.emission(packName, fuel, u, "co2_ef")
		if err != nil {
			return nil, err
		}
		p.exact, p.unit = k, "t CO2"
		p.terms = []planTerm{newTerm(k, uses)}
		p.factors, p.notes = append(p.factors, fs...), append(p.notes, notes...)
		if bio := e.biogenicFraction(packName, fuel); bio.Sign() > 0 {
			p.notes = append(p.notes, biogenicNote(fuel, bio)+"; fuel_co2e leaves it out")
		}
	case kindCO2e:
		set, err := e.resolveGWPSet(key.to)
		if err != nil {
			return nil, err
		}
		sec, err := resolveSector(key.sector)
		if err != nil {
			return nil, err
		}
		ch4, n2o, note, err := e.sectorGases(packName, fuel, sec, strings.TrimSpace(key.sector) != "")
		if err != nil {
			return nil, err
		}
		if err := e.co2ePlan(p, packName, fuel, u, set, "co2_ef", ch4, n2o); err != nil {
			return nil, err
		}
		p.notes = append(p.notes, note)
	case kindMobileCO2, kindMobileCO2e:
		if err := e.mobilePlan(p, key, packName, fuel, u); err != nil {
			return nil, err
		}
	case kindCarbon:
		if err := e.carbonPlan(p, packName, fuel, u); err != nil {
			return nil, err
		}
	case kindEnergy:
		to, err := units.ParseAs(key.to, units.Energy)
		if err != nil {
			return nil, unitError("to_unit", err)
		}
		// A target without a basis is NCV, except the Btu family, which is HHV by
		// North American practice (see convertAmount).
		b := to.Basis
		if b == units.NoBasis {
			b = units.NCV
			if to.Usual != units.NoBasis {
				b = to.Usual
			}
		}
		c, err := e.convertAmount(packName, fuel, u, units.Energy, b)
		if err != nil {
			return nil, err
		}
		k := new(big.Rat).Mul(u.SI(), c.mul)
		p.exact = k.Quo(k, to.SI())
		p.unit = to.String()
		p.terms = []planTerm{newTerm(p.exact, usesOf(c.factors, c.pows))}
		p.factors, p.notes = append(p.factors, c.factors...), append(p.notes, c.notes...)
		switch {
		case to.Basis == units.NoBasis && to.Usual != units.NoBasis:
			p.notes = append(p.notes, "energy on an "+b.String()+" basis: "+usualBasisNote(to))
		case to.Basis == units.NoBasis:
			p.notes = append(p.notes, "energy on an NCV basis")
		}
	}
	if n := lentNote(packName, fuel, p.factors); n != "" {
		p.notes = append(p.notes, n)
	}
	return p, nil
}

// emission returns tonnes of the factor's species per unit amount, exactly, with
// the factor rows of the chain and how each enters the product.
func (e *Engine) emission(packName string, fuel *Fuel, u units.Unit, quantity string) (*big.Rat, []*Factor, []factorUse, []string, error) {
	ef := e.fuelRow(packName, fuel, quantity)
	if ef == nil {
		return nil, nil, nil, nil, e.missingRow(packName, fuel.ID, quantity)
	}
	c, err := e.convertAmount(packName, fuel, u, ef.denDim(), ef.Basis)
	if err != nil {
		return nil, nil, nil, nil, err
	}
	k := new(big.Rat).Mul(u.SI(), c.mul)
	k.Mul(k, ef.exact)
	k.Quo(k, big.NewRat(1000, 1)) // kg -> t
	fs := append(c.factors, ef)
	return k, fs, usesOf(fs, append(c.pows, 1)), c.notes, nil
}

// ratFloat rounds an exact value once.
func ratFloat(r *big.Rat) float64 {
	f, _ := r.Float64()
	return f
}

// missingRow is the error for a row the pack does not have, naming the packs
// that have it.
func (e *Engine) missingRow(packName, id, quantity string) error {
	msg := "pack " + packName + " has no " + quantity + " for " + id
	if others := e.packs.packsWith(id, quantity); len(others) > 0 {
		msg += "; pack " + strings.Join(others, ", ") + " has it (pass it as pack)"
	} else if !e.packs.hasID(packName, id) {
		if others := e.packs.packsWithID(id); len(others) > 0 {
			msg = "pack " + packName + " has no factors for " + id + "; pack " + strings.Join(others, ", ") + " has (pass it as pack)"
		}
	}
	return &Error{Code: CodeMissingFactor, Param: "fuel", Msg: msg}
}

// biogenicFraction is the share of the fuel's CO2 that is biogenic: its
// biogenic_fraction row, else 1 for biomass fuels and 0 for the others.
func (e *Engine) biogenicFraction(packName string, fuel *Fuel) *big.Rat {
	if f := e.fuelRow(packName, fuel, "biogenic_fraction"); f != nil {
		return f.exact
	}
	if fuel.Biogenic {
		return big.NewRat(1, 1)
	}
	return new(big.Rat)
}

// nonEnergyNote warns that the fuel is mostly used as a product, so that a
// result computed for it counts only what was in fact burned.
func nonEnergyNote(fuel *Fuel) string {
	return fuel.ID + " is mostly used as a product, not burned (IPCC 2006 Vol 3 Ch 5, non-energy products): " +
		"compute only the amount burned as fuel"
}

func biogenicNote(fuel *Fuel, bio *big.Rat) string {
	share := "all of it"
	if bio.Cmp(big.NewRat(1, 1)) < 0 {
		share = FormatNumber(ratFloat(bio)*100) + " % of it"
	}
	return "CO2 from " + fuel.ID + " is biogenic (" + share + "): report it separately as a memo item, outside the Scope 1 total"
}

// co2ePlan fills p with the CO2e of fuel: CO2, CH4 and N2O from the quantities co2, ch4 and
// n2o (co2_ef and a sector's or a mode's rows).
func (e *Engine) co2ePlan(p *plan, packName string, fuel *Fuel, u units.Unit, set, co2, ch4, n2o string) error {
	bio := e.biogenicFraction(packName, fuel)
	kCO2, fs, usesCO2, notes, err := e.emission(packName, fuel, u, co2)
	if err != nil {
		return err
	}
	p.factors, p.notes = append(p.factors, fs...), append(p.notes, notes...)
	kCH4, fs, usesCH4, notes, err := e.emission(packName, fuel, u, ch4)
	if err != nil {
		return err
	}
	p.factors, p.notes = append(p.factors, fs...), append(p.notes, notes...)
	kN2O, fs, usesN2O, notes, err := e.emission(packName, fuel, u, n2o)
	if err != nil {
		return err
	}
	p.factors, p.notes = append(p.factors, fs...), append(p.notes, notes...)

	gCH4, ch4Factors, ch4Desc, err := e.methaneGWP(packName, set, bio)
	if err != nil {
		return err
	}
	gN2O := e.packs.lookup(packName, "n2o", "gwp100_"+set)
	if gN2O == nil {
		return e.missingGWP(set, "n2o")
	}
	p.factors = append(p.factors, ch4Factors...)
	p.factors = append(p.factors, gN2O)
	fossil := new(big.Rat).Sub(big.NewRat(1, 1), bio)
	k := new(big.Rat).Mul(kCO2, fossil)
	k.Add(k, new(big.Rat).Mul(kCH4, gCH4))
	k.Add(k, new(big.Rat).Mul(kN2O, gN2O.exact))
	p.exact = k
	p.unit = "t CO2e"
	// CO2 + CH4 x GWP + N2O x GWP: a sum of products sharing the chain's conversion rows
	p.terms = append(p.terms, newTerm(new(big.Rat).Mul(kCO2, fossil), usesCO2))
	for _, g := range ch4Factors {
		w := big.NewRat(1, 1) // the weight of a GWP split by origin (AR6)
		switch {
		case len(ch4Factors) > 1 && g.ID == "ch4_fossil":
			w = fossil
		case len(ch4Factors) > 1:
			w = bio
		}
		t := new(big.Rat).Mul(kCH4, g.exact)
		p.terms = append(p.terms, newTerm(t.Mul(t, w), append(slices.Clone(usesCH4), factorUse{g, 1})))
	}
	p.terms = append(p.terms, newTerm(new(big.Rat).Mul(kN2O, gN2O.exact), append(slices.Clone(usesN2O), factorUse{gN2O, 1})))
	p.notes = append(p.notes, "CO2e with GWP-100 "+strings.ToUpper(set)+": "+ch4Desc+", N2O "+FormatNumber(gN2O.Value))
	if bio.Sign() > 0 {
		p.notes = append(p.notes, biogenicNote(fuel, bio)+"; it is excluded from this CO2e, which counts CH4 and N2O")
	}
	return nil
}

// methaneGWP is the CH4 GWP for a fuel whose CO2 is a fraction bio biogenic.
// A set that gives fossil and non-fossil CH4 separately (AR6 Table 7.15) is
// weighted by origin; otherwise its single CH4 value is used.
func (e *Engine) methaneGWP(packName, set string, bio *big.Rat) (*big.Rat, []*Factor, string, error) {
	fossil := e.packs.lookup(packName, "ch4_fossil", "gwp100_"+set)
	nonFossil := e.packs.lookup(packName, "ch4_nonfossil", "gwp100_"+set)
	if fossil != nil && nonFossil != nil {
		share := new(big.Rat).Sub(big.NewRat(1, 1), bio)
		g := new(big.Rat).Mul(fossil.exact, share)
		g.Add(g, new(big.Rat).Mul(nonFossil.exact, bio))
		switch {
		case bio.Sign() == 0:
			return g, []*Factor{fossil}, "fossil CH4 " + FormatNumber(fossil.Value), nil
		case share.Sign() == 0:
			return g, []*Factor{nonFossil}, "non-fossil CH4 " + FormatNumber(nonFossil.Value), nil
		}
		return g, []*Factor{fossil, nonFossil}, "CH4 " + FormatNumber(ratFloat(g)) + " (fossil and non-fossil by share)", nil
	}
	ch4 := e.packs.lookup(packName, "ch4", "gwp100_"+set)
	if ch4 == nil {
		return nil, nil, "", e.missingGWP(set, "ch4")
	}
	return ch4.exact, []*Factor{ch4}, "CH4 " + FormatNumber(ch4.Value), nil
}

func (e *Engine) missingGWP(set, gas string) error {
	msg := "GWP set " + set + " has no value for " + gas
	var with []string
	for _, s := range e.gwpSets() {
		if e.packs.lookup(e.defaultPack, gas, "gwp100_"+s) != nil {
			with = append(with, s)
		}
	}
	if len(with) > 0 {
		msg += "; sets with it: " + strings.Join(with, ", ")
	}
	return &Error{Code: CodeMissingFactor, Param: "gwp_set", Msg: msg}
}

func (e *Engine) carbonPlan(p *plan, packName string, fuel *Fuel, u units.Unit) error {
	if cc := e.fuelRow(packName, fuel, "carbon_content"); cc != nil {
		k, fs, uses, notes, err := e.emission(packName, fuel, u, "carbon_content")
		if err != nil {
			return err
		}
		p.exact, p.unit = k, "t C"
		p.terms = []planTerm{newTerm(k, uses)}
		p.factors, p.notes = append(p.factors, fs...), append(p.notes, notes...)
		return nil
	}
	k, fs, uses, notes, err := e.emission(packName, fuel, u, "co2_ef")
	if err != nil {
		if fe, ok := AsError(err); ok && fe.Code == CodeMissingFactor && e.fuelRow(packName, fuel, "co2_ef") == nil {
			return &Error{Code: CodeMissingFactor, Param: "fuel", Msg: "pack " + packName + " has neither carbon_content nor co2_ef for " + fuel.ID}
		}
		return err
	}
	ratio, rf, err := e.co2PerCarbon(packName)
	if err != nil {
		return err
	}
	p.exact, p.unit = k.Quo(k, ratio), "t C"
	p.terms = []planTerm{newTerm(p.exact, append(uses, factorUse{rf[0], -1}, factorUse{rf[1], 1}))}
	p.factors = append(append(p.factors, fs...), rf...)
	p.notes = append(append(p.notes, notes...), "carbon derived from the CO2 factor x 12/44 (full oxidation assumed)")
	return nil
}

// co2PerCarbon is the exact mass ratio CO2/C from the molar-mass rows (44/12).
func (e *Engine) co2PerCarbon(packName string) (*big.Rat, []*Factor, error) {
	mCO2 := e.packs.lookup(packName, "co2", "molar_mass")
	mC := e.packs.lookup(packName, "c", "molar_mass")
	if mCO2 == nil || mC == nil || mC.Value == 0 {
		return nil, nil, &Error{Code: CodeMissingFactor, Msg: "no molar_mass rows for co2 and c in pack " + packName + " or common"}
	}
	return new(big.Rat).Quo(mCO2.exact, mC.exact), []*Factor{mCO2, mC}, nil
}

func callFuel(kind planKind, toIndex int, toDefault string) func(e *Engine, c *callCtx, a argList) (float64, string, error) {
	return func(e *Engine, c *callCtx, a argList) (float64, string, error) {
		fuel, err := a.str(0)
		if err != nil {
			return 0, "", err
		}
		amount, err := a.num(1)
		if err != nil {
			return 0, "", err
		}
		unit, err := a.str(2)
		if err != nil {
			return 0, "", err
		}
		to := ""
		packIndex := 3
		if toIndex > 0 {
			if to, err = a.optStr(toIndex, toDefault); err != nil {
				return 0, "", err
			}
			packIndex = toIndex + 1
		}
		pack, err := a.optStr(packIndex, "")
		if err != nil {
			return 0, "", err
		}
		sector := ""
		if kind == kindCO2e {
			if sector, err = a.optStr(packIndex+1, ""); err != nil {
				return 0, "", err
			}
		}
		p, err := e.planFor(c, planKey{kind: kind, pack: pack, fuel: fuel, unit: unit, to: to, sector: sector})
		if err != nil {
			return 0, "", withFunc(err, a.fn.Name)
		}
		c.use(p.factors...)
		c.note(p.notes...)
		if p.memoPrefix != "" {
			c.note(p.memoNote(amount))
		}
		c.record(p, amount)
		return p.apply(amount), p.unit, nil
	}
}

// withFunc sets the function name on a funcs error.
func withFunc(err error, name string) error {
	if fe, ok := AsError(err); ok && fe.Func == "" {
		c := *fe
		c.Func = name
		return &c
	}
	return err
}

// unitError turns a units error into a funcs error for parameter param.
func unitError(param string, err error) error {
	if ue, ok := err.(*units.Error); ok {
		return &Error{Code: CodeUnit, UnitCode: ue.Code, Param: param, Msg: ue.Msg, Err: err}
	}
	return &Error{Code: CodeUnit, Param: param, Msg: err.Error(), Err: err}
}

// apply is amount x k. With k held as a fraction of two exact integers, the
// product is rounded once (1000 x 561/10000 = 56.1, not 56.099999999999994)
// whenever amount x num is exact, as it is for ordinary amounts.
func (p *plan) apply(amount float64) float64 { return amount * p.num / p.den }

// smallFraction returns r as num/den when both fit exactly in a float64.
func smallFraction(r *big.Rat) (num, den float64, ok bool) {
	const limit = 1 << 53
	n, d := r.Num(), r.Denom()
	if n.IsInt64() && d.IsInt64() {
		ni, di := n.Int64(), d.Int64()
		if ni > -limit && ni < limit && di < limit {
			return float64(ni), float64(di), true
		}
	}
	return 0, 0, false
}
