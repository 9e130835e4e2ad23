package server

import (
	"net/url"
	"strconv"

	"github.com/fluecell/fluecell/funcs"
)

// intervalQuery reads the uncertainty, seed and draws parameters of /v1/annotate: how the 95 %
// intervals of the report's totals are computed (Approach 1 when left out). draws is bounded
// by maxDraws, as for /v1/eval; the error names the parameter and what it accepts.
func intervalQuery(q url.Values) (funcs.IntervalOptions, *apiError) {
	var opt funcs.IntervalOptions
	a, err := funcs.ParseApproach(q.Get("uncertainty"))
	if err != nil {
		return opt, badRequest("uncertainty", "uncertainty="+quoteText(q.Get("uncertainty"))+": accepted are approach1 (error propagation) and approach2 (Monte Carlo)")
	}
	opt.Approach = a
	if s := q.Get("seed"); s != "" {
		v, err := strconv.ParseUint(s, 10, 64)
		if err != nil {
			return opt, badRequest("seed", "seed="+quoteText(s)+": give a whole number from 0 to 18446744073709551615")
		}
		opt.Seed = v
	}
	if s := q.Get("draws"); s != "" {
		v, err := strconv.Atoi(s)
		if err != nil || v < 1 || v > maxDraws {
			return opt, badRequest("draws", "draws="+quoteText(s)+": give a whole number from 1 to "+strconv.Itoa(maxDraws))
		}
		opt.Draws = v
	}
	return opt, nil
}
