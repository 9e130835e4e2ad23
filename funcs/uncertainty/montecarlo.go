package uncertainty

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
)

// z975 is the 97.5th percentile of the standard normal distribution.
const z975 = 1.959963984540054

// MaxDraws bounds the draws of one Monte Carlo run.
const MaxDraws = 10_000_000

// symmetricTolerance: a range whose two halves differ by less than this share
// of the larger one is drawn from a normal distribution.
const symmetricTolerance = 0.01

// sampler draws one factor as a multiple of its value.
type sampler struct {
	exact     bool
	lognormal bool
	mu, sigma float64 // of the normal, or of the logarithm of the multiple
}

func newSampler(f Factor) sampler {
	if !f.HasRange || f.Low == f.High {
		return sampler{exact: true}
	}
	lo, hi := f.halves()
	if math.Abs(hi-lo) <= symmetricTolerance*max(lo, hi) {
		return sampler{mu: 1, sigma: (lo + hi) / 2 / z975}
	}
	// lognormal through the published percentiles, as a multiple of the value
	a, b := math.Log(f.Low/f.Value), math.Log(f.High/f.Value)
	return sampler{lognormal: true, mu: (a + b) / 2, sigma: (b - a) / (2 * z975)}
}

func (s sampler) draw(r *rand.Rand) float64 {
	switch {
	case s.exact:
		return 1
	case s.lognormal:
		return math.Exp(s.mu + s.sigma*r.NormFloat64())
	}
	return s.mu + s.sigma*r.NormFloat64()
}

// MonteCarlo is Approach 2: draws iterations, each drawing every factor once
// (so a factor shared by terms moves them together) and summing the terms;
// the interval is the 2.5th and 97.5th percentiles of the totals, Mean their
// mean. The same seed gives the same interval (math/rand/v2 PCG seeded with
// seed, seed). draws must lie in 1..MaxDraws.
func MonteCarlo(m Model, seed uint64, draws int) (Interval, error) {
	if draws < 1 || draws > MaxDraws {
		return Interval{}, fmt.Errorf("draws %d: give 1 to %d (10000 is usual)", draws, MaxDraws)
	}
	if err := m.check(); err != nil {
		return Interval{}, err
	}
	r := rand.New(rand.NewPCG(seed, seed))
	ss := make([]sampler, len(m.Factors))
	for i, f := range m.Factors {
		ss[i] = newSampler(f)
	}
	mult := make([]float64, len(m.Factors))
	totals := make([]float64, draws)
	sum := 0.0
	for d := range totals {
		for i, s := range ss {
			mult[i] = s.draw(r)
		}
		t := 0.0
		for _, term := range m.Terms {
			v := term.Value
			for _, u := range term.Uses {
				if u.Power < 0 {
					v /= mult[u.Factor]
				} else {
					v *= mult[u.Factor]
				}
			}
			t += v
		}
		totals[d] = t
		sum += t
	}
	slices.Sort(totals)
	return Interval{Low: percentile(totals, 0.025), High: percentile(totals, 0.975), Mean: sum / float64(draws)}, nil
}

// percentile of sorted xs by linear interpolation between closest ranks.
func percentile(xs []float64, p float64) float64 {
	if len(xs) == 1 {
		return xs[0]
	}
	h := p * float64(len(xs)-1)
	i := int(h)
	if i >= len(xs)-1 {
		return xs[len(xs)-1]
	}
	return xs[i] + (h-float64(i))*(xs[i+1]-xs[i])
}
