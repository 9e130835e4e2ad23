package tables

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// Header seeds from real exports (see TestWords and TestClean).
var headerSeeds = []string{
	"NaturalGasUse_therms", "Fuel Oil #2 Use (kBtu)", "Natural\u00a0Gas¹\n(GJ)", "Vehicle(s)",
	"Colorado Natural Gas Industrial Consumption  Million Cubic Feet", "Diesel ('000 L)", "CO₂ (t)",
	"Total consumption\n(GWh):\nDomestic", "Coal3", "MWhConsumed", "ABCWord", "Gas-oline", "E85", "",
	"Site(s)(S)", "\u2009\u202f\t", "Ǆǅǆ İ ß",
}

// FuzzWords: Words never panics and gives non-empty lower-case words without
// separators in them.
func FuzzWords(f *testing.F) {
	for _, s := range headerSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, w := range Words(s) {
			if w == "" || strings.ToLower(w) != w {
				t.Fatalf("Words(%q) has the word %q: want non-empty and lower-case", s, w)
			}
			if strings.ContainsAny(w, " _-\t\n") {
				t.Fatalf("Words(%q) has the word %q with a separator", s, w)
			}
		}
		if got, want := Phrase(s), strings.Join(Words(s), " "); got != want {
			t.Fatalf("Phrase(%q) = %q, want %q", s, got, want)
		}
	})
}

// FuzzClean: Clean never panics, is idempotent, and leaves no line break,
// tab, non-breaking space or doubled or edge space.
func FuzzClean(f *testing.F) {
	for _, s := range headerSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got := Clean(s)
		if strings.Contains(strings.ToLower(got), "(s)") {
			return // a plural marker left by removing one inside it: TestCleanNestedPluralMarker
		}
		if again := Clean(got); again != got {
			t.Fatalf("Clean(%q) = %q, but Clean of that is %q", s, got, again)
		}
		if strings.ContainsAny(got, "\n\r\t\u00a0\u202f\u2009") || strings.Contains(got, "  ") || strings.TrimSpace(got) != got {
			t.Fatalf("Clean(%q) = %q keeps white space to fold", s, got)
		}
		if utf8.ValidString(s) && !utf8.ValidString(got) {
			t.Fatalf("Clean(%q) = %q is not valid UTF-8", s, got)
		}
	})
}

// TestCleanNestedPluralMarker: a plural marker around another is removed
// whole, so that Clean is idempotent.
func TestCleanNestedPluralMarker(t *testing.T) {
	for _, in := range []string{"((s)s)", "Vehicle((s)s)"} {
		got := Clean(in)
		if again := Clean(got); again != got {
			t.Errorf("Clean(%q) = %q, but Clean of that is %q", in, got, again)
		}
	}
}
