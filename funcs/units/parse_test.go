package units

import (
	"errors"
	"slices"
	"testing"
)

func TestParseSpellings(t *testing.T) {
	tests := []struct{ in, want string }{
		{"MWh", "MWh"},
		{"  kWh  ", "kWh"},
		{"metric   ton", "t"},
		{"\tshort ton\u00a0", "short_ton"},
		{"short tons", "short_ton"},
		{"US ton", "short_ton"},
		{"long_ton", "long_ton"},
		{"tonne", "t"},
		{"tonnes", "t"},
		{"Mg", "t"},
		{"Gg", "kt"},
		{"Tg", "Mt"},
		{"Pg", "Gt"},
		{"lbs", "lb"},
		{"pound", "lb"},
		{"m³", "m3"},
		{"cubic meter", "m3"},
		{"litres", "L"},
		{"l", "L"},
		{"liter", "L"},
		{"gallon", "gal"},
		{"gal (US)", "gal"},
		{"US gal", "gal"},
		{"USG", "gal"},
		{"gal_imp", "gal_imp"},
		{"barrels", "bbl"},
		{"SCF", "scf"},
		{"Mscf", "Mcf"},
		{"mcf", "Mcf"},
		{"MMcf", "MMcf"},
		{"mmBtu", "MMBtu"},
		{"MMbtu", "MMBtu"},
		{"MMBTU", "MMBtu"},
		{"BTU", "Btu"},
		{"dekatherm", "Dth"},
		{"therms", "therm"},
		{"quads", "quad"},
		{"TW·yr", "TWyr"},
		{"TW-yr", "TWyr"},
		{"twyr", "TWyr"},
		{"kWe", "kW"},
		{"MWp", "MW"},
		{"MWth", "MW"},
		{"gwe", "GW"},
		{"Mtoe", "Mtoe"},
		{"tce", "tce"},
		{"Gcal", "Gcal"},
		{"kcal", "kcal"},
		{"KCAL", "kcal"},
		{"hr", "h"},
		{"hours", "h"},
		{"days", "d"},
		{"years", "yr"},
		{"a", "yr"},
		{"MIN", "min"},
		// basis suffixes
		{"MMBtu HHV", "MMBtu HHV"},
		{"GJ (NCV)", "GJ NCV"},
		{"GJ(NCV)", "GJ NCV"},
		{"GJ [LHV]", "GJ NCV"},
		{"GJ ( NCV )", "GJ NCV"},
		{"MWh, GCV", "MWh HHV"},
		{"MWh,GCV", "MWh HHV"},
		{"MWh , GCV", "MWh HHV"},
		{"mmbtu hhv", "MMBtu HHV"},
		{"therm  (GCV)", "therm HHV"},
		{"GJ\u00a0NCV", "GJ NCV"},
		{"TJ LHV", "TJ NCV"},
		{"toe NCV", "toe NCV"},
	}
	for _, tt := range tests {
		u, err := Parse(tt.in)
		if err != nil {
			t.Errorf("Parse(%q): %v", tt.in, err)
			continue
		}
		if got := u.String(); got != tt.want {
			t.Errorf("Parse(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

// TestParseCaseRules: exact spelling first, then a case-insensitive match only when unique and
// not declared ambiguous.
func TestParseCaseRules(t *testing.T) {
	tests := []struct{ in, want, code string }{
		{"mwh", "MWh", ""},
		{"GJ", "GJ", ""},
		{"gj", "GJ", ""},
		{"Mt", "Mt", ""},
		{"MT", "", CodeAmbiguous},
		{"mt", "", CodeAmbiguous},
		{"mT", "", CodeAmbiguous},
		{"ML", "ML", ""},
		{"mL", "mL", ""},
		{"ml", "", CodeAmbiguous},
		{"Ml", "", CodeAmbiguous},
		{"Mg", "t", ""},
		{"mg", "", CodeAmbiguous},
		{"MG", "", CodeAmbiguous},
		{"MBtu", "", CodeAmbiguous},
		{"Mbtu", "", CodeAmbiguous},
		{"mbtu", "", CodeAmbiguous},
		{"Ton", "", CodeAmbiguous},
		{"TON", "", CodeAmbiguous},
		{"Cal", "", CodeAmbiguous},
		{"TONNE", "t", ""},
		{"Short_Ton", "short_ton", ""},
		{"KWH", "kWh", ""},
		{"A", "", CodeUnknown},  // "a" (year) matches only as written: A is the ampere
		{"st", "", CodeUnknown}, // stone, not supported
	}
	for _, tt := range tests {
		u, err := Parse(tt.in)
		if tt.code == "" {
			if err != nil || u.Symbol != tt.want {
				t.Errorf("Parse(%q) = %q, %v; want %s", tt.in, u.Symbol, err, tt.want)
			}
			continue
		}
		var e *Error
		if !errors.As(err, &e) || e.Code != tt.code {
			t.Errorf("Parse(%q) = %q, %v; want code %s", tt.in, u.Symbol, err, tt.code)
		}
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		in, code, msg string
		alts          []string
		suggestion    string
	}{
		{in: "kwhh", code: CodeUnknown, msg: `unknown unit "kwhh" (did you mean kWh?)`, suggestion: "kWh"},
		{in: "furlong", code: CodeUnknown, msg: `unknown unit "furlong": accepted units are listed by 'fluecell units'`},
		{in: "st", code: CodeUnknown, msg: `unknown unit "st": accepted units are listed by 'fluecell units'`},
		{in: "tonnne", code: CodeUnknown, msg: `unknown unit "tonnne" (did you mean t?)`, suggestion: "t"},
		{in: "MMBTUs", code: CodeUnknown, msg: `unknown unit "MMBTUs" (did you mean MMBtu?)`, suggestion: "MMBtu"},
		{in: "kbut", code: CodeUnknown, msg: `unknown unit "kbut" (did you mean kBtu?)`, suggestion: "kBtu"}, // swapped letters
		{in: "mwhh", code: CodeUnknown, msg: `unknown unit "mwhh" (did you mean MWh?)`, suggestion: "MWh"},
		// as close to kW as to kWh: no guess
		{in: "khw", code: CodeUnknown, msg: `unknown unit "khw": accepted units are listed by 'fluecell units'`},
		{in: "", code: CodeUnknown, msg: `empty unit: give a unit such as GJ, kWh, t or L`},
		{in: " \t ", code: CodeUnknown, msg: `empty unit: give a unit such as GJ, kWh, t or L`},
		{in: "ton", code: CodeAmbiguous,
			msg:  `ambiguous unit "ton": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb)`,
			alts: []string{"t", "short_ton", "long_ton"}},
		{in: "  tons ", code: CodeAmbiguous,
			msg:  `ambiguous unit "tons": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb)`,
			alts: []string{"t", "short_ton", "long_ton"}},
		{in: "MT", code: CodeAmbiguous, msg: `ambiguous unit "MT": write t (tonne, 1000 kg) or Mt (megatonne, 1e9 kg)`,
			alts: []string{"t", "Mt"}},
		{in: "mt", code: CodeAmbiguous, msg: `ambiguous unit "mt": write t (tonne, 1000 kg) or Mt (megatonne, 1e9 kg)`,
			alts: []string{"t", "Mt"}},
		{in: "MBtu", code: CodeAmbiguous, msg: `ambiguous unit "MBtu": write kBtu (thousand Btu) or MMBtu (million Btu)`,
			alts: []string{"kBtu", "MMBtu"}},
		{in: "mg", code: CodeAmbiguous,
			msg:  `ambiguous unit "mg": milligram is not supported and megagram is t; write t (tonne, 1000 kg) or g (gram)`,
			alts: []string{"t", "g"}},
		{in: "ml", code: CodeAmbiguous, msg: `ambiguous unit "ml": write mL (millilitre) or ML (megalitre)`,
			alts: []string{"mL", "ML"}},
		{in: "cal", code: CodeAmbiguous,
			msg:  `ambiguous unit "cal": the calorie has several definitions; write kcal (International Table calorie) or J (joule)`,
			alts: []string{"kcal", "J"}},
		{in: "MBtu HHV", code: CodeAmbiguous, msg: `ambiguous unit "MBtu": write kBtu (thousand Btu) or MMBtu (million Btu)`,
			alts: []string{"kBtu", "MMBtu"}},
		{in: "kg HHV", code: CodeBasis, msg: `basis "HHV" applies only to energy units, not to "kg"`},
		{in: "gal (GCV)", code: CodeBasis, msg: `basis "GCV" applies only to energy units, not to "gal"`},
		{in: "MW ncv", code: CodeBasis, msg: `basis "ncv" applies only to energy units, not to "MW"`},
		{in: "GJ NCV HHV", code: CodeBasis, msg: `unit "GJ NCV HHV" declares two bases: give one of HHV (= GCV) or NCV (= LHV)`},
		{in: "kwhh HHV", code: CodeUnknown, msg: `unknown unit "kwhh" (did you mean kWh?)`, suggestion: "kWh"},
		{in: "GJNCV", code: CodeUnknown, msg: `unknown unit "GJNCV": accepted units are listed by 'fluecell units'`},
		{in: "NCV", code: CodeUnknown, msg: `unknown unit "NCV": accepted units are listed by 'fluecell units'`},
		{in: "(HHV)", code: CodeUnknown, msg: `unknown unit "(HHV)": accepted units are listed by 'fluecell units'`},
		{in: "k\x00W", code: CodeUnknown, msg: `unknown unit "k\x00W" (did you mean kW?)`, suggestion: "kW"},
	}
	for _, tt := range tests {
		_, err := Parse(tt.in)
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("Parse(%q) error = %v, want *Error", tt.in, err)
			continue
		}
		if e.Code != tt.code || e.Msg != tt.msg || err.Error() != tt.msg {
			t.Errorf("Parse(%q) = %s: %s\nwant %s: %s", tt.in, e.Code, e.Msg, tt.code, tt.msg)
		}
		if !slices.Equal(e.Alternatives, tt.alts) {
			t.Errorf("Parse(%q).Alternatives = %q, want %q", tt.in, e.Alternatives, tt.alts)
		}
		if e.Suggestion != tt.suggestion {
			t.Errorf("Parse(%q).Suggestion = %q, want %q", tt.in, e.Suggestion, tt.suggestion)
		}
		if e.Input != tt.in {
			t.Errorf("Parse(%q).Input = %q, want the input as given", tt.in, e.Input)
		}
	}
}

func TestParseAs(t *testing.T) {
	tests := []struct {
		in   string
		want []Dimension
		sym  string
		msg  string
	}{
		{in: "MWh", want: []Dimension{Energy}, sym: "MWh"},
		{in: "kg", want: []Dimension{Energy, Mass, Volume}, sym: "kg"},
		{in: "GJ NCV", want: []Dimension{Energy}, sym: "GJ"},
		{in: "yr", sym: "yr"},
		{in: "kW", want: []Dimension{Energy}, msg: `unit "kW" is a power, but an energy is needed here (did you mean kWh?)`},
		{in: "MWe", want: []Dimension{Energy}, msg: `unit "MWe" is a power, but an energy is needed here (did you mean MWh?)`},
		{in: "W", want: []Dimension{Energy}, msg: `unit "W" is a power, but an energy is needed here (did you mean Wh?)`},
		{in: "TW", want: []Dimension{Energy, Mass}, msg: `unit "TW" is a power, but an energy or a mass is needed here (did you mean TWh?)`},
		{in: "kg", want: []Dimension{Energy, Volume}, msg: `unit "kg" is a mass, but an energy or a volume is needed here`},
		{in: "  MWh ", want: []Dimension{Power}, msg: `unit "MWh" is an energy, but a power is needed here (did you mean MW?)`},
		{in: "GJ", want: []Dimension{Power}, msg: `unit "GJ" is an energy, but a power is needed here`},
		{in: "L", want: []Dimension{Energy, Mass, Time}, msg: `unit "L" is a volume, but an energy, a mass or a time is needed here`},
		{in: "s", want: []Dimension{Mass}, msg: `unit "s" is a time, but a mass is needed here`},
	}
	for _, tt := range tests {
		u, err := ParseAs(tt.in, tt.want...)
		if tt.msg == "" {
			if err != nil || u.Symbol != tt.sym {
				t.Errorf("ParseAs(%q, %v) = %q, %v; want %s", tt.in, tt.want, u.Symbol, err, tt.sym)
			}
			continue
		}
		var e *Error
		if !errors.As(err, &e) || e.Code != CodeDimension || e.Msg != tt.msg {
			t.Errorf("ParseAs(%q, %v) = %q, %v\nwant %s: %s", tt.in, tt.want, u.Symbol, err, CodeDimension, tt.msg)
		}
		if u != (Unit{}) {
			t.Errorf("ParseAs(%q) returned %v with its error, want the zero Unit", tt.in, u)
		}
	}
	// Parse errors come through unchanged.
	if _, err := ParseAs("ton", Mass); err == nil || err.(*Error).Code != CodeAmbiguous {
		t.Errorf("ParseAs(ton, Mass) = %v, want unit-ambiguous", err)
	}
}

// TestEverySpellingParses: every listed spelling parses to its unit, and every symbol's
// String() parses back to the same Unit, with and without a basis.
func TestEverySpellingParses(t *testing.T) {
	for _, e := range List() {
		for _, s := range append([]string{e.Symbol}, e.Spellings...) {
			u, err := Parse(s)
			if err != nil || u != e.Unit {
				t.Errorf("Parse(%q) = %v, %v; want %s", s, u, err, e.Symbol)
			}
		}
		if slices.Contains(e.Spellings, e.Symbol) {
			t.Errorf("%s lists its own symbol among the other spellings", e.Symbol)
		}
		if e.Dim != Energy {
			continue
		}
		for _, b := range []Basis{NCV, HHV} {
			w := e.WithBasis(b)
			if got, err := Parse(w.String()); err != nil || got != w {
				t.Errorf("Parse(%q) = %v, %v; want %v", w.String(), got, err, w)
			}
		}
	}
}

func TestWithBasisAndString(t *testing.T) {
	gj := mustParse(t, "GJ")
	if got := gj.WithBasis(NCV).String(); got != "GJ NCV" {
		t.Errorf("GJ.WithBasis(NCV) = %q", got)
	}
	if got := mustParse(t, "GJ HHV").WithBasis(NoBasis); got != gj {
		t.Errorf("WithBasis(NoBasis) = %v, want %v", got, gj)
	}
	if gj.Basis != NoBasis {
		t.Errorf("WithBasis modified its receiver")
	}
	kg := mustParse(t, "kg")
	if got := kg.WithBasis(HHV); got != kg {
		t.Errorf("kg.WithBasis(HHV) = %v, want kg unchanged (basis applies to energy only)", got)
	}
	if got := gj.WithBasis(Basis(9)); got != gj {
		t.Errorf("WithBasis(Basis(9)) = %v, want unchanged", got)
	}
	if got := (Unit{}).String(); got != "" {
		t.Errorf("zero Unit String() = %q", got)
	}
}

func TestDimensionAndBasisStrings(t *testing.T) {
	for d, want := range map[Dimension]string{Energy: "energy", Mass: "mass", Volume: "volume", Power: "power", Time: "time", 0: "Dimension(0)", 9: "Dimension(9)"} {
		if got := d.String(); got != want {
			t.Errorf("Dimension(%d).String() = %q, want %q", d, got, want)
		}
	}
	for b, want := range map[Basis]string{NoBasis: "", NCV: "NCV", HHV: "HHV", 3: "Basis(3)"} {
		if got := b.String(); got != want {
			t.Errorf("Basis(%d).String() = %q, want %q", b, got, want)
		}
	}
}

// TestParseAllocs: the per-row path must not allocate for a plain spelling.
func TestParseAllocs(t *testing.T) {
	for _, s := range []string{"MWh", "mwh", "MMBtu HHV", "GJ (NCV)", "short_ton"} {
		if n := testing.AllocsPerRun(100, func() { _, _ = Parse(s) }); n != 0 {
			t.Errorf("Parse(%q) allocates %v times per call, want 0", s, n)
		}
	}
}

// Lookup reads what Parse reads and fails with the same codes, but builds
// no spelling suggestion: the importer classifies thousands of cell texts
// with it and asks Parse only for the one it reports.
func TestLookupLikeParse(t *testing.T) {
	for _, s := range []string{"GJ", "MMBtu HHV", "Thousand Barrels", "kgal", "ton", "kwhh", "Consumers", ""} {
		u1, err1 := Parse(s)
		u2, err2 := Lookup(s)
		if u1 != u2 || (err1 == nil) != (err2 == nil) {
			t.Errorf("%q: Parse = %v, %v; Lookup = %v, %v", s, u1, err1, u2, err2)
			continue
		}
		if err1 == nil {
			continue
		}
		e1, e2 := err1.(*Error), err2.(*Error)
		if e1.Code != e2.Code || e2.Suggestion != "" {
			t.Errorf("%q: Parse code %s, Lookup code %s suggestion %q", s, e1.Code, e2.Code, e2.Suggestion)
		}
	}
	if _, err := Parse("kwhh"); err == nil || err.(*Error).Suggestion == "" {
		t.Errorf("Parse(kwhh) = %v, want a suggestion", err)
	}
}
