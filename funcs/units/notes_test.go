package units

import "testing"

// TestImperialGallonSpellings: a spelling that says imperial or UK is the imperial gallon,
// 4.54609 L (UK Weights and Measures Act 1985); one that says US, or nothing, the US gallon,
// 3.785411784 L (NIST SP 811 Appendix B.8).
func TestImperialGallonSpellings(t *testing.T) {
	for _, s := range []string{"imperial gallon", "Imperial Gallons", "UK gallon", "UK gallons", "gallon (UK)",
		"gallons (UK)", "gal (UK)", "imp gal", "gal (imp)", "imperial gal", "gallons (imperial)", "UK gal"} {
		u, err := Parse(s)
		if err != nil || u.Symbol != "gal_imp" {
			t.Errorf("Parse(%q) = %q, %v; want gal_imp", s, u.Symbol, err)
			continue
		}
		if l, err := Convert(1, u, mustParse(t, "L")); err != nil || l != 4.54609 {
			t.Errorf("1 %s = %v L, %v; want 4.54609 (UK Weights and Measures Act 1985)", s, l, err)
		}
		if n := SpellingNote(s); n != "" {
			t.Errorf("SpellingNote(%q) = %q, want none: the spelling says imperial", s, n)
		}
	}
	for _, s := range []string{"US gallon", "US gallons", "gal (US)", "USG", "US gal"} {
		u, err := Parse(s)
		if err != nil || u.Symbol != "gal" {
			t.Errorf("Parse(%q) = %q, %v; want gal", s, u.Symbol, err)
		}
		if n := SpellingNote(s); n != "" {
			t.Errorf("SpellingNote(%q) = %q, want none: the spelling says US", s, n)
		}
	}
	if u, err := Parse("thousand imperial gallons"); err != nil || u.Symbol != "thousand gal_imp" {
		t.Errorf("thousand imperial gallons = %q, %v", u.Symbol, err)
	}
}

// TestGallonNote: a bare gallon is the US gallon, and SpellingNote says so.
func TestGallonNote(t *testing.T) {
	const want = "gallon read as US gallon (3.785411784 L); write gal_imp for imperial"
	if GallonNote != want {
		t.Errorf("GallonNote = %q, want %q", GallonNote, want)
	}
	for _, s := range []string{"gal", "GAL", "gals", "gallon", "Gallons", " gallons ", "GA", "kgal", "thousand gallons",
		"Thousands of Gallons", "million gallons", "'000 gal"} {
		u, err := Parse(s)
		if err != nil {
			t.Errorf("Parse(%q): %v", s, err)
			continue
		}
		// US gallon, 3.785411784 L (NIST SP 811 Appendix B.8), times 1, 10^3 or 10^6
		r, err := Ratio(u, mustParse(t, "gal"))
		if err != nil || !r.IsInt() || r.Num().String() != "1" && r.Num().String() != "1000" && r.Num().String() != "1000000" {
			t.Errorf("Parse(%q) = %s = %v US gallons, %v; want 1, 10^3 or 10^6", s, u.Symbol, r, err)
		}
		if n := SpellingNote(s); n != want {
			t.Errorf("SpellingNote(%q) = %q, want %q", s, n, want)
		}
	}
	for _, s := range []string{"L", "m3", "bbl", "GJ", "gal_imp", "not a unit", "", "Mgal"} {
		if n := SpellingNote(s); n != "" {
			t.Errorf("SpellingNote(%q) = %q, want none", s, n)
		}
	}
}

// TestSpellingNoteAllocs: the per-row path must not allocate for a plain spelling.
func TestSpellingNoteAllocs(t *testing.T) {
	for _, s := range []string{"gal", "Gallons", "GJ", "L"} {
		if n := testing.AllocsPerRun(100, func() { _ = SpellingNote(s) }); n != 0 {
			t.Errorf("SpellingNote(%q): %v allocations, want 0", s, n)
		}
	}
}
