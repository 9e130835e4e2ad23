package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestAnnotateReportStdoutIsJSON: with --report -, standard output is the
// report JSON and nothing else (so `| jq .` works); the human summary is on
// standard error.
func TestAnnotateReportStdoutIsJSON(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "site.csv")
	if err := os.WriteFile(in, []byte("Fuel,Quantity,Unit\nDiesel,1000,L\nNatural gas,500,GJ\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCLI(t, "annotate", in, "-o", filepath.Join(dir, "out.csv"), "--report", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s %s", code, out, errs)
	}
	dec := json.NewDecoder(strings.NewReader(out))
	var rep struct {
		Computed int `json:"computed"`
		Totals   struct {
			TCO2 float64 `json:"tCO2"`
		} `json:"totals"`
	}
	if err := dec.Decode(&rep); err != nil {
		t.Fatalf("standard output is not JSON: %v\n%s", err, out)
	}
	if dec.More() {
		t.Fatalf("standard output holds more than the report:\n%s", out)
	}
	if rep.Computed != 2 {
		t.Errorf("computed %d rows, want 2", rep.Computed)
	}
	// IPCC 2006 Vol 2 Ch 2 Table 2.2 / Ch 1 Tables 1.2 and 1.3 (the default
	// pack): natural gas 56,100 kg CO2/TJ, so 500 GJ = 28.05 t; diesel
	// (gas/diesel oil, 74,100 kg CO2/TJ) adds a positive amount.
	if rep.Totals.TCO2 <= 28.05 || math.IsNaN(rep.Totals.TCO2) {
		t.Errorf("total tCO2 %v, want more than natural gas's 28.05 t", rep.Totals.TCO2)
	}
	if !strings.Contains(errs, "wrote ") || !strings.Contains(errs, "rows computed") {
		t.Errorf("the human summary is not on standard error:\n%s", errs)
	}
}
