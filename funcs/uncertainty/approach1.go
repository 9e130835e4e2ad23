package uncertainty

import "math"

// Rule says how Approach 1 treats an asymmetric range.
type Rule uint8

const (
	// RuleSeparate combines the lower half-widths and the upper half-widths
	// separately, giving an asymmetric interval.
	RuleSeparate Rule = iota
	// RuleLarger uses the larger half-width of each factor on both sides
	// (IPCC 2006 Vol 1 Ch 3 Table 3.3 notes, from memory).
	RuleLarger
)

// Product is IPCC 2006 Vol 1 Ch 3 Equation 3.1: the relative uncertainty of
// a product of independent quantities, sqrt(U1² + … + Un²), with every U a
// fraction (0.05 for ±5 %).
func Product(us ...float64) float64 {
	s := 0.0
	for _, u := range us {
		s += u * u
	}
	return math.Sqrt(s)
}

// Sum is IPCC 2006 Vol 1 Ch 3 Equation 3.2: the relative uncertainty of a sum
// of independent quantities xs with relative uncertainties us,
// sqrt((U1·x1)² + … + (Un·xn)²) / |x1 + … + xn|. It returns +Inf when the
// sum is zero and a term is uncertain, and panics when the lengths differ.
func Sum(xs, us []float64) float64 {
	if len(xs) != len(us) {
		panic("uncertainty.Sum: xs and us differ in length")
	}
	total, s := 0.0, 0.0
	for i, x := range xs {
		total += x
		s += (us[i] * x) * (us[i] * x)
	}
	if s == 0 {
		return 0
	}
	return math.Sqrt(s) / math.Abs(total)
}

// Propagate is Approach 1 on a model: the 95 % interval of its total from the
// factors' ranges by first-order error propagation, of which Equations 3.1
// (one term) and 3.2 (terms with no factor in common) are the two cases. A
// factor shared by several terms counts once, with the sum of the values of the
// terms it multiplies or divides (fully correlated across them). The lower and
// upper half-widths are combined as rule says. Errors name the factor or term.
func Propagate(m Model, rule Rule) (Interval, error) {
	if err := m.check(); err != nil {
		return Interval{}, err
	}
	total := m.Total()
	// sensitivity of the total to a relative change of each factor
	sens := make([]float64, len(m.Factors))
	for _, t := range m.Terms {
		for _, u := range t.Uses {
			sens[u.Factor] += float64(u.Power) * t.Value
		}
	}
	down, up := 0.0, 0.0 // variances of the total below and above it
	for i, f := range m.Factors {
		lo, hi := f.halves()
		if rule == RuleLarger {
			lo = max(lo, hi)
			hi = lo
		}
		s := sens[i]
		if s < 0 { // a factor's low end raises the total
			lo, hi = hi, lo
		}
		down += (s * lo) * (s * lo)
		up += (s * hi) * (s * hi)
	}
	return Interval{Low: total - math.Sqrt(down), High: total + math.Sqrt(up), Mean: total}, nil
}
