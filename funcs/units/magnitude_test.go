package units

import (
	"errors"
	"strings"
	"testing"
	"time"
)

// TestRecordSpellings covers unit spellings of fuel-card exports, utility bills and national
// statistics tables. want is the resulting unit's String(); exact its SI factor.
func TestRecordSpellings(t *testing.T) {
	const (
		gal = "0.003785411784" // NIST SP 811 Appendix B.8 (gallon US)
		scf = "0.028316846592" // NIST SP 811 Appendix B.8 (cubic foot); 40 CFR 98.6 (60 °F)
		btu = "1055.05585262"  // NIST SP 811 Appendix B.8 (Btu IT)
	)
	mul := func(dec string, k string) string { return mulDec(t, dec, k) }
	tests := []struct{ in, want, exact, source string }{
		// US gallon on fuel-card exports
		{"GA", "gal", gal, "NIST SP 811 (gallon US)"},
		{"GAL", "gal", gal, "NIST SP 811 (gallon US)"},
		{"Gals", "gal", gal, "NIST SP 811 (gallon US)"},
		{"gals", "gal", gal, "NIST SP 811 (gallon US)"},
		{"Gallons", "gal", gal, "NIST SP 811 (gallon US)"},
		{"kgal", "kgal", mul(gal, "1e3"), "k = 10^3"},
		{"Kgal", "kgal", mul(gal, "1e3"), "k = 10^3"},
		{"thousand gallons", "kgal", mul(gal, "1e3"), "thousand = 10^3"},
		{"Thousand Gallons", "kgal", mul(gal, "1e3"), "thousand = 10^3"},
		{"thousands of gallons", "kgal", mul(gal, "1e3"), "thousand = 10^3"},
		// gas volumes: C = 100, M = 10^3, MM = 10^6 (SEC Form 10-K glossaries), B = 10^9
		{"CCF", "ccf", mul(scf, "100"), "C = 100 scf"},
		{"Ccf", "ccf", mul(scf, "100"), "C = 100 scf"},
		{"Mcf", "Mcf", mul(scf, "1e3"), "M = 10^3 (SEC Form 10-K glossary)"},
		{"MCF", "Mcf", mul(scf, "1e3"), "M = 10^3 (SEC Form 10-K glossary)"},
		{"MMcf", "MMcf", mul(scf, "1e6"), "MM = 10^6 (SEC Form 10-K glossary)"},
		{"Bcf", "Bcf", mul(scf, "1e9"), "B = 10^9"},
		{"Million cubic feet", "MMcf", mul(scf, "1e6"), "US EIA table unit"},
		{"Thousand cubic feet", "Mcf", mul(scf, "1e3"), "thousand = 10^3"},
		// oil volumes
		{"Mbbl", "Mbbl", mul("0.158987294928", "1e3"), "M = 10^3 (SEC Form 10-K glossary: MBbl)"},
		{"MMbbl", "MMbbl", mul("0.158987294928", "1e6"), "MM = 10^6 (SEC Form 10-K glossary: MMBbl)"},
		{"Thousand Barrels", "Mbbl", mul("0.158987294928", "1e3"), "US EIA table unit"},
		{"Million Barrels", "MMbbl", mul("0.158987294928", "1e6"), "million = 10^6"},
		// energy
		{"TBtu", "TBtu", mul(btu, "1e12"), "T = 10^12"},
		{"Trillion Btu", "TBtu", mul(btu, "1e12"), "trillion = 10^12"},
		{"Billion Btu", "billion Btu", mul(btu, "1e9"), "US EIA SEDS table unit; billion = 10^9"},
		{"Quadrillion Btu", "quad", mul(btu, "1e15"), "US EIA MER table unit"},
		{"Million Btu", "MMBtu", mul(btu, "1e6"), "million = 10^6"},
		{"Dth", "Dth", mul(btu, "1e6"), "dekatherm = 10 therm"},
		{"dekatherm", "Dth", mul(btu, "1e6"), "dekatherm = 10 therm"},
		{"kBtu", "kBtu", mul(btu, "1e3"), "k = 10^3"},
		{"Million kWh", "million kWh", "3600000000000", "NIST SP 811 (kWh = 3.6e6 J); million = 10^6"},
		{"Million kilowatthours", "million kWh", "3600000000000", "US EIA SEDS table unit"},
		{"thousand MWh", "thousand MWh", "3600000000000", "thousand = 10^3"},
		{"Billion Btu HHV", "billion Btu HHV", mul(btu, "1e9"), "basis after a magnitude"},
		// mass
		{"Thousand Short Tons", "thousand short_ton", "907184.74", "NIST SP 811 (ton, short); US EIA SEDS table unit"},
		{"Thousand Metric Tons", "kt", "1000000", "SI Brochure (tonne); thousand = 10^3"},
		{"'000 tonnes", "kt", "1000000", "thousand = 10^3"},
		{"klb", "klb", "453.59237", "NIST SP 811 (pound); k = 10^3"},
		{"Mlb", "klb", "453.59237", "City of Duluth Resolution 06-0351R: Mlbs = thousand pounds of steam"},
		{"'000 L", "kL", "1", "SI (litre); thousand = 10^3"},
		// time stays time
		{"s", "s", "1", "SI"},
		{"HR", "h", "3600", "SI Brochure (hour)"},
	}
	for _, tt := range tests {
		u, err := Parse(tt.in)
		if err != nil {
			t.Errorf("Parse(%q): %v", tt.in, err)
			continue
		}
		if u.String() != tt.want {
			t.Errorf("Parse(%q) = %q, want %q", tt.in, u.String(), tt.want)
		}
		if got, want := u.SI(), rat(t, tt.exact); got.Cmp(want) != 0 {
			t.Errorf("Parse(%q) = %s base units, want %s (%s)", tt.in, got.FloatString(12), tt.exact, tt.source)
		}
		if f, _ := rat(t, tt.exact).Float64(); u.SIFloat() != f {
			t.Errorf("Parse(%q).SIFloat() = %v, want %v", tt.in, u.SIFloat(), f)
		}
		if back, err := Parse(u.String()); err != nil || back != u {
			t.Errorf("Parse(%q) = %#v, but Parse(%q) = %#v, %v", tt.in, u, u.String(), back, err)
		}
	}
}

// mulDec multiplies two exact decimals and writes the product as a decimal.
func mulDec(t *testing.T, a, b string) string {
	t.Helper()
	return exactString(rat(t, a).Mul(rat(t, a), rat(t, b)))
}

// TestDerivedUnitsConvert: a magnitude word converts exactly to the named unit it equals.
func TestDerivedUnitsConvert(t *testing.T) {
	for _, c := range []struct {
		from, to string
		want     float64
	}{
		{"million kWh", "GWh", 1},
		{"billion Btu", "MMBtu", 1000},
		{"MMBtu", "billion Btu", 0.001},
		{"thousand short_ton", "short_ton", 1000},
		{"thousand MWh", "million kWh", 1},
	} {
		got, err := Factor(mustParse(t, c.from), mustParse(t, c.to))
		if err != nil || got != c.want {
			t.Errorf("Factor(%s, %s) = %v, %v; want %v", c.from, c.to, got, err, c.want)
		}
	}
	if _, err := Factor(mustParse(t, "billion Btu HHV"), mustParse(t, "GJ NCV")); err == nil || err.(*Error).Code != CodeBasis {
		t.Errorf("billion Btu HHV -> GJ NCV: %v, want unit-basis", err)
	}
	if u := mustParse(t, "Billion Btu"); u.Usual != HHV {
		t.Errorf("billion Btu.Usual = %v, want HHV like Btu", u.Usual)
	}
	forged := mustParse(t, "million kWh")
	forged.Symbol = "million GWh"
	if _, err := Factor(forged, mustParse(t, "J")); err == nil {
		t.Errorf("a hand-edited derived unit converts")
	}
}

// TestNoStraySuggestions: short words of other columns (each, lump sum) and names of another
// dimension than the one asked for get no "did you mean".
func TestNoStraySuggestions(t *testing.T) {
	for _, c := range []struct {
		in   string
		want []Dimension
	}{
		{"EA", nil}, {"ea", nil}, {"Each", nil}, {"LS", nil}, {"Ls", nil}, {"EA", []Dimension{Energy}},
		{"kWhh", []Dimension{Mass}}, {"gallonz", []Dimension{Energy}},
	} {
		_, err := ParseAs(c.in, c.want...)
		var e *Error
		if !errors.As(err, &e) || e.Code != CodeUnknown || e.Suggestion != "" {
			t.Errorf("ParseAs(%q, %v) = %v, want unit-unknown without a suggestion", c.in, c.want, err)
		}
	}
	_, err := ParseAs("gallonz", Volume)
	if e := err.(*Error); e.Suggestion != "gal" {
		t.Errorf("ParseAs(gallonz, Volume) suggests %q, want gal", e.Suggestion)
	}
}

// TestMagnitudeRefusals: ambiguous M readings and ambiguous units after a magnitude stay errors.
func TestMagnitudeRefusals(t *testing.T) {
	for in, want := range map[string]string{
		"Mgal":             `ambiguous unit "Mgal": M means a thousand on some bills and a million in others; write kgal (thousand US gallons) or million gal (million US gallons)`,
		"thousand tons":    `ambiguous unit "thousand tons": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb)`,
		"MBtu":             `ambiguous unit "MBtu": write kBtu (thousand Btu) or MMBtu (million Btu)`,
		"thousand":         `unknown unit "thousand": accepted units are listed by 'fluecell units'`,
		"million furlongs": `unknown unit "million furlongs": accepted units are listed by 'fluecell units'`,
	} {
		_, err := Parse(in)
		if err == nil || err.Error() != want {
			t.Errorf("Parse(%q) = %v\nwant %s", in, err, want)
		}
	}
	if u := mustParse(t, "million gal"); u.String() != "million gal" {
		t.Errorf("million gal = %v", u)
	}
}

// TestLongInputIsFast: a failed parse of a very long cell does no quadratic work.
func TestLongInputIsFast(t *testing.T) {
	long := strings.Repeat("gallons of diesel ", 20000)
	start := time.Now()
	for range 10 {
		if _, err := Parse(long); err == nil {
			t.Fatal("a long sentence parsed as a unit")
		}
	}
	if d := time.Since(start); d > 2*time.Second {
		t.Errorf("10 parses of %d bytes took %v", len(long), d)
	}
}
