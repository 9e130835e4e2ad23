package funcs

import (
	"math/big"
	"strconv"
	"strings"

	"github.com/expr-lang/expr/ast"
	"github.com/fluecell/fluecell/funcs/uncertainty"
)

// Approach chooses how the 95 % interval of a result is computed.
type Approach uint8

const (
	// Approach1 is error propagation, IPCC 2006 Vol 1 Ch 3 Equations 3.1 and 3.2.
	Approach1 Approach = iota + 1
	// Approach2 is Monte Carlo simulation, seeded and reproducible.
	Approach2
)

// DefaultDraws is the number of Monte Carlo draws when IntervalOptions.Draws is 0.
const DefaultDraws = 10_000

// String is "approach1" or "approach2".
func (a Approach) String() string {
	if a == Approach2 {
		return "approach2"
	}
	return "approach1"
}

// ParseApproach reads "approach1" or "approach2" ("1", "2", "propagation" and
// "montecarlo" also); the error names what is accepted.
func ParseApproach(s string) (Approach, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "approach1", "1", "propagation", "":
		return Approach1, nil
	case "approach2", "2", "montecarlo", "monte_carlo":
		return Approach2, nil
	}
	return 0, &Error{Code: CodeBadArgument, Param: "uncertainty", Msg: "uncertainty " + quote(s) +
		" is not an approach: accepted are approach1 (error propagation) and approach2 (Monte Carlo)"}
}

// IntervalOptions asks for the 95 % interval of a result.
type IntervalOptions struct {
	Approach Approach // zero: Approach1
	Seed     uint64   // Approach2: seed of the draws
	Draws    int      // Approach2: the number of draws, 0: DefaultDraws
}

// Interval is the 95 % interval of a result from the ranges of the factor rows
// used; the amounts are taken as exact.
type Interval struct {
	Low, High float64
	Approach  Approach
	Mean      float64 // Approach2: the mean of the draws
	Draws     int     // Approach2
	Seed      uint64  // Approach2
}

// factorUse is a factor row in a product, multiplying (pow 1) or dividing (pow -1).
type factorUse struct {
	f   *Factor
	pow int
}

// planTerm is one product of a plan's value per unit amount.
type planTerm struct {
	perUnit float64
	uses    []factorUse
}

func newTerm(k *big.Rat, uses []factorUse) planTerm {
	return planTerm{perUnit: ratFloat(k), uses: uses}
}

func usesOf(fs []*Factor, pows []int) []factorUse {
	out := make([]factorUse, len(fs))
	for i, f := range fs {
		out[i] = factorUse{f, pows[i]}
	}
	return out
}

func scaleTerms(ts []planTerm, k float64) []planTerm {
	out := make([]planTerm, len(ts))
	for i, t := range ts {
		out[i] = planTerm{perUnit: t.perUnit * k, uses: t.uses}
	}
	return out
}

// planInterval is a plan's Approach 1 interval per unit amount, computed once.
type planInterval struct {
	ok        bool
	low, high float64
	noRange   []string // keys of the rows used that publish no range
	ranged    int      // rows used that publish one
	err       string
}

func newPlanInterval(ts []planTerm) planInterval {
	if len(ts) == 0 {
		return planInterval{}
	}
	var c callCtx
	c.contribs = []contrib{{amount: 1, sign: 1, terms: ts}}
	m, noRange := c.model()
	ranged := len(m.Factors) - len(noRange)
	iv, err := uncertainty.Propagate(m, uncertainty.RuleSeparate)
	if err != nil {
		return planInterval{err: err.Error(), noRange: noRange, ranged: ranged}
	}
	return planInterval{ok: true, low: iv.Low, high: iv.High, noRange: noRange, ranged: ranged}
}

// contrib is one call of a function with a plan, as a share of the result.
type contrib struct {
	amount float64
	sign   float64 // set from the expression's shape when the result is built
	terms  []planTerm
	iv     *planInterval // the plan's own interval per unit amount; nil for terms built per call
	// activity is the kind of record the amount comes from (ActivityStationaryFuel ...),
	// for the activity-data uncertainty of workbook totals (see totalinterval.go).
	activity string
	// why, when not "", says why the call has no interval (a statistic other than the median).
	why string
}

// record keeps the call of fuel plan p on amount, when the run tracks intervals.
func (c *callCtx) record(p *plan, amount float64) {
	c.recordTerms(p.terms, &p.iv, amount, ActivityStationaryFuel)
}

// model builds the uncertainty model of the recorded calls: every factor row
// once, however many calls use it. It also returns the keys of the rows with
// no published range.
func (c *callCtx) model() (uncertainty.Model, []string) {
	var m uncertainty.Model
	index := map[*Factor]int{}
	var noRange []string
	for _, k := range c.contribs {
		for _, t := range k.terms {
			mt := uncertainty.Term{Value: k.sign * k.amount * t.perUnit, Uses: make([]uncertainty.Use, len(t.uses))}
			for j, u := range t.uses {
				i, seen := index[u.f]
				if !seen {
					i = len(m.Factors)
					index[u.f] = i
					f, ok := modelFactor(u.f)
					if !ok {
						noRange = append(noRange, u.f.Key())
					}
					m.Factors = append(m.Factors, f)
				}
				mt.Uses[j] = uncertainty.Use{Factor: i, Power: u.pow}
			}
			m.Terms = append(m.Terms, mt)
		}
	}
	return m, noRange
}

// interval fills res.Interval from the calls recorded in c, when the result is
// a signed sum of them (signs, in call order; nil when the expression is not
// such a sum), and notes why not otherwise.
func (c *callCtx) interval(res *Result, signs []float64, opt IntervalOptions) {
	if len(c.untracked) > 0 {
		res.Notes = append(res.Notes, "no 95 % interval: the factor ranges are not propagated through "+strings.Join(c.untracked, ", "))
		return
	}
	if len(c.contribs) == 0 {
		return
	}
	for _, k := range c.contribs {
		if k.why != "" {
			res.Notes = append(res.Notes, "no 95 % interval: "+k.why)
			return
		}
	}
	if signs == nil || len(signs) != len(c.contribs) {
		res.Notes = append(res.Notes, "no 95 % interval: it is given for a call, or a sum or difference of calls, not for other arithmetic")
		return
	}
	for i := range c.contribs {
		c.contribs[i].sign = signs[i]
	}
	var iv Interval
	var noRange []string
	var how string
	switch {
	case opt.Approach != Approach2 && len(c.contribs) == 1 && c.contribs[0].iv != nil:
		// one call: the plan's interval per unit amount, computed once, scaled
		k, p := c.contribs[0], c.contribs[0].iv
		if p.ranged == 0 {
			res.Notes = append(res.Notes, noRangeNote(p.noRange))
			return
		}
		if !p.ok {
			res.Notes = append(res.Notes, "no 95 % interval: "+p.err)
			return
		}
		a := k.sign * k.amount
		iv = Interval{Low: a * p.low, High: a * p.high, Approach: Approach1}
		if a < 0 {
			iv.Low, iv.High = iv.High, iv.Low
		}
		noRange = p.noRange
	default:
		m, nr := c.model()
		noRange = nr
		if len(nr) == len(m.Factors) {
			res.Notes = append(res.Notes, noRangeNote(nr))
			return
		}
		if opt.Approach == Approach2 {
			draws := opt.Draws
			if draws == 0 {
				draws = DefaultDraws
			}
			u, err := uncertainty.MonteCarlo(m, opt.Seed, draws)
			if err != nil {
				res.Notes = append(res.Notes, "no 95 % interval: "+err.Error())
				return
			}
			iv = Interval{Low: u.Low, High: u.High, Mean: u.Mean, Approach: Approach2, Draws: draws, Seed: opt.Seed}
		} else {
			u, err := uncertainty.Propagate(m, uncertainty.RuleSeparate)
			if err != nil {
				res.Notes = append(res.Notes, "no 95 % interval: "+err.Error())
				return
			}
			iv = Interval{Low: u.Low, High: u.High, Approach: Approach1}
		}
	}
	if iv.Approach == Approach2 {
		how = "Approach 2 (Monte Carlo, " + strconv.Itoa(iv.Draws) + " draws, seed " + strconv.FormatUint(iv.Seed, 10) +
			"; normal draws for symmetric ranges, lognormal for asymmetric ones; a row used twice is drawn once)"
	} else {
		how = "Approach 1 (error propagation, Equations 3.1 and 3.2; lower and upper halves of asymmetric ranges combined separately)"
	}
	iv.Low, iv.High, iv.Mean = round12(iv.Low), round12(iv.High), round12(iv.Mean)
	res.Interval = &iv
	res.Notes = append(res.Notes, "95 % interval by IPCC 2006 Vol 1 Ch 3 "+how+" from the published ranges of the factor rows; the amounts are taken as exact")
	if len(noRange) > 0 {
		res.Notes = append(res.Notes, "no published range for "+strings.Join(noRange, ", ")+": these rows add nothing to the interval")
	}
}

// callSigns returns the signs of the catalog calls of n in evaluation order
// when n is a sum or difference of calls (whose arguments call nothing) and
// numbers, so that each call's share of the result is known; nil otherwise.
func (e *Engine) callSigns(n ast.Node) []float64 {
	switch n := n.(type) {
	case *ast.IntegerNode, *ast.FloatNode, *ast.IdentifierNode:
		return []float64{}
	case *ast.CallNode:
		for _, a := range n.Arguments {
			if hasCall(a) {
				return nil
			}
		}
		return []float64{1}
	case *ast.UnaryNode:
		s := e.callSigns(n.Node)
		if s == nil || (n.Operator != "-" && n.Operator != "+") {
			return nil
		}
		if n.Operator == "-" {
			for i := range s {
				s[i] = -s[i]
			}
		}
		return s
	case *ast.BinaryNode:
		if n.Operator != "+" && n.Operator != "-" {
			return nil
		}
		l, r := e.callSigns(n.Left), e.callSigns(n.Right)
		if l == nil || r == nil {
			return nil
		}
		if n.Operator == "-" {
			for i := range r {
				r[i] = -r[i]
			}
		}
		return append(l, r...)
	}
	return nil
}

// hasCall reports whether n calls a function anywhere.
func hasCall(n ast.Node) bool {
	found := false
	ast.Find(n, func(m ast.Node) bool {
		_, ok := m.(*ast.CallNode)
		found = found || ok
		return ok
	})
	return found
}

// round12 rounds x to 12 significant digits, dropping the float noise of the
// arithmetic (56.1545 - 1.8 is 54.3545, not 54.354499999999994); a range is
// known to far fewer digits.
func round12(x float64) float64 {
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 12, 64), 64)
	if err != nil {
		return x
	}
	return r
}

// noRangeNote says why a result whose rows publish no range has no interval.
func noRangeNote(keys []string) string {
	return "no 95 % interval: none of the rows used publishes a range (" + strings.Join(keys, ", ") + ")"
}
