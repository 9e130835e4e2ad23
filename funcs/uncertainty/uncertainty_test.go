package uncertainty

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
	"time"
)

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.Abs(got-want) > tol {
		t.Errorf("%s = %.6g, want %.6g (± %g)", what, got, want, tol)
	}
}

func sym(name string, v, pct float64) Factor {
	return Factor{Name: name, Value: v, Low: v * (1 - pct/100), High: v * (1 + pct/100), HasRange: true}
}

// IPCC 2006 Vol 1 Ch 3 Equation 3.1 (the equation from memory; figures by hand):
// activity data ±5 % and an emission factor ±10 % give sqrt(5² + 10²) = 11.18 %.
func TestProductEquation31(t *testing.T) {
	near(t, "Product(5 %, 10 %)", Product(0.05, 0.10), 0.111803, 1e-6)
	near(t, "Product(3 %, 4 %)", Product(0.03, 0.04), 0.05, 1e-12)
	near(t, "Product()", Product(), 0, 0)
}

// IPCC 2006 Vol 1 Ch 3 Equation 3.2 (the equation from memory; figures by hand):
// 100 ±10 % plus 50 ±20 % is 150 ± sqrt(10² + 10²) = 14.142, i.e. 9.428 %.
func TestSumEquation32(t *testing.T) {
	near(t, "Sum", Sum([]float64{100, 50}, []float64{0.10, 0.20}), math.Sqrt(200)/150, 1e-12)
	near(t, "Sum of one", Sum([]float64{42}, []float64{0.07}), 0.07, 1e-12)
	if !math.IsInf(Sum([]float64{10, -10}, []float64{0.1, 0.1}), 1) {
		t.Error("a sum of zero with uncertain terms must have an infinite relative uncertainty")
	}
}

// Propagate reduces to Equation 3.1 for one term and to Equation 3.2 for terms
// with no factor in common.
func TestPropagateReducesToEquations(t *testing.T) {
	one := Model{Factors: []Factor{sym("ad", 2, 5), sym("ef", 3, 10)},
		Terms: []Term{{Value: 6, Uses: []Use{{0, 1}, {1, 1}}}}}
	iv, err := Propagate(one, RuleSeparate)
	if err != nil {
		t.Fatal(err)
	}
	u := Product(0.05, 0.10)
	near(t, "low", iv.Low, 6*(1-u), 1e-12)
	near(t, "high", iv.High, 6*(1+u), 1e-12)

	two := Model{Factors: []Factor{sym("a", 1, 10), sym("b", 1, 20)},
		Terms: []Term{{Value: 100, Uses: []Use{{0, 1}}}, {Value: 50, Uses: []Use{{1, -1}}}}}
	iv, err = Propagate(two, RuleSeparate)
	if err != nil {
		t.Fatal(err)
	}
	u = Sum([]float64{100, 50}, []float64{0.10, 0.20})
	near(t, "sum low", iv.Low, 150*(1-u), 1e-9)
	near(t, "sum high", iv.High, 150*(1+u), 1e-9)
}

// The natural gas CO2 factor of IPCC 2006 Vol 2 Ch 1 Table 1.4, 56 100 kg/TJ with the
// range 54 300–58 300: Approach 1 keeps its halves, -3.21 % and +3.92 %; RuleLarger
// uses +3.92 % both ways.
func TestAsymmetricRange(t *testing.T) {
	ng := Factor{Name: "co2_ef", Value: 56100, Low: 54300, High: 58300, HasRange: true}
	m := Model{Factors: []Factor{ng}, Terms: []Term{{Value: 56.1, Uses: []Use{{0, 1}}}}}
	iv, err := Propagate(m, RuleSeparate)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "separate low", iv.Low, 54.3, 1e-9)
	near(t, "separate high", iv.High, 58.3, 1e-9)
	iv, err = Propagate(m, RuleLarger)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "larger low", iv.Low, 56.1-2.2, 1e-9)
	near(t, "larger high", iv.High, 58.3, 1e-9)
	// dividing by the factor turns its low end into the result's high end
	m.Terms[0].Uses[0].Power = -1
	iv, _ = Propagate(m, RuleSeparate)
	near(t, "divided low", iv.Low, 56.1*(1-2200.0/56100), 1e-9)
	near(t, "divided high", iv.High, 56.1*(1+1800.0/56100), 1e-9)
}

// Monte Carlo against propagation where both apply (small, symmetric ranges):
// the bounds agree within 0.5 % of the value and the half-widths within 5 %.
func TestMonteCarloAgreesWithPropagation(t *testing.T) {
	cases := map[string]Model{
		"product": {Factors: []Factor{sym("ad", 1000, 2), sym("ncv", 48, 3), sym("ef", 56.1, 4)},
			Terms: []Term{{Value: 1000 * 48 * 56.1, Uses: []Use{{0, 1}, {1, 1}, {2, 1}}}}},
		"sum with a shared factor": {Factors: []Factor{sym("ncv", 1, 3), sym("co2", 1, 4), sym("ch4", 1, 5)},
			Terms: []Term{{Value: 100, Uses: []Use{{0, 1}, {1, 1}}}, {Value: 20, Uses: []Use{{0, 1}, {2, 1}}}}},
		"difference": {Factors: []Factor{sym("a", 1, 5), sym("b", 1, 5)},
			Terms: []Term{{Value: 100, Uses: []Use{{0, 1}}}, {Value: -30, Uses: []Use{{1, 1}}}}},
	}
	for name, m := range cases {
		a1, err := Propagate(m, RuleSeparate)
		if err != nil {
			t.Fatal(err)
		}
		a2, err := MonteCarlo(m, 7, 100_000)
		if err != nil {
			t.Fatal(err)
		}
		v := m.Total()
		near(t, name+" mean", a2.Mean, v, 0.002*math.Abs(v))
		near(t, name+" low", a2.Low, a1.Low, 0.005*math.Abs(v))
		near(t, name+" high", a2.High, a1.High, 0.005*math.Abs(v))
		near(t, name+" half-width", (a2.High-a2.Low)/(a1.High-a1.Low), 1, 0.05)
	}
}

func TestMonteCarloReproducible(t *testing.T) {
	m := Model{Factors: []Factor{sym("a", 1, 10), {Name: "b", Value: 1, Low: 0.5, High: 3, HasRange: true}},
		Terms: []Term{{Value: 10, Uses: []Use{{0, 1}, {1, 1}}}}}
	x, _ := MonteCarlo(m, 42, 5000)
	y, _ := MonteCarlo(m, 42, 5000)
	if x != y {
		t.Errorf("same seed, different intervals: %+v and %+v", x, y)
	}
	z, _ := MonteCarlo(m, 43, 5000)
	if x == z {
		t.Errorf("seeds 42 and 43 gave the same interval %+v", x)
	}
}

// One factor used by two terms moves both at once: the sum is wider than with
// two independent factors of the same range (by sqrt 2 for two equal terms).
func TestSharedFactorIsCorrelated(t *testing.T) {
	shared := Model{Factors: []Factor{sym("ef", 1, 10)},
		Terms: []Term{{Value: 50, Uses: []Use{{0, 1}}}, {Value: 50, Uses: []Use{{0, 1}}}}}
	indep := Model{Factors: []Factor{sym("ef1", 1, 10), sym("ef2", 1, 10)},
		Terms: []Term{{Value: 50, Uses: []Use{{0, 1}}}, {Value: 50, Uses: []Use{{1, 1}}}}}
	s1, _ := Propagate(shared, RuleSeparate)
	i1, _ := Propagate(indep, RuleSeparate)
	near(t, "approach 1 shared low", s1.Low, 90, 1e-9)
	near(t, "approach 1 independent low", i1.Low, 100-math.Sqrt(50), 1e-9)
	s2, _ := MonteCarlo(shared, 1, 50_000)
	i2, _ := MonteCarlo(indep, 1, 50_000)
	ratio := (s2.High - s2.Low) / (i2.High - i2.Low)
	near(t, "approach 2 width ratio shared/independent", ratio, math.Sqrt2, 0.05)
}

// A skewed range is drawn from the lognormal through the published percentiles:
// the draws' 2.5th and 97.5th percentiles land on low and high.
func TestLognormalKeepsPublishedRange(t *testing.T) {
	f := Factor{Name: "n2o_ef", Value: 0.6, Low: 0.2, High: 2, HasRange: true}
	m := Model{Factors: []Factor{f}, Terms: []Term{{Value: 0.6, Uses: []Use{{0, 1}}}}}
	iv, err := MonteCarlo(m, 3, 200_000)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "low", iv.Low, 0.2, 0.01*0.2)
	near(t, "high", iv.High, 2, 0.02*2)
}

func TestErrorsNameTheInput(t *testing.T) {
	m := Model{Factors: []Factor{{Name: "x/y/co2_ef", Value: 10, Low: 12, High: 14, HasRange: true}},
		Terms: []Term{{Value: 1, Uses: []Use{{0, 1}}}}}
	if _, err := Propagate(m, RuleSeparate); err == nil || !strings.Contains(err.Error(), "x/y/co2_ef") {
		t.Errorf("range not holding the value: got %v", err)
	}
	if _, err := MonteCarlo(Model{}, 1, 0); err == nil || !strings.Contains(err.Error(), "draws 0") {
		t.Errorf("draws 0: got %v", err)
	}
	bad := Model{Factors: []Factor{sym("a", 1, 1)}, Terms: []Term{{Value: 1, Uses: []Use{{3, 1}}}}}
	if _, err := Propagate(bad, RuleSeparate); err == nil || !strings.Contains(err.Error(), "index 3") {
		t.Errorf("bad index: got %v", err)
	}
}

// TestMonteCarloTime logs the time of 10 000 draws of a CO2e-like model
// (three terms, five factors).
func TestMonteCarloTime(t *testing.T) {
	m := Model{Factors: []Factor{sym("ncv", 48, 3), {Name: "co2", Value: 56100, Low: 54300, High: 58300, HasRange: true},
		{Name: "ch4", Value: 1, Low: 0.3, High: 3, HasRange: true}, {Name: "n2o", Value: 0.1, Low: 0.03, High: 0.3, HasRange: true}, sym("ad", 1, 2)},
		Terms: []Term{{Value: 56.1, Uses: []Use{{0, 1}, {1, 1}, {4, 1}}}, {Value: 0.03, Uses: []Use{{0, 1}, {2, 1}, {4, 1}}},
			{Value: 0.0265, Uses: []Use{{0, 1}, {3, 1}, {4, 1}}}}}
	start := time.Now()
	if _, err := MonteCarlo(m, 1, 10_000); err != nil {
		t.Fatal(err)
	}
	t.Logf("Monte Carlo, 10 000 draws of 3 terms and 5 factors: %v", time.Since(start))
}

func BenchmarkMonteCarlo10k(b *testing.B) {
	m := Model{Factors: []Factor{sym("ncv", 48, 3), {Name: "co2", Value: 56100, Low: 54300, High: 58300, HasRange: true}},
		Terms: []Term{{Value: 56.1, Uses: []Use{{0, 1}, {1, 1}}}}}
	for b.Loop() {
		_, _ = MonteCarlo(m, 1, 10_000)
	}
}

// A skewed range is drawn around the published value: the median of the
// draws is the value (diesel's CO2 factor, 74,100 kg/TJ with 72,600-74,800,
// IPCC 2006 Vol 2 Ch 1 Table 1.4), not sqrt(low x high) = 73,693.
func TestSkewedRangeCentredOnValue(t *testing.T) {
	f := Factor{Name: "diesel co2", Value: 74100, Low: 72600, High: 74800, HasRange: true}
	s := newSampler(f)
	r := rand.New(rand.NewPCG(7, 7))
	xs := make([]float64, 200001)
	for i := range xs {
		xs[i] = f.Value * s.draw(r)
	}
	slices.Sort(xs)
	med := xs[len(xs)/2]
	if math.Abs(med-74100) > 15 {
		t.Errorf("median of the draws %.1f, want the published 74,100 (within 15)", med)
	}
	lo, hi := xs[int(0.025*float64(len(xs)))], xs[int(0.975*float64(len(xs)))]
	if math.Abs(lo-72600) > 30 || math.Abs(hi-74800) > 30 {
		t.Errorf("2.5th and 97.5th percentiles %.1f and %.1f, want the published 72,600 and 74,800", lo, hi)
	}
}
