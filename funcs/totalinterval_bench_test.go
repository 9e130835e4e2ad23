package funcs

import "testing"

// The cost of modelling a row for the interval of a total: RunTracked + AddTo against Run,
// on fuel_co2e of natural gas (three terms sharing the chain's rows).
func benchRow(b *testing.B, tracked bool) {
	e := newTestEngine(b)
	p, err := e.Compile(`fuel_co2e("natural_gas", q, "GJ")`, WithVariables("q"))
	if err != nil {
		b.Fatal(err)
	}
	r := p.NewRunner()
	tm := NewTotalModel(func(string, string) float64 { return 5 })
	vars := map[string]any{"q": 1000.0}
	for b.Loop() {
		if tracked {
			if _, err := r.RunTracked(vars); err != nil {
				b.Fatal(err)
			}
			r.AddTo(tm, "A")
		} else if _, err := r.Run(vars); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkRowRun(b *testing.B)        { benchRow(b, false) }
func BenchmarkRowRunTracked(b *testing.B) { benchRow(b, true) }
