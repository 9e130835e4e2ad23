package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestAnnotateGridFlag: --grid names the grid of purchased electricity
// rows; an unknown grid is refused naming it.
func TestAnnotateGridFlag(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "site.csv")
	if err := os.WriteFile(in, []byte("Energy,Quantity,Unit\nElectricity,2000,kWh\nDiesel,100,L\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	rep := filepath.Join(dir, "r.json")
	code, out, errs := runCLI(t, "annotate", in, "-o", filepath.Join(dir, "out.csv"), "--grid", "UK", "--report", rep)
	if code != 0 {
		t.Fatalf("exit %d: %s %s", code, out, errs)
	}
	if !strings.Contains(out, `tCO2e = electricity_co2e(quantity, unit, "gb")`) {
		t.Errorf("rules do not show the grid:\n%s", out)
	}
	data, err := os.ReadFile(rep)
	if err != nil {
		t.Fatal(err)
	}
	var r struct {
		ByFuel map[string]map[string]float64 `json:"by_fuel"`
	}
	if err := json.Unmarshal(data, &r); err != nil {
		t.Fatal(err)
	}
	// UK: 0.20707 kg CO2e/kWh (UK Government GHG Conversion Factors for
	// Company Reporting 2023, UK electricity): 2000 kWh = 0.41414 t.
	if got := r.ByFuel["Scope 2: electricity"]["tCO2e"]; math.Abs(got-0.41414) > 1e-9 {
		t.Errorf("electricity %.9g t CO2e, want 0.41414", got)
	}

	code, _, errs = runCLI(t, "annotate", in, "-o", filepath.Join(dir, "out2.csv"), "--grid", "Atlantis")
	if code != 1 || !strings.Contains(errs, `grid "Atlantis"`) {
		t.Errorf("--grid Atlantis: exit %d, stderr %q", code, errs)
	}
}

// TestBatchGridFingerprint: a batch run with another --grid annotates its
// workbooks again; the same grid leaves them up to date.
func TestBatchGridFingerprint(t *testing.T) {
	in, out := t.TempDir(), filepath.Join(t.TempDir(), "out")
	if err := os.WriteFile(filepath.Join(in, "site.csv"), []byte("Energy,Quantity,Unit\nElectricity,2000,kWh\nElectricity,2500,kWh\nDiesel,100,L\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ grid, want string }{
		{"UK", "1 written"},
		{"UK", "1 up to date"},
		{"DE", "1 written"},
	} {
		code, stdout, errs := runCLI(t, "batch", in, out, "--grid", c.grid)
		if code != 0 || !strings.Contains(stdout+errs, c.want) {
			t.Errorf("batch --grid %s: exit %d, want %q in %s %s", c.grid, code, c.want, stdout, errs)
		}
	}
}
