package main

import (
	"strings"
	"testing"
)

func TestGridsCommand(t *testing.T) {
	code, out, _ := runCLI(t, "grids")
	if code != 0 || !strings.Contains(out, "us_camx") || !strings.Contains(out, "WECC California (CAMX)") || !strings.Contains(out, "2022") {
		t.Errorf("grids: %d\n%s", code, out)
	}
	// UK conversion factors 2023 (flat file v1.1): electricity generated 0.20707 kg CO2e/kWh.
	code, out, _ = runCLI(t, "grids", "United Kingdom")
	if code != 0 || !strings.Contains(out, "gb: United Kingdom") || !strings.Contains(out, "0.20707") {
		t.Errorf("grids United Kingdom: %d\n%s", code, out)
	}
	code, _, errOut := runCLI(t, "grids", "Atlantis")
	if code != 1 || !strings.Contains(errOut, `unknown grid "Atlantis"`) {
		t.Errorf("grids Atlantis: %d %s", code, errOut)
	}
}
