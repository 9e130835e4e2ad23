package funcs

import (
	"slices"
	"strings"
	"testing"
)

// lbToKg is the international pound (NIST SP 811 Appendix B.8).
const lbToKg = 0.45359237

// TestElectricityReference checks results against the published rates, one
// grid per set, computed by hand from the table named beside each row.
func TestElectricityReference(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct {
		expr, source string
		want         float64
	}{
		// US EPA GHG Emission Factors Hub (2026) Table 6 (eGRID2024), total output rates, lb/MWh.
		{`electricity_co2(1000, "MWh", "us_camx", "location", 2024)`, "Hub 2026 Table 6 CAMX CO2 403.6", 403.6 * lbToKg},
		{`electricity_co2(1, "GWh", "us")`, "Hub 2026 Table 6 US average CO2 747.9", 747.9 * lbToKg},
		{`electricity_co2e(1000, "MWh", "us_erct", "location", 2024)`, "Hub 2026 Table 6 ERCT 700.7 / 0.040 / 0.006, AR5 28/265",
			(700.7 + 0.040*28 + 0.006*265) * lbToKg},
		{`electricity_co2e(1000, "MWh", "us_prms", "location", 2024, "ar4")`, "Hub 2026 Table 6 PRMS 1594.5 / 0.085 / 0.014, AR4 25/298",
			(1594.5 + 0.085*25 + 0.014*298) * lbToKg},
		// US EPA eGRID2023 Summary Tables rev 2, Table 1: CO2e total output rate as published (AR5).
		{`electricity_co2e(1000, "MWh", "us_nyup", "location", 2023)`, "eGRID2023 Table 1 NYUP CO2e 242.8", 242.8 * lbToKg},
		{`electricity_co2(1000, "MWh", "us_srmw", "location", 2023)`, "eGRID2023 Table 1 SRMW CO2 1239.8", 1239.8 * lbToKg},
		{`electricity_co2e(1000, "MWh", "us_srmw", "location", 2023, "ar6")`, "eGRID2023 Table 1 SRMW 1239.8 / 0.132 / 0.019, AR6 27.9/273",
			(1239.8 + 0.132*27.9 + 0.019*273) * lbToKg},
		{`electricity_co2e(1000, "MWh", "us", "location", 2023)`, "eGRID2023 US CO2e 770.9", 770.9 * lbToKg},
		// UK GHG Conversion Factors 2025, UK electricity: electricity generated, kg CO2e/kWh.
		{`electricity_co2e(1000, "MWh", "gb")`, "UK 2025 electricity generated 0.177 kg CO2e/kWh", 177},
		{`electricity_co2(1000, "MWh", "gb")`, "UK 2025 electricity generated, kg CO2e of CO2 0.17489", 174.89},
		{`electricity_co2e(1000, "MWh", "gb", "location", 2025, "ar6")`, "UK 2025 split 0.17489 + 0.0009/28x27.9 + 0.00122/265x273",
			174.89 + 0.9/28*27.9 + 1.22/265*273},
		// European Environment Agency, GHG emission intensity of electricity generation, g CO2e/kWh.
		{`electricity_co2e(1000, "MWh", "pl")`, "EEA 2022 Poland 681 g CO2e/kWh", 681},
		{`electricity_co2e(1000, "MWh", "fr")`, "EEA 2022 France 74 g CO2e/kWh", 74},
		{`electricity_co2e(500, "kWh", "se")`, "EEA 2022 Sweden 8 g CO2e/kWh", 0.004},
		{`electricity_co2e(1, "GWh", "eu27")`, "EEA assessment 2020: EU-27 2018 281 g CO2e/kWh", 281},
		{`electricity_co2e(3.6, "TJ", "de")`, "EEA 2022 Germany 368 g CO2e/kWh; 3.6 TJ = 1 GWh", 368},
	}
	for _, tc := range tests {
		r, err := evalExpr(e, tc.expr)
		if err != nil {
			t.Errorf("%s: %v", tc.expr, err)
			continue
		}
		if !near(r.Value, tc.want, 1e-12) {
			t.Errorf("%s = %v, want %v (%s)", tc.expr, r.Value, tc.want, tc.source)
		}
	}
}

// TestElectricityWorkedExample: 1000 MWh in eGRID subregion SRVC, data year 2024.
// Hub 2026 Table 6 SRVC: CO2 637.4, CH4 0.047, N2O 0.007 lb/MWh. With AR5
// (CH4 28, N2O 265): 637.4 + 1.316 + 1.855 = 640.571 lb CO2e/MWh; x 1000 MWh =
// 640 571 lb = 290.5588... t CO2e.
func TestElectricityWorkedExample(t *testing.T) {
	e := newTestEngine(t)
	r := call(t, e, `electricity_co2e(1000, "MWh", "eGRID SRVC", "location", 2024)`)
	if !near(r.Value, 640571*lbToKg/1000, 1e-12) || r.Unit != "t CO2e" {
		t.Errorf("SRVC: %v %s, want %v t CO2e", r.Value, r.Unit, 640571*lbToKg/1000)
	}
	for _, part := range []string{"grid us_srvc", "location-based", "data year 2024", "Hub (2026) Table 6", "CH4 x 28 + N2O x 265", `"eGRID SRVC" read as us_srvc`} {
		if !hasNote(r, part) {
			t.Errorf("notes %q lack %q", r.Notes, part)
		}
	}
	keys := strings.Join(r.FactorKeys(), " ")
	for _, k := range []string{"egrid2024/us_srvc/grid_co2", "egrid2024/us_srvc/grid_ch4", "egrid2024/us_srvc/grid_n2o", "common/ch4/gwp100_ar5"} {
		if !strings.Contains(keys, k) {
			t.Errorf("sources %s lack %s", keys, k)
		}
	}
	// The default year is the latest loaded: 2024 for eGRID subregions.
	if d := call(t, e, `electricity_co2e(1000, "MWh", "us_srvc")`); d.Value != r.Value {
		t.Errorf("default year gives %v, 2024 gives %v", d.Value, r.Value)
	}
}

// TestElectricityLosses: UK T&D factor as published, and eGRID's grid gross
// loss applied as consumption x r / (1 - r) x the generation rate.
func TestElectricityLosses(t *testing.T) {
	e := newTestEngine(t)
	// UK conversion factors 2025, Transmission and distribution: T&D- UK electricity 0.01853 kg CO2e/kWh.
	if r := call(t, e, `electricity_losses_co2e(1000, "MWh", "United Kingdom")`); !near(r.Value, 18.53, 1e-12) || !hasNote(r, "Scope 3 category 3") {
		t.Errorf("gb losses %v %q", r.Value, r.Notes)
	}
	// Hub 2026 Table 6 CAMX: 403.6 / 0.025 / 0.003 lb/MWh, grid gross loss 4.4 %.
	want := (403.6 + 0.025*28 + 0.003*265) * lbToKg * 0.044 / 0.956
	if r := call(t, e, `electricity_losses_co2e(1000, "MWh", "us_camx")`); !near(r.Value, want, 1e-12) || !hasNote(r, "0.044 / (1 - 0.044)") {
		t.Errorf("CAMX losses %v, want %v; %q", r.Value, want, r.Notes)
	}
}

const marketRows = `pack,id,quantity,value,unit,source,from_memory
supplier2025,brightvolt_green,market_co2e,0.05,kg CO2e/kWh,"Brightvolt Energy fuel-mix disclosure 2025 (invented for this test)",false
residual2024,de,market_co2e,0.6,kg CO2e/kWh,"residual mix for this test (invented value)",false
residual2024,pl,market_co2,0.7,kg CO2/kWh,"residual mix for this test (invented value)",false
`

// TestElectricityMarket: a user's supplier and residual-mix rows, loaded as
// factor rows, serve method market; location stays with the grid average.
func TestElectricityMarket(t *testing.T) {
	e, err := New(WithFactorData("workbook:Carbon factors", []byte(marketRows)))
	if err != nil {
		t.Fatal(err)
	}
	r := call(t, e, `electricity_co2e(2000, "MWh", "brightvolt_green", "market")`)
	if !near(r.Value, 100, 1e-12) || !hasNote(r, "market-based, data year 2025") || r.FactorKeys()[0] != "supplier2025/brightvolt_green/market_co2e" {
		t.Errorf("supplier: %v %q %v", r.Value, r.Notes, r.FactorKeys())
	}
	if r := call(t, e, `electricity_co2e(1000, "MWh", "Germany", "market")`); !near(r.Value, 600, 1e-12) {
		t.Errorf("residual mix de: %v", r.Value)
	}
	if r := call(t, e, `electricity_co2e(1000, "MWh", "de")`); !near(r.Value, 368, 1e-12) {
		t.Errorf("location de with a market row loaded: %v", r.Value)
	}
	if r := call(t, e, `electricity_co2(1000, "MWh", "pl", "market")`); !near(r.Value, 700, 1e-12) {
		t.Errorf("market CO2 pl: %v", r.Value)
	}
	// No market row for fr: the grid average, said in a note.
	if r := call(t, e, `electricity_co2e(1000, "MWh", "fr", "market")`); !near(r.Value, 74, 1e-12) || !hasNote(r, "location-based grid average is used") {
		t.Errorf("fr market fallback: %v %q", r.Value, r.Notes)
	}
	if _, err := evalExpr(e, `electricity_co2e(1000, "MWh", "de", "market", 2025)`); err == nil ||
		!strings.Contains(err.Error(), "has no market-based factor (supplier or residual mix) for 2025: available years are 2024") {
		t.Errorf("market year: %v", err)
	}
	if _, err := evalExpr(e, `electricity_co2e(1000, "MWh", "brightvolt_green")`); err == nil ||
		!strings.Contains(err.Error(), `grid brightvolt_green has market-based rows only (a supplier or residual mix): pass method "market"`) {
		t.Errorf("location on a supplier row: %v", err)
	}
	// User grid sets are not fuel packs.
	if ps := e.PackNames(); slices.Contains(ps, "supplier2025") || slices.Contains(ps, "egrid2024") || slices.Contains(ps, "residual2024") {
		t.Errorf("pack names %v list grid sets", ps)
	}
	gi, err := e.ResolveGrid("Brightvolt green")
	if err != nil || gi.ID != "brightvolt_green" || !slices.Equal(gi.Methods, []string{MethodMarket}) || !slices.Equal(gi.Years, []int{2025}) {
		t.Errorf("ResolveGrid supplier: %+v %v", gi, err)
	}
}

// TestElectricityBadInputs: every bad input names its parameter and what is accepted.
func TestElectricityBadInputs(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct{ expr, param, msg string }{
		{`electricity_co2e(1000, "MWh", "Germny")`, "grid", `unknown grid "Germny" (did you mean germany (de)?): accepted are at, be, bg,`},
		{`electricity_co2e(1000, "MWh", "atlantis")`, "grid", `unknown grid "atlantis": accepted are at, be, bg, cy, cz, de,`},
		{`electricity_co2e(1000, "MWh", "us", "location", 2019)`, "year", `grid us has no location-based factor for 2019: available years are 2024, 2023`},
		{`electricity_co2e(1000, "MWh", "us", "location", 2024.5)`, "year", `year must be a whole year such as 2024, got 2024.5`},
		{`electricity_co2(1000, "MWh", "de")`, "grid", `grid de (Germany) has a CO2e rate only, no CO2 rate: use electricity_co2e`},
		{`electricity_co2e(1000, "t", "us")`, "unit", `unit "t" is a mass, but an energy is needed here`},
		{`electricity_co2e(1000, "MWh HHV", "us")`, "unit", `delivered energy has no heating-value basis: write "MWh" without HHV`},
		{`electricity_co2e(1000, "MWh", "us", "residual")`, "method", `unknown method "residual": accepted are location, market`},
		{`electricity_co2e(1000, "MWh", "us", "location", 2024, "ar9")`, "gwp_set", `unknown GWP set "ar9": accepted are ar4, ar5, ar6`},
		{`electricity_losses_co2e(1000, "MWh", "de")`, "grid", `grid de (Germany) has no transmission and distribution loss data; grids with it: gb, us,`},
	}
	for _, tc := range tests {
		_, err := evalExpr(e, tc.expr)
		fe, ok := AsError(err)
		if !ok {
			t.Errorf("%s: error %v, want an *Error", tc.expr, err)
			continue
		}
		if fe.Param != tc.param || !strings.Contains(fe.Error(), tc.msg) {
			t.Errorf("%s:\n got param %s: %s\nwant param %s containing %s", tc.expr, fe.Param, fe.Headline(), tc.param, tc.msg)
		}
	}
}

// TestResolveGrid: ids, ISO codes, country names and eGRID acronyms as analysts write them.
func TestResolveGrid(t *testing.T) {
	e := newTestEngine(t)
	for name, want := range map[string]string{
		"de": "de", "DE": "de", "Germany": "de", "DEU": "de", "Deutschland": "de",
		"United Kingdom": "gb", "UK": "gb", "Great Britain": "gb", "GB": "gb", "GBR": "gb",
		"CAMX": "us_camx", "eGRID CAMX": "us_camx", "eGRID2023 CAMX": "us_camx", "US-CAMX": "us_camx", "WECC California": "us_camx",
		"SRVC": "us_srvc", "SERC Virginia/Carolinas": "us_srvc", "subregion: SRVC": "us_srvc",
		"U.S.": "us", "USA": "us", "United States": "us", "US average": "us",
		"EU-27": "eu27", "European Union": "eu27", "EL": "gr", "Czech Republic": "cz", "España": "es",
	} {
		gi, err := e.ResolveGrid(name)
		if err != nil || gi.ID != want {
			t.Errorf("ResolveGrid(%q) = %q, %v; want %s", name, gi.ID, err, want)
		}
	}
	_, err := e.ResolveGrid("Norway")
	if fe, ok := AsError(err); !ok || fe.Param != "grid" || !strings.Contains(fe.Msg, "accepted are at, be,") {
		t.Errorf("Norway: %v", err)
	}
}

// TestGrids lists every grid with its sets, years, methods and losses.
func TestGrids(t *testing.T) {
	e := newTestEngine(t)
	gs := e.Grids()
	// 27 eGRID subregions + US, 27 EU member states + EU-27, UK.
	if len(gs) != 57 {
		t.Errorf("%d grids, want 57", len(gs))
	}
	byID := map[string]GridInfo{}
	for _, g := range gs {
		byID[g.ID] = g
	}
	if g := byID["us_camx"]; g.Name != "WECC California (CAMX)" || !slices.Equal(g.Years, []int{2023, 2024}) || !g.Losses || len(g.Sources) != 2 {
		t.Errorf("us_camx: %+v", g)
	}
	if g := byID["gb"]; !slices.Equal(g.Years, []int{2025}) || !g.Losses || !slices.Equal(g.Methods, []string{MethodLocation}) {
		t.Errorf("gb: %+v", g)
	}
	if g := byID["pl"]; g.Name != "Poland" || g.Losses {
		t.Errorf("pl: %+v", g)
	}
	// Grid sets stay out of the fuel packs; the factor listing still works.
	if ps := e.PackNames(); !slices.Equal(ps, []string{"epa2025", "ipcc2006"}) {
		t.Errorf("pack names %v", ps)
	}
	if _, err := e.Factors("", ""); err != nil {
		t.Error(err)
	}
	if _, err := evalExpr(e, `fuel_co2("natural_gas", 1000, "GJ", "egrid2024")`); err == nil || !strings.Contains(err.Error(), `unknown pack "egrid2024"`) {
		t.Errorf("a grid set as fuel pack: %v", err)
	}
}
