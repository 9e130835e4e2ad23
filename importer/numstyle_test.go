package importer

import (
	"context"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestDecideNumStyle(t *testing.T) {
	cases := []struct {
		name  string
		texts []string
		want  numStyle
	}{
		{"utility report: thousands commas beside text", []string{"20,523", "No gas", "14,938", "1,234,567", "3,118"}, styleDotDecimal},
		{"only ambiguous values", []string{"14,938", "20,523", "No gas"}, styleUnknown},
		{"one value with a decimal point", []string{"14,938", "2.5"}, styleDotDecimal},
		{"both marks, English", []string{"1,250.50", "980"}, styleDotDecimal},
		{"both marks, German", []string{"1.250,50", "1.234"}, styleCommaDecimal},
		{"dot thousands", []string{"1.234.567", "14.938"}, styleCommaDecimal},
		{"decimal comma", []string{"12,5", "7,25", "1.234"}, styleCommaDecimal},
		{"decimal comma after zero", []string{"0,250", "1,125"}, styleCommaDecimal},
		{"decimal point after zero", []string{"0.250", "1,125"}, styleDotDecimal},
		{"French spaces", []string{"1\u202f234,5", "12\u00a0345,67"}, styleCommaDecimal},
		{"space grouping, three decimals", []string{"1 234,567"}, styleCommaDecimal},
		{"Swiss apostrophes", []string{"1'234.50", "12'000"}, styleDotDecimal},
		{"Indian grouping", []string{"12,34,567", "1,23,456"}, styleDotDecimal},
		{"percent with decimal comma", []string{"35,5 %", "12 %"}, styleCommaDecimal},
		{"accounting negatives", []string{"(1,234.00)", "$2,100.75"}, styleDotDecimal},
		{"contradicting values", []string{"1,234,567", "12,5"}, styleUnknown},
		{"contradicting marks", []string{"1,250.50", "1.250,50"}, styleUnknown},
		{"plain integers", []string{"2019", "2020", "150"}, styleUnknown},
		{"dates and codes", []string{"12.05.2020", "N9140US2", "1.2.3"}, styleUnknown},
		{"nothing", nil, styleUnknown},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := decideNumStyle(c.texts); got != c.want {
				t.Errorf("decideNumStyle(%q) = %v, want %v", c.texts, got, c.want)
			}
		})
	}
}

func TestNumStyleLikely(t *testing.T) {
	cases := []struct {
		name   string
		texts  []string
		votes  numStyleVotes
		likely numStyle
	}{
		// The utility report's usage column: every value one comma before
		// three digits, beside "No gas" in the next column.
		{"thousands commas only", []string{"20,523", "7,193", "27,715", "No gas"}, numStyleVotes{DotWeak: 3}, styleDotDecimal},
		{"one weak value", []string{"20,523", "No gas"}, numStyleVotes{DotWeak: 1}, styleUnknown},
		{"weak dots", []string{"20.523", "7.193"}, numStyleVotes{CommaWeak: 2}, styleCommaDecimal},
		{"weak both ways", []string{"20.523", "7,193", "1,250"}, numStyleVotes{DotWeak: 2, CommaWeak: 1}, styleUnknown},
		{"strong beats weak", []string{"20.523", "7.193", "1,234,567"}, numStyleVotes{Dot: 1, CommaWeak: 2}, styleDotDecimal},
		{"strong conflict stays unknown", []string{"20,523", "7,193", "1,234,567", "12,5"}, numStyleVotes{Dot: 1, Comma: 1, DotWeak: 2}, styleUnknown},
		{"currency amounts", []string{"$ 891,249", "$ 73,200"}, numStyleVotes{DotWeak: 2}, styleDotDecimal},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			v := countNumStyle(c.texts)
			if v != c.votes || v.likely() != c.likely {
				t.Errorf("votes %+v likely %v; want %+v %v", v, v.likely(), c.votes, c.likely)
			}
			if v.decide() != decideNumStyle(c.texts) {
				t.Error("decide and decideNumStyle differ")
			}
		})
	}
}

func TestTextNumberIn(t *testing.T) {
	const no = math.MaxFloat64 // not a number in that style
	cases := []struct {
		in                  string
		dot, comma, unknown float64
	}{
		// Thousands groups: the ambiguous case the column decides.
		{"14,938", 14938, 14.938, no},
		{"20,523", 20523, 20.523, no},
		{"1.250", 1.25, 1250, 1.25},
		{"1,234,567", 1234567, no, 1234567},
		{"1.234.567", no, 1234567, 1234567},
		{"1,234,567.89", 1234567.89, no, 1234567.89},
		{"1.234.567,89", no, 1234567.89, 1234567.89},
		{"12,5", no, 12.5, 12.5},
		{"3.25", 3.25, no, 3.25},
		{"0,250", 250, 0.25, no},
		{"1,2345", no, 1.2345, 1.2345},
		{"1234", 1234, 1234, 1234},
		{"1234.5", 1234.5, no, 1234.5},
		{"1234,5", no, 1234.5, 1234.5},
		{".5", 0.5, no, 0.5},
		{",5", no, 0.5, 0.5},
		// Spaces and apostrophes group thousands in either style.
		{"1 234 567", 1234567, 1234567, 1234567},
		{"1\u00a0234,5", no, 1234.5, 1234.5},
		{"1\u202f234\u202f567,89", no, 1234567.89, 1234567.89},
		{"1\u2009234.5", 1234.5, no, 1234.5},
		{"1'234'567.50", 1234567.5, no, 1234567.5},
		{"1\u2019234.50", 1234.5, no, 1234.5},
		{"12 34", no, no, no},
		{"1 234,567.8", no, no, no},
		// Indian grouping.
		{"12,34,567", 1234567, no, 1234567},
		{"1,23,456.75", 123456.75, no, 123456.75},
		{"1,234,56,789", no, no, no},
		// Signs, accounting negatives, percent, currency.
		{"-1,234.5", -1234.5, no, -1234.5},
		{"\u22121.234,5", no, -1234.5, -1234.5},
		{"+12", 12, 12, 12},
		{"(1,250.5)", -1250.5, no, -1250.5},
		{"( 3.118,00 )", no, -3118, -3118},
		{"1,234-", -1234, -1.234, no},
		{"35 %", 0.35, 0.35, 0.35},
		{"35,5%", no, 0.355, 0.355},
		{"(2.5%)", -0.025, no, -0.025},
		{"$1,234.56", 1234.56, no, 1234.56},
		{"US$ 2,100", 2100, 2.1, no},
		{"-$45.10", -45.1, no, -45.1},
		{"$-45.10", -45.1, no, -45.1},
		{"€ 1.234,56", no, 1234.56, 1234.56},
		{"1.234,56 €", no, 1234.56, 1234.56},
		{"£12", 12, 12, 12},
		{"R$ 1.234,56", no, 1234.56, 1234.56},
		{"50¢", no, no, no},
		{"  42\u00a0", 42, 42, 42},
		// Exponents.
		{"1.5E+03", 1500, no, 1500},
		{"2e-3", 0.002, 0.002, 0.002},
		{"1,5e3", no, 1500, 1500},
		{"1,234e3", no, 1234, 1234},
		// Not numbers.
		{"No gas", no, no, no},
		{"n/a", no, no, no},
		{"", no, no, no},
		{"-", no, no, no},
		{"--", no, no, no},
		{"(-5)", no, no, no},
		{"1.2.3", no, no, no},
		{"12.05.2020", no, no, no},
		{"1,,234", no, no, no},
		{"1,23", no, 1.23, 1.23},
		{"NaN", no, no, no},
		{"Inf", no, no, no},
		{"1e999", no, no, no},
		{"e5", no, no, no},
		{"12 kWh", no, no, no},
		{"N9140US2", no, no, no},
		{"EUR 12", no, no, no},
		{strings.Repeat("1", 70), no, no, no},
	}
	for _, c := range cases {
		for _, st := range []struct {
			style numStyle
			want  float64
		}{{styleDotDecimal, c.dot}, {styleCommaDecimal, c.comma}, {styleUnknown, c.unknown}} {
			got, ok := textNumberIn(c.in, st.style)
			switch {
			case st.want == no && ok:
				t.Errorf("textNumberIn(%q, %v) = %v, want no number", c.in, st.style, got)
			case st.want != no && (!ok || math.Abs(got-st.want) > 1e-9*math.Max(1, math.Abs(st.want))):
				t.Errorf("textNumberIn(%q, %v) = %v, %v; want %v", c.in, st.style, got, ok, st.want)
			}
		}
	}
}

// TestTextNumberInAgreesWithTextNumber: where textNumber reads a value
// without ambiguity, the unknown style reads the same.
func TestTextNumberInAgreesWithTextNumber(t *testing.T) {
	for _, s := range []string{"1,250.5", "1 250,5", "1.250,5", "12,5", "(1,250.5)", "35 %", "-12", "1.250.000", "0.5", "7", "1e3"} {
		want, ok, amb := textNumber(s)
		if !ok || amb {
			t.Fatalf("textNumber(%q) does not read it: %v %v", s, ok, amb)
		}
		if got, ok := textNumberIn(s, styleUnknown); !ok || got != want {
			t.Errorf("textNumberIn(%q, unknown) = %v, %v; textNumber gives %v", s, got, ok, want)
		}
	}
	if _, _, amb := textNumber("14,938"); !amb {
		t.Error("textNumber no longer calls 14,938 ambiguous")
	}
}

func FuzzTextNumberIn(f *testing.F) {
	for _, s := range []string{"14,938", "1.234,5", "(1,250.5)", "$1,234.56", "35,5 %", "1'234.5", "12,34,567", "1.5E+03"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, st := range []numStyle{styleUnknown, styleDotDecimal, styleCommaDecimal} {
			v, ok := textNumberIn(s, st)
			if ok && (math.IsNaN(v) || math.IsInf(v, 0)) {
				t.Fatalf("textNumberIn(%q, %v) = %v", s, st, v)
			}
		}
		_ = decideNumStyle([]string{s})
	})
}

// TestNumStyleRealColumns decides the style of columns of real public files
// (FLUECELL_DEVSET=/work/shared/realworld): decimal commas in a Vietnamese
// plan exported as CSV, and thousands commas in a utility report saved as
// .xls.
func TestNumStyleRealColumns(t *testing.T) {
	dev := os.Getenv("FLUECELL_DEVSET")
	if dev == "" {
		t.Skip("FLUECELL_DEVSET is not set (the folder of real public workbooks)")
	}
	f, err := os.Open(filepath.Join(dev, "vn_PDP7A_Objectives.csv"))
	must(t, err)
	recs, err := csv.NewReader(f).ReadAll()
	f.Close()
	must(t, err)
	// Column R ("Error") of the Supply tables: -0,1% ... 572,0.
	var errCol []string
	for _, r := range recs {
		if len(r) > 17 && r[17] != "" {
			errCol = append(errCol, r[17])
		}
	}
	if st := decideNumStyle(errCol); st != styleCommaDecimal {
		t.Fatalf("column R %q: %v, want decimal comma", errCol, st)
	}
	if v, ok := textNumberIn("-265,0", styleCommaDecimal); !ok || v != -265 {
		t.Errorf("-265,0 read as %v %v", v, ok)
	}

	o := requireOffice(t)
	conv, err := o.toXLSX(context.Background(), filepath.Join(dev, "masssave_2022_Geographic_Report_Truro.xls"))
	if err != nil {
		t.Fatal(err)
	}
	defer conv.remove()
	cells := sheetCells(t, conv.Path)
	// Column E: Annual Electric Usage (MWh), rows 3 to 5; column H: gas usage.
	var usage, gas []string
	for r := 3; r <= 5; r++ {
		usage = append(usage, cells[cellRef(5, r)].text)
		gas = append(gas, cells[cellRef(8, r)].text)
	}
	v := countNumStyle(append(usage, gas...))
	if v.decide() != styleUnknown || v.likely() != styleDotDecimal {
		t.Errorf("usage %q, gas %q: votes %+v, decide %v, likely %v; want unknown and comma thousands", usage, gas, v, v.decide(), v.likely())
	}
	if x, ok := textNumberIn(usage[0], v.likely()); !ok || x != 20523 {
		t.Errorf("%q read as %v %v, want 20523", usage[0], x, ok)
	}
}
