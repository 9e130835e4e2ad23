package importer

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// golden compares got with testdata/golden/name; with
// FLUECELL_UPDATE_GOLDEN=1 it rewrites the file instead (review the diff).
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if os.Getenv("FLUECELL_UPDATE_GOLDEN") != "" {
		must(t, os.MkdirAll(filepath.Dir(path), 0o755))
		must(t, os.WriteFile(path, got, 0o644))
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (create it with FLUECELL_UPDATE_GOLDEN=1 go test ./importer -run Golden)", err)
	}
	if !bytes.Equal(got, want) {
		gl, wl := strings.Split(string(got), "\n"), strings.Split(string(want), "\n")
		for i := 0; i < max(len(gl), len(wl)); i++ {
			var g, w string
			if i < len(gl) {
				g = gl[i]
			}
			if i < len(wl) {
				w = wl[i]
			}
			if g != w {
				t.Fatalf("%s differs from line %d:\n got: %s\nwant: %s\n(FLUECELL_UPDATE_GOLDEN=1 rewrites it)", path, i+1, g, w)
			}
		}
	}
}

func reportJSON(t *testing.T, rep *Report) []byte {
	t.Helper()
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	must(t, enc.Encode(rep))
	return buf.Bytes()
}

// TestGoldenMessyReport pins the whole report of the messy workbook: rules,
// totals, totals by fuel, warnings, tables and their columns, packs.
func TestGoldenMessyReport(t *testing.T) {
	rep := scanFile(t, writeMessy(t, t.TempDir()), Options{})
	golden(t, "tarnside.report.json", reportJSON(t, rep))
}

// messyCSV is a semicolon-separated export with a BOM, CRLF line ends, a
// title line, decimal commas, a thousands separator, quoted fields and a
// field holding the delimiter.
const messyCSV = "\ufeffKestrel Vale depots - fuel cards Q1;;;;\r\n" +
	";;;;\r\n" +
	"Date;Depot;Fuel;Quantity;Unit\r\n" +
	"2026-01-05;North;Diesel;1 250,5;L\r\n" +
	"2026-01-06;North;\"Gas oil\";800;L\r\n" +
	"2026-01-07;\"South; annex\";natural gas;12,5;MWh\r\n" +
	"2026-01-08;South;Propane;40;gal\r\n" +
	"2026-01-09;South;Diesel;30;kW\r\n" +
	"Total;;;;\r\n"

// TestGoldenCSV annotates a CSV file: the output keeps every input record
// byte for byte and appends the computed fields to the table's records.
func TestGoldenCSV(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "kestrel-q1.csv")
	must(t, os.WriteFile(in, []byte(messyCSV), 0o644))
	out := filepath.Join(dir, "kestrel-q1.carbon.csv")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	if err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(out)
	must(t, err)
	golden(t, "kestrel-q1.carbon.csv", got)
	if rep.Output != out {
		t.Errorf("output %q", rep.Output)
	}
	rep.Output = filepath.Base(rep.Output) // the temporary folder changes
	golden(t, "kestrel-q1.report.json", reportJSON(t, rep))
	inLines := strings.SplitAfter(strings.TrimPrefix(messyCSV, "\ufeff"), "\r\n")
	outLines := strings.SplitAfter(strings.TrimPrefix(string(got), "\ufeff"), "\r\n")
	if len(outLines) != len(inLines) || !strings.HasPrefix(string(got), "\ufeff") {
		t.Fatalf("%d lines out, %d in (BOM kept: %v)", len(outLines), len(inLines), strings.HasPrefix(string(got), "\ufeff"))
	}
	for i, l := range inLines {
		if !strings.HasPrefix(outLines[i], strings.TrimSuffix(l, "\r\n")) {
			t.Errorf("line %d: %q does not start with the input %q", i+1, outLines[i], l)
		}
	}
	codes := map[string]string{}
	for _, w := range rep.Warnings {
		codes[w.Cell] = w.Code
	}
	for cell, code := range map[string]string{"D4": CodeValueTextNumber, "D6": CodeValueTextNumber, "E8": CodeUnitDimension} {
		if codes[cell] != code {
			t.Errorf("%s: code %q, want %q (warnings %+v)", cell, codes[cell], code, rep.Warnings)
		}
	}
}
