package funcs

import (
	"math/big"
	"sort"
	"strconv"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// The screening method estimates a year's refrigerant leaks from the charge of the equipment and
// an annual leak rate, when no record of top-ups exists: charge x rate x GWP. The published
// default rates are rows of quantity annual_leak_rate (data/refrigerant_leak_rates.csv).

const leakRateQuantity = "annual_leak_rate"

// fugitiveQuantities declares the quantity of the leak-rate rows.
func fugitiveQuantities() map[string]quantitySpec {
	return map[string]quantitySpec{
		leakRateQuantity: {fraction: true, doc: "operating leak rate, fraction of the charge lost per year (unit 1)"},
	}
}

// fugitiveFunctions declares the screening estimate and the default leak rates.
func fugitiveFunctions(e *Engine) []*Function {
	table79 := "IPCC 2006 Guidelines Vol 3 Ch 7 Table 7.9 (operation emission factors)"
	equipment := e.leakEquipment()
	return []*Function{
		{Name: "fugitive_co2e", Doc: "Screening estimate of a year's refrigerant leaks from equipment: charge in t x annual leak rate x GWP-100. " +
			"Operating leaks only: emissions at installation and at end of life are not included. Where top-ups are recorded, refrigerant_co2e of the mass topped up is the better estimate.",
			ResultUnit: "t CO2e/yr", Params: []Param{gasParam(e),
				paramNum("charge", "the unit given in unit", "refrigerant charge (full capacity) of the equipment"),
				{Name: "unit", Type: typeString, Unit: "unit string", Doc: "mass unit of charge (kg, lb, t...)", kind: kindMassUnit},
				paramNum("leak_rate", "fraction per yr", "share of the charge lost per year, in [0, 1]; refrigerant_leak_rate gives published defaults"),
				gwpSetParam(e, "IPCC assessment whose GWP-100 values weight the gas")},
			Example:       `fugitive_co2e("R-404A", 200, "kg", 0.35)`,
			ExampleResult: 0.2 * 0.35 * (0.44*3170 + 0.52*4800 + 0.04*1300),
			Sources:       []string{table79, "IPCC AR5 WG1 Ch 8 Table 8.A.1", "ANSI/ASHRAE Standard 34 (blend compositions)"}, call: callFugitive},
		{Name: "refrigerant_leak_rate", Doc: "Published annual leak rate of a kind of refrigeration or air-conditioning equipment, as a fraction of its charge; " +
			"high (the default) is the top of the published range, the value screening estimates use.",
			ResultUnit: "fraction per yr", Params: []Param{
				paramStr("equipment", "kind of equipment", equipment...).checked(func(e *Engine, s string) error { _, err := e.resolveEquipment(s); return err }),
				optional(paramStr("bound", "end of the published range", "low", "high"), "high").checked(func(_ *Engine, s string) error { _, err := leakBound(s); return err })},
			Example: `refrigerant_leak_rate("chillers")`, ExampleResult: 0.15, Sources: []string{table79}, call: callLeakRate},
	}
}

// leakEquipment lists the ids with a leak-rate row, sorted.
func (e *Engine) leakEquipment() []string {
	var out []string
	if c := e.packs.packs[CommonPack]; c != nil {
		for k := range c.rows {
			if k.quantity == leakRateQuantity {
				out = append(out, k.id)
			}
		}
	}
	sort.Strings(out)
	return out
}

// resolveEquipment accepts an id written with any case, spaces or hyphens ("Mobile air-conditioning").
func (e *Engine) resolveEquipment(s string) (string, error) {
	ids := e.leakEquipment()
	k := gasKey(s)
	for _, id := range ids {
		if gasKey(id) == k {
			return id, nil
		}
	}
	msg := "unknown equipment " + quote(s) + ": accepted are " + strings.Join(ids, ", ")
	if sug := suggestFrom(strings.ReplaceAll(strings.ToLower(strings.TrimSpace(s)), " ", "_"), ids); sug != "" {
		msg = "unknown equipment " + quote(s) + " (did you mean " + sug + "?): accepted are " + strings.Join(ids, ", ")
	}
	return "", &Error{Code: CodeBadArgument, Param: "equipment", Msg: msg}
}

// leakBound reads the bound argument: true for high.
func leakBound(s string) (bool, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "high", "":
		return true, nil
	case "low":
		return false, nil
	}
	return false, &Error{Code: CodeBadArgument, Param: "bound", Msg: "unknown bound " + quote(s) + ": accepted are low, high"}
}

func callLeakRate(e *Engine, c *callCtx, a argList) (float64, string, error) {
	s, err := a.str(0)
	if err != nil {
		return 0, "", err
	}
	id, err := e.resolveEquipment(s)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	bs, err := a.optStr(1, "high")
	if err != nil {
		return 0, "", err
	}
	high, err := leakBound(bs)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	f := e.packs.lookup(CommonPack, id, leakRateQuantity)
	c.use(f)
	if high {
		if f.High != nil {
			return *f.High, "", nil
		}
		return f.Value, "", nil
	}
	if f.Low == nil {
		return 0, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "bound", Msg: "no published low end for " + id}
	}
	return *f.Low, "", nil
}

func callFugitive(e *Engine, c *callCtx, a argList) (float64, string, error) {
	gasArg, err := a.str(0)
	if err != nil {
		return 0, "", err
	}
	charge, err := a.num(1)
	if err != nil {
		return 0, "", err
	}
	us, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	u, err := units.ParseAs(us, units.Mass)
	if err != nil {
		return 0, "", withFunc(unitError("unit", err), a.fn.Name)
	}
	rate, err := a.num(3)
	if err != nil {
		return 0, "", err
	}
	if rate < 0 || rate > 1 {
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "leak_rate",
			Msg: "must lie in [0, 1] (a fraction of the charge per year, 0.15 for 15 %), got " + FormatNumber(rate)}
	}
	if charge < 0 {
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "charge", Msg: "must not be negative, got " + FormatNumber(charge)}
	}
	setArg, err := a.optStr(4, "")
	if err != nil {
		return 0, "", err
	}
	g, err := e.gwpPlan(gasArg, setArg)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	c.use(g.factors...)
	c.note(g.notes...)
	c.note("screening estimate: " + FormatNumber(charge) + " " + us + " charge x " + FormatNumber(rate) + " lost per year x GWP-100 " +
		strings.ToUpper(g.set) + " " + FormatNumber(g.value) + "; operating leaks only")
	// charge and rate as the decimals they print as, so that the product is rounded once
	v := new(big.Rat).Mul(u.SI(), g.exact)
	v.Mul(v, decimalRat(charge))
	v.Mul(v, decimalRat(rate))
	v.Quo(v, big.NewRat(1000, 1))
	// the leak rate is an argument, taken as exact like the charge; the GWP rows carry the range
	if c.track {
		c.recordTerms(scaleTerms(perAmount(e.gwpTerms(g), u.SI()), ratFloat(decimalRat(rate))), nil, charge, ActivityRefrigerantCharge)
	}
	return ratFloat(v), "", nil
}

// decimalRat is v as the shortest decimal that reads back to it, exactly.
func decimalRat(v float64) *big.Rat {
	r, ok := new(big.Rat).SetString(strconv.FormatFloat(v, 'g', -1, 64))
	if !ok {
		r = new(big.Rat).SetFloat64(v)
	}
	return r
}
