package funcs

import (
	"math"
	"strings"
	"testing"
)

func nearRel(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (± %g relative)", what, got, want, rel)
	}
}

func ivNote(r Result, part string) bool {
	for _, n := range r.Notes {
		if strings.Contains(n, part) {
			return true
		}
	}
	return false
}

// IPCC 2006 Vol 2 Ch 1 Table 1.4: natural gas 56 100 kg CO2/TJ, 95 % range 54 300–58 300.
// 1000 GJ = 1 TJ, so by hand the result is 56.1 t CO2 with the interval 54.3–58.3 t.
func TestIntervalFuelCO2NaturalGas(t *testing.T) {
	e := newTestEngine(t)
	r, err := e.CallInterval("fuel_co2", map[string]string{"fuel": "natural_gas", "amount": "1000", "unit": "GJ"}, IntervalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Interval == nil {
		t.Fatalf("no interval; notes %q", r.Notes)
	}
	nearRel(t, "value", r.Value, 56.1, 1e-12)
	nearRel(t, "low", r.Interval.Low, 54.3, 1e-12)
	nearRel(t, "high", r.Interval.High, 58.3, 1e-12)
	if !ivNote(r, "Approach 1") || !ivNote(r, "amounts are taken as exact") {
		t.Errorf("notes do not say how the interval was computed: %q", r.Notes)
	}
	// a negative amount turns the interval round
	r, _ = e.CallInterval("fuel_co2", map[string]string{"fuel": "natural_gas", "amount": "-1000", "unit": "GJ"}, IntervalOptions{})
	nearRel(t, "negative low", r.Interval.Low, -58.3, 1e-12)
	nearRel(t, "negative high", r.Interval.High, -54.3, 1e-12)
	// without asking, no interval and no extra note
	r, _ = e.Call("fuel_co2", map[string]string{"fuel": "natural_gas", "amount": "1000", "unit": "GJ"})
	if r.Interval != nil || ivNote(r, "interval") {
		t.Errorf("Call without interval gave %+v, notes %q", r.Interval, r.Notes)
	}
}

// A mass of natural gas goes through the NCV (IPCC 2006 Vol 2 Ch 1 Table 1.2: 48.0 TJ/Gg,
// 46.5–50.4) and the CO2 factor (Table 1.4): Equation 3.1 with the halves taken separately,
// lower sqrt((1.5/48)² + (1.8/56.1)²), upper sqrt((2.4/48)² + (2.2/56.1)²).
func TestIntervalProductOfTwoRanges(t *testing.T) {
	e := newTestEngine(t)
	r, err := e.CallInterval("fuel_co2", map[string]string{"fuel": "natural_gas", "amount": "1", "unit": "Gg"}, IntervalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	v := 48.0 * 56.1 // TJ x t/TJ
	nearRel(t, "value", r.Value, v, 1e-12)
	lo := math.Sqrt(math.Pow(1.5/48, 2) + math.Pow(1.8/56.1, 2))
	hi := math.Sqrt(math.Pow(2.4/48, 2) + math.Pow(2.2/56.1, 2))
	nearRel(t, "low", r.Interval.Low, v*(1-lo), 1e-11)
	nearRel(t, "high", r.Interval.High, v*(1+hi), 1e-11)
}

// fuel_co2e of natural gas is CO2 + CH4 x 28 + N2O x 265 (AR5); only the CO2 factor of
// Table 1.4 publishes a range in the pack, so the interval is 56.1546 - 1.8 .. + 2.2 and a
// note names the CH4 and N2O rows without one.
func TestIntervalFuelCO2eSumOfProducts(t *testing.T) {
	e := newTestEngine(t)
	r, err := e.CallInterval("fuel_co2e", map[string]string{"fuel": "natural_gas", "amount": "1000", "unit": "GJ"}, IntervalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	v := 56.1 + 0.001*28 + 0.0001*265
	nearRel(t, "value", r.Value, v, 1e-12)
	nearRel(t, "low", r.Interval.Low, v-1.8, 1e-12)
	nearRel(t, "high", r.Interval.High, v+2.2, 1e-12)
	if !ivNote(r, "no published range for") || !ivNote(r, "natural_gas/ch4_ef") {
		t.Errorf("no note on rows without a range: %q", r.Notes)
	}
}

// The same factor row in two calls is one quantity (fully correlated): two 1000 GJ of
// natural gas give 108.6..116.6 (Table 1.4 range doubled); natural gas plus gas/diesel oil
// (74 100, 72 600–74 800) are independent: 130.2 - sqrt(1.8² + 1.5²) .. + sqrt(2.2² + 0.7²).
func TestIntervalSumOfCalls(t *testing.T) {
	e := newTestEngine(t)
	eval := func(src string, opt IntervalOptions) Result {
		t.Helper()
		p, err := e.Compile(src)
		if err != nil {
			t.Fatal(err)
		}
		r, err := p.EvalInterval(nil, opt)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	r := eval(`fuel_co2("natural_gas", 1000, "GJ") + fuel_co2("natural_gas", 1000, "GJ")`, IntervalOptions{})
	nearRel(t, "shared low", r.Interval.Low, 108.6, 1e-12)
	nearRel(t, "shared high", r.Interval.High, 116.6, 1e-12)
	r = eval(`fuel_co2("natural_gas", 1000, "GJ") + fuel_co2("diesel", 1000, "GJ")`, IntervalOptions{})
	nearRel(t, "independent low", r.Interval.Low, 130.2-math.Hypot(1.8, 1.5), 1e-11)
	nearRel(t, "independent high", r.Interval.High, 130.2+math.Hypot(2.2, 0.7), 1e-11)
	r = eval(`fuel_co2("natural_gas", 2000, "GJ") - fuel_co2("natural_gas", 1000, "GJ")`, IntervalOptions{})
	nearRel(t, "difference low", r.Interval.Low, 54.3, 1e-12)
	nearRel(t, "difference high", r.Interval.High, 58.3, 1e-12)
	r = eval(`2 * fuel_co2("natural_gas", 1000, "GJ")`, IntervalOptions{})
	if r.Interval != nil || !ivNote(r, "not for other arithmetic") {
		t.Errorf("a product of a call got %+v, notes %q", r.Interval, r.Notes)
	}
	r = eval(`fuel_co2("natural_gas", 1000, "GJ") + gwp("ch4")`, IntervalOptions{})
	if r.Interval != nil || !ivNote(r, "not propagated through gwp") {
		t.Errorf("a call without a model got %+v, notes %q", r.Interval, r.Notes)
	}
	// Approach 2: seeded, reproducible, close to Approach 1
	opt := IntervalOptions{Approach: Approach2, Seed: 9, Draws: 20000}
	a := eval(`fuel_co2("natural_gas", 1000, "GJ") + fuel_co2("diesel", 1000, "GJ")`, opt)
	b := eval(`fuel_co2("natural_gas", 1000, "GJ") + fuel_co2("diesel", 1000, "GJ")`, opt)
	if *a.Interval != *b.Interval {
		t.Errorf("same seed, different intervals %+v %+v", a.Interval, b.Interval)
	}
	nearRel(t, "approach 2 low", a.Interval.Low, 130.2-math.Hypot(1.8, 1.5), 0.005)
	nearRel(t, "approach 2 high", a.Interval.High, 130.2+math.Hypot(2.2, 0.7), 0.005)
	if !ivNote(a, "Monte Carlo, 20000 draws, seed 9") {
		t.Errorf("notes: %q", a.Notes)
	}
}

func TestParseApproach(t *testing.T) {
	for s, want := range map[string]Approach{"approach1": Approach1, "approach2": Approach2, "2": Approach2, "": Approach1} {
		if got, err := ParseApproach(s); err != nil || got != want {
			t.Errorf("ParseApproach(%q) = %v, %v", s, got, err)
		}
	}
	if _, err := ParseApproach("approach3"); err == nil || !strings.Contains(err.Error(), "approach1") {
		t.Errorf("approach3: %v", err)
	}
}

// The EPA Hub rows publish no range: no interval, and a note says so.
func TestIntervalNoRangeAtAll(t *testing.T) {
	e := newTestEngine(t)
	r, err := e.CallInterval("fuel_co2", map[string]string{"fuel": "diesel", "amount": "1000", "unit": "gal", "pack": "epa2025"}, IntervalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Interval != nil || !ivNote(r, "none of the rows used publishes a range") {
		t.Errorf("got %+v, notes %q", r.Interval, r.Notes)
	}
}

// EvalInterval is safe for concurrent use: every goroutine gets the interval of
// its own amount (Table 1.4 range scaled by hand: q GJ gives 0.0543q..0.0583q t).
func TestEvalIntervalConcurrent(t *testing.T) {
	e := newTestEngine(t)
	p, err := e.Compile(`fuel_co2("natural_gas", q, "GJ")`, WithVariables("q"))
	if err != nil {
		t.Fatal(err)
	}
	errs := make(chan string, 8)
	for g := range 8 {
		go func() {
			q := float64(1000 * (g + 1))
			for range 200 {
				r, err := p.EvalInterval(map[string]any{"q": q}, IntervalOptions{})
				if err != nil || r.Interval == nil || math.Abs(r.Interval.Low-0.0543*q) > 1e-9*q || math.Abs(r.Interval.High-0.0583*q) > 1e-9*q {
					errs <- "q " + FormatNumber(q) + ": wrong interval"
					return
				}
			}
			errs <- ""
		}()
	}
	for range 8 {
		if msg := <-errs; msg != "" {
			t.Error(msg)
		}
	}
}
