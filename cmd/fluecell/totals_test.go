package main

import (
	"context"
	"path/filepath"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/demo"
)

// TestPrintedTotalsByKind: annotate and inspect print one line per kind,
// never a sum of a fuel log and a build plan, each with its completeness;
// the fuel log's wood is biogenic (2.4 t x 15.6 GJ/t, IPCC 2006 Vol 2 Ch 1
// Table 1.2, x 112 kg CO2/GJ, Table 1.4 = 4.19328 t), apart from tCO2.
func TestPrintedTotalsByKind(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := runCLI(t, "annotate", paths[0], "-o", filepath.Join(dir, "fuel.carbon.xlsx"))
	// the interval as the report has it (importer/uncertainty_test.go checks its figures by hand)
	e, err := funcs.New()
	if err != nil {
		t.Fatal(err)
	}
	res, err := importer.Scan(context.Background(), e, paths[0], importer.Options{})
	if err != nil || !res.Report.Totals.HasInterval() {
		t.Fatalf("scan: %v, totals %+v", err, res.Report.Totals)
	}
	iv := " (95 %: " + sig4(res.Report.Totals.Low) + "–" + sig4(res.Report.Totals.High) + ")"
	want := "stationary combustion (Scope 1): 375.587 tCO2 (fossil), 376.86 tCO2e" + iv + "; biogenic 4.193 tCO2 (memo item, in no total); " +
		"14 of 17 rows computed: incomplete (left out: Fuel log!C11, Fuel log!E15, Fuel log!E16)"
	if code != 0 || !strings.Contains(stdout, "totals by kind (never added together):") || !strings.Contains(stdout, want) {
		t.Errorf("annotate: exit %d\n%s\n%s\nwant the line %q", code, stdout, stderr, want)
	}
	code, stdout, stderr = runCLI(t, "annotate", paths[2], "-o", filepath.Join(dir, "plan.carbon.xlsx"))
	if code != 0 || !strings.Contains(stdout, "total: 0 tCO2, 0 tCO2e (Scope 1") ||
		!strings.Contains(stdout, "embodied (life-cycle, not Scope 1 or 2): 0 tCO2 (fossil), 719696.196 tCO2e (95 %: ") ||
		!strings.Contains(stdout, "; 5 of 6 rows computed: incomplete") {
		t.Errorf("annotate build plan: exit %d\n%s\n%s", code, stdout, stderr)
	}
	code, stdout, stderr = runCLI(t, "inspect", paths[0])
	if code != 0 || !strings.Contains(stdout, "14 of 17 rows computed: incomplete") {
		t.Errorf("inspect: exit %d\n%s\n%s", code, stdout, stderr)
	}
}

// TestAnnotateUncertaintyFlag: --uncertainty approach2 with --seed says its method, seed and draws
// under the totals; an unknown approach is a usage error naming the flag.
func TestAnnotateUncertaintyFlag(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := runCLI(t, "annotate", "--uncertainty", "approach2", "--seed", "3", "--draws", "2000", "-o", filepath.Join(dir, "a.xlsx"), paths[0])
	if code != 0 || !strings.Contains(stdout, "Approach 2 (Monte Carlo, 2000 draws, seed 3)") || !strings.Contains(stdout, "376.86 tCO2e (95 %: ") {
		t.Errorf("approach2: exit %d\n%s\n%s", code, stdout, stderr)
	}
	code, _, stderr = runCLI(t, "annotate", "--uncertainty", "approach3", paths[0])
	if code != 2 || !strings.Contains(stderr, "--uncertainty \"approach3\": accepted are approach1") {
		t.Errorf("approach3: exit %d, %s", code, stderr)
	}
	code, _, stderr = runCLI(t, "batch", "--draws", "0", dir, filepath.Join(dir, "out"))
	if code != 2 || !strings.Contains(stderr, "--draws 0") {
		t.Errorf("batch --draws 0: exit %d, %s", code, stderr)
	}
}
