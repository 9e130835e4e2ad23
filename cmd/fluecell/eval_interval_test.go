package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// IPCC 2006 Vol 2 Ch 1 Table 1.4: natural gas 56 100 kg CO2/TJ, 95 % range 54 300–58 300,
// so 1000 GJ is 56.1 t CO2 within 54.3–58.3 t (by hand).
func TestEvalInterval(t *testing.T) {
	expr := `fuel_co2("natural_gas", 1000, "GJ")`
	code, out, errs := runCLI(t, "eval", "--json", expr)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var r struct {
		Value, Low, High float64
		Interval         struct{ Approach string }
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	if r.Value != 56.1 || r.Low != 54.3 || r.High != 58.3 || r.Interval.Approach != "approach1" {
		t.Errorf("eval --json: %s", out)
	}
	code, out, _ = runCLI(t, "eval", "--uncertainty", "approach1", expr)
	if code != 0 || !strings.Contains(out, "95 % interval: 54.3 to 58.3 (approach1)") {
		t.Errorf("text with --uncertainty approach1: %s", out)
	}
	if _, out, _ := runCLI(t, "eval", expr); strings.Contains(out, "interval") {
		t.Errorf("plain eval printed an interval: %s", out)
	}
	// approach2: the same seed repeats the interval, another seed moves it
	a := func(seed string) string {
		_, out, _ := runCLI(t, "eval", "--uncertainty", "approach2", "--seed", seed, "--draws", "5000", expr)
		return out
	}
	if x, y, z := a("4"), a("4"), a("5"); x != y || x == z || !strings.Contains(x, "(approach2)") {
		t.Errorf("approach2 runs:\n%s\n%s\n%s", x, y, z)
	}
	for _, bad := range [][]string{{"--uncertainty", "approach9"}, {"--uncertainty", "approach2", "--draws", "0"}} {
		code, _, errs := runCLI(t, append(append([]string{"eval"}, bad...), expr)...)
		if code != 2 || !strings.Contains(errs, bad[len(bad)-2]) {
			t.Errorf("%v: exit %d, %s", bad, code, errs)
		}
	}
}
