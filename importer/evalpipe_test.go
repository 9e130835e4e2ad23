package importer

import (
	"bytes"
	"context"
	"path/filepath"
	"runtime"
	"testing"
	"time"

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
	dir := t.TempDir()
	for _, in := range sameResultInputs(t, dir) {
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

// TestNoGoroutineLeft annotates a 20 000-row fuel log (its rows read, its
// merged cells found and its rules run in goroutines of their own), stops
// an annotation of it part way (cancelled after 30 ms), and annotates a
// workbook whose sheet is cut short: after each, the goroutines the
// annotation started have ended.
func TestNoGoroutineLeft(t *testing.T) {
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	in := fuelLogN(t, 20_000)
	parts := partsOf(t, in)
	cut := parts.with(floorSheet, parts[floorSheet][:len(parts[floorSheet])/2]).write(t, dir, "cut.xlsx")
	settle := func() int {
		n := runtime.NumGoroutine()
		for range 100 {
			time.Sleep(10 * time.Millisecond)
			if m := runtime.NumGoroutine(); m >= n {
				break
			} else {
				n = m
			}
		}
		return n
	}
	base := settle()
	if _, err := Annotate(context.Background(), e, in, filepath.Join(dir, "a.xlsx"), Options{}); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Millisecond)
	_, err = Annotate(ctx, e, in, filepath.Join(dir, "b.xlsx"), Options{})
	cancel()
	if err == nil {
		t.Log("the annotation ended before it was stopped")
	}
	if _, err := Annotate(context.Background(), e, cut, filepath.Join(dir, "c.xlsx"), Options{}); err == nil {
		t.Error("a sheet cut short was annotated")
	}
	if n := settle(); n > base {
		buf := make([]byte, 1<<20)
		t.Fatalf("%d goroutines left after the annotations (%d before):\n%s", n, base, buf[:runtime.Stack(buf, true)])
	}
}
