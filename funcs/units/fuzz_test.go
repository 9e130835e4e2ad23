package units

import (
	"errors"
	"math"
	"testing"
)

// FuzzParse: Parse never panics; a parsed unit's String() parses back to the same unit; every
// failure is an *Error with a known code and a message.
func FuzzParse(f *testing.F) {
	for _, e := range List() {
		f.Add(e.Symbol)
		for _, s := range e.Spellings {
			f.Add(s)
		}
	}
	for _, s := range []string{"", " ", "MMBtu HHV", "GJ (NCV)", "GJ [LHV]", "MWh, GCV", "GJ NCV HHV", "ton",
		"MT", "mt", "gal (UK)", "kg HHV", "kwhh", "m³", "\u00a0GJ\tNCV ", "(", ")", "[]", ",", "GJ(", "GJ )",
		"MWh,,GCV", "\xff\xfe", "Ａ", "İ", "ǅ", "Thousand Gallons", "Million kWh", "Billion Btu HHV",
		"'000 L", "thousand", "thousand of", "’000tonnes", "EA", "Vehicle(s)", "Mgal", "thousand tons"} {
		f.Add(s)
	}
	codes := map[string]bool{CodeUnknown: true, CodeAmbiguous: true, CodeBasis: true}
	f.Fuzz(func(t *testing.T, s string) {
		u, err := Parse(s)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || !codes[e.Code] || e.Msg == "" || e.Input != s {
				t.Fatalf("Parse(%q): error %#v", s, err)
			}
			if u != (Unit{}) {
				t.Fatalf("Parse(%q) returned %v with an error", s, u)
			}
			if (e.Code == CodeAmbiguous) != (len(e.Alternatives) > 0) {
				t.Fatalf("Parse(%q): code %s with alternatives %q", s, e.Code, e.Alternatives)
			}
			if e.Suggestion != "" {
				if _, err := Parse(e.Suggestion); err != nil {
					t.Fatalf("Parse(%q) suggests %q, which does not parse: %v", s, e.Suggestion, err)
				}
			}
			return
		}
		if !u.Dim.valid() || u.Symbol == "" || u.Basis != NoBasis && u.Dim != Energy {
			t.Fatalf("Parse(%q) = %#v", s, u)
		}
		back, err := Parse(u.String())
		if err != nil || back != u {
			t.Fatalf("Parse(%q) = %v, but Parse(%q) = %v, %v", s, u, u.String(), back, err)
		}
		if _, err := ParseAs(s, u.Dim); err != nil {
			t.Fatalf("ParseAs(%q, %s): %v", s, u.Dim, err)
		}
	})
}

// FuzzRoundTrip: a value converted from A to B and back is within 1e-12 relative of itself,
// for all pairs of units of the same dimension, listed units and units with a magnitude word.
func FuzzRoundTrip(f *testing.F) {
	for _, v := range []float64{1, 0, -1, 3.6, 1e-9, 1e12, 123.456, -7.25e5, 1e-300, 1e300, math.SmallestNonzeroFloat64} {
		f.Add(v)
	}
	list := List()
	for _, s := range []string{"thousand MWh", "million kWh", "billion Btu", "thousand short_ton", "million gal", "quadrillion J"} {
		list = append(list, Entry{Unit: mustParse(f, s)})
	}
	f.Fuzz(func(t *testing.T, v float64) {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			if _, err := Convert(v, list[0].Unit, list[0].Unit); err == nil {
				t.Fatalf("Convert(%v) gave no error", v)
			}
			return
		}
		for _, a := range list {
			for _, b := range list {
				if a.Dim != b.Dim {
					continue
				}
				mid, err := Convert(v, a.Unit, b.Unit)
				if err != nil {
					var e *Error
					if !errors.As(err, &e) || e.Code != CodeNotANumber {
						t.Fatalf("Convert(%v, %s, %s): %v", v, a.Symbol, b.Symbol, err)
					}
					continue // beyond the float64 range
				}
				if v != 0 && math.Abs(mid) < 0x1p-1000 {
					continue // near or below the subnormal range: precision is gone, not a factor error
				}
				back, err := Convert(mid, b.Unit, a.Unit)
				if err != nil {
					t.Fatalf("Convert(%v, %s, %s): %v", mid, b.Symbol, a.Symbol, err)
				}
				if rel := math.Abs(back-v) / math.Abs(v); v == 0 && back != 0 || v != 0 && rel > 1e-12 {
					t.Fatalf("%v %s -> %v %s -> %v %s (relative error %g)", v, a.Symbol, mid, b.Symbol, back, a.Symbol, rel)
				}
			}
		}
	})
}
