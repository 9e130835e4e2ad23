package importer

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// Real files of testdata/realworld read beyond fuels burned on site; each
// reference is computed here from the file's own columns, independently of
// detection.

// columnSums sums the numbers of the CSV columns whose header satisfies
// pick (thousands commas allowed), keyed by the header.
func columnSums(t *testing.T, path string, pick func(header string) bool) map[string]float64 {
	t.Helper()
	f, err := os.Open(path)
	must(t, err)
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	recs, err := r.ReadAll()
	must(t, err)
	out := map[string]float64{}
	for j, h := range recs[0] {
		if !pick(h) {
			continue
		}
		for _, rec := range recs[1:] {
			if j < len(rec) {
				// "1,058,318.40": the file's thousands commas
				if x, err := strconv.ParseFloat(strings.ReplaceAll(strings.TrimSpace(rec[j]), ",", ""), 64); err == nil {
					out[h] += x
				}
			}
		}
	}
	return out
}

// TestRealWorldFederalFleet: the US federal fleet report (GSA FY2015 Table
// 4-3, agencies' vehicle miles and gasoline) is a fleet by its VMT columns:
// gasoline takes road CH4 and N2O of light-duty vehicles of 1995 or later
// (IPCC 2006 Vol 2 Ch 3 Table 3.2.2: 3.8 and 5.7 kg/TJ), CO2 as before.
func TestRealWorldFederalFleet(t *testing.T) {
	path := filepath.Join("..", "testdata", "realworld", "gsa_ffr_fy2015_table4_3_agency_vmt_gasoline.csv")
	rep := scanFile(t, path, Options{})
	if !strings.Contains(strings.Join(rep.Rules, "\n"), `mobile_co2e("motor_gasoline", worldwide_gasoline_use, worldwide_gasoline_use_unit, "road_low_mileage_1995")`) {
		t.Fatalf("rules %q: want the fleet's mobile rule", rep.Rules)
	}
	gal := columnSums(t, path, func(h string) bool { return strings.HasPrefix(h, "Worldwide Gasoline Use") })["Worldwide Gasoline Use (Gallons)"]
	if gal <= 0 {
		t.Fatal("no gallons in the file")
	}
	want := gal * lPerGal * gasolineTJPerL * co2eTJ(69300, 3.8, 5.7)
	if got := rep.Totals.TCO2e; !near(got, want) {
		t.Errorf("total %.9g t CO2e, want %.9g (%.0f US gal)", got, want, gal)
	}
}

// TestRealWorldBuildingsGrid: San Francisco's building benchmarking
// (electricity bought in kWh, district steam in kBtu, four years side by
// side) with --grid CAMX: Scope 2 is the kWh x eGRID2024 CAMX (403.6 lb CO2,
// 0.025 lb CH4, 0.003 lb N2O per MWh; US EPA GHG Emission Factors Hub 2026
// Table 6) plus the steam x the Hub's Table 7 steam and heat factor (66.33
// kg CO2, 1.25 g CH4, 0.125 g N2O per MMBtu).
func TestRealWorldBuildingsGrid(t *testing.T) {
	path := filepath.Join("..", "testdata", "realworld", "sf_existing_buildings_energy_performance_report_first600.csv")
	rep := scanFile(t, path, Options{Grid: "CAMX"})
	var kWh, kBtu float64
	for h, v := range columnSums(t, path, func(h string) bool {
		return strings.Contains(h, "Grid Purchase (kWh)") || strings.Contains(h, "District Steam Use")
	}) {
		if strings.Contains(h, "kWh") {
			kWh += v
		} else {
			kBtu += v
		}
	}
	const lbPerMWh = 497.443
	want := kWh/1000*lbPerMWh*kgPerLb/1000 + kBtu/1000*steamTPerMM
	if got := rep.ByFuel["Scope 2: purchased energy"].TCO2e; !near(got, want) {
		t.Errorf("Scope 2 %.9g t CO2e, want %.9g (%.0f kWh, %.0f kBtu of steam)", got, want, kWh, kBtu)
	}
	// The fuels burned on site are as without a grid (the corpus reference).
	base := scanFile(t, path, Options{})
	if got, want := rep.Totals.TCO2, base.Totals.TCO2; !near(got, want) {
		t.Errorf("tCO2 %.9g with a grid, %.9g without", got, want)
	}
	if rep.Computed != base.Computed {
		t.Errorf("computed %d rows with a grid, %d without", rep.Computed, base.Computed)
	}
}

// TestRealWorldProvinceGrid: Calgary's corporate buildings give their
// province ("Alberta") in a column, which is read as each row's grid:
// Scope 2 is the kWh x Alberta's 670 g CO2e/kWh (Environment and Climate
// Change Canada, National Inventory Report 1990-2019, Part 3 Annex 13,
// 2019) plus district hot water x the EPA GHG Emission Factors Hub 2025
// Table 7 steam and heat factor, without any option.
func TestRealWorldProvinceGrid(t *testing.T) {
	path := filepath.Join("..", "testdata", "realworld", "calgary_corporate_building_energy_benchmarking_2019-2023.csv")
	rep := scanFile(t, path, Options{})
	if got := columnAt(t, rep.Tables[0], "F1"); got.Header != "Province" || got.Role != "grid" {
		t.Fatalf("F1 = %+v, want the grid column Province", got)
	}
	sums := columnSums(t, path, func(h string) bool {
		return h == "Electricity Use - Grid Purchase (kWh)" || h == "District Hot Water Use (GJ)"
	})
	const gjPerMMBtu = 1.05505585262 // 1 Btu = 1055.05585262 J (International Table Btu, NIST SP 811)
	want := sums["Electricity Use - Grid Purchase (kWh)"]*0.670/1000 + sums["District Hot Water Use (GJ)"]/gjPerMMBtu*steamTPerMM
	if got := rep.ByFuel["Scope 2: purchased energy"].TCO2e; !near(got, want) {
		t.Errorf("Scope 2 %.9g t CO2e, want %.9g (%v)", got, want, sums)
	}
}
