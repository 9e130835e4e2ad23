package funcs

import (
	"fmt"
	"math"
	"slices"
	"testing"

	"github.com/fluecell/fluecell/funcs/units"
)

// TestGallonNoteInResults: a bare gallon is the US gallon and the result says so; an
// imperial or a US spelling carries no note. The ratio of the two results is the ratio of the
// gallons: 4.54609 L (UK Weights and Measures Act 1985) to 3.785411784 L (NIST SP 811
// Appendix B.8).
func TestGallonNoteInResults(t *testing.T) {
	e := newTestEngine(t)
	us, err := e.Call("fuel_co2", map[string]string{"fuel": "diesel", "amount": "100", "unit": "gallons"})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(us.Notes, units.GallonNote) {
		t.Errorf("fuel_co2 in gallons: notes %q, want %q", us.Notes, units.GallonNote)
	}
	imp, err := evalExpr(e, `fuel_co2("diesel", 100, "imperial gallons")`)
	if err != nil {
		t.Fatal(err)
	}
	if slices.Contains(imp.Notes, units.GallonNote) {
		t.Errorf("fuel_co2 in imperial gallons: notes %q, want no gallon note", imp.Notes)
	}
	if got, want := imp.Value/us.Value, 4.54609/3.785411784; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("imperial/US = %v, want %v (UK WMA 1985 / NIST SP 811)", got, want)
	}
	for _, src := range []string{`fuel_co2("diesel", 100, "US gallons")`, `fuel_co2("diesel", 100, "L")`, `to_unit(1, "gal (US)", "L")`} {
		r, err := evalExpr(e, src)
		if err != nil {
			t.Fatal(err)
		}
		if slices.Contains(r.Notes, units.GallonNote) {
			t.Errorf("%s: notes %q, want no gallon note", src, r.Notes)
		}
	}
	r, err := evalExpr(e, `to_unit(10, "gal", "L")`)
	if err != nil || r.Value != 37.85411784 || !slices.Contains(r.Notes, units.GallonNote) {
		t.Errorf(`to_unit(10, "gal", "L") = %v %q, %v; want 37.85411784 L (NIST SP 811) with the gallon note`, r.Value, r.Notes, err)
	}
}

// TestNegativeAmountNote: a negative amount is computed as given, with a note.
func TestNegativeAmountNote(t *testing.T) {
	e := newTestEngine(t)
	neg, err := evalExpr(e, `fuel_co2("natural_gas", -1000, "GJ")`)
	if err != nil {
		t.Fatal(err)
	}
	// IPCC 2006 Vol 2 Ch 1 Table 1.4: natural gas 56 100 kg CO2/TJ, so -1000 GJ is -56.1 t CO2.
	if neg.Value != -56.1 || !slices.Contains(neg.Notes, NegativeAmountNote) {
		t.Errorf("fuel_co2(natural_gas, -1000, GJ) = %v %q; want -56.1 with %q", neg.Value, neg.Notes, NegativeAmountNote)
	}
	if NegativeAmountNote != "negative amount: a return or correction?" {
		t.Errorf("NegativeAmountNote = %q", NegativeAmountNote)
	}
	c, err := e.Call("fuel_co2", map[string]string{"fuel": "natural_gas", "amount": "-1000", "unit": "GJ"})
	if err != nil || !slices.Contains(c.Notes, NegativeAmountNote) {
		t.Errorf("Call fuel_co2 amount -1000: %q, %v", c.Notes, err)
	}
	pos, err := evalExpr(e, `fuel_co2("natural_gas", 1000, "GJ") + to_unit(-5, "t", "kg")`)
	if err != nil || slices.Contains(pos.Notes, NegativeAmountNote) {
		t.Errorf("positive amount (and a negative to_unit value): notes %q, %v; want no negative-amount note", pos.Notes, err)
	}
}

// TestOverflowNamesParameter: a result beyond the float64 range names the argument and the
// range that gives a finite result with the other arguments as given.
func TestOverflowNamesParameter(t *testing.T) {
	e := newTestEngine(t)
	for _, c := range []struct {
		tmpl, value, want string
		limit             float64
	}{
		// 1 t = 1000 kg (SI): the limit is the largest float64 / 1000, rounded down.
		{`to_unit(%s, "t", "kg")`, "1e307", `to_unit: value 1e+307 gives a result beyond the float64 range (+Inf): with the other arguments as given, value must lie between -1.79e+305 and 1.79e+305`, 1.79e305},
		{`to_unit(%s, "t", "kg")`, "-1e307", `to_unit: value -1e+307 gives a result beyond the float64 range (-Inf): with the other arguments as given, value must lie between -1.79e+305 and 1.79e+305`, -1.79e305},
		// CO2 = C x 44/12 (IPCC 2006 Vol 2 Ch 1): the limit is the largest float64 x 12/44.
		{`co2_from_carbon(%s)`, "1e308", `co2_from_carbon: mass 1e+308 gives a result beyond the float64 range (+Inf): with the other arguments as given, mass must lie between -4.9e+307 and 4.9e+307`, 4.9e307},
	} {
		_, err := evalExpr(e, fmt.Sprintf(c.tmpl, c.value))
		fe, ok := AsError(err)
		if !ok || fe.Code != CodeArithmetic || fe.Headline() != c.want+" (character 1)" {
			t.Errorf("%s:\n got: %v\nwant: %s", c.tmpl, err, c.want)
			continue
		}
		// The stated limit gives a finite result; ten times it does not.
		if r, err := evalExpr(e, fmt.Sprintf(c.tmpl, FormatNumber(c.limit))); err != nil || math.IsInf(r.Value, 0) {
			t.Errorf("%s at the stated limit %v: %v, %v", c.tmpl, c.limit, r.Value, err)
		}
		if _, err := evalExpr(e, fmt.Sprintf(c.tmpl, FormatNumber(10*c.limit))); err == nil {
			t.Errorf("%s at ten times the stated limit: no error", c.tmpl)
		}
	}
	_, err := e.Call("to_unit", map[string]string{"value": "1e400", "from": "t", "to": "kg"})
	if fe, ok := AsError(err); !ok || fe.Param != "value" ||
		fe.Error() != "to_unit: value 1e400 is beyond the float64 range: give a number between -1.7976931348623157e308 and 1.7976931348623157e308" {
		t.Errorf("value 1e400: %v", err)
	}
	if _, err := e.CallValues("to_unit", math.Inf(1), "t", "kg"); err == nil ||
		err.Error() != "to_unit: value: expected a finite number between -1.7976931348623157e308 and 1.7976931348623157e308, got +Inf" {
		t.Errorf("value +Inf: %v", err)
	}
}
