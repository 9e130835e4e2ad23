package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/fluecell/fluecell/funcs/units"
)

// runCLI runs the whole program in-process and returns the exit code and
// what it wrote.
func runCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(context.Background(), args, stdio{in: strings.NewReader(""), out: &out, err: &errb})
	return code, out.String(), errb.String()
}

func TestEval(t *testing.T) {
	code, out, errs := runCLI(t, "eval", `fuel_co2("natural_gas", 1000, "GJ")`)
	if code != 0 || errs != "" {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	// IPCC 2006 Vol 2 Ch 1 Table 1.4: 56 100 kg CO2/TJ
	if first := strings.SplitN(out, "\n", 2)[0]; first != "56.1 t CO2" {
		t.Errorf("first line %q", first)
	}
	if !strings.Contains(out, "source: ipcc2006/natural_gas/co2_ef = 56100 kg CO2/TJ NCV (IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.4)") {
		t.Errorf("no source line:\n%s", out)
	}
}

func TestEvalJSONAndVars(t *testing.T) {
	code, out, errs := runCLI(t, "eval", "--json", "--var", "q=1000", "--var", "fuel=diesel", `fuel_co2(fuel, q, "gal", "epa2025")`, "--pack", "ipcc2006")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var r struct {
		Value   float64
		Unit    string
		Sources []struct {
			Factor string
			Source string
		}
		Notes []string
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	// EPA GHG Emission Factors Hub 2025 Table 1: 0.138 MMBtu/gal x 73.96 kg CO2/MMBtu
	// Notes: the fuel alias, gal read as the US gallon, and no interval (the EPA rows publish no range).
	if r.Value != 1000*0.138*73.96/1000 || r.Unit != "t CO2" || len(r.Sources) != 2 || len(r.Notes) != 3 || r.Notes[1] != units.GallonNote ||
		!strings.HasPrefix(r.Notes[2], "no 95 % interval: none of the rows used publishes a range") {
		t.Errorf("%+v", r)
	}
}

func TestEvalErrors(t *testing.T) {
	tests := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"eval"}, 2, "fluecell eval: give exactly one expression"},
		{[]string{"eval", "--var", "q", "q"}, 2, `fluecell eval: --var "q": write NAME=VALUE`},
		{[]string{"eval", `fuel_co2("natural_gas", 1, "TJ", "ipcc")`}, 1, `fluecell eval: fuel_co2: pack: unknown pack "ipcc": accepted are epa2025, ipcc2006 (character 34)`},
		{[]string{"eval", "--pack", "nope", "1"}, 1, `fluecell eval: pack: unknown pack "nope": accepted are epa2025, ipcc2006`},
		{[]string{"eval", "q * 2"}, 1, `fluecell eval: expr: unknown variable "q"; no variables are given (character 1)`},
		{[]string{"eval", "--no-such-flag", "1"}, 2, "flag provided but not defined: -no-such-flag"},
		{[]string{"frobnicate"}, 2, `fluecell: unknown command "frobnicate"`},
	}
	for _, tt := range tests {
		code, out, errs := runCLI(t, tt.args...)
		if code != tt.code {
			t.Errorf("%q: exit %d, want %d (stderr %q)", tt.args, code, tt.code, errs)
		}
		if out != "" && code != 0 {
			t.Errorf("%q: wrote to stdout on error: %q", tt.args, out)
		}
		if !strings.HasPrefix(errs, tt.want) {
			t.Errorf("%q: stderr\n%q\nwant prefix\n%q", tt.args, errs, tt.want)
		}
		if strings.Contains(errs, "goroutine") || strings.Contains(errs, "panic") {
			t.Errorf("%q: stack trace on stderr", tt.args)
		}
	}
	// A runtime error is one line; a compile error adds the source and a caret.
	_, _, errs := runCLI(t, "eval", `fuel_co2("natural_gas", 1, "ton")`)
	if lines := strings.Split(strings.TrimSuffix(errs, "\n"), "\n"); len(lines) != 3 || !strings.HasSuffix(lines[2], "^") {
		t.Errorf("caret missing:\n%s", errs)
	}
	_, _, errs = runCLI(t, "eval", "--var", "q=0", `fuel_co2("natural_gas", 1, "TJ") / q`)
	if strings.Count(errs, "\n") != 3 || !strings.Contains(errs, "division by zero") {
		t.Errorf("division by zero:\n%s", errs)
	}
}

func TestFactorsFlag(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "supplier.csv")
	os.WriteFile(good, []byte("id,quantity,value,unit,basis,source\nnatural_gas,co2_ef,55900,kg CO2/TJ,NCV,Hollinsmere Gas certificate 2026 (demo)\n"), 0o644)
	code, out, errs := runCLI(t, "eval", "--factors", good, `fuel_co2("natural_gas", 1, "TJ")`)
	if code != 0 || !strings.HasPrefix(out, "55.9 t CO2\n") || !strings.Contains(out, "Hollinsmere Gas certificate 2026") {
		t.Errorf("exit %d: %s %s", code, out, errs)
	}
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("id,quantity,value,unit,basis,source\nnatural_gas,co2_ef,lots,kg CO2/TJ,NCV,x\n"), 0o644)
	code, _, errs = runCLI(t, "eval", "--factors", bad, `fuel_co2("natural_gas", 1, "TJ")`)
	if code != 1 || !strings.Contains(errs, bad+`:2: column value: value "lots" is not a number`) {
		t.Errorf("exit %d: %s", code, errs)
	}
}

func TestListings(t *testing.T) {
	code, out, _ := runCLI(t, "functions")
	if code != 0 || !strings.Contains(out, "fuel_co2e(fuel, amount, unit [, gwp_set [, pack [, sector]]]) -> t CO2e") || !strings.Contains(out, "example: to_unit(1, \"MMBtu\", \"GJ\") = 1.05505585262") {
		t.Errorf("functions:\n%s", out)
	}
	code, out, _ = runCLI(t, "functions", "--json", "gwp")
	var fs []map[string]any
	if code != 0 || json.Unmarshal([]byte(out), &fs) != nil || len(fs) != 1 || fs[0]["name"] != "gwp" {
		t.Errorf("functions --json gwp: %s", out)
	}
	code, out, _ = runCLI(t, "factors", "diesel")
	if code != 0 || !strings.Contains(out, "gas_diesel_oil  co2_ef") || !strings.Contains(out, "74100") || !strings.Contains(out, "Tier 1 estimates") {
		t.Errorf("factors diesel:\n%s", out)
	}
	code, out, _ = runCLI(t, "factors", "--pack", "epa2025", "--json")
	var rows []map[string]any
	if code != 0 || json.Unmarshal([]byte(out), &rows) != nil || len(rows) < 44 {
		t.Errorf("factors --json: %d rows", len(rows))
	}
	code, out, _ = runCLI(t, "units")
	if code != 0 || !strings.Contains(out, "1055.05585262") || !strings.Contains(out, "365 days") {
		t.Errorf("units:\n%s", out)
	}
	code, out, _ = runCLI(t, "--help")
	if code != 0 || !strings.Contains(out, "accredited verification") {
		t.Errorf("help:\n%s", out)
	}
	code, _, errs := runCLI(t, "eval", "--help")
	if code != 0 || !strings.Contains(errs, "Tier 1 estimates") {
		t.Errorf("eval --help: %d %s", code, errs)
	}
}
