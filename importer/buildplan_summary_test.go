package importer

import (
	"context"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The build plan of the Tarnside workbook (invented names) in the atmosphere:
// its embodied total with the published range, as GtC and ppm. By hand, from
// the infrastructure & supply-chain column of IPCC AR5 WG3 Annex III Table
// A.III.2 (min/median/max g CO2eq/kWh) and 8760 h a year:
//
//	pv_utility 40 MW, CF 0.21, 30 yr:   48 (18-180) g/kWh -> 105 960.96 t
//	wind_offshore 300 MW, CF 0.45, 25:  12 (8-35)          -> 354 780 t
//	pv_rooftop 0.9 MW, CF 0.11, 25:     41 (26-60)         -> 888.921 t
//	gas_cc 400 MW, CF 0.55, 30:         1.7 (1.6-1.9)      -> 98 287.2 t
//
// total 559 917.081 t CO2e; GtC = t x 12/44 / 1e9; ppm = GtC / 2.124 (Global
// Carbon Budget); observed airborne fraction 0.44.
func TestSummaryBuildPlanInAtmosphere(t *testing.T) {
	dir := t.TempDir()
	in := writeMessy(t, dir)
	out := filepath.Join(dir, "tarnside.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	must(t, err)
	bp := rep.BuildPlan
	if bp == nil {
		t.Fatal("no build-plan total")
	}
	total := 105960.96 + 354780 + 888.921 + 98287.2
	low := 105960.96*18/48 + 354780*8.0/12 + 888.921*26/41 + 98287.2*1.6/1.7
	high := 105960.96*180/48 + 354780*35.0/12 + 888.921*60/41 + 98287.2*1.9/1.7
	gtc := total * 12 / 44 / 1e9
	near := func(name string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-9*math.Abs(want) {
			t.Errorf("%s = %v, want %v", name, got, want)
		}
	}
	near("tCO2e", bp.TCO2e, total)
	if bp.Low == nil || bp.High == nil {
		t.Fatalf("no range: %q", bp.RangeNote)
	}
	near("low", *bp.Low, low)
	near("high", *bp.High, high)
	near("GtC", bp.GtC, gtc)
	near("ppm", bp.PPM, gtc/2.124)
	near("ppm at 0.44", bp.PPMObserved, gtc*0.44/2.124)
	if bp.AirborneFraction != 1 || bp.ObservedAirborneFraction != 0.44 {
		t.Errorf("airborne fractions %v, %v", bp.AirborneFraction, bp.ObservedAirborneFraction)
	}

	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	rows, err := g.GetRows(SheetSummary, excelize.Options{RawCellValue: true})
	must(t, err)
	found := map[string][]string{}
	for _, r := range rows {
		if len(r) > 0 {
			for _, key := range []string{"tCO2e", "GtC", "ppm CO2, airborne fraction 1 ", "ppm CO2, airborne fraction 0.44 "} {
				if strings.HasPrefix(r[0], key) && found[key] == nil {
					found[key] = r
				}
			}
		}
	}
	// shown with three significant figures, not as 0.000
	shown, err := g.GetRows(SheetSummary)
	must(t, err)
	for _, r := range shown {
		if len(r) > 1 && strings.HasPrefix(r[0], "GtC") && r[1] != "1.527E-04" {
			t.Errorf("GtC shown as %q, want 1.527E-04", r[1])
		}
	}
	for key, want := range map[string][3]float64{
		"tCO2e":                            {total, low, high},
		"GtC":                              {gtc, gtc * low / total, gtc * high / total},
		"ppm CO2, airborne fraction 1 ":    {gtc / 2.124, gtc / 2.124 * low / total, gtc / 2.124 * high / total},
		"ppm CO2, airborne fraction 0.44 ": {gtc * 0.44 / 2.124, gtc * 0.44 / 2.124 * low / total, gtc * 0.44 / 2.124 * high / total},
	} {
		r := found[key]
		if len(r) < 4 {
			t.Errorf("summary line %q: %v", key, r)
			continue
		}
		for i, w := range want {
			v, err := strconv.ParseFloat(r[1+i], 64)
			if err != nil || math.Abs(v-w) > 1e-9*math.Abs(w) {
				t.Errorf("%s column %d = %q, want %v", key, 2+i, r[1+i], w)
			}
		}
	}
}

// A workbook without a build plan has no build-plan total.
func TestNoBuildPlanNoAtmosphereLine(t *testing.T) {
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, [][]any{
		{"Fuel", "Quantity", "Unit"},
		{"diesel", 1200, "L"},
	})
	rep := scanFile(t, save(t, f, filepath.Join(t.TempDir(), "wexcombe.xlsx")), Options{})
	if rep.BuildPlan != nil {
		t.Errorf("build plan %+v", rep.BuildPlan)
	}
}
