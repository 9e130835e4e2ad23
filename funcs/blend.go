package funcs

import (
	"math/big"

	"github.com/fluecell/fluecell/funcs/units"
)

// A blend (E10, E85, B20: data/fuel_names.csv) is a fossil base fuel with a nominal fossil
// share by volume, the rest a biofuel. The fossil part is the base fuel's computation on
// share x amount; the biogenic part the biofuel's on (1 - share) x amount:
//
//   - fuel_co2 is the fossil CO2 only; the biofuel's CO2 is a memo item, stated in a note
//     with its amount (IPCC 2006 Vol 2 Ch 2 section 2.3.3.4: CO2 from biomass is reported as
//     an information item, outside the energy total);
//   - fuel_co2e is the fossil part's CO2e plus the biofuel part's CH4 and N2O;
//   - fuel_carbon is the fossil carbon only;
//   - fuel_energy is the energy of both parts.
//
// The share is by volume; for an amount in energy or mass it is applied as an approximation,
// and a note says so.

// blendPlan builds the plan of key for the blend m.
func (e *Engine) blendPlan(key planKey, m fuelMatch) (*plan, error) {
	row := m.entry.row
	baseKey, bioKey := key, key
	baseKey.fuel, bioKey.fuel = m.entry.fuel.ID, row.bioID
	base, err := e.fuelPlan(baseKey)
	if err != nil {
		return nil, err
	}
	share := row.share
	rest := new(big.Rat).Sub(big.NewRat(1, 1), share)
	pct := func(r *big.Rat) string { return FormatNumber(ratFloat(r) * 100) }
	p := &plan{unit: base.unit, exact: new(big.Rat).Mul(share, base.exact), terms: scaleTerms(base.terms, ratFloat(share))}
	p.notes = append(p.notes, "fuel "+quote(key.fuel)+" read as a blend: "+pct(share)+" % "+m.entry.fuel.ID+
		" (fossil) and "+pct(rest)+" % "+row.bioID+" (biogenic) by volume ("+row.source+")")
	if u, err := units.Parse(key.unit); err == nil && u.Dim != units.Volume {
		p.notes = append(p.notes, "the blend shares are by volume: applied to an amount in "+u.Symbol+" as an approximation")
	}
	p.factors = append(p.factors, base.factors...)
	p.notes = append(p.notes, base.notes...)
	switch key.kind {
	case kindCO2, kindMobileCO2:
		memo := quote(key.fuel) + ": " + pct(share) + " % fossil by volume; " + pct(rest) + " % " + row.bioID + " is biogenic, its CO2 "
		if bio, err := e.fuelPlan(bioKey); err == nil {
			k := new(big.Rat).Mul(rest, bio.exact)
			p.memoK, p.memoDen = ratFloat(k), 1
			if n, d, ok := smallFraction(k); ok {
				p.memoK, p.memoDen = n, d
			}
			p.memoPrefix, p.memoSuffix = memo+"(", " t) is a memo item, not in this result"
			p.factors = append(p.factors, bio.factors...)
		} else {
			p.notes = append(p.notes, memo+"is a memo item, not in this result (not computed: "+errHeadline(err)+")")
		}
	case kindCarbon:
		p.notes = append(p.notes, "fossil carbon only: the "+pct(rest)+" % "+row.bioID+" is biogenic")
	case kindCO2e, kindMobileCO2e, kindEnergy:
		bio, err := e.fuelPlan(bioKey)
		if err != nil {
			return nil, err
		}
		p.exact.Add(p.exact, new(big.Rat).Mul(rest, bio.exact))
		p.terms = append(p.terms, scaleTerms(bio.terms, ratFloat(rest))...)
		p.factors = append(p.factors, bio.factors...)
		if key.kind == kindCO2e || key.kind == kindMobileCO2e {
			p.notes = append(p.notes, "CO2e of the "+pct(share)+" % fossil part plus CH4 and N2O of the "+pct(rest)+" % "+row.bioID+
				"; the "+row.bioID+" CO2 is biogenic, a memo item outside this result")
		}
	}
	return p, nil
}

// memoNote is the note of a blend's biogenic CO2 for an amount; "" when there is none.
func (p *plan) memoNote(amount float64) string {
	if p.memoPrefix == "" {
		return ""
	}
	return p.memoPrefix + FormatNumber(amount*p.memoK/p.memoDen) + p.memoSuffix
}

// errHeadline is an error's message without the function prefix or caret snippet.
func errHeadline(err error) string {
	if fe, ok := AsError(err); ok {
		return fe.Msg
	}
	return err.Error()
}
