package funcs

import (
	"math/big"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// refrigerantFunctions declares the functions for fugitive fluorinated gases: the CO2e of a
// leaked or topped-up refrigerant mass.
func refrigerantFunctions(e *Engine) []*Function {
	gwpTables := []string{"IPCC AR4 WG1 Ch 2 Table 2.14", "IPCC AR5 WG1 Ch 8 Table 8.A.1", "IPCC AR6 WG1 Ch 7 Table 7.SM.7"}
	return []*Function{
		{Name: "refrigerant_co2e", Doc: "CO2e of a mass of refrigerant or other fugitive gas released: mass in t x GWP-100. " +
			"A top-up that replaces leaked refrigerant counts as the mass leaked. A blend's GWP is the mass-weighted sum of its components'; " +
			"the notes give its composition and the sum.",
			ResultUnit: "t CO2e", Params: []Param{gasParam(e),
				paramNum("mass", "the unit given in unit", "mass of gas released (leaked, or topped up to replace a leak)"),
				{Name: "unit", Type: typeString, Unit: "unit string", Doc: "mass unit of mass (kg, g, lb, oz, t...)", kind: kindMassUnit},
				gwpSetParam(e, "IPCC assessment whose GWP-100 values weight the gas")},
			Example: `refrigerant_co2e("R-404A", 10, "kg")`, ExampleResult: 10.0 / 1000 * (0.44*3170 + 0.52*4800 + 0.04*1300),
			Sources: append(gwpTables, "ANSI/ASHRAE Standard 34 (blend compositions)"), call: callRefrigerant},
	}
}

// gasParam is the gas parameter of gwp and refrigerant_co2e. Its vocabulary is open (spellings,
// user packs), so it is checked by resolving the name rather than listed as allowed values; the
// doc names the known gases and blends.
func gasParam(e *Engine) Param {
	var pure, blends []string
	for _, g := range e.gases.ordered {
		if g.parts != nil {
			blends = append(blends, g.info.Name)
		} else {
			pure = append(pure, g.info.Name)
		}
	}
	doc := "gas or refrigerant as records write it; case, spaces and hyphens are ignored (R-410A = R410a) and a bare number is an " +
		"ASHRAE refrigerant number (134a = R-134a). Gases: " + strings.Join(pure, ", ") +
		" (and their R- numbers, chemical names and ids). Blends: " + strings.Join(blends, ", ")
	return paramStr("gas", doc).checked(checkGas)
}

// gwpSetParam is the optional gwp_set parameter.
func gwpSetParam(e *Engine, doc string) Param {
	return optional(paramStr("gwp_set", doc, e.gwpSets()...), DefaultGWPSet).with(kindGWPSet)
}

// refrigerantKey identifies a refrigerant_co2e computation by its string arguments as given.
type refrigerantKey struct{ gas, unit, set string }

// refrigerantPlan is a cached refrigerant_co2e computation: result = mass x num / den t CO2e.
type refrigerantPlan struct {
	gwp      *gwpPlan
	num, den float64 // num/den exactly when both are integers below 2^53; else num = k, den = 1
	notes    []string
	terms    []planTerm   // t CO2e per unit of mass, from the GWP rows (interval_record.go)
	iv       planInterval // the 95 % interval per unit of mass, computed once
}

func (e *Engine) refrigerantPlan(gasArg, unitArg, setArg string) (*refrigerantPlan, error) {
	key := refrigerantKey{gasArg, unitArg, setArg}
	if p, ok := e.plans.Load(key); ok {
		return p.(*refrigerantPlan), nil
	}
	u, err := units.ParseAs(unitArg, units.Mass)
	if err != nil {
		return nil, unitError("unit", err)
	}
	g, err := e.gwpPlan(gasArg, setArg)
	if err != nil {
		return nil, err
	}
	// t CO2e per unit of mass = (kg per unit / 1000) x GWP, exactly; rounded once with the mass
	k := new(big.Rat).Mul(u.SI(), g.exact)
	k.Quo(k, big.NewRat(1000, 1))
	p := &refrigerantPlan{gwp: g, notes: g.notes, terms: perAmount(e.gwpTerms(g), u.SI())}
	p.iv = newPlanInterval(p.terms)
	if num, den, ok := smallFraction(k); ok {
		p.num, p.den = num, den
	} else {
		p.num, p.den = ratFloat(k), 1
	}
	if g.gas.parts == nil {
		p.notes = append(append([]string(nil), g.notes...), "CO2e with GWP-100 "+strings.ToUpper(g.set)+" of "+g.gas.info.Name+": "+FormatNumber(g.value))
	}
	e.cachePlan(key, p)
	return p, nil
}

func callRefrigerant(e *Engine, c *callCtx, a argList) (float64, string, error) {
	gasArg, err := a.str(0)
	if err != nil {
		return 0, "", err
	}
	mass, err := a.num(1)
	if err != nil {
		return 0, "", err
	}
	us, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	setArg, err := a.optStr(3, "")
	if err != nil {
		return 0, "", err
	}
	p, err := e.refrigerantPlan(gasArg, us, setArg)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	c.use(p.gwp.factors...)
	c.note(p.notes...)
	if mass < 0 {
		c.note("negative mass: the result is negative, as for a correction or recovered gas")
	}
	c.recordTerms(p.terms, &p.iv, mass, ActivityRefrigerantTopUp)
	return mass * p.num / p.den, "", nil
}
