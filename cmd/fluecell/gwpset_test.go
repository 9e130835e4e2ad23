package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestGWPSetFlag: --gwp-set weights CH4 and N2O of every call naming no set.
// 1 TJ natural gas in the energy industries: CO2 56 100 kg (IPCC 2006 Vol 2
// Ch 1 Table 1.4), CH4 1 kg and N2O 0.1 kg (Vol 2 Ch 2 Table 2.2); with AR6
// (fossil CH4 29.8, N2O 273; AR6 WG1 Ch 7 Table 7.15) 56.1571 t CO2e, with
// AR5 (CH4 28, N2O 265; AR5 WG1 Ch 8 Table 8.7) 56.1545 t.
func TestGWPSetFlag(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "gas.csv")
	if err := os.WriteFile(in, []byte("Fuel,Quantity,Unit\nnatural gas,1,TJ\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		args []string
		set  string
		want float64
	}{
		{[]string{"--gwp-set", "ar6"}, "ar6", (56100 + 29.8 + 0.1*273) / 1000},
		{[]string{"--gwp-set", "AR5"}, "ar5", (56100 + 28 + 0.1*265) / 1000},
		{nil, "ar5", (56100 + 28 + 0.1*265) / 1000},
	} {
		rep := filepath.Join(dir, c.set+".json")
		args := append([]string{"annotate", in, "-o", filepath.Join(dir, "out.csv"), "--report", rep}, c.args...)
		code, out, errs := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s %s", c.args, code, out, errs)
		}
		data, err := os.ReadFile(rep)
		if err != nil {
			t.Fatal(err)
		}
		var r struct {
			GWPSet string `json:"gwp_set"`
			Totals struct {
				TCO2e float64 `json:"tCO2e"`
			} `json:"totals"`
		}
		if err := json.Unmarshal(data, &r); err != nil {
			t.Fatal(err)
		}
		if r.GWPSet != c.set || math.Abs(r.Totals.TCO2e-c.want) > 1e-9 {
			t.Errorf("%v: gwp_set %q, %.9g t CO2e; want %s, %.9g", c.args, r.GWPSet, r.Totals.TCO2e, c.set, c.want)
		}
		if shown := strings.Contains(out, "(GWP set "+c.set+")"); shown != (c.args != nil) {
			t.Errorf("%v: the rules printed name the set: %v\n%s", c.args, shown, out)
		}
	}

	code, _, errs := runCLI(t, "annotate", in, "-o", filepath.Join(dir, "bad.csv"), "--gwp-set", "ar7")
	if code != 1 || !strings.Contains(errs, "--gwp-set ar7") || !strings.Contains(errs, "ar4, ar5, ar6") {
		t.Errorf("--gwp-set ar7: exit %d, stderr %q", code, errs)
	}
	if _, err := os.Stat(filepath.Join(dir, "bad.csv")); !os.IsNotExist(err) {
		t.Errorf("--gwp-set ar7 wrote an output (%v)", err)
	}

	// inspect writes the set into the mapping; annotate reads it back from there.
	m := filepath.Join(dir, "m.json")
	if code, out, errs := runCLI(t, "inspect", in, "--gwp-set", "ar6", "--write-mapping", m); code != 0 {
		t.Fatalf("inspect: exit %d: %s %s", code, out, errs)
	}
	data, err := os.ReadFile(m)
	if err != nil || !strings.Contains(string(data), `"gwp_set": "ar6"`) {
		t.Fatalf("mapping %s (%v) has no gwp_set ar6", data, err)
	}
	code, out, errs := runCLI(t, "annotate", in, "-o", filepath.Join(dir, "m.csv"), "--mapping", m)
	if code != 0 || !strings.Contains(out, "(GWP set ar6)") {
		t.Errorf("annotate --mapping with gwp_set ar6: exit %d: %s %s", code, out, errs)
	}
	code, _, errs = runCLI(t, "annotate", in, "-o", filepath.Join(dir, "m2.csv"), "--mapping", m, "--gwp-set", "ar4")
	if code != 1 || !strings.Contains(errs, "ar4") || !strings.Contains(errs, "gwp_set ar6") {
		t.Errorf("--gwp-set ar4 with a mapping saying ar6: exit %d, stderr %q", code, errs)
	}
}

// TestBatchGWPSetFingerprint: a batch run with another --gwp-set annotates
// its workbooks again; the same set leaves them up to date.
func TestBatchGWPSetFingerprint(t *testing.T) {
	in, out := t.TempDir(), filepath.Join(t.TempDir(), "out")
	if err := os.WriteFile(filepath.Join(in, "site.csv"), []byte("Fuel,Quantity,Unit\nDiesel,100,L\nnatural gas,20,GJ\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ set, want string }{
		{"ar6", "1 written"},
		{"ar6", "1 up to date"},
		{"ar4", "1 written"},
	} {
		code, stdout, errs := runCLI(t, "batch", in, out, "--gwp-set", c.set)
		if code != 0 || !strings.Contains(stdout+errs, c.want) {
			t.Errorf("batch --gwp-set %s: exit %d, want %q in %s %s", c.set, code, c.want, stdout, errs)
		}
	}
	code, _, errs := runCLI(t, "batch", in, out, "--gwp-set", "ar9")
	if code != 1 || !strings.Contains(errs, "--gwp-set ar9") {
		t.Errorf("batch --gwp-set ar9: exit %d, stderr %q", code, errs)
	}
}
