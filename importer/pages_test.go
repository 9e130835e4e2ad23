package importer

import (
	"bytes"
	"context"
	"math"
	"math/rand"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs"
)

// TestPagedColumnModel runs random appends, reads and writes on paged
// columns with a budget of a few pages, against plain slices: every value
// read back must be the one written, whichever pages went to the file.
func TestPagedColumnModel(t *testing.T) {
	rng := rand.New(rand.NewSource(7))
	const pageRows = 1 << pageShift
	ps := newPageSet(3*pageRows*8, 0)
	nums := newFixed(ps, 0, 0.0)
	states := newFixed(ps, 0, int8(0))
	var wantNums []float64
	var wantStates []int8
	for step := 0; step < 60_000; step++ {
		switch op := rng.Intn(10); {
		case op < 5:
			v := rng.NormFloat64()
			nums.push(v)
			wantNums = append(wantNums, v)
			s := int8(rng.Intn(3))
			states.push(s)
			wantStates = append(wantStates, s)
		case op < 7 && len(wantNums) > 0:
			i := rng.Intn(len(wantNums))
			v := rng.NormFloat64()
			nums.set(i, v)
			wantNums[i] = v
		case len(wantNums) > 0:
			i := rng.Intn(len(wantNums))
			if got := nums.at(i); got != wantNums[i] {
				t.Fatalf("step %d: row %d reads %v, want %v", step, i, got, wantNums[i])
			}
			if got := states.at(i); got != wantStates[i] {
				t.Fatalf("step %d: row %d state %d, want %d", step, i, got, wantStates[i])
			}
		}
	}
	if nums.len() != len(wantNums) {
		t.Fatalf("%d rows, want %d", nums.len(), len(wantNums))
	}
	for i, w := range wantNums {
		if got := nums.at(i); got != w {
			t.Fatalf("row %d reads %v, want %v", i, got, w)
		}
	}
	if ps.spilled() == 0 {
		t.Fatalf("no page was written out: the test did not exercise the file")
	}
	if max := ps.budget + int64(pageRows*8); ps.resident > max {
		t.Fatalf("%d bytes resident, over the budget %d and one page", ps.resident, ps.budget)
	}
	// A whole column filled at once keeps its value on every row.
	filled := newFixed(ps, 3*pageRows+5, math.NaN())
	for _, i := range []int{0, pageRows - 1, pageRows, 3*pageRows + 4} {
		if !math.IsNaN(filled.at(i)) {
			t.Fatalf("filled row %d reads %v, want NaN", i, filled.at(i))
		}
	}
}

// TestCellValPages writes stored cells of every kind through pages that go
// to the file, and reads them back equal.
func TestCellValPages(t *testing.T) {
	const pageRows = 1 << pageShift
	ps := newPageSet(1, 0) // every page but the one in use goes out
	tb := &table{ps: ps, slots: make([]*column, 3), intern: map[string]string{}}
	want := func(i int) []cellVal {
		return []cellVal{
			{kind: kNumber, num: float64(i) * 1.25, formula: i%7 == 0},
			{kind: kText, text: []string{"Diesel", "", "gas oil – red", "x\x00y"}[i%4], merged: i%5 == 0},
			{kind: cellKind(i % 5), noCache: i%3 == 0, num: -float64(i), text: strings.Repeat("é", i%9)},
		}
	}
	const rows = 2*pageRows + 77
	for i := 0; i < rows; i++ {
		tb.storeRow(i+4, want(i))
	}
	tb.setVal(5, 1, cellVal{kind: kText, text: "changed"})
	for i := rows - 1; i >= 0; i-- {
		w := want(i)
		if i == 5 {
			w[1] = cellVal{kind: kText, text: "changed"}
		}
		for s := range w {
			if got := tb.val(i, s); got != w[s] {
				t.Fatalf("row %d cell %d reads %+v, want %+v", i, s, got, w[s])
			}
		}
		if tb.rowNum(i) != i+4 {
			t.Fatalf("row %d numbered %d, want %d", i, tb.rowNum(i), i+4)
		}
	}
	if tb.indexOfRow(pageRows+10) != pageRows+6 || tb.indexOfRow(2) != -1 {
		t.Fatalf("indexOfRow: %d, %d", tb.indexOfRow(pageRows+10), tb.indexOfRow(2))
	}
	if ps.spilled() == 0 {
		t.Fatal("no page was written out")
	}
}

// TestPagesSameResults annotates real public workbooks and CSV files
// (testdata/realworld, with their origins in its README), the messy
// workbook and a 20 000-row fuel log twice: with every row in memory, and
// with pages of 16 rows and a budget so small that the pages of any table
// of more than a few dozen rows go to the temporary file. The reports and every part of the written workbooks must be the
// same.
func TestPagesSameResults(t *testing.T) {
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	inputs := sameResultInputs(t, dir)
	// Pages of 16 rows and a budget of 16 kB: every table of more than a
	// few dozen rows has pages in the file.
	const smallBudget, smallPages = 16 << 10, 4
	spilledFiles := 0
	defer func() {
		if spilledFiles < 3 {
			t.Errorf("pages went to the file for %d inputs only: the test did not exercise it", spilledFiles)
		}
	}()
	for _, in := range inputs {
		t.Run(filepath.Base(in), func(t *testing.T) {
			res, err := Scan(context.Background(), e, in, Options{PageBudget: smallBudget, pageShift: smallPages})
			if err != nil {
				t.Skipf("not a workbook fluecell reads: %v", err)
			}
			if res.sc.pages.spilled() > 0 {
				spilledFiles++
			}
			ext := filepath.Ext(in)
			outMem, outDisk := filepath.Join(dir, "mem"+ext), filepath.Join(dir, "disk"+ext)
			repMem, err := Annotate(context.Background(), e, in, outMem, Options{PageBudget: -1})
			if err != nil {
				t.Fatal(err)
			}
			repDisk, err := Annotate(context.Background(), e, in, outDisk, Options{PageBudget: smallBudget, pageShift: smallPages})
			if err != nil {
				t.Fatal(err)
			}
			repMem.Output, repDisk.Output = "", ""
			if a, b := reportJSON(t, repMem), reportJSON(t, repDisk); !bytes.Equal(a, b) {
				t.Fatalf("the reports differ:\n%s", firstDiff(string(a), string(b)))
			}
			samePackage(t, outMem, outDisk)
		})
	}
}

// sameResultInputs lists the inputs of the tests that require the same
// results two ways: every real file of testdata/realworld (origins in its
// README), the messy workbook (written to dir) and a 20 000-row fuel log.
func sameResultInputs(t *testing.T, dir string) []string {
	t.Helper()
	var inputs []string
	for _, pat := range []string{"*.xlsx", "*.csv"} {
		m, _ := filepath.Glob(filepath.Join("..", "testdata", "realworld", pat))
		inputs = append(inputs, m...)
	}
	return append(inputs, writeMessy(t, dir), fuelLogN(t, 20_000))
}

// samePackage compares two written files: every zip part unpacked, or the
// bytes of a CSV.
func samePackage(t *testing.T, a, b string) {
	t.Helper()
	if filepath.Ext(a) == ".csv" {
		x, err := os.ReadFile(a)
		must(t, err)
		y, err := os.ReadFile(b)
		must(t, err)
		if !bytes.Equal(x, y) {
			t.Fatalf("the CSV files differ:\n%s", firstDiff(string(x), string(y)))
		}
		return
	}
	pa, pb := partsOf(t, a), partsOf(t, b)
	if len(pa) != len(pb) {
		t.Fatalf("%d parts against %d", len(pa), len(pb))
	}
	for name, x := range pa {
		if y, ok := pb[name]; !ok || !bytes.Equal(x, y) {
			t.Fatalf("part %s differs:\n%s", name, firstDiff(string(x), string(y)))
		}
	}
}

// firstDiff shows where two texts first differ.
func firstDiff(a, b string) string {
	i := 0
	for i < len(a) && i < len(b) && a[i] == b[i] {
		i++
	}
	lo := max(0, i-120)
	return "first:  …" + a[lo:min(len(a), i+120)] + "\nsecond: …" + b[lo:min(len(b), i+120)]
}

// TestPagesWithoutTempFolder: when the temporary file cannot be made (the
// temporary folder is missing), pages stay in memory and the results are
// the same; nothing fails and nothing is lost.
func TestPagesWithoutTempFolder(t *testing.T) {
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	in := writeMessy(t, t.TempDir())
	want, err := Scan(context.Background(), e, in, Options{PageBudget: -1})
	must(t, err)
	t.Setenv("TMPDIR", filepath.Join(t.TempDir(), "missing"))
	got, err := Scan(context.Background(), e, in, Options{PageBudget: 1, pageShift: 2})
	must(t, err)
	if got.sc.pages.failed == nil || got.sc.pages.spilled() != 0 {
		t.Fatalf("the temporary file was made (failed %v, %d pages written)", got.sc.pages.failed, got.sc.pages.spilled())
	}
	if !strings.Contains(got.Report.PageFileError, "stayed in memory") || !strings.Contains(got.Report.PageFileError, "missing") {
		t.Fatalf("the report does not say the rows stayed in memory, and why: %q", got.Report.PageFileError)
	}
	if want.Report.PageFileError != "" {
		t.Fatalf("a scan that needed no file says %q", want.Report.PageFileError)
	}
	got.Report.PageFileError = ""
	if a, b := reportJSON(t, want.Report), reportJSON(t, got.Report); !bytes.Equal(a, b) {
		t.Fatalf("the reports differ:\n%s", firstDiff(string(a), string(b)))
	}
}
