package importer

import (
	"context"
	"math"
	"math/rand"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/importer/demo"
)

// The robust test flags a slip of about a factor of 10 and keeps quiet on
// ordinary and on honestly skewed amounts. Its threshold is the modified
// z-score of 3.5 of Iglewicz and Hoaglin (How to Detect and Handle
// Outliers, 1993; from memory).
func TestRobustOutliers(t *testing.T) {
	geometric := func(start, step float64, n int) []float64 {
		out := make([]float64, n)
		for i := range out {
			out[i] = start * math.Pow(step, float64(i))
		}
		return out
	}
	cases := []struct {
		name string
		vals []float64
		want []int
	}{
		{"an extra zero among deliveries of about 3,000 L",
			[]float64{3050, 2980, 3120, 2890, 3010, 30500, 3200, 2950}, []int{5}},
		{"a missing zero", []float64{3050, 2980, 312, 2890, 3010, 3050, 3200}, []int{2}},
		{"an extra zero in a group of exactly five",
			[]float64{3050, 2980, 31200, 2890, 3010}, []int{2}},
		{"equal deliveries (no spread at all) and one ten times as large",
			[]float64{3000, 3000, 3000, 3000, 3000, 30000}, []int{5}},
		{"a factor of 3 is ordinary", []float64{3050, 2980, 3120, 2890, 9000, 3010, 3200}, nil},
		{"fewer than five rows", []float64{3050, 2980, 30500, 3010}, nil},
		// A campus: buildings of every size, the largest 20 times the smallest.
		{"a smooth heavy tail", []float64{120, 180, 260, 340, 450, 600, 820, 1100, 1500, 2000, 2400}, nil},
		// A series growing 30 % a step for 20 steps: 190 times from first to last.
		{"a growing series", geometric(100, 1.3, 21), nil},
		// Amounts a factor of 3 apart each: jumps everywhere, but the spread
		// is the data's own, so the modified z-score stays under 3.5.
		{"a wide geometric spread", geometric(1, 3, 7), nil},
		{"a block of rows ten times the others is a section, not a slip",
			[]float64{3050, 2980, 3120, 30500, 29800, 31200, 2890, 3010, 3200, 2950, 3100}, nil},
		{"two slips apart from each other", []float64{3050, 29800, 3120, 2890, 3010, 3200, 31000, 2950}, []int{1, 6}},
	}
	for _, c := range cases {
		in := slices.Clone(c.vals)
		_, got := robustOutliers(c.vals)
		if !slices.Equal(got, c.want) {
			t.Errorf("%s: flagged %v, want %v", c.name, got, c.want)
		}
		if !slices.Equal(in, c.vals) {
			t.Errorf("%s: the values were changed", c.name)
		}
	}
	if med, _ := robustOutliers([]float64{4, 1, 3, 2}); med != 2.5 {
		t.Errorf("median of 1..4 = %v, want 2.5", med)
	}
}

// costHeader tells a total paid from a price per unit or a tax.
func TestCostHeader(t *testing.T) {
	for _, h := range []string{"Cost (£)", "Amount paid", "Invoice EUR", "$", "Total price", "Cost incl. VAT", "Spend (USD)"} {
		if !costHeader(h) {
			t.Errorf("%q: not read as a cost column", h)
		}
	}
	for _, h := range []string{"Price per litre", "€/L", "Unit cost", "VAT (€)", "Price", "Cost per kWh", "Quantity", "Fuel efficiency", "Average cost"} {
		if costHeader(h) {
			t.Errorf("%q: read as a cost column", h)
		}
	}
}

// fuelLogCSV is a diesel and LPG log with a cost column; rows
// replaces rows by index (0-based data rows).
func fuelLogCSV(rows map[int]string) string {
	lines := []string{"Date,Site,Fuel,Quantity,Unit,Cost (£)",
		"2025-01-06,North depot,Diesel,3050,L,4392",
		"2025-01-20,North depot,Diesel,2980,L,4321",
		"2025-02-03,North depot,Diesel,3120,L,4430",
		"2025-02-17,North depot,Diesel,2890,L,4104",
		"2025-03-03,North depot,Diesel,3010,L,4334",
		"2025-03-17,North depot,Diesel,3200,L,4512",
		"2025-03-31,North depot,Diesel,2950,L,4189",
		"2025-04-14,North depot,Diesel,3080,L,4404",
		"2025-01-10,Mill house,LPG,480,kg,610",
		"2025-03-10,Mill house,LPG,450,kg,572",
	}
	for i, r := range rows {
		lines[i+1] = r
	}
	return strings.Join(lines, "\n") + "\n"
}

// findings returns the warnings of code.
func findings(rep *Report, code string) []Warning {
	var out []Warning
	for _, w := range rep.Warnings {
		if w.Code == code {
			out = append(out, w)
		}
	}
	return out
}

// An extra zero in a quantity is flagged at its cell with the median and
// the factor; the cost column confirms the amount is the slip.
func TestOutlierExtraZeroAtCell(t *testing.T) {
	rep := scanCSVText(t, "fuel.csv", fuelLogCSV(map[int]string{5: "2025-03-17,North depot,Diesel,32000,L,4512"}))
	if len(findings(rep, CodePriceOutlier)) != 0 {
		t.Errorf("a price finding beside the amount's: %+v", findings(rep, CodePriceOutlier))
	}
	ws := findings(rep, CodeValueOutlier)
	if len(ws) != 1 || ws[0].Cell != "D7" {
		t.Fatalf("want one value-outlier at D7, got %+v", ws)
	}
	for _, part := range []string{"32000 is 10.6 times the median 3030 of the 8 rows of gas_diesel_oil in L",
		"the decimal point one place to the right? 3200 would fit",
		"the row's cost gives a unit price of 0.141 (cost 4512 in F7 / 32000), 1/10.1 the median 1.42",
		"the amount is the likely slip"} {
		if !strings.Contains(ws[0].Message, part) {
			t.Errorf("message %q lacks %q", ws[0].Message, part)
		}
	}
	// Three times the usual delivery is not a slip.
	rep = scanCSVText(t, "fuel.csv", fuelLogCSV(map[int]string{5: "2025-03-17,North depot,Diesel,9600,L,13536"}))
	if ws := append(findings(rep, CodeValueOutlier), findings(rep, CodePriceOutlier)...); len(ws) != 0 {
		t.Errorf("a factor of 3 flagged: %+v", ws)
	}
}

// A cost typed ten times too large leaves the amount in line but not the
// price: one finding at the quantity cell naming the amount and the cost.
func TestPriceOutlier(t *testing.T) {
	rep := scanCSVText(t, "fuel.csv", fuelLogCSV(map[int]string{2: "2025-02-03,North depot,Diesel,3120,L,44300"}))
	if ws := findings(rep, CodeValueOutlier); len(ws) != 0 {
		t.Errorf("amount flagged: %+v", ws)
	}
	ws := findings(rep, CodePriceOutlier)
	if len(ws) != 1 || ws[0].Cell != "D4" || ws[0].Severity != SevWarning {
		t.Fatalf("want one price-outlier warning at D4, got %+v", ws)
	}
	for _, part := range []string{"the amount 3120 and its cost give a unit price of 14.2 (cost 44300 in F4 / 3120), 9.9 times the median 1.43",
		"of the 8 rows of gas_diesel_oil in L", "31200 or 4430 would fit"} {
		if !strings.Contains(ws[0].Message, part) {
			t.Errorf("message %q lacks %q", ws[0].Message, part)
		}
	}
	// Without a cost column the same rows raise nothing.
	plain := strings.ReplaceAll(fuelLogCSV(map[int]string{2: "2025-02-03,North depot,Diesel,3120,L,44300"}), "Cost (£)", "Supplier ref")
	if ws := findings(scanCSVText(t, "fuel.csv", plain), CodePriceOutlier); len(ws) != 0 {
		t.Errorf("price finding without a cost column: %+v", ws)
	}
}

// Groups of three or four rows are too small for the robust test: only a
// factor of 100 is flagged there, an extra zero is not.
func TestOutlierSmallGroup(t *testing.T) {
	const head = "Date,Fuel,Quantity,Unit\n2025-01-06,Diesel,3050,L\n2025-01-20,Diesel,2980,L\n2025-02-03,Diesel,3120,L\n"
	if ws := findings(scanCSVText(t, "fuel.csv", head+"2025-02-17,Diesel,30500,L\n"), CodeValueOutlier); len(ws) != 0 {
		t.Errorf("an extra zero among 4 rows flagged: %+v", ws)
	}
	ws := findings(scanCSVText(t, "fuel.csv", head+"2025-02-17,Diesel,330000,L\n"), CodeValueOutlier)
	if len(ws) != 1 || ws[0].Cell != "C5" || !strings.Contains(ws[0].Message, "330000 is 107 times the median 3085 of the 4 rows") {
		t.Errorf("want one finding at C5 for a factor of 100 among 4 rows, got %+v", ws)
	}
}

// TestOutlierGroupsByWorkbookName: two names of one fuel (diesel for the
// vans, heating oil for a boiler: both gas_diesel_oil) are judged apart when
// a name has five rows or more, so the spread between them hides no slip
// within either; the other names' rows are judged with the whole fuel.
func TestOutlierGroupsByWorkbookName(t *testing.T) {
	// Pages of 2 rows and a budget of one page: the samples go through the
	// temporary file (pages.go) as a million-row table's would.
	const k = "Fuel log|D|gas_diesel_oil|L"
	ss := newSampleSet(newPageSet(1, 1))
	one := newSampleSet(newPageSet(-1, 0)) // the diesel rows alone
	add := func(word string, vs ...float64) {
		for _, v := range vs {
			ss.add(k, ss.key.len()+2, 4, v, word, 0)
			if word == "diesel" {
				one.add(k, one.key.len()+2, 4, v, word, 0)
			}
		}
	}
	// Diesel deliveries of about 1,200 L, one keyed with an extra zero;
	// gas oil and heating oil at other levels.
	add("diesel", 1250, 1150, 1090, 1210, 11900)
	add("gas oil", 4000)
	add("heating oil", 300, 250)
	groups := ss.outlierGroups(k)
	if len(groups) != 2 || groups[0].name != `"diesel" (gas_diesel_oil in L)` || len(ss.sorted(groups[0])) != 5 ||
		groups[1].name != "gas_diesel_oil in L" || len(groups[1].own) != 1 || !groups[1].own[groups[0].word] {
		t.Fatalf("groups %+v", groups)
	}
	var flagged []int
	for _, g := range groups {
		for _, f := range ss.testGroup(g) {
			flagged = append(flagged, f.row)
			if !strings.Contains(f.msg, "1190 would fit") {
				t.Errorf("finding %q does not suggest the value without the extra zero", f.msg)
			}
		}
	}
	if !slices.Equal(flagged, []int{6}) {
		t.Errorf("flagged rows %v, want [6] (the 11,900 L)", flagged)
	}
	// Judged as one fuel, the same amounts hide the slip: the spread of the
	// three names widens the median absolute deviation (modified z 2.4).
	if _, out := robustOutliers([]float64{1250, 1150, 1090, 1210, 11900, 4000, 300, 250}); len(out) != 0 {
		t.Errorf("as one group the slip is flagged (%v): the case no longer shows why names are judged apart", out)
	}
	// One name only: one group, under the fuel's own name.
	if g := one.outlierGroups(k); len(g) != 1 || g[0].name != "gas_diesel_oil in L" {
		t.Errorf("one name: groups %+v", g)
	}
}

// TestDemoFuelLogExtraZero: the demo's fuel log holds 11,900 L of diesel
// keyed for an invoice of 1,190 L (the reported 3.18 t CO2 is the
// invoice's); the annotation flags it as an outlier and the reported figure
// as a mismatch.
func TestDemoFuelLogExtraZero(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	rep, err := Annotate(context.Background(), testEngine(t), paths[0], filepath.Join(dir, "out.xlsx"), Options{})
	must(t, err)
	var outlier, mismatch bool
	for _, w := range rep.Warnings {
		switch {
		case w.Cell == "D21" && w.Code == CodeValueOutlier:
			outlier = strings.Contains(w.Message, "11900 is 9.9 times the median")
		case w.Cell == "G21" && w.Code == CodeExistingMismatch:
			mismatch = true
		}
	}
	if !outlier || !mismatch {
		t.Errorf("the extra zero in Fuel log!D21: outlier %v, mismatch %v; findings %+v", outlier, mismatch, rep.Warnings)
	}
}

// TestRobustOutliersAgainstDefinition compares the test as computed
// (groupStats: the deviations' median taken by walking out from the
// median, the jumps found once) with the definition written out: the
// logarithms, their deviations sorted, and the jumps marked value by value,
// on random heavy-tailed groups with slips, ties and sections.
func TestRobustOutliersAgainstDefinition(t *testing.T) {
	rng := rand.New(rand.NewSource(11))
	for trial := 0; trial < 3000; trial++ {
		n := 5 + rng.Intn(60)
		vals := make([]float64, n)
		for i := range vals {
			vals[i] = math.Round(math.Exp(rng.NormFloat64()*float64(1+trial%3)) * 100)
			if vals[i] <= 0 || rng.Intn(7) == 0 {
				vals[i] = 120 // ties
			}
			if rng.Intn(15) == 0 {
				vals[i] *= 10 // a slip
			}
		}
		med, got := robustOutliers(vals)
		wantMed, want := definitionOutliers(vals)
		if med != wantMed || !slices.Equal(got, want) {
			t.Fatalf("trial %d %v: got median %v flags %v, want %v %v", trial, vals, med, got, wantMed, want)
		}
	}
}

// definitionOutliers is the robust test as its doc comment defines it.
func definitionOutliers(vals []float64) (float64, []int) {
	n := len(vals)
	s := append([]float64(nil), vals...)
	sort.Float64s(s)
	med := median(s)
	logs := make([]float64, n)
	for i, v := range s {
		logs[i] = math.Log(v)
	}
	lm := median(logs)
	dev := make([]float64, n)
	for i, l := range logs {
		dev[i] = math.Abs(l - lm)
	}
	sort.Float64s(dev)
	mad := median(dev)
	up, down := n/2, (n-1)/2
	gap := make([]bool, n)
	for k := up + 1; k < n; k++ {
		gap[k] = gap[k-1] || s[k] >= outlierGap*s[k-1]
	}
	for k := down - 1; k >= 0; k-- {
		gap[k] = gap[k+1] || s[k+1] >= outlierGap*s[k]
	}
	var out []int
	for i, v := range vals {
		r := v / med
		if r < outlierFactor && r > 1/outlierFactor {
			continue
		}
		if d := math.Abs(math.Log(v) - lm); mad > 0 && 0.6745*d/mad <= outlierZ {
			continue
		}
		var k int
		if v > med {
			k = sort.SearchFloat64s(s, v)
		} else {
			k = sort.Search(n, func(j int) bool { return s[j] > v }) - 1
		}
		if gap[k] {
			out = append(out, i)
		}
	}
	return med, dropRuns(out, func(i int) float64 { return vals[i] }, med)
}
