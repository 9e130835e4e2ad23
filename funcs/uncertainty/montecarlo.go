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
	mu, sigma float64 // of the normal (symmetric ranges)
	// sLo, sHi: a skewed range is drawn from a two-piece lognormal, the
	// logarithm of the multiple being normal with spread sLo below 0 and sHi
	// above: its median is the published value (as in Approach 1, which
	// keeps the value and combines the lower and upper halves apart) and its
	// 2.5th and 97.5th percentiles are the published low and high. A
	// lognormal fitted through low and high alone would centre the draws on
	// sqrt(low x high) instead of the published value (diesel's CO2 factor,
	// 74,100 kg/TJ with 72,600-74,800, IPCC 2006 Vol 2 Ch 1 Table 1.4, would
	// centre on 73,693).
	sLo, sHi float64
}

func newSampler(f Factor) sampler {
	if !f.HasRange || f.Low == f.High {
		return sampler{exact: true}
	}
	lo, hi := f.halves()
	if math.Abs(hi-lo) <= symmetricTolerance*max(lo, hi) {
		return sampler{mu: 1, sigma: (lo + hi) / 2 / z975}
	}
	// two-piece lognormal: median the value, percentiles the published ends
	a, b := math.Log(f.Low/f.Value), math.Log(f.High/f.Value)
	return sampler{lognormal: true, sLo: -a / z975, sHi: b / z975}
}

func (s sampler) draw(r *rand.Rand) float64 {
	switch {
	case s.exact:
		return 1
	case s.lognormal:
		z := r.NormFloat64()
		if z < 0 {
			return math.Exp(z * s.sLo)
		}
		return math.Exp(z * s.sHi)
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
