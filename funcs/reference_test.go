package funcs

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"testing"
)

// TestReferenceChecks evaluates every row of testdata/reference_checks.csv:
// an expression, the value computed by hand from the cited publication and
// table, and a relative tolerance.
func TestReferenceChecks(t *testing.T) {
	f, err := os.Open("../testdata/reference_checks.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	e := newTestEngine(t)
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	for _, need := range []string{"expr", "expected", "rel_tol", "source"} {
		if _, ok := col[need]; !ok {
			t.Fatalf("reference_checks.csv has no column %q", need)
		}
	}
	if len(rows) < 40 {
		t.Fatalf("only %d reference rows", len(rows)-1)
	}
	for i, row := range rows[1:] {
		src, source := row[col["expr"]], row[col["source"]]
		want, err := strconv.ParseFloat(row[col["expected"]], 64)
		if err != nil {
			t.Fatalf("line %d: expected %q: %v", i+2, row[col["expected"]], err)
		}
		tol, err := strconv.ParseFloat(row[col["rel_tol"]], 64)
		if err != nil || tol <= 0 || tol > 0.01 {
			t.Fatalf("line %d: rel_tol %q must be in (0, 0.01]", i+2, row[col["rel_tol"]])
		}
		if source == "" {
			t.Fatalf("line %d: no source", i+2)
		}
		t.Run(strconv.Itoa(i+2), func(t *testing.T) {
			p, err := e.Compile(src)
			if err != nil {
				t.Fatalf("%s: %v", src, err)
			}
			got, err := p.Eval(nil)
			if err != nil {
				t.Fatalf("%s: %v", src, err)
			}
			if rel := math.Abs(got.Value-want) / math.Max(math.Abs(want), 1e-300); rel > tol {
				t.Errorf("%s = %v, want %v ± %g relative (%s)", src, got.Value, want, tol, source)
			}
		})
	}
}

func newTestEngine(t testing.TB) *Engine {
	t.Helper()
	e, err := New()
	if err != nil {
		t.Fatal(err)
	}
	return e
}
