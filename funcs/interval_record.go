package funcs

import (
	"math/big"
	"strings"

	"github.com/fluecell/fluecell/funcs/uncertainty"
)

// Kinds of record an amount comes from: each has a default activity-data
// uncertainty in data/activity_uncertainty_table.csv (see activityinterval.go).
// A function records the kind of its amount with its terms, so that a
// workbook total can add the uncertainty of the records to that of the factors.
const (
	ActivityStationaryFuel    = "stationary_fuel"     // fuel bought or metered for boilers, furnaces, generators
	ActivityMobileFuel        = "mobile_fuel"         // fuel bought for vehicles and machinery
	ActivityDistance          = "distance"            // distance driven, from odometers or trip logs
	ActivityElectricity       = "electricity_metered" // electricity from utility meters or bills
	ActivityHeat              = "heat"                // purchased steam, hot water or cooling
	ActivityRefrigerantTopUp  = "refrigerant_topup"   // refrigerant mass topped up (service records)
	ActivityRefrigerantCharge = "refrigerant_charge"  // nameplate charge of equipment (screening estimate)
	ActivityBuildPlan         = "build_plan"          // capacity, floor area or count of a build plan
)

// recordTerms keeps a call whose result is amount x the terms (per unit amount), when the run
// tracks intervals; iv is the plan's own interval per unit amount, or nil when the terms are
// built per call.
func (c *callCtx) recordTerms(ts []planTerm, iv *planInterval, amount float64, activity string) {
	if c.track && len(ts) > 0 {
		c.contribs = append(c.contribs, contrib{amount: amount, sign: 1, terms: ts, iv: iv, activity: activity})
	}
}

// recordWhy keeps a call that has no interval, with the reason, when the run tracks intervals.
func (c *callCtx) recordWhy(why string) {
	if c.track {
		c.contribs = append(c.contribs, contrib{sign: 1, why: why})
	}
}

// modelFactor is f as an uncertain quantity: with its published range when the row has one
// that a 95 % interval can be read from (positive, holding the value). A range with a low of 0
// is the bound of a value printed as "<1" (gwp100.csv) or a range down to nothing: it gives no
// interval here, and the row is listed as one without a usable range.
func modelFactor(f *Factor) (uncertainty.Factor, bool) {
	u := uncertainty.Factor{Name: f.Key(), Value: f.Value}
	if f.Low == nil || f.High == nil || !(*f.Low > 0) || !(f.Value > 0) || *f.Low > f.Value || *f.High < f.Value {
		return u, false
	}
	u.Low, u.High, u.HasRange = *f.Low, *f.High, true
	return u, true
}

// rateTerms are the terms of a row of a grid or heat set in kg per joule: the row alone.
func rateTerm(f *Factor) planTerm {
	return newTerm(f.exact, []factorUse{{f, 1}})
}

// perAmount scales terms in kg per joule to tonnes per unit of u's SI factor si.
func perAmount(ts []planTerm, si *big.Rat) []planTerm {
	k := new(big.Rat).Quo(si, big.NewRat(1000, 1))
	return scaleTerms(ts, ratFloat(k))
}

// gwpTerms are the terms of a gas's GWP-100: its own row, or for a blend the mass fraction of
// each component times the component's row.
func (e *Engine) gwpTerms(p *gwpPlan) []planTerm {
	if f := e.packs.lookup(CommonPack, p.gas.info.ID, "gwp100_"+p.set); f != nil {
		return []planTerm{newTerm(f.exact, []factorUse{{f, 1}})}
	}
	var ts []planTerm
	for _, part := range p.gas.parts {
		f := e.packs.lookup(CommonPack, part.gas.info.ID, "gwp100_"+p.set)
		if f == nil {
			continue
		}
		ts = append(ts, newTerm(new(big.Rat).Mul(part.frac, f.exact), []factorUse{{f, 1}}))
	}
	return ts
}

// statWhy is the reason a result computed at a statistic other than the median has no interval.
func statWhy(stat string) string {
	if s := strings.ToLower(strings.TrimSpace(stat)); s != "" && s != "median" {
		return "stat " + s + " is itself an end of the published range"
	}
	return ""
}

// recordEmbodied keeps an embodied_per_mw or embodied call: perMW t CO2e per MW, the product
// of the rows uses, on mw MW. The intensity's published range is the minimum and maximum of
// the studies IPCC AR5 WG3 Annex III Table A.III.2 reviewed, taken as the 95 % range.
func (c *callCtx) recordEmbodied(perMW float64, uses []factorUse, stat string, mw float64) {
	if why := statWhy(stat); why != "" {
		c.recordWhy(why)
		return
	}
	if c.track {
		c.note("the range of the intensity is the minimum and maximum of the studies IPCC AR5 WG3 Annex III reviewed, taken here as a 95 % range")
	}
	c.recordTerms([]planTerm{{perUnit: perMW, uses: uses}}, nil, mw, ActivityBuildPlan)
}

// recordBuild keeps a call of building_embodied, vehicle_embodied or battery_embodied: the
// terms per unit amount (t CO2e per m2, per vehicle or per unit of capacity) on amount, when
// the run tracks intervals and the statistic is the median.
func (c *callCtx) recordBuild(ts []planTerm, stat string, amount float64) {
	if !c.track {
		return
	}
	if why := statWhy(stat); why != "" {
		c.recordWhy(why)
		return
	}
	c.recordTerms(ts, nil, amount, ActivityBuildPlan)
}
