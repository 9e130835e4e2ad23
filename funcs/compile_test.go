package funcs

import (
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"
)

// TestCompileRefuses checks the allow-list: everything outside it is a
// compile error with a column.
func TestCompileRefuses(t *testing.T) {
	e := newTestEngine(t)
	refused := map[string]string{
		`map([1, 2], # * 2)`:                 "map() is not available",
		`filter([1], # > 0)`:                 "filter() is not available",
		`sum([1, 2])`:                        "sum() is not available",
		`len("abc")`:                         "len() is not available",
		`max(1, 2)`:                          "max() is not available",
		`1..3`:                               `operator ".." is not allowed`,
		`"a" matches "b"`:                    `operator "matches" is not allowed`,
		`"a" contains "b"`:                   `operator "contains" is not allowed`,
		`"a" startsWith "b"`:                 `operator "startsWith" is not allowed`,
		`1 in [1]`:                           `operator "in" is not allowed`,
		`let a = 1; a`:                       "let is not allowed",
		`if q > 1 { 2 } else { 3 }`:          "if/else is not allowed",
		`q.x`:                                "member access",
		`q?.x`:                               "member access",
		`q[0]`:                               "member access",
		`[1, 2]`:                             "arrays and maps are not allowed",
		`{"a": 1}`:                           "arrays and maps are not allowed",
		`nil`:                                "nil is not allowed",
		`q ?? 1`:                             `operator "??" is not allowed`,
		`q | 1`:                              "",
		`1; 2`:                               "several expressions",
		`__run`:                              "reserved",
		`$env`:                               "",
		`fuel_co2`:                           "is a function",
		`fuel_co2("diesel", 1, "L")(1)`:      "unexpected token",
		`now()`:                              "now() is not available",
		`fuel_co2("diesel", 1, "L", "x", 1)`: "takes 3 to 4 arguments",
	}
	for src, want := range refused {
		t.Run(src, func(t *testing.T) {
			_, err := e.Compile(src)
			if err == nil {
				t.Fatalf("%s compiled", src)
			}
			fe, ok := AsError(err)
			if !ok || (fe.Code != CodeCompile && fe.Code != CodeUnknownFunction) {
				t.Fatalf("%s: %v (code %v)", src, err, fe)
			}
			if want != "" && !strings.Contains(fe.Msg, want) {
				t.Errorf("%s: message %q does not contain %q", src, fe.Msg, want)
			}
			if fe.Position < 1 {
				t.Errorf("%s: no column", src)
			}
		})
	}
}

// TestCompileAllows checks every allowed construct evaluates as expected.
func TestCompileAllows(t *testing.T) {
	e := newTestEngine(t)
	vars := map[string]any{"q": 10.0, "fuel": "natural_gas", "unit": "GJ", "flag": true}
	tests := map[string]float64{
		`q * 56.1 / 1000`:            0.561,
		`-q + 2`:                     -8,
		`+q`:                         10,
		`q ** 2`:                     100,
		`q ^ 2`:                      100,
		`7 % 4`:                      3,
		`q > 5 ? 1 : 2`:              1,
		`q >= 10 && q <= 10 ? 1 : 0`: 1,
		`q < 5 || q != 10 ? 1 : 0`:   0,
		`not (q == 10) ? 1 : 0`:      0,
		`!flag ? 1 : 0`:              0,
		`q > 5 and fuel == "natural_gas" ? 3 : 4`:             3,
		`q < 5 or fuel != "natural_gas" ? 3 : 4`:              4,
		`fuel_co2(fuel, q * 100, unit)`:                       56.1,
		`fuel_co2(fuel, q, "TJ") - fuel_co2("gas", 10, "TJ")`: 0,
		`1e3 + 0.5`: 1000.5,
	}
	for src, want := range tests {
		p, err := e.Compile(src, WithVariables("q", "fuel", "unit", "flag"))
		if err != nil {
			t.Errorf("%s: %v", src, err)
			continue
		}
		got, err := p.Eval(vars)
		if err != nil {
			t.Errorf("%s: %v", src, err)
			continue
		}
		if math.Abs(got.Value-want) > 1e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("%s = %v, want %v", src, got.Value, want)
		}
	}
}

// TestCaret checks that a compile error points at the offending column.
func TestCaret(t *testing.T) {
	e := newTestEngine(t)
	_, err := e.Compile(`fuel_co2(fuel, q, "kwhh") + 1`, WithVariables("fuel", "q"))
	want := "fuel_co2: unit: unknown unit \"kwhh\" (did you mean kWh?) (character 19)\n" +
		" | fuel_co2(fuel, q, \"kwhh\") + 1\n" +
		" |                   ^"
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
	_, err = e.Compile("q +\n  qq", WithVariables("q", "qty"))
	want = "expr: unknown variable \"qq\" (did you mean q?); known variables: q, qty (character 7)\n | " + "  qq\n |   ^"
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
	_, err = e.Compile(`fuel_co2("diesel", 1, "L"`)
	if fe, ok := AsError(err); !ok || fe.Code != CodeCompile || fe.Position != 25 {
		t.Errorf("unclosed call: %v", err)
	}
}

func TestLimits(t *testing.T) {
	e := newTestEngine(t)
	long := strings.Repeat("1+", MaxExprLength/2) + "1"
	if _, err := e.Compile(long); err == nil || !strings.Contains(err.Error(), "the limit is 4096") {
		t.Errorf("long source: %v", err)
	}
	many := strings.Repeat("q+", MaxExprNodes) + "q"
	if _, err := e.Compile(many); err == nil || !strings.Contains(err.Error(), "more than 400 parts") {
		t.Errorf("many nodes: %v", err)
	}
}

func TestStaticUnit(t *testing.T) {
	e := newTestEngine(t)
	tests := map[string]string{
		`fuel_co2("gas", q, "GJ")`:                                    "t CO2",
		`fuel_co2e("gas", q, "GJ") + fuel_co2e("coal", q, "t")`:       "t CO2e",
		`fuel_co2("gas", q, "GJ") + fuel_co2e("coal", q, "t")`:        "",
		`fuel_co2("gas", q, "GJ") * 1000`:                             "",
		`-fuel_carbon("gas", q, "GJ")`:                                "t C",
		`q > 1 ? fuel_co2("gas", q, "GJ") : fuel_co2("coal", q, "t")`: "t CO2",
		`to_unit(q, "MWh", "GJ")`:                                     "GJ",
		`fuel_energy("gas", q, "t", "MMBtu HHV")`:                     "MMBtu HHV",
		`fuel_energy("gas", q, "t")`:                                  "GJ",
		`ppm_from_gtc(q)`:                                             "ppm",
		`q * 2`:                                                       "",
	}
	for src, want := range tests {
		p, err := e.Compile(src)
		if err != nil {
			t.Fatal(err)
		}
		if p.Unit() != want {
			t.Errorf("%s: unit %q, want %q", src, p.Unit(), want)
		}
		if r, err := p.Eval(map[string]any{"q": 2.0}); err != nil || r.Unit != want {
			t.Errorf("%s: result unit %q (%v), want %q", src, r.Unit, err, want)
		}
	}
}

// TestRunnerReuse checks that a Runner's provenance is per row.
func TestRunnerReuse(t *testing.T) {
	e := newTestEngine(t)
	p, err := e.Compile(`fuel_co2(fuel, q, unit)`, WithVariables("fuel", "q", "unit"))
	if err != nil {
		t.Fatal(err)
	}
	r := p.NewRunner()
	a, err := r.Run(map[string]any{"fuel": "diesel", "q": 1.0, "unit": "t"})
	if err != nil {
		t.Fatal(err)
	}
	a = a.Clone()
	b, err := r.Run(map[string]any{"fuel": "natural_gas", "q": 1.0, "unit": "TJ"})
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(a.FactorKeys(), ","); got != "ipcc2006/gas_diesel_oil/ncv,ipcc2006/gas_diesel_oil/co2_ef" {
		t.Errorf("first row sources %s", got)
	}
	if got := strings.Join(b.FactorKeys(), ","); got != "ipcc2006/natural_gas/co2_ef" {
		t.Errorf("second row sources %s", got)
	}
	if len(a.Notes) != 1 || len(b.Notes) != 0 {
		t.Errorf("notes: %q then %q", a.Notes, b.Notes)
	}
	if _, err := r.Run(map[string]any{"fuel": "diesel", "q": 1.0}); err == nil || !strings.Contains(err.Error(), `variable "unit" has no value`) {
		t.Errorf("missing variable: %v", err)
	}
	if _, err := r.Run(map[string]any{"fuel": "diesel", "q": "lots", "unit": "t"}); err == nil || !strings.Contains(err.Error(), `amount: expected a number, got the string "lots"`) {
		t.Errorf("text amount: %v", err)
	}
}

// TestConcurrentEval runs one Program from many goroutines (go test -race).
func TestConcurrentEval(t *testing.T) {
	e := newTestEngine(t)
	p, err := e.Compile(`fuel_co2e(fuel, q, "GJ", gwp_set)`, WithVariables("fuel", "q", "gwp_set"))
	if err != nil {
		t.Fatal(err)
	}
	fuels := []string{"natural_gas", "diesel", "coal", "lignite", "wood"}
	sets := []string{"ar4", "ar5", "ar6"}
	want := map[string]float64{}
	for _, f := range fuels {
		for _, s := range sets {
			r, err := p.Eval(map[string]any{"fuel": f, "q": 1000.0, "gwp_set": s})
			if err != nil {
				t.Fatal(err)
			}
			want[f+s] = r.Value
		}
	}
	var wg sync.WaitGroup
	errs := make(chan error, 8)
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func(g int) {
			defer wg.Done()
			r := p.NewRunner()
			for i := 0; i < 300; i++ {
				f, s := fuels[(i+g)%len(fuels)], sets[i%len(sets)]
				var res Result
				var err error
				if i%2 == 0 {
					res, err = r.Run(map[string]any{"fuel": f, "q": 1000.0, "gwp_set": s})
				} else {
					res, err = p.Eval(map[string]any{"fuel": f, "q": 1000.0, "gwp_set": s})
				}
				if err != nil {
					errs <- err
					return
				}
				if res.Value != want[f+s] {
					errs <- fmt.Errorf("%s %s: %v, want %v", f, s, res.Value, want[f+s])
					return
				}
			}
		}(g)
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Error(err)
	}
}
