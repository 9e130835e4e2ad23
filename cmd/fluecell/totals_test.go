package main

import (
	"path/filepath"
	"strings"
	"testing"

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
	want := "stationary combustion (Scope 1): 375.587 tCO2 (fossil), 376.86 tCO2e; biogenic 4.193 tCO2 (memo item, in no total); " +
		"14 of 17 rows computed: incomplete (left out: Fuel log!C11, Fuel log!E15, Fuel log!E16)"
	if code != 0 || !strings.Contains(stdout, "totals by kind (never added together):") || !strings.Contains(stdout, want) {
		t.Errorf("annotate: exit %d\n%s\n%s\nwant the line %q", code, stdout, stderr, want)
	}
	code, stdout, stderr = runCLI(t, "annotate", paths[2], "-o", filepath.Join(dir, "plan.carbon.xlsx"))
	if code != 0 || !strings.Contains(stdout, "total: 0 tCO2, 0 tCO2e (Scope 1") ||
		!strings.Contains(stdout, "embodied (life-cycle, not Scope 1 or 2): 0 tCO2 (fossil), 719696.196 tCO2e; 5 of 6 rows computed: incomplete") {
		t.Errorf("annotate build plan: exit %d\n%s\n%s", code, stdout, stderr)
	}
	code, stdout, stderr = runCLI(t, "inspect", paths[0])
	if code != 0 || !strings.Contains(stdout, "14 of 17 rows computed: incomplete") {
		t.Errorf("inspect: exit %d\n%s\n%s", code, stdout, stderr)
	}
}
