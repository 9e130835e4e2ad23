package importer

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/demo"
)

func nearRel(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (± %g relative)", what, got, want, rel)
	}
}

// gasDieselLog writes a fuel log of natural gas 1000 and 2000 GJ and diesel 1000 GJ.
func gasDieselLog(t *testing.T) string {
	t.Helper()
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"natural gas", 1000, "GJ"}, {"natural gas", 2000, "GJ"}, {"diesel", 1000, "GJ"}})
	return save(t, f, filepath.Join(t.TempDir(), "gas-diesel.xlsx"))
}

// The Scope 1 total of a fuel log by Approach 1, by hand. CO2 factors of IPCC 2006 Vol 2 Ch 1
// Table 1.4: natural gas 56 100 kg/TJ (54 300-58 300), gas/diesel oil 74 100 (72 600-74 800); the
// CH4 and N2O rows of the pack publish no range. 3 TJ of gas give 168.3 t CO2, whose factor moves
// it by -5.4/+6.6 t (168.3 x 1800/56 100, 168.3 x 2200/56 100); 1 TJ of diesel 74.1 t, -1.5/+0.7 t.
// The table's amounts share one activity quantity, ±5 % (stationary fuel default): 0.05 x the
// total T. Equation 3.2 per side (the factors are independent; the one gas factor counts once
// for both gas rows): lower sqrt(5.4² + 1.5² + (0.05 T)²), upper sqrt(6.6² + 0.7² + (0.05 T)²).
func TestTotalIntervalByHand(t *testing.T) {
	rep := scanFile(t, gasDieselLog(t), Options{})
	T := rep.Totals.TCO2e
	nearRel(t, "CO2", rep.Totals.TCO2, 168.3+74.1, 1e-12)
	if !rep.Totals.HasInterval() {
		t.Fatalf("no interval: %q", rep.Totals.IntervalNote)
	}
	a := 0.05 * T
	nearRel(t, "low", rep.Totals.Low, T-math.Sqrt(5.4*5.4+1.5*1.5+a*a), 1e-9)
	nearRel(t, "high", rep.Totals.High, T+math.Sqrt(6.6*6.6+0.7*0.7+a*a), 1e-9)
	st := kindTotalOf(rep, KindStationary)
	if !st.HasInterval() || st.Low != rep.Totals.Low || st.Approach != "approach1" {
		t.Errorf("stationary %+v, Scope 1 %+v: one kind, the same interval", st.TotalInterval, rep.Totals.TotalInterval)
	}
	if tb := rep.Tables[0]; !tb.Totals.HasInterval() || tb.Totals.Low != rep.Totals.Low {
		t.Errorf("table totals %+v", tb.Totals)
	}
	if !strings.Contains(st.IntervalNote, "ipcc2006/natural_gas/ch4_ef") {
		t.Errorf("the rows without a range are not named: %q", st.IntervalNote)
	}
	u := rep.Uncertainty
	if u == nil || u.Approach != "approach1" || len(u.Activity) != 1 || u.Activity[0].Table != "Fuel log!A1" ||
		u.Activity[0].Kind != funcs.ActivityStationaryFuel || u.Activity[0].Percent != 5 || !strings.Contains(u.Activity[0].From, "Table 2.15") {
		t.Errorf("uncertainty %+v", u)
	}
}

// The mapping's activity_uncertainty replaces the default for its table: at 0 % only the factors
// remain, sqrt(5.4² + 1.5²) below and sqrt(6.6² + 0.7²) above (by hand, as above); at 10 % the
// activity part is 0.1 T. A value out of 0..100 is an error naming the table's key.
func TestMappingActivityUncertainty(t *testing.T) {
	in := gasDieselLog(t)
	ins, err := Inspect(context.Background(), testEngine(t), in, Options{})
	must(t, err)
	for _, c := range []struct {
		pct       float64
		low, high func(T float64) float64
	}{
		{0, func(T float64) float64 { return T - math.Hypot(5.4, 1.5) }, func(T float64) float64 { return T + math.Hypot(6.6, 0.7) }},
		{10, func(T float64) float64 { return T - math.Sqrt(5.4*5.4+1.5*1.5+0.01*T*T) }, func(T float64) float64 { return T + math.Sqrt(6.6*6.6+0.7*0.7+0.01*T*T) }},
	} {
		mf := ins.MappingFile()
		mf.Tables[0].ActivityUncertainty = &c.pct
		p := filepath.Join(t.TempDir(), "m.json")
		must(t, mf.Write(p))
		m, err := LoadMapping(testEngine(t), p)
		must(t, err)
		rep := scanFile(t, in, Options{Mapping: m})
		T := rep.Totals.TCO2e
		if !rep.Totals.HasInterval() {
			t.Fatalf("%g %%: no interval: %q", c.pct, rep.Totals.IntervalNote)
		}
		nearRel(t, "low", rep.Totals.Low, c.low(T), 1e-9)
		nearRel(t, "high", rep.Totals.High, c.high(T), 1e-9)
		if a := rep.Uncertainty.Activity; len(a) != 1 || a[0].Percent != c.pct || a[0].From != "mapping" {
			t.Errorf("%g %%: activity %+v", c.pct, a)
		}
	}
	doc := `{"fluecell_mapping": 1, "tables": [{"sheet": "Fuel log", "header_row": 1, "activity_uncertainty": 150, "columns": []}]}`
	_, err = ParseMapping(testEngine(t), "m.json", []byte(doc))
	if err == nil || !strings.Contains(err.Error(), "tables[0].activity_uncertainty") || !strings.Contains(err.Error(), "from 0 to below 100") {
		t.Errorf("activity_uncertainty 150: %v", err)
	}
	doc = strings.Replace(doc, "150", `"5 %"`, 1)
	if _, err = ParseMapping(testEngine(t), "m.json", []byte(doc)); err == nil || !strings.Contains(err.Error(), "activity_uncertainty") {
		t.Errorf("activity_uncertainty \"5 %%\": %v", err)
	}
}

// twinPack: an invented pack of two fuels with the same CO2 factor and symmetric range,
// 56 100 kg/TJ (54 300-57 900), so that only their correlation differs.
const twinPack = "pack,id,quantity,value,unit,low,high,basis,source,from_memory\n" +
	"twin,natural_gas,co2_ef,56100,kg CO2/TJ,54300,57900,NCV,invented test row,false\n" +
	"twin,lpg,co2_ef,56100,kg CO2/TJ,54300,57900,NCV,invented test row,false\n"

func twinScan(t *testing.T, rows [][]any, opt Options) *Report {
	t.Helper()
	dir := t.TempDir()
	pack := filepath.Join(dir, "twin.csv")
	must(t, os.WriteFile(pack, []byte(twinPack), 0o644))
	e, err := funcs.New(funcs.WithFactorFiles(pack))
	must(t, err)
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, append([][]any{{"Fuel", "Quantity", "Unit"}}, rows...))
	opt.Rules = []string{`tCO2e = fuel_co2(fuel, quantity, unit, "twin")`}
	res, err := Scan(context.Background(), e, save(t, f, filepath.Join(dir, "twin.xlsx")), opt)
	must(t, err)
	return res.Report
}

// Two rows of the same fuel share its factor: 112.2 t ± sqrt(3.6² + 5.61²) with the table's
// ±5 % activity (0.05 x 112.2 = 5.61, one quantity for the table). Two fuels of the same range
// are independent: ± sqrt(1.8² + 1.8² + 5.61²). By hand from Equations 3.1 and 3.2.
func TestTotalSharedFactorWider(t *testing.T) {
	same := twinScan(t, [][]any{{"natural gas", 1000, "GJ"}, {"natural gas", 1000, "GJ"}}, Options{})
	diff := twinScan(t, [][]any{{"natural gas", 1000, "GJ"}, {"LPG", 1000, "GJ"}}, Options{})
	for _, r := range []*Report{same, diff} {
		if k := kindTotalOf(r, KindStationary); !k.HasInterval() || !near(k.TCO2e, 112.2) {
			t.Fatalf("total %+v; by kind %+v; tables %+v", k, r.ByKind, r.Tables)
		}
	}
	s, d := kindTotalOf(same, KindStationary), kindTotalOf(diff, KindStationary)
	nearRel(t, "same fuel low", s.Low, 112.2-math.Sqrt(3.6*3.6+5.61*5.61), 1e-9)
	nearRel(t, "two fuels low", d.Low, 112.2-math.Sqrt(2*1.8*1.8+5.61*5.61), 1e-9)
	if s.High-s.Low <= d.High-d.Low {
		t.Errorf("same fuel %g..%g is not wider than two fuels %g..%g", s.Low, s.High, d.Low, d.High)
	}
}

// Approach 2 agrees with Approach 1 on a workbook total of small symmetric ranges (the twin
// rows ±3.2 %, activity ±5 %): the bounds within 0.5 % of the total (10⁵ draws), reproducibly.
func TestTotalMonteCarloAgreesWithPropagation(t *testing.T) {
	rows := [][]any{{"natural gas", 1000, "GJ"}, {"LPG", 2500, "GJ"}, {"natural gas", 400, "GJ"}}
	a1 := kindTotalOf(twinScan(t, rows, Options{}), KindStationary)
	opt := Options{Uncertainty: funcs.IntervalOptions{Approach: funcs.Approach2, Seed: 4, Draws: 100_000}}
	rep := twinScan(t, rows, opt)
	a2 := kindTotalOf(rep, KindStationary)
	if !a1.HasInterval() || !a2.HasInterval() || a2.Approach != "approach2" {
		t.Fatalf("approach 1 %+v, approach 2 %+v", a1.TotalInterval, a2.TotalInterval)
	}
	v := a1.TCO2e
	nearRel(t, "low", a2.Low, a1.Low, 0.005*v/a1.Low)
	nearRel(t, "high", a2.High, a1.High, 0.005*v/a1.High)
	if u := rep.Uncertainty; u.Seed != 4 || u.Draws != 100_000 || !strings.Contains(u.Method, "seed 4") {
		t.Errorf("the report gives no seed and draws: %+v", u)
	}
	if again := kindTotalOf(twinScan(t, rows, opt), KindStationary); again.Low != a2.Low || again.High != a2.High {
		t.Errorf("same seed, different intervals: %+v %+v", a2.TotalInterval, again.TotalInterval)
	}
}

// The demo's fuel log: its Scope 1 total carries an interval holding it, and the summary sheet
// shows the interval beside the total.
func TestDemoFuelLogInterval(t *testing.T) {
	paths, err := demo.Write(t.TempDir())
	must(t, err)
	rep := scanFile(t, paths[0], Options{})
	tot := rep.Totals
	if !tot.HasInterval() || !(tot.Low < tot.TCO2e && tot.TCO2e < tot.High) || tot.Approach != "approach1" {
		t.Fatalf("demo fuel log totals %+v", tot)
	}
	// at least the table's activity part (±5 %) and at most a third of the total
	if lo := tot.TCO2e - tot.Low; lo < 0.05*tot.TCO2e || lo > tot.TCO2e/3 {
		t.Errorf("lower half-width %g of %g", lo, tot.TCO2e)
	}
}
