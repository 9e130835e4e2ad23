package importer

import (
	"bytes"
	"context"
	"path/filepath"
	"testing"

	"github.com/fluecell/fluecell/funcs"
)

// TestEvalPipeSameResults annotates real public workbooks and CSV files
// (testdata/realworld, with their origins in its README), the messy
// workbook (every kind of bad cell) and a 20 000-row fuel log three ways:
// each row's rules run in place; in a goroutine in batches of 3 rows; and
// in batches of the default size. The reports (findings in the same order,
// the same totals and intervals) and every part of the written files must
// be the same: with the default bound of findings per column, and with one
// finding per column and code, where the order findings are added in
// decides which is kept.
func TestEvalPipeSameResults(t *testing.T) {
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	var inputs []string
	for _, pat := range []string{"*.xlsx", "*.csv"} {
		m, _ := filepath.Glob(filepath.Join("..", "testdata", "realworld", pat))
		inputs = append(inputs, m...)
	}
	dir := t.TempDir()
	inputs = append(inputs, writeMessy(t, dir), fuelLogN(t, 20_000))
	for _, in := range inputs {
		for _, maxWarn := range []int{0, 1} {
			t.Run(filepath.Base(in)+"/max-"+itoa(maxWarn), func(t *testing.T) {
				sameWithPipe(t, e, dir, in, maxWarn)
			})
		}
	}
}

func sameWithPipe(t *testing.T, e *funcs.Engine, dir, in string, maxWarn int) {
	ext := filepath.Ext(in)
	outIn := filepath.Join(dir, "inplace"+ext)
	repIn, err := Annotate(context.Background(), e, in, outIn, Options{evalAsync: -1, MaxWarningsPerColumn: maxWarn})
	if err != nil {
		t.Skipf("not a workbook fluecell reads: %v", err)
	}
	repIn.Output = ""
	want := reportJSON(t, repIn)
	for _, batch := range []int{3, evalBatchRows} {
		out := filepath.Join(dir, "async"+ext)
		rep, err := Annotate(context.Background(), e, in, out, Options{evalAsync: batch, MaxWarningsPerColumn: maxWarn})
		if err != nil {
			t.Fatal(err)
		}
		rep.Output = ""
		if got := reportJSON(t, rep); !bytes.Equal(want, got) {
			t.Fatalf("batches of %d rows: the reports differ:\n%s", batch, firstDiff(string(want), string(got)))
		}
		samePackage(t, outIn, out)
	}
}
