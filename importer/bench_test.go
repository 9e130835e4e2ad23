package importer

import (
	"context"
	"math/rand"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/fluecell/fluecell/funcs"
	"github.com/xuri/excelize/v2"
)

// The benchmark input: a fuel log of the invented haulier "Grebe Freight",
// one title row, one blank row, a header and n rows of ten columns.
var benchHeader = []any{"Date", "Depot", "Vehicle", "Fuel", "Quantity", "Unit", "Supplier", "Invoice", "Cost (EUR)", "Driver"}

// writeFuelLog streams an n-row fuel log to path with excelize.
func writeFuelLog(tb testing.TB, path string, n int) {
	tb.Helper()
	f := excelize.NewFile()
	defer f.Close()
	const sheet = "Fuel log"
	if err := f.SetSheetName("Sheet1", sheet); err != nil {
		tb.Fatal(err)
	}
	sw, err := f.NewStreamWriter(sheet)
	if err != nil {
		tb.Fatal(err)
	}
	must := func(err error) {
		if err != nil {
			tb.Fatal(err)
		}
	}
	must(sw.SetRow("A1", []any{"Grebe Freight - fuel cards, all depots"}))
	must(sw.SetRow("A3", benchHeader))
	rng := rand.New(rand.NewSource(42))
	depots := []string{"Harwick", "Ostmere", "Calder Yard", "Penmoor"}
	fuels := []struct{ name, unit string }{{"Diesel", "L"}, {"diesel", "L"}, {"Petrol", "L"}, {"Natural gas", "kWh"}, {"LPG", "kg"}, {"Gas oil", "L"}}
	suppliers := []string{"Fenwick Oils", "Brackwater Energy", "Tolland Fuels"}
	row := make([]any, 10)
	for i := 0; i < n; i++ {
		fu := fuels[rng.Intn(len(fuels))]
		row[0] = 45658 + i/300
		row[1] = depots[rng.Intn(len(depots))]
		row[2] = "GF-" + strconv.Itoa(100+rng.Intn(400))
		row[3] = fu.name
		row[4] = float64(20+rng.Intn(800)) + float64(rng.Intn(100))/100
		row[5] = fu.unit
		row[6] = suppliers[rng.Intn(len(suppliers))]
		row[7] = "INV-" + strconv.Itoa(500000+i)
		row[8] = float64(rng.Intn(200000)) / 100
		row[9] = "driver " + strconv.Itoa(rng.Intn(90))
		must(sw.SetRow("A"+strconv.Itoa(4+i), row))
	}
	must(sw.Flush())
	must(f.SaveAs(path))
}

// fuelLog100k returns the 100 000-row benchmark input, generated once into
// the temporary folder (kept there across runs; the name carries the
// generator's version).
func fuelLog100k(tb testing.TB) string {
	tb.Helper()
	path := filepath.Join(os.TempDir(), "fluecell-bench-grebe-fuel-log-100k-v1.xlsx")
	if _, err := os.Stat(path); err == nil {
		return path
	}
	tmp := path + ".tmp-" + strconv.Itoa(os.Getpid()) + ".xlsx"
	writeFuelLog(tb, tmp, 100_000)
	if err := os.Rename(tmp, path); err != nil {
		tb.Fatal(err)
	}
	return path
}

// baselineExcelize is the minimal excelize program the annotation is
// measured against: stream the rows, compute one number per row (litres x a
// fixed factor) and stream it into a new sheet, then save.
func baselineExcelize(in, out string) error {
	f, err := excelize.OpenFile(in)
	if err != nil {
		return err
	}
	defer f.Close()
	rows, err := f.Rows("Fuel log")
	if err != nil {
		return err
	}
	if _, err := f.NewSheet("Computed"); err != nil {
		return err
	}
	sw, err := f.NewStreamWriter("Computed")
	if err != nil {
		return err
	}
	r := 0
	for rows.Next() {
		r++
		cols, err := rows.Columns()
		if err != nil {
			return err
		}
		if r < 4 || len(cols) < 5 {
			continue
		}
		q, err := strconv.ParseFloat(cols[4], 64)
		if err != nil {
			continue
		}
		if err := sw.SetRow("A"+strconv.Itoa(r), []any{q * 0.00265}); err != nil {
			return err
		}
	}
	if err := rows.Close(); err != nil {
		return err
	}
	if err := sw.Flush(); err != nil {
		return err
	}
	return f.SaveAs(out)
}

func BenchmarkBaselineExcelize100k(b *testing.B) {
	in := fuelLog100k(b)
	out := filepath.Join(b.TempDir(), "baseline.xlsx")
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := baselineExcelize(in, out); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkAnnotate100k(b *testing.B) {
	in := fuelLog100k(b)
	out := filepath.Join(b.TempDir(), "annotated.xlsx")
	e, err := funcs.New()
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rep, err := Annotate(context.Background(), e, in, out, Options{})
		if err != nil {
			b.Fatal(err)
		}
		if rep.Computed != 100_000 || rep.Layout != LayoutInline {
			b.Fatalf("computed %d rows, layout %s", rep.Computed, rep.Layout)
		}
	}
}

func BenchmarkScan100k(b *testing.B) {
	in := fuelLog100k(b)
	e, err := funcs.New()
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Scan(context.Background(), e, in, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
