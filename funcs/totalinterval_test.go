package funcs

import (
	"math"
	"testing"
)

// twinPack is an invented test pack: two fuels with the same CO2 factor and the same symmetric
// range, 56 100 kg/TJ (54 300-57 900), so that only the correlation differs between them.
const twinPack = "pack,id,quantity,value,unit,low,high,basis,source,from_memory\n" +
	"twin,natural_gas,co2_ef,56100,kg CO2/TJ,54300,57900,NCV,invented test row,false\n" +
	"twin,lpg,co2_ef,56100,kg CO2/TJ,54300,57900,NCV,invented test row,false\n"

// addRows runs src once per amount and adds each result to tm under group.
func addRows(t *testing.T, e *Engine, tm *TotalModel, group, src string, amounts ...float64) float64 {
	t.Helper()
	p, err := e.Compile(src, WithVariables("q"))
	if err != nil {
		t.Fatal(err)
	}
	r := p.NewRunner()
	sum := 0.0
	for _, q := range amounts {
		res, err := r.RunTracked(map[string]any{"q": q})
		if err != nil {
			t.Fatal(err)
		}
		r.AddTo(tm, group)
		sum += res.Value
	}
	return sum
}

// Two rows of the same fuel share its factor (one quantity): the total's relative range is the
// factor's, 1.8/56.1 = 3.209 %. Two fuels with the same range are independent: by Equation 3.2,
// sqrt(1.8² + 1.8²)/112.2 = 2.269 %.
func TestTotalSharedFactorIsCorrelated(t *testing.T) {
	e := engineWithFile(t, "twin.csv", twinPack)
	same := NewTotalModel(nil)
	v := addRows(t, e, same, "A", `fuel_co2("natural_gas", q, "GJ", "twin")`, 1000, 1000)
	nearRel(t, "same fuel total", v, 112.2, 1e-12)
	a := same.Interval(IntervalOptions{}).Interval
	nearRel(t, "same fuel low", a.Low, 112.2-3.6, 1e-11)
	nearRel(t, "same fuel high", a.High, 112.2+3.6, 1e-11)

	diff := NewTotalModel(nil)
	addRows(t, e, diff, "A", `fuel_co2("natural_gas", q, "GJ", "twin")`, 1000)
	addRows(t, e, diff, "A", `fuel_co2("lpg", q, "GJ", "twin")`, 1000)
	b := diff.Interval(IntervalOptions{}).Interval
	nearRel(t, "two fuels low", b.Low, 112.2-math.Sqrt2*1.8, 1e-11)
	nearRel(t, "two fuels high", b.High, 112.2+math.Sqrt2*1.8, 1e-11)
	if (a.High-a.Low)/112.2 <= (b.High-b.Low)/112.2 {
		t.Errorf("shared factor %+v is not wider than independent factors %+v", a, b)
	}
}

// Activity data: the rows of one table share one quantity of the table's stated uncertainty;
// two tables are independent. Natural gas (IPCC 2006 Vol 2 Ch 1 Table 1.4, 56 100, 54 300-58 300)
// 1000 GJ twice in table A with activity ±5 %: Equation 3.1 per side on the sum 112.2 t,
// lower sqrt((0.05 x 112.2)² + 3.6²) = 6.6658, upper sqrt(5.61² + 4.4²) = 7.1297. In two tables
// the activity parts are independent: sqrt(2 x 2.805² + 3.6²) lower.
func TestTotalActivityUncertainty(t *testing.T) {
	e := newTestEngine(t)
	five := func(group, kind string) float64 {
		if kind != ActivityStationaryFuel {
			t.Errorf("kind %q, want %q", kind, ActivityStationaryFuel)
		}
		return 5
	}
	one := NewTotalModel(five)
	addRows(t, e, one, "A", `fuel_co2("natural_gas", q, "GJ")`, 1000, 1000)
	iv := one.Interval(IntervalOptions{}).Interval
	nearRel(t, "one table low", iv.Low, 112.2-math.Sqrt(5.61*5.61+3.6*3.6), 1e-11)
	nearRel(t, "one table high", iv.High, 112.2+math.Sqrt(5.61*5.61+4.4*4.4), 1e-11)

	two := NewTotalModel(five)
	addRows(t, e, two, "A", `fuel_co2("natural_gas", q, "GJ")`, 1000)
	addRows(t, e, two, "B", `fuel_co2("natural_gas", q, "GJ")`, 1000)
	iv = two.Interval(IntervalOptions{}).Interval
	nearRel(t, "two tables low", iv.Low, 112.2-math.Sqrt(2*2.805*2.805+3.6*3.6), 1e-11)

	// merging the tables' models gives the same as one model of both
	ma, mb := NewTotalModel(five), NewTotalModel(five)
	addRows(t, e, ma, "A", `fuel_co2("natural_gas", q, "GJ")`, 1000)
	addRows(t, e, mb, "B", `fuel_co2("natural_gas", q, "GJ")`, 1000)
	ma.Merge(mb)
	m := ma.Interval(IntervalOptions{}).Interval
	if *m != *iv {
		t.Errorf("merged %+v, one model %+v", m, iv)
	}
}

// Approach 2 agrees with Approach 1 on a total of small symmetric ranges (the twin rows ±3.2 %
// and activity ±2 %): bounds within 0.5 % of the total, and the same seed gives the same interval.
func TestTotalMonteCarloAgrees(t *testing.T) {
	e := engineWithFile(t, "twin.csv", twinPack)
	tm := NewTotalModel(func(string, string) float64 { return 2 })
	addRows(t, e, tm, "A", `fuel_co2("natural_gas", q, "GJ", "twin")`, 1000, 2000, 500)
	addRows(t, e, tm, "B", `fuel_co2("lpg", q, "GJ", "twin") - fuel_co2("natural_gas", q / 10, "GJ", "twin")`, 3000)
	v := 56.1*3.5 + 56.1*3 - 5.61*3
	a1 := tm.Interval(IntervalOptions{}).Interval
	opt := IntervalOptions{Approach: Approach2, Seed: 11, Draws: 100_000}
	a2 := tm.Interval(opt).Interval
	nearRel(t, "low", a2.Low, a1.Low, 0.005*v/a1.Low)
	nearRel(t, "high", a2.High, a1.High, 0.005*v/a1.High)
	if again := tm.Interval(opt).Interval; *again != *a2 {
		t.Errorf("same seed, different intervals: %+v %+v", a2, again)
	}
	if a2.Seed != 11 || a2.Draws != 100_000 || a2.Approach != Approach2 {
		t.Errorf("approach 2 does not say its seed and draws: %+v", a2)
	}
}

// Memory is bounded by the distinct products: 100 000 rows of two fuels hold 2 terms, and the
// interval is that of the summed amounts.
func TestTotalModelBounded(t *testing.T) {
	e := newTestEngine(t)
	tm := NewTotalModel(nil)
	qs := make([]float64, 50_000)
	for i := range qs {
		qs[i] = float64(i%7 + 1)
	}
	sum := addRows(t, e, tm, "A", `fuel_co2("natural_gas", q, "GJ")`, qs...)
	sum += addRows(t, e, tm, "A", `fuel_co2e("natural_gas", q, "TJ")`, qs...)
	if tm.Terms() > 4 {
		t.Errorf("%d terms for 100 000 rows of two plans, want at most 4 (CO2, CO2 + CH4 + N2O sharing CO2's rows)", tm.Terms())
	}
	iv := tm.Interval(IntervalOptions{}).Interval
	if iv == nil || !(iv.Low < sum && sum < iv.High) {
		t.Fatalf("interval %+v does not hold the sum %g", iv, sum)
	}
}

// A rule that is not a sum of calls, or calls a function without a model, gives no interval and
// says why.
func TestTotalNotModelled(t *testing.T) {
	e := newTestEngine(t)
	tm := NewTotalModel(nil)
	addRows(t, e, tm, "A", `2 * fuel_co2("natural_gas", q, "GJ")`, 1000)
	if ti := tm.Interval(IntervalOptions{}); ti.Interval != nil || ti.Note == "" {
		t.Errorf("got %+v", ti)
	}
}

// The activity defaults are read from the embedded table, one per kind, with a source each.
func TestActivityDefaults(t *testing.T) {
	ds, err := ActivityDefaults()
	if err != nil {
		t.Fatal(err)
	}
	if len(ds) != len(ActivityKinds()) {
		t.Fatalf("%d defaults for %d kinds", len(ds), len(ActivityKinds()))
	}
	for _, d := range ds {
		if d.Source == "" || d.Basis == "" || d.Percent < 0 || d.Percent >= MaxActivityPercent {
			t.Errorf("bad default %+v", d)
		}
	}
	bad := "kind,value_pct,basis,source,from_memory\nstationary_fuel,120,x,common practice,false\n"
	if _, err := parseActivityTable([]byte(bad), "t.csv"); err == nil {
		t.Error("120 % accepted")
	}
}
