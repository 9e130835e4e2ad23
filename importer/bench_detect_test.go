package importer

import (
	"bytes"
	"context"
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// Detection's hot paths, each beside a baseline measured in the same run
// (compare the ns/op of the pair):
//
//   - BenchmarkFuelNamePhrase reads a statistics phrase ("Distillate fuel
//     oil consumed by the industrial sector") the way a column's evidence
//     is counted, without the per-scan cache; the baseline is the engine's
//     exact lookup of one fuel name (BenchmarkLookupFuelBaseline).
//   - BenchmarkScanRealCSV scans a real public file (the US EIA Monthly
//     Energy Review coal table, testdata/realworld) end to end; the
//     baseline only parses the same bytes with encoding/csv
//     (BenchmarkCSVParseBaseline).

var benchPhrases = []string{
	"Distillate fuel oil consumed by the industrial sector",
	"Natural gas consumed by (delivered to) the commercial sector",
	"Coal Consumed by the Residential Sector",
	"Hydrocarbon gas liquids consumed by the transportation sector",
	"Residual fuel oil price in the electric power sector",
	"Total Fossil Fuels Consumption",
	"Gas Firm",
	"Weekly U.S. Product Supplied of Finished Motor Gasoline",
}

func BenchmarkLookupFuelBaseline(b *testing.B) {
	e := testEngine(b)
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		e.LookupFuel("natural gas")
	}
}

func BenchmarkFuelNamePhrase(b *testing.B) {
	sc := newScanCtx(context.Background(), testEngine(b), "bench.csv", Options{})
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		// A fresh text each time: the cache would hide the work.
		sc.readFuelName(benchPhrases[i%len(benchPhrases)] + " " + strconv.Itoa(i%7))
	}
}

const benchRealCSV = "../testdata/realworld/eia_mer_t06_02_coal_consumption_2010on.csv"

func BenchmarkCSVParseBaseline(b *testing.B) {
	data, err := os.ReadFile(benchRealCSV)
	if err != nil {
		b.Skip(err)
	}
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		r := csv.NewReader(bytes.NewReader(data))
		if _, err := r.ReadAll(); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkScanRealCSV(b *testing.B) {
	data, err := os.ReadFile(benchRealCSV)
	if err != nil {
		b.Skip(err)
	}
	path := filepath.Join(b.TempDir(), "mer.csv")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		b.Fatal(err)
	}
	e := testEngine(b)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		res, err := Scan(context.Background(), e, path, Options{})
		if err != nil || res.Report.Computed == 0 {
			b.Fatalf("scan: %v (computed %d)", err, res.Report.Computed)
		}
	}
}
