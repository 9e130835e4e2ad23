package units

import (
	"errors"
	"math/big"
	"testing"
)

// TestPrefixNeverChanged: an SI prefix on a unit of the table means what the SI says or the
// spelling is refused. For every SI prefix (SI Brochure, 9th edition, Table 7) before every
// unit symbol an SI prefix is written on, Parse either fails or returns a unit whose exact
// factor is the prefix times the unit (raised to the power of a square or cubic unit).
func TestPrefixNeverChanged(t *testing.T) {
	prefixes := map[string]int{ // SI Brochure Table 7
		"Q": 30, "R": 27, "Y": 24, "Z": 21, "E": 18, "P": 15, "T": 12, "G": 9, "M": 6, "k": 3, "h": 2,
		"da": 1, "d": -1, "c": -2, "m": -3, "µ": -6, "u": -6, "n": -9, "p": -12, "f": -15, "a": -18,
		"z": -21, "y": -24, "r": -27, "q": -30,
	}
	bases := []struct {
		sym, unit string
		power     int
	}{
		{"J", "J", 1}, {"Wh", "Wh", 1}, {"W", "W", 1}, {"Wyr", "Wyr", 1}, {"g", "g", 1}, {"t", "t", 1},
		{"L", "L", 1}, {"l", "L", 1}, {"m", "m", 1}, {"m2", "m2", 2}, {"m3", "m3", 3}, {"s", "s", 1},
		{"toe", "toe", 1}, {"tce", "tce", 1}, {"Sm3", "Sm3", 1}, {"Nm3", "Nm3", 1},
	}
	accepted, refused := 0, 0
	for p, exp := range prefixes {
		for _, b := range bases {
			in := p + b.sym
			u, err := Parse(in)
			if err != nil {
				refused++
				continue
			}
			accepted++
			want := mustParse(t, b.unit).SI()
			e := exp * b.power
			if e >= 0 {
				want.Mul(want, pow10(e))
			} else {
				want.Quo(want, pow10(-e))
			}
			if u.SI().Cmp(want) != 0 {
				t.Errorf("Parse(%q) = %s (%s), but the SI reads %s as %s %s", in, u.Symbol, u.SI().FloatString(9),
					in, want.FloatString(9), mustParse(t, b.unit).Symbol)
			}
		}
	}
	if accepted < 20 || refused < 100 {
		t.Errorf("accepted %d, refused %d prefixed spellings: the check covered too little", accepted, refused)
	}
}

// TestPrefixRefusals checks the messages of spellings refused because folding their case
// would change an SI prefix, or read an SI unit as another unit.
func TestPrefixRefusals(t *testing.T) {
	for in, want := range map[string]string{
		"mWh":     `unit "mWh" reads as milliwatt hour, which is not accepted: for megawatt hour write MWh`,
		"mJ":      `unit "mJ" reads as millijoule, which is not accepted: for megajoule write MJ`,
		"mW":      `unit "mW" reads as milliwatt, which is not accepted: for megawatt write MW`,
		"mWe":     `unit "mWe" reads as milliwatt, which is not accepted: for megawatt write MW`,
		"pJ":      `unit "pJ" reads as picojoule, which is not accepted: for petajoule write PJ`,
		"mWyr":    `unit "mWyr" reads as milliwatt year, which is not accepted: for megawatt year (365-day year) write MWyr`,
		"mcal":    `unit "mcal" reads as millicalorie, which is not accepted: for megacalorie (International Table) write Mcal`,
		"mtoe":    `unit "mtoe" reads as millitonne of oil equivalent, which is not accepted: for million tonnes of oil equivalent write Mtoe`,
		"pg":      `unit "pg" reads as picogram, which is not accepted: for gigatonne write Gt`,
		"nm3":     `unit "nm3" reads as cubic nanometre, which is not accepted: for normal cubic metre (0 °C, 101.325 kPa) write Nm3`,
		"mNm3":    `unit "mNm3" reads as milli-Nm3, which is not accepted: for million normal cubic metres write MNm3`,
		"T":       `unit "T" reads as tesla, which is not accepted: for tonne write t`,
		"GT":      `unit "GT" reads as gigatesla, which is not accepted: for gigatonne write Gt`,
		"H":       `unit "H" reads as henry, which is not accepted: for hour write h`,
		"S":       `unit "S" reads as siemens, which is not accepted: for second write s`,
		"hA":      `unit "hA" reads as hectoampere, which is not accepted: for hectare write ha`,
		"mWh HHV": `unit "mWh" reads as milliwatt hour, which is not accepted: for megawatt hour write MWh`,
		// declared ambiguous before any prefix reading
		"ml": `ambiguous unit "ml": write mL (millilitre) or ML (megalitre)`,
		"mt": `ambiguous unit "mt": write t (tonne, 1000 kg) or Mt (megatonne, 1e9 kg)`,
	} {
		_, err := Parse(in)
		var e *Error
		if !errors.As(err, &e) || e.Code != CodeAmbiguous || e.Msg != want {
			t.Errorf("Parse(%q): %v\n want %s", in, err, want)
		}
	}
	_, err := Parse("mWh")
	var e *Error
	if errors.As(err, &e) && (len(e.Alternatives) != 1 || e.Alternatives[0] != "MWh") {
		t.Errorf("mWh alternatives = %v, want [MWh]", e.Alternatives)
	}
}

// TestFoldStillAccepted: spellings that are no SI symbol, or whose SI reading is the unit
// found, still match case-insensitively.
func TestFoldStillAccepted(t *testing.T) {
	for in, want := range map[string]string{
		"mwh": "MWh", "MWH": "MWh", "mj": "MJ", "Gj": "GJ", "gJ": "GJ", "mw": "MW", "mwp": "MW",
		"KWH": "kWh", "KJ": "kJ", "gwh": "GWh", "kwyr": "kWyr",
		"kl":   "kL", // kilolitre as written: the SI reading is kL
		"MTOE": "Mtoe", "NM3": "Nm3", "msm3": "MSm3", "KM": "km", "HA": "ha", "Kg": "kg", "KG": "kg",
		"mbbl": "Mbbl", "mcf": "Mcf", // bbl and cf take no SI prefix: M is a thousand in oil and gas usage
		"tg": "Mt", "MIN": "min", "D": "d",
	} {
		u, err := Parse(in)
		if err != nil || u.Symbol != want {
			t.Errorf("Parse(%q) = %q, %v; want %s", in, u.Symbol, err, want)
		}
	}
	// The SI reading is checked with the exact factor, so kL and "kl" agree.
	if r, err := Ratio(mustParse(t, "kl"), mustParse(t, "m3")); err != nil || r.Cmp(big.NewRat(1, 1)) != 0 {
		t.Errorf("kl = %v m3, %v; want 1 (SI prefix k on the litre, 10^-3 m3)", r, err)
	}
}
