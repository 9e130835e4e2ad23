package units

import (
	"math/big"
	"regexp"
	"testing"
)

func TestList(t *testing.T) {
	list := List()
	if len(list) == 0 {
		t.Fatal("List() is empty")
	}
	symbols := map[string]bool{}
	for i, e := range list {
		if symbols[e.Symbol] {
			t.Errorf("symbol %s listed twice", e.Symbol)
		}
		symbols[e.Symbol] = true
		exact, ok := new(big.Rat).SetString(e.Exact)
		if !ok || exact.Cmp(e.SI()) != 0 {
			t.Errorf("%s: Exact %q does not equal SI() %s", e.Symbol, e.Exact, e.SI().FloatString(20))
		}
		if i == 0 {
			continue
		}
		prev := list[i-1]
		if prev.Dim > e.Dim || prev.Dim == e.Dim && prev.SI().Cmp(e.SI()) > 0 {
			t.Errorf("List not sorted by dimension then factor: %s before %s", prev.Symbol, e.Symbol)
		}
	}
	for d := Energy; d <= lastDim; d++ {
		n := 0
		for _, e := range list {
			if e.Dim == d {
				n++
			}
		}
		if n == 0 {
			t.Errorf("no %s units listed", d)
		}
	}
	// Exact is a plain decimal: no exponent, no trailing zeros after a point; a reduced
	// fraction only where the factor has no finite decimal (Nm3).
	plain := regexp.MustCompile(`^(0|[1-9][0-9]*)(\.[0-9]*[1-9])?$`)
	fraction := regexp.MustCompile(`^[1-9][0-9]*/[1-9][0-9]*$`)
	for _, e := range list {
		if !plain.MatchString(e.Exact) && !fraction.MatchString(e.Exact) {
			t.Errorf("%s: Exact %q is neither a plain shortest decimal nor a fraction", e.Symbol, e.Exact)
		}
		if fraction.MatchString(e.Exact) && finiteDecimal(e.SI()) {
			t.Errorf("%s: Exact %q is a fraction, but the factor has a finite decimal", e.Symbol, e.Exact)
		}
	}
}

func TestListIsACopy(t *testing.T) {
	a := List()
	a[0].Symbol = "changed"
	for i := range a {
		if len(a[i].Spellings) > 0 {
			a[i].Spellings[0] = "changed"
		}
	}
	for _, e := range List() {
		if e.Symbol == "changed" || len(e.Spellings) > 0 && e.Spellings[0] == "changed" {
			t.Fatalf("List() returned shared storage: %v", e)
		}
	}
}

func TestListExamples(t *testing.T) {
	want := map[string]string{"Btu": "1055.05585262", "gal": "0.003785411784", "TWyr": "31536000000000000000", "mL": "0.000001",
		"Nm3": "1921/1821", "mi": "1609.344", "ft2": "0.09290304"} // 288.15/273.15 = 1921/1821
	for _, e := range List() {
		if w, ok := want[e.Symbol]; ok && e.Exact != w {
			t.Errorf("%s Exact = %q, want %q", e.Symbol, e.Exact, w)
		}
		if e.Symbol == "t" {
			for _, s := range []string{"tonne", "tonnes", "metric ton"} {
				found := false
				for _, sp := range e.Spellings {
					found = found || sp == s
				}
				if !found {
					t.Errorf("t does not list spelling %q", s)
				}
			}
		}
	}
}

// finiteDecimal reports whether r has a finite decimal expansion: its reduced denominator has
// no prime factor but 2 and 5.
func finiteDecimal(r *big.Rat) bool {
	d := new(big.Int).Set(r.Denom())
	m := new(big.Int)
	for _, p := range []int64{2, 5} {
		bp := big.NewInt(p)
		for m.Rem(d, bp).Sign() == 0 {
			d.Quo(d, bp)
		}
	}
	return d.Cmp(big.NewInt(1)) == 0
}
