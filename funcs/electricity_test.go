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
		// US EPA eGRID2022, CO2 total output emission rate by eGRID subregion (lb/MWh), EPA data file
		// USEPA/ggcapdthemes data-raw/CO2_total_output_emission_rate_by_eGRID_subregion_2022.csv.
		{`electricity_co2(1000, "MWh", "us_camx", "location", 2022)`, "eGRID2022 CAMX CO2 497.443", 497.443 * lbToKg},
		{`electricity_co2(1, "GWh", "us")`, "eGRID2022 US CO2 823.149", 823.149 * lbToKg},
		{`electricity_co2e(1000, "MWh", "us_erct")`, "eGRID2022 ERCT CO2 771.083 (CO2 only: CH4 and N2O not included)", 771.083 * lbToKg},
		{`electricity_co2e(1000, "MWh", "us_prms", "location", 2022, "ar4")`, "eGRID2022 PRMS CO2 1593.481 (CO2 only, any GWP set)", 1593.481 * lbToKg},
		// UK Government GHG Conversion Factors 2023, flat file v1.1 (Factors by Category rows 2850-2853),
		// UK electricity: electricity generated, kg CO2e/kWh; the split is stated with AR5 (28, 265).
		{`electricity_co2e(1000, "MWh", "gb", "location", 2023)`, "UK 2023 electricity generated 0.20707 kg CO2e/kWh", 207.07},
		{`electricity_co2e(1000, "MWh", "gb")`, "UK 2023 electricity generated 0.20707 kg CO2e/kWh (latest)", 207.07},
		{`electricity_co2(1000, "MWh", "gb")`, "UK 2023 electricity generated, kg CO2e of CO2 0.20496", 204.96},
		{`electricity_co2e(1000, "MWh", "gb", "location", 2023, "ar6")`, "UK 2023 split 0.20496 + 0.0009/28x27.9 + 0.00122/265x273",
			204.96 + 0.9/28*27.9 + 1.22/265*273},
		// EEA CO2 emission intensity of electricity generation (2017 data set), 2014, g CO2/kWh;
		// CO2 only.
		{`electricity_co2e(1000, "MWh", "pl")`, "EEA 2014 Poland 670.6 g CO2/kWh", 670.6},
		{`electricity_co2(1000, "MWh", "fr")`, "EEA 2014 France 34.8 g CO2/kWh", 34.8},
		{`electricity_co2e(500, "kWh", "se")`, "EEA 2014 Sweden 10.5 g CO2/kWh", 0.00525},
		{`electricity_co2e(1000, "MWh", "gb", "location", 2014)`, "EEA 2014 United Kingdom 388.8 g CO2/kWh", 388.8},
		{`electricity_co2e(1, "GWh", "eu27")`, "EEA assessment 2020: EU-27 2018 281 g CO2e/kWh", 281},
		{`electricity_co2e(3.6, "TJ", "de")`, "EEA 2014 Germany 424.9 g CO2/kWh; 3.6 TJ = 1 GWh", 424.9},
		// Australian National Greenhouse Accounts Factors 2024, scope 2 (EF2), kg CO2-e/kWh,
		// read in the Hugging Face dataset Programmer-RD-AI/national-greenhouse-accounts-factors-2024.
		{`electricity_co2e(1000, "MWh", "Victoria")`, "NGA 2024 Victoria 0.77", 770},
		{`electricity_co2e(1000, "MWh", "Australian Capital Territory")`, "NGA 2024 NSW and ACT 0.66", 660},
		{`electricity_co2e(1000, "MWh", "Tasmania")`, "NGA 2024 Tasmania 0.15", 150},
		{`electricity_co2e(1, "GWh", "Australia")`, "NGA 2024 national average 0.63", 630},
		// Canada NIR 1990-2019 (2021) Annex 13, electricity intensity by province, g CO2 eq/kWh.
		{`electricity_co2e(1000, "MWh", "Alberta")`, "NIR 2021 Annex 13 Alberta 2019 670", 670},
		{`electricity_co2e(1000, "MWh", "Alberta", "location", 2018)`, "NIR 2021 Annex 13 Alberta 2018 690", 690},
		{`electricity_co2e(1000, "MWh", "Québec", "location", 2017)`, "NIR 2021 Annex 13 Quebec 2017 1.4", 1.4},
		{`electricity_co2e(1, "GWh", "CAN")`, "NIR 2021 Annex 13 Canada 2019 120", 120},
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

// TestElectricityWorkedExample: 1000 MWh in eGRID subregion SRVC, data year 2022.
// eGRID2022 SRVC CO2 total output rate 622.987 lb/MWh (EPA data file
// USEPA/ggcapdthemes data-raw/CO2_total_output_emission_rate_by_eGRID_subregion_2022.csv);
// x 1000 MWh = 622 987 lb = 282.5826... t CO2. The set gives CO2 only, so CO2e is CO2 with a note.
func TestElectricityWorkedExample(t *testing.T) {
	e := newTestEngine(t)
	r := call(t, e, `electricity_co2e(1000, "MWh", "eGRID SRVC", "location", 2022)`)
	if !near(r.Value, 622987*lbToKg/1000, 1e-12) || r.Unit != "t CO2e" {
		t.Errorf("SRVC: %v %s, want %v t CO2e", r.Value, r.Unit, 622987*lbToKg/1000)
	}
	for _, part := range []string{"grid us_srvc", "location-based", "data year 2022", "eGRID2022", "the source gives CO2 only", `"eGRID SRVC" read as us_srvc`} {
		if !hasNote(r, part) {
			t.Errorf("notes %q lack %q", r.Notes, part)
		}
	}
	if keys := strings.Join(r.FactorKeys(), " "); !strings.Contains(keys, "egrid2022/us_srvc/grid_co2") {
		t.Errorf("sources %s lack egrid2022/us_srvc/grid_co2", keys)
	}
	// The default year, and year 0, is the latest loaded: 2022 for eGRID subregions.
	if d := call(t, e, `electricity_co2e(1000, "MWh", "us_srvc")`); d.Value != r.Value {
		t.Errorf("default year gives %v, 2022 gives %v", d.Value, r.Value)
	}
	if d := call(t, e, `electricity_co2e(1000, "MWh", "us_srvc", "location", 0, "ar5")`); d.Value != r.Value {
		t.Errorf("year 0 gives %v, 2022 gives %v", d.Value, r.Value)
	}
	if id, ok := e.LookupGrid("SRVC"); !ok || id != "us_srvc" {
		t.Errorf("LookupGrid(SRVC) = %q, %v", id, ok)
	}
	if _, ok := e.LookupGrid("diesel"); ok {
		t.Error("LookupGrid(diesel) reads as a grid")
	}
}

// laterSetRows is a later UK set that states CO2e only, and an eGRID-style set
// with a grid loss rate (both invented for these tests).
const laterSetRows = `pack,id,quantity,value,unit,source,from_memory
uk2030,gb,grid_co2e,0.1,kg CO2e/kWh,"later UK set stating CO2e only (invented for this test)",false
lossy2022,us_camx,grid_co2,500,lb CO2/MWh,"subregion rate (invented for this test)",false
lossy2022,us_camx,grid_loss_rate,0.05,1,"grid gross loss (invented for this test)",false
`

// TestElectricityLatestWithData: a later set that states CO2e only leaves CO2
// to the latest set that gives it (UK conversion factors 2023, kg CO2e of CO2
// 0.20496), said in a note.
func TestElectricityLatestWithData(t *testing.T) {
	e, err := New(WithFactorData("later.csv", []byte(laterSetRows)))
	if err != nil {
		t.Fatal(err)
	}
	r := call(t, e, `electricity_co2(1000, "MWh", "gb")`)
	if !near(r.Value, 204.96, 1e-12) || !hasNote(r, "the 2030 set (uk2030) gives no location-based CO2 factor for gb; the latest that does is 2023") {
		t.Errorf("gb CO2: %v %q", r.Value, r.Notes)
	}
	if r := call(t, e, `electricity_co2e(1000, "MWh", "gb")`); !near(r.Value, 100, 1e-12) {
		t.Errorf("gb CO2e 2030: %v", r.Value)
	}
}

// TestElectricityLosses: UK T&D factor as published, and a grid loss rate
// applied as consumption x r / (1 - r) x the generation rate.
func TestElectricityLosses(t *testing.T) {
	e, err := New(WithFactorData("later.csv", []byte(laterSetRows)))
	if err != nil {
		t.Fatal(err)
	}
	// UK conversion factors 2023 (flat file row 3411), T&D- UK electricity 0.01792 kg CO2e/kWh.
	if r := call(t, e, `electricity_losses_co2e(1000, "MWh", "United Kingdom", 2023)`); !near(r.Value, 17.92, 1e-12) || !hasNote(r, "Scope 3 category 3") || !hasNote(r, "data year 2023") {
		t.Errorf("gb losses %v %q", r.Value, r.Notes)
	}
	// Invented set: 500 lb CO2/MWh, loss rate 5 %: 1000 MWh x 0.05 / 0.95 x 500 lb.
	want := 500 * lbToKg * 0.05 / 0.95
	if r := call(t, e, `electricity_losses_co2e(1000, "MWh", "us_camx", 2022)`); !near(r.Value, want, 1e-12) || !hasNote(r, "0.05 / (1 - 0.05)") {
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
	if r := call(t, e, `electricity_co2e(1000, "MWh", "de")`); !near(r.Value, 424.9, 1e-12) {
		t.Errorf("location de with a market row loaded: %v", r.Value)
	}
	if r := call(t, e, `electricity_co2(1000, "MWh", "pl", "market")`); !near(r.Value, 700, 1e-12) {
		t.Errorf("market CO2 pl: %v", r.Value)
	}
	// No market row for fr: the grid average, said in a note.
	if r := call(t, e, `electricity_co2e(1000, "MWh", "fr", "market")`); !near(r.Value, 34.8, 1e-12) || !hasNote(r, "location-based grid average is used") {
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
	if ps := e.PackNames(); slices.Contains(ps, "supplier2025") || slices.Contains(ps, "egrid2022") || slices.Contains(ps, "residual2024") {
		t.Errorf("pack names %v list grid sets", ps)
	}
	gi, err := e.ResolveGrid("Brightvolt green")
	if err != nil || gi.ID != "brightvolt_green" || !slices.Equal(gi.Methods, []string{MethodMarket}) || !slices.Equal(gi.Years, []int{2025}) {
		t.Errorf("ResolveGrid supplier: %+v %v", gi, err)
	}
}

// TestElectricityUndatedRow: a supplier row without a pack column applies to every
// pack; it is one undated market-based edition named by its file, used for any year
// with a note, and it never turns a grid average into a market factor.
func TestElectricityUndatedRow(t *testing.T) {
	rows := "id,quantity,value,unit,source\nde,market_co2e,0.45,kg CO2e/kWh,\"supplier statement (invented for this test)\"\n"
	e, err := New(WithFactorData("supplier.csv", []byte(rows)))
	if err != nil {
		t.Fatal(err)
	}
	r := call(t, e, `electricity_co2e(1000, "MWh", "de", "market", 2024)`)
	if !near(r.Value, 450, 1e-12) || !hasNote(r, "user set supplier.csv") || !hasNote(r, "states no year; it is used for 2024") {
		t.Errorf("undated supplier row: %v %q", r.Value, r.Notes)
	}
	if len(r.Sources) != 1 || r.Sources[0].Key() != "common/de/market_co2e" {
		t.Errorf("undated supplier row is cited under a fuel or grid set's name: %v", r.Sources)
	}
	if r := call(t, e, `electricity_co2e(1000, "MWh", "de")`); !near(r.Value, 424.9, 1e-12) || !hasNote(r, "European Environment Agency") {
		t.Errorf("location de: %v %q", r.Value, r.Notes)
	}
	if g, _ := e.ResolveGrid("de"); !slices.Equal(g.Years, []int{2014}) || !slices.Equal(g.Methods, []string{MethodLocation, MethodMarket}) {
		t.Errorf("de: %+v", g)
	}
}

// TestElectricityBadInputs: every bad input names its parameter and what is accepted.
func TestElectricityBadInputs(t *testing.T) {
	e := newTestEngine(t)
	tests := []struct{ expr, param, msg string }{
		{`electricity_co2e(1000, "MWh", "Germny")`, "grid", `unknown grid "Germny" (did you mean germany (de)?): accepted are at, au, au_nsw,`},
		{`electricity_co2e(1000, "MWh", "atlantis")`, "grid", `unknown grid "atlantis": accepted are at, au, au_nsw,`},
		{`electricity_co2e(1000, "MWh", "us", "location", 2019)`, "year", `grid us has no location-based factor for 2019: available years are 2022`},
		{`electricity_co2e(1000, "MWh", "ca_on", "location", 2016)`, "year", `grid ca_on has no location-based factor for 2016: available years are 2019, 2018, 2017`},
		{`electricity_co2e(1000, "MWh", "us", "location", 2024.5)`, "year", `year must be a whole year such as 2024 (or 0 for the latest), got 2024.5`},
		{`electricity_co2(1000, "MWh", "au_vic")`, "grid", `grid au_vic (Victoria) has a CO2e rate only, no CO2 rate: use electricity_co2e`},
		{`electricity_co2e(1000, "t", "us")`, "unit", `unit "t" is a mass, but an energy is needed here`},
		{`electricity_co2e(1000, "MWh HHV", "us")`, "unit", `delivered energy has no heating-value basis: write "MWh" without HHV`},
		{`electricity_co2e(1000, "MWh", "us", "residual")`, "method", `unknown method "residual": accepted are location, market`},
		{`electricity_co2e(1000, "MWh", "us", "location", 2022, "ar9")`, "gwp_set", `unknown GWP set "ar9": accepted are ar4, ar5, ar6`},
		{`electricity_losses_co2e(1000, "MWh", "de")`, "grid", `grid de (Germany) has no transmission and distribution loss data; grids with it: gb`},
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
		"CAMX": "us_camx", "eGRID CAMX": "us_camx", "eGRID2022 CAMX": "us_camx", "US-CAMX": "us_camx", "WECC California": "us_camx",
		"SRVC": "us_srvc", "SERC Virginia/Carolinas": "us_srvc", "subregion: SRVC": "us_srvc",
		"U.S.": "us", "USA": "us", "United States": "us", "US average": "us",
		"Australia": "au", "South West Interconnected System": "au_wa_swis", "NSW": "au_nsw", "AU-SA": "au_sa",
		"EU-27": "eu27", "European Union": "eu27", "EL": "gr", "Czech Republic": "cz", "España": "es",
	} {
		gi, err := e.ResolveGrid(name)
		if err != nil || gi.ID != want {
			t.Errorf("ResolveGrid(%q) = %q, %v; want %s", name, gi.ID, err, want)
		}
	}
	_, err := e.ResolveGrid("Norway")
	if fe, ok := AsError(err); !ok || fe.Param != "grid" || !strings.Contains(fe.Msg, "accepted are at, au,") {
		t.Errorf("Norway: %v", err)
	}
}

// TestGridQuantityNames: the cheap test agrees with the declared quantities.
func TestGridQuantityNames(t *testing.T) {
	for q := range gridQuantities() {
		if !isGridQuantity(q) {
			t.Errorf("%s declared but not recognised", q)
		}
	}
	for _, q := range []string{"co2_ef", "grid", "grid_co2x", "lifecycle", "heat_", "gwp100_ar5"} {
		if isGridQuantity(q) {
			t.Errorf("%s recognised as a grid quantity", q)
		}
	}
}

// TestGrids lists every grid with its sets, years, methods and losses.
func TestGrids(t *testing.T) {
	e := newTestEngine(t)
	gs := e.Grids()
	// 27 eGRID subregions + US, 27 EU member states + EU-27, UK, Australia + 7 NGA state rows,
	// Canada + 13 provinces and territories.
	if len(gs) != 79 {
		t.Errorf("%d grids, want 79", len(gs))
	}
	byID := map[string]GridInfo{}
	for _, g := range gs {
		byID[g.ID] = g
	}
	if g := byID["us_camx"]; g.Name != "WECC California (CAMX)" || !slices.Equal(g.Years, []int{2022}) || g.Losses || len(g.Sources) != 1 {
		t.Errorf("us_camx: %+v", g)
	}
	if g := byID["gb"]; !slices.Equal(g.Years, []int{2014, 2023}) || !g.Losses || !slices.Equal(g.Methods, []string{MethodLocation}) || len(g.Sources) != 2 {
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
	if _, err := evalExpr(e, `fuel_co2("natural_gas", 1000, "GJ", "egrid2022")`); err == nil || !strings.Contains(err.Error(), `unknown pack "egrid2022"`) {
		t.Errorf("a grid set as fuel pack: %v", err)
	}
}
