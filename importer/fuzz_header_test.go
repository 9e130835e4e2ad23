package importer

import (
	"context"
	"reflect"
	"strings"
	"testing"
	"time"
)

// Header seeds: spellings of real exports and the edges of the header
// patterns (brackets, separators, snake_case, scales, flows).
var parseHeaderSeeds = []string{
	"NaturalGasUse_therms", "Fuel Oil #2 Use (kBtu)", "Natural\u00a0Gas¹\n(GJ)", "Vehicle(s)",
	"Colorado Natural Gas Industrial Consumption  Million Cubic Feet", "Diesel ('000 L)",
	"Total consumption (GWh): Domestic", "Gas (MMBtu, HHV)", "Coal (ton)", "Capacity factor (%)",
	"Weekly Product Supplied of Distillate Fuel Oil (Thousand Barrels per Day)", "(L)", "_L", "x_",
	"Litres", "kWh", "m3 '000", "Energy - GJ", "Fuel used in litres", "[[]]", "( )", "", " ",
}

// FuzzParseHeader: parseHeader never panics; its name and unit come from
// the cleaned header (the header is its name, its unit and what joins
// them); the scale is 1, a thousand or a million; parsing the cleaned text
// again gives the same reading.
func FuzzParseHeader(f *testing.F) {
	for _, s := range parseHeaderSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, raw string) {
		h := parseHeader(raw)
		if h.Text != cleanHeader(raw) {
			t.Fatalf("parseHeader(%q).text = %q, want the cleaned %q", raw, h.Text, cleanHeader(raw))
		}
		if h.Scale != 1 && h.Scale != 1e3 && h.Scale != 1e6 {
			t.Fatalf("parseHeader(%q).scale = %v, want 1, 1e3 or 1e6", raw, h.Scale)
		}
		if h.UnitText != "" && !strings.Contains(h.Text, h.UnitText) {
			t.Fatalf("parseHeader(%q): unit %q is not in %q", raw, h.UnitText, h.Text)
		}
		if h.UnitText != "" && h.Base != h.Text && !madeOf(h.Text, h.Base, h.UnitText) {
			t.Fatalf("parseHeader(%q): %q is not its name %q and its unit %q", raw, h.Text, h.Base, h.UnitText)
		}
		if h.UnitErr != nil && (h.UnitText == "" || h.Unit.Symbol != "") {
			t.Fatalf("parseHeader(%q): unusable unit %q read as %q", raw, h.UnitText, h.Unit.Symbol)
		}
		if h.Percent && h.UnitText != "" || h.Flow && h.UnitText == "" || h.FlowDays < 0 {
			t.Fatalf("parseHeader(%q) = %+v: percent, flow and unit disagree", raw, h)
		}
		if again := parseHeader(h.Text); !reflect.DeepEqual(again, h) {
			t.Fatalf("parseHeader(%q) = %+v, but parseHeader of its text = %+v", raw, h, again)
		}
	})
}

// madeOf reports whether text holds unit at some place and, around it,
// every word of base.
func madeOf(text, base, unit string) bool {
	for i := 0; i <= len(text)-len(unit); i++ {
		if !strings.HasPrefix(text[i:], unit) {
			continue
		}
		rest, all := text[:i]+" "+text[i+len(unit):], true
		for _, w := range strings.Fields(base) {
			all = all && strings.Contains(rest, w)
		}
		if all {
			return true
		}
	}
	return false
}

// fuelNameBudget bounds one fuelName call on a 10 000-character text: the
// texts of one sheet are read in well under a second (common practice for
// an interactive tool); generous, for the race detector.
const fuelNameBudget = 2 * time.Second

// FuzzFuelName: scanCtx.fuelName never panics, a fuel it reads resolves, it
// answers the same twice, and a 10 000-character text built from the input
// is read fast.
func FuzzFuelName(f *testing.F) {
	for _, s := range []string{"Coal Consumed by the Residential Sector", "Gas Firm", "Total Fossil Fuels", "Combined",
		"Electricity", "Natral gas", "Gas-oline", "Natural Gas Consumption (Excluding Supplemental Gaseous Fuels)",
		"Crude Oil Price", "Wood", "no", "-", "(", "a-b-c-d-e", "natural gas natural gas natural gas natural gas"} {
		f.Add(s)
	}
	e := testEngine(f)
	f.Fuzz(func(t *testing.T, s string) {
		sc := newScanCtx(context.Background(), e, "fuzz.xlsx", Options{})
		r := sc.fuelName(s)
		if r.kind > nameRate {
			t.Fatalf("fuelName(%q): kind %d", s, r.kind)
		}
		if r.kind == nameFuel {
			if r.id == "" || r.name == "" || sc.fuel(r.id).err != nil {
				t.Fatalf("fuelName(%q) = %+v: a fuel that does not resolve", s, r)
			}
		}
		if again := newScanCtx(context.Background(), e, "fuzz.xlsx", Options{}).fuelName(s); again != r {
			t.Fatalf("fuelName(%q) = %+v, then %+v", s, r, again)
		}
		long := s + " "
		long = strings.Repeat(long, 10_000/len(long)+1)[:10_000]
		start := time.Now()
		sc.fuelName(long)
		sc.fuelName(strings.ReplaceAll(long, " ", "-"))
		if d := time.Since(start); d > fuelNameBudget {
			t.Fatalf("fuelName of 10 000 characters of %q took %v, want under %v", s, d, fuelNameBudget)
		}
	})
}

// TestFuelNameLongTexts: texts of 10 000 characters, a cell's worth of
// words, are read fast.
func TestFuelNameLongTexts(t *testing.T) {
	sc := newScanCtx(context.Background(), testEngine(t), "long.xlsx", Options{})
	for _, unit := range []string{"natural gas ", "Natral gas consumed by the residential sector ", "Gas-oline ", "a", "(", "é "} {
		long := strings.Repeat(unit, 10_000/len(unit)+1)[:10_000]
		for _, s := range []string{long, long[:190], long[:199] + "("} {
			start := time.Now()
			sc.fuelName(s)
			if d := time.Since(start); d > fuelNameBudget {
				t.Errorf("fuelName of %d characters of %q took %v", len(s), unit, d)
			}
		}
	}
}
