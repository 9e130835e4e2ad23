package importer

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Factors of the checks below (IPCC 2006 Guidelines): NCV in TJ/Gg and CO2
// in kg/TJ from Vol 2 Ch 1 Tables 1.2 and 1.4 (gas/diesel oil 43 and 74 100,
// motor gasoline 44.3 and 69 300, natural gas 56 100); road CH4 and N2O in
// kg/TJ from Vol 2 Ch 3 Table 3.2.2 (diesel 3.9 and 3.9; gasoline, light-duty
// vehicles of 1995 or later, 3.8 and 5.7); stationary CH4 and N2O of natural
// gas from Vol 2 Ch 2 Tables 2.2 (energy: 1 and 0.1) and 2.4
// (commercial/institutional: 5 and 0.1); GWP-100 28 and 265 (IPCC AR5 WG1
// Table 8.7). Densities of the default pack: diesel 832.5 and gasoline
// 747.5 kg/m3 (EN 590 and EN 228 midpoints).
const (
	dieselTJPerL   = 0.8325 * 43 / 1e6
	gasolineTJPerL = 0.7475 * 44.3 / 1e6
)

func co2eTJ(co2, ch4, n2o float64) float64 { return (co2 + 28*ch4 + 265*n2o) / 1000 }

// TestFleetLog: a log with a registration column is a fleet: diesel rows
// take road transport's CH4 and N2O, gasoline rows those of light-duty
// vehicles of 1995 or later; the finding names the evidence.
func TestFleetLog(t *testing.T) {
	rep := scanWith(t, "fleet.xlsx", "Fuel cards", [][]any{
		{"Date", "Registration", "Fuel", "Litres"},
		{"2024-01-03", "KX21 ABC", "Diesel", 60},
		{"2024-01-05", "LM19 XYZ", "Petrol", 40},
		{"2024-01-09", "KX21 ABC", "Diesel", 55},
	}, Options{})
	if rep.Computed != 3 {
		t.Fatalf("computed %d rows, want 3; findings %s", rep.Computed, listFindings(rep))
	}
	want := 115*dieselTJPerL*co2eTJ(74100, 3.9, 3.9) + 40*gasolineTJPerL*co2eTJ(69300, 3.8, 5.7)
	if got := rep.Totals.TCO2e; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; rules %v", got, want, rep.Rules)
	}
	rules := strings.Join(rep.Rules, "\n")
	for _, want := range []string{`tCO2e = mobile_co2e(fuel, litres, litres_unit, "road")`, `tCO2e = mobile_co2e(fuel, litres, litres_unit, "road_low_mileage_1995")`} {
		if !strings.Contains(rules, want) {
			t.Errorf("rules %q lack %q", rules, want)
		}
	}
	if w := wantFinding(t, rep, "Fuel cards", "D1", SevInfo, CodeReadAs); !strings.Contains(w.Message, `"Registration"`) {
		t.Errorf("D1: %q, want the evidence named", w.Message)
	}
	wantFinding(t, rep, "Fuel cards", "C3", SevInfo, CodeReadAs)
}

// TestSectorColumn: a sector column chooses each row's stationary CH4 and
// N2O; an empty sector cell, or one naming no stationary sector, takes
// fuel_co2e's default (energy), the latter with a finding. Natural gas in
// residential combustion has the same CH4 and N2O as commercial (Table 2.5:
// 5 and 0.1 kg/TJ).
func TestSectorColumn(t *testing.T) {
	rep := scanWith(t, "sites.xlsx", "Gas", [][]any{
		{"Site", "Sector", "Fuel", "Amount", "Unit"},
		{"Library", "Commercial/Institutional", "Natural gas", 1000, "GJ"},
		{"Plant", "", "Natural gas", 2000, "GJ"},
		{"Depot", "Transportation", "Natural gas", 500, "GJ"},
		{"Flats", "Residential", "Natural gas", 300, "GJ"},
	}, Options{})
	want := 1.3*co2eTJ(56100, 5, 0.1) + 2.5*co2eTJ(56100, 1, 0.1)
	if got := rep.Totals.TCO2e; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; rules %v findings %s", got, want, rep.Rules, listFindings(rep))
	}
	if got := columnAt(t, rep.Tables[0], "B1"); got.Role != "sector" {
		t.Errorf("B1 role %q, want sector", got.Role)
	}
	if w := wantFinding(t, rep, "Gas", "B4", SevInfo, CodeReadAs); !strings.Contains(w.Message, "energy industries") {
		t.Errorf("B4: %q", w.Message)
	}
}

// TestMappingSector: the mapping's sector applies to every row of its table.
func TestMappingSector(t *testing.T) {
	f := newBook(t, "Gas")
	setRows(t, f, "Gas", 1, [][]any{
		{"Fuel", "Amount", "Unit"},
		{"Natural gas", 1000, "GJ"},
	})
	dir := t.TempDir()
	path := save(t, f, filepath.Join(dir, "gas.xlsx"))
	mpath := filepath.Join(dir, "m.json")
	must(t, os.WriteFile(mpath, []byte(`{"fluecell_mapping": 1, "tables": [{"sheet": "Gas", "header_row": 1, "sector": "commercial",
 "columns": [{"column": "A", "header": "Fuel", "role": "fuel"}, {"column": "B", "header": "Amount", "role": "quantity"}, {"column": "C", "header": "Unit", "role": "unit"}]}]}`), 0o644))
	m, err := LoadMapping(testEngine(t), mpath)
	if err != nil {
		t.Fatal(err)
	}
	rep := scanFile(t, path, Options{Mapping: m})
	if got, want := rep.Totals.TCO2e, co2eTJ(56100, 5, 0.1); !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g; rules %v", got, want, rep.Rules)
	}
	if _, err := ParseMapping(testEngine(t), "bad.json", []byte(`{"fluecell_mapping": 1, "tables": [{"sheet": "Gas", "header_row": 1, "sector": "shipping", "columns": []}]}`)); err == nil ||
		!strings.Contains(err.Error(), `tables[0].sector: unknown sector "shipping": accepted are energy, manufacturing, commercial, residential, agriculture`) {
		t.Errorf("err = %v, want the unknown sector named", err)
	}
}

// TestFleetBlendFallsBack: E-85, whose ethanol has no road CH4 and N2O in
// the default pack, is computed as stationary combustion with a finding,
// not left out.
func TestFleetBlendFallsBack(t *testing.T) {
	rep := scanWith(t, "fleet.xlsx", "Fuel cards", [][]any{
		{"Vehicle", "Fuel", "Litres"},
		{"Van 1", "Diesel", 60},
		{"Car 7", "E-85", 30},
		{"Van 1", "Diesel", 50},
	}, Options{})
	if rep.Computed != 3 {
		t.Errorf("computed %d rows, want 3; findings %s", rep.Computed, listFindings(rep))
	}
	if w := wantFinding(t, rep, "Fuel cards", "B3", SevInfo, CodeReadAs); !strings.Contains(w.Message, "stationary combustion") {
		t.Errorf("B3: %q", w.Message)
	}
}
