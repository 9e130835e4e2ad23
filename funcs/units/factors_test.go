package units

import (
	"math"
	"math/big"
	"strings"
	"testing"
)

// rat reads an exact decimal; the test fails on a malformed literal.
func rat(t *testing.T, s string) *big.Rat {
	t.Helper()
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		t.Fatalf("bad decimal %q in test table", s)
	}
	return r
}

// mustParse parses a spelling the test knows to be valid.
func mustParse(t testing.TB, s string) Unit {
	t.Helper()
	u, err := Parse(s)
	if err != nil {
		t.Fatalf("Parse(%q): %v", s, err)
	}
	return u
}

// TestFactorsAgainstSources checks the exact SI factor of every unit against the publication
// that defines it. Each row names its source.
func TestFactorsAgainstSources(t *testing.T) {
	rows := []struct{ sym, exact, source string }{
		// Energy, J.
		{"J", "1", "SI"},
		{"kJ", "1000", "SI prefix k"},
		{"MJ", "1000000", "SI prefix M"},
		{"GJ", "1000000000", "SI prefix G"},
		{"TJ", "1000000000000", "SI prefix T"},
		{"PJ", "1000000000000000", "SI prefix P"},
		{"EJ", "1000000000000000000", "SI prefix E"},
		{"Wh", "3600", "SI (1 W for 3600 s)"},
		{"kWh", "3600000", "NIST SP 811 Appendix B.8 (kilowatt hour = 3.6 E+06 J)"},
		{"MWh", "3600000000", "SI prefix M on Wh"},
		{"GWh", "3600000000000", "SI prefix G on Wh"},
		{"TWh", "3600000000000000", "SI prefix T on Wh"},
		{"Wyr", "31536000", "definition: 1 W for a 365-day year (365 x 86 400 s)"},
		{"kWyr", "31536000000", "definition (365-day year)"},
		{"MWyr", "31536000000000", "definition (365-day year)"},
		{"GWyr", "31536000000000000", "definition (365-day year)"},
		{"TWyr", "31536000000000000000", "definition (365-day year): 3.1536e19 J"},
		{"Btu", "1055.05585262", "NIST SP 811 Appendix B.8 (British thermal unit, International Table)"},
		{"kBtu", "1055055.85262", "definition (10^3 Btu IT)"},
		{"MMBtu", "1055055852.62", "definition (10^6 Btu IT)"},
		{"therm", "105505585.262", "definition used here (10^5 Btu IT); see TestThermDiffersFromUSTherm"},
		{"Dth", "1055055852.62", "definition (dekatherm = 10 therm)"},
		{"quad", "1055055852620000000", "definition (10^15 Btu IT)"},
		{"TBtu", "1055055852620000", "definition (10^12 Btu IT; T = trillion, US EIA usage)"},
		{"toe", "41868000000", "IEA (toe = 41.868 GJ)"},
		{"ktoe", "41868000000000", "IEA (toe), prefix k"},
		{"Mtoe", "41868000000000000", "IEA (toe), prefix M"},
		{"tce", "29307600000", "IEA/UN (tce = 29.3076 GJ)"},
		{"ktce", "29307600000000", "IEA/UN (tce), prefix k"},
		{"Mtce", "29307600000000000", "IEA/UN (tce), prefix M"},
		{"kcal", "4186.8", "NIST SP 811 Appendix B.8 (calorie, International Table = 4.1868 J)"},
		{"Mcal", "4186800", "NIST SP 811 Appendix B.8 (calorie IT), prefix M on kcal"},
		{"Gcal", "4186800000", "NIST SP 811 Appendix B.8 (calorie IT), prefix G"},
		// Mass, kg.
		{"g", "0.001", "SI"},
		{"kg", "1", "SI base unit"},
		{"t", "1000", "SI Brochure (tonne = 10^3 kg, accepted for use with the SI)"},
		{"kt", "1000000", "SI prefix k on t (= Gg)"},
		{"Mt", "1000000000", "SI prefix M on t (= Tg)"},
		{"Gt", "1000000000000", "SI prefix G on t (= Pg)"},
		{"lb", "0.45359237", "NIST SP 811 Appendix B.8 (pound, avoirdupois, exact)"},
		{"klb", "453.59237", "NIST SP 811 Appendix B.8 (pound); klb = Mlb = 1000 lb (City of Duluth Resolution 06-0351R, thousand pounds of steam)"},
		{"MMlb", "453592.37", "NIST SP 811 Appendix B.8 (pound); MM = 10^6"},
		{"short_ton", "907.18474", "NIST SP 811 Appendix B.8 (ton, short = 2000 lb)"},
		{"long_ton", "1016.0469088", "NIST SP 811 Appendix B.8 (ton, long = 2240 lb)"},
		// Volume, m3.
		{"m3", "1", "SI"},
		{"L", "0.001", "SI Brochure (litre = 1 dm3)"},
		{"mL", "0.000001", "SI prefix m on L"},
		{"kL", "1", "SI prefix k on L"},
		{"ML", "1000", "SI prefix M on L"},
		{"gal", "0.003785411784", "NIST SP 811 Appendix B.8 (gallon, US = 231 in3 = 3.785411784 L)"},
		{"gal_imp", "0.00454609", "UK Weights and Measures Act 1985 (gallon = 4.54609 dm3)"},
		{"kgal", "3.785411784", "NIST SP 811 Appendix B.8 (gallon US), k = 10^3"},
		{"bbl", "0.158987294928", "NIST SP 811 Appendix B.8 (barrel for petroleum = 42 gal US)"},
		{"Mbbl", "158.987294928", "SEC Form 10-K glossary (MBbl = thousand barrels), NIST SP 811 (barrel)"},
		{"MMbbl", "158987.294928", "SEC Form 10-K glossary (MMBbl = million barrels), NIST SP 811 (barrel)"},
		{"scf", "0.028316846592", "NIST SP 811 Appendix B.8 (cubic foot); 40 CFR 98.6 (standard conditions)"},
		{"ccf", "2.8316846592", "definition (100 scf)"},
		{"Mcf", "28.316846592", "definition (1000 scf)"},
		{"MMcf", "28316.846592", "definition (10^6 scf)"},
		{"Bcf", "28316846.592", "definition (10^9 scf)"},
		{"Tcf", "28316846592", "definition (10^12 scf)"},
		{"Sm3", "1", "ISO 13443 (m3 at standard reference conditions 15 °C, 101.325 kPa)"},
		{"kSm3", "1000", "ISO 13443, SI prefix k"},
		{"MSm3", "1000000", "ISO 13443, SI prefix M"},
		{"Nm3", "1921/1821", "288.15/273.15 reduced: ISO 13443 (288.15 K) and normal conditions (273.15 K) at 101.325 kPa, ideal gas"},
		{"kNm3", "1921000/1821", "normal conditions, SI prefix k"},
		{"MNm3", "1921000000/1821", "normal conditions, SI prefix M"},
		// Power, W.
		{"W", "1", "SI"},
		{"kW", "1000", "SI prefix k"},
		{"MW", "1000000", "SI prefix M"},
		{"GW", "1000000000", "SI prefix G"},
		{"TW", "1000000000000", "SI prefix T"},
		// Time, s.
		{"s", "1", "SI"},
		{"min", "60", "SI Brochure (minute = 60 s)"},
		{"h", "3600", "SI Brochure (hour = 3600 s)"},
		{"d", "86400", "SI Brochure (day = 86 400 s)"},
		{"yr", "31536000", "definition (365-day year)"},
		// Length, m.
		{"m", "1", "SI base unit"},
		{"km", "1000", "SI prefix k"},
		{"mi", "1609.344", "NIST SP 811 Appendix B.8 (mile, international = 1.609344 E+03 m, exact)"},
		{"nmi", "1852", "NIST SP 811 Appendix B.8 (mile, nautical = 1.852 E+03 m); SI Brochure Table 8"},
		// Area, m2.
		{"m2", "1", "SI"},
		{"ft2", "0.09290304", "NIST SP 811 Appendix B.8 (square foot = 9.290304 E-02 m2, exact)"},
		{"ha", "10000", "SI Brochure Table 8 (hectare = 1 hm2 = 10^4 m2)"},
		{"km2", "1000000", "SI (km)^2"},
	}
	seen := map[string]bool{}
	for _, r := range rows {
		u := mustParse(t, r.sym)
		if u.Symbol != r.sym {
			t.Errorf("Parse(%q).Symbol = %q, want the canonical symbol", r.sym, u.Symbol)
			continue
		}
		seen[r.sym] = true
		if got, want := u.SI(), rat(t, r.exact); got.Cmp(want) != 0 {
			t.Errorf("%s = %s base units, want %s (%s)", r.sym, got.FloatString(12), r.exact, r.source)
		}
		if got, want := u.SIFloat(), mustFloat(t, r.exact); got != want {
			t.Errorf("%s SIFloat = %v, want %v (%s)", r.sym, got, want, r.source)
		}
	}
	for _, e := range List() {
		if !seen[e.Symbol] {
			t.Errorf("unit %s has no row in this source table", e.Symbol)
		}
	}
	if len(seen) != len(List()) {
		t.Errorf("table checks %d units, List has %d", len(seen), len(List()))
	}
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	f, _ := rat(t, s).Float64()
	return f
}

// TestFactorDerivations rebuilds factors from the definitions they come from, independently of
// the decimal values in the table.
func TestFactorDerivations(t *testing.T) {
	ratio := func(a, b string) *big.Rat {
		t.Helper()
		r, err := Ratio(mustParse(t, a), mustParse(t, b))
		if err != nil {
			t.Fatalf("Ratio(%s, %s): %v", a, b, err)
		}
		return r
	}
	inch, foot := rat(t, "0.0254"), rat(t, "0.3048") // NIST SP 811 Appendix B.8 (exact)
	cube := func(r *big.Rat) *big.Rat { return new(big.Rat).Mul(r, new(big.Rat).Mul(r, r)) }
	checks := []struct {
		name   string
		got    *big.Rat
		want   *big.Rat
		source string
	}{
		{"gal = 231 in3", mustParse(t, "gal").SI(), new(big.Rat).Mul(big.NewRat(231, 1), cube(inch)),
			"NIST SP 811 Appendix B.8 (gallon US = 231 in3; inch = 0.0254 m)"},
		{"scf = ft3", mustParse(t, "scf").SI(), cube(foot), "NIST SP 811 Appendix B.8 (foot = 0.3048 m)"},
		{"bbl = 42 gal", ratio("bbl", "gal"), big.NewRat(42, 1), "NIST SP 811 Appendix B.8 (barrel for petroleum)"},
		{"Btu IT = cal IT/(g K) x lb / 1.8", mustParse(t, "Btu").SI(),
			new(big.Rat).Quo(new(big.Rat).Mul(rat(t, "4.1868"), rat(t, "453.59237")), rat(t, "1.8")),
			"NIST SP 811 Appendix B.8 (Btu IT from the IT calorie and the pound; relation from memory)"},
		{"toe = 10^7 kcal IT", ratio("toe", "kcal"), big.NewRat(10_000_000, 1), "IEA (toe = 10^7 kcal; from memory)"},
		{"tce = 7 x 10^6 kcal IT", ratio("tce", "kcal"), big.NewRat(7_000_000, 1), "IEA/UN (tce = 7 Gcal; from memory)"},
		{"yr = 8760 h", ratio("yr", "h"), big.NewRat(8760, 1), "definition (365-day year)"},
		{"TWyr = TW x yr", ratio("TWyr", "J"), new(big.Rat).Mul(mustParse(t, "TW").SI(), mustParse(t, "yr").SI()), "definition"},
		{"short_ton = 2000 lb", ratio("short_ton", "lb"), big.NewRat(2000, 1), "NIST SP 811 Appendix B.8"},
		{"long_ton = 2240 lb", ratio("long_ton", "lb"), big.NewRat(2240, 1), "NIST SP 811 Appendix B.8"},
		{"Dth = MMBtu", ratio("Dth", "MMBtu"), big.NewRat(1, 1), "definition (dekatherm = 10 therm = 10^6 Btu)"},
		{"Gg = kt", ratio("Gg", "kt"), big.NewRat(1, 1), "SI prefixes"},
		{"mi = 5280 ft", mustParse(t, "mi").SI(), new(big.Rat).Mul(big.NewRat(5280, 1), foot), "NIST SP 811 Appendix B.8 (mile = 5280 ft; foot = 0.3048 m)"},
		{"ft2 = ft x ft", mustParse(t, "ft2").SI(), new(big.Rat).Mul(foot, foot), "NIST SP 811 Appendix B.8 (foot = 0.3048 m)"},
		{"ha = hm2", ratio("ha", "m2"), new(big.Rat).Mul(big.NewRat(100, 1), big.NewRat(100, 1)), "SI Brochure Table 8 (hectare = 1 hm2)"},
		{"km2 = km x km", ratio("km2", "m2"), new(big.Rat).Mul(ratio("km", "m"), ratio("km", "m")), "SI"},
		{"Nm3/Sm3 = T_std/T_normal", ratio("Nm3", "Sm3"), new(big.Rat).Quo(new(big.Rat).Add(rat(t, "273.15"), rat(t, "15")), rat(t, "273.15")),
			"ISO 13443 (15 °C) and normal conditions (0 °C), both 101.325 kPa: ideal gas V proportional to T"},
		{"MNm3 = 10^6 Nm3", ratio("MNm3", "Nm3"), big.NewRat(1_000_000, 1), "SI prefix M"},
		{"TWyr / Julian TWyr = 365/365.25", new(big.Rat).Quo(mustParse(t, "TWyr").SI(), rat(t, "3.15576e19")),
			new(big.Rat).Quo(big.NewRat(365, 1), rat(t, "365.25")), "Julian year 365.25 d (IAU); the table uses 365 d"},
	}
	for _, c := range checks {
		if c.got.Cmp(c.want) != 0 {
			t.Errorf("%s: got %s, want %s (%s)", c.name, c.got.FloatString(15), c.want.FloatString(15), c.source)
		}
	}
}

// TestNISTPrintedValues compares with the seven-digit factors printed in NIST SP 811
// Appendix B.8 (printed values from memory; each is the rounding of the exact factor).
func TestNISTPrintedValues(t *testing.T) {
	rows := []struct {
		sym     string
		printed float64
	}{
		{"Btu", 1.055056e3}, // British thermal unit IT to J
		{"kcal", 4.1868e3},  // calorie IT (4.1868 J) x 1000
		{"kWh", 3.6e6},      // kilowatt hour to J
		{"lb", 4.535924e-1}, // pound avoirdupois to kg
		{"short_ton", 9.071847e2},
		{"long_ton", 1.016047e3},
		{"gal", 3.785412e-3}, // gallon US to m3
		{"bbl", 1.589873e-1}, // barrel for petroleum to m3
		{"scf", 2.831685e-2}, // cubic foot to m3
		{"mi", 1.609344e3},   // mile (international) to m
		{"nmi", 1.852e3},     // mile, nautical to m
		{"ft2", 9.290304e-2}, // square foot to m2
	}
	for _, r := range rows {
		got := mustParse(t, r.sym).SIFloat()
		if rel := math.Abs(got-r.printed) / r.printed; rel > 5e-7 {
			t.Errorf("%s = %v, NIST SP 811 B.8 prints %v (relative difference %.2g)", r.sym, got, r.printed, rel)
		}
	}
}

// TestThermDiffersFromUSTherm documents that the therm here (10^5 Btu IT) is not NIST's US
// therm, 1.054804e8 J (NIST SP 811 Appendix B.8), which is about 0.02 % smaller.
func TestThermDiffersFromUSTherm(t *testing.T) {
	got := mustParse(t, "therm").SIFloat()
	const usTherm = 1.054804e8
	rel := (got - usTherm) / usTherm
	if rel < 2.0e-4 || rel > 2.5e-4 {
		t.Errorf("therm %v J vs US therm %v J: relative difference %.3g, want about 0.024 %%", got, usTherm, rel)
	}
}

// TestUsualBasis checks that the Btu family implies HHV (North American practice: common
// practice) and nothing else implies a basis.
func TestUsualBasis(t *testing.T) {
	hhv := map[string]bool{"Btu": true, "kBtu": true, "MMBtu": true, "TBtu": true, "therm": true, "Dth": true, "quad": true}
	for _, e := range List() {
		want := NoBasis
		if hhv[e.Symbol] {
			want = HHV
		}
		if e.Usual != want {
			t.Errorf("%s.Usual = %q, want %q", e.Symbol, e.Usual, want)
		}
		if e.Basis != NoBasis {
			t.Errorf("%s listed with Basis %q, want none", e.Symbol, e.Basis)
		}
		if e.Source == "" || e.Name == "" {
			t.Errorf("%s has no Source or Name", e.Symbol)
		}
	}
}

// TestYearNames checks that every year-based unit says which year it uses.
func TestYearNames(t *testing.T) {
	for _, s := range []string{"Wyr", "kWyr", "MWyr", "GWyr", "TWyr"} {
		if u := mustParse(t, s); !strings.Contains(u.Name, "365-day year") {
			t.Errorf("%s.Name = %q, want it to say 365-day year", s, u.Name)
		}
	}
}
