package importer

import (
	"context"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/calctest"
	"github.com/fluecell/fluecell/importer/demo"
)

// Published values the checks below use:
//   - wood/wood waste: NCV 15.6 TJ/Gg (IPCC 2006 Guidelines Vol 2 Ch 1
//     Table 1.2) and CO2 112,000 kg/TJ (Table 1.4), so one tonne of wood
//     gives 15.6 GJ x 112 kg/GJ = 1.7472 t of biogenic CO2;
//   - wood CH4 30 kg/TJ and N2O 4 kg/TJ (Vol 2 Ch 2 Table 2.2, energy
//     industries), weighted by 28 and 265 (IPCC AR5 WG1 Ch 8 Table 8.A.1).
const (
	woodBioTPerT  = 15.6 * 112 / 1000
	woodCO2eTPerT = 15.6 * (30*28 + 4*265) / 1e6
)

// kindTotalOf is the total of kind in rep; a zero KindTotal when it has none.
func kindTotalOf(rep *Report, kind string) KindTotal {
	for _, k := range rep.ByKind {
		if k.Kind == kind {
			return k
		}
	}
	return KindTotal{}
}

// TestDemoFuelLogFossilAndBiogenic: the demo's fuel log holds 2.4 t of wood
// pellets. Their CO2 is biogenic: it is in the column tCO2_biogenic and the
// biogenic total, not in tCO2, so that tCO2e (fossil CO2 plus CH4 and N2O)
// is never smaller than tCO2. Before, tCO2 347.2 > tCO2e 344.2.
func TestDemoFuelLogFossilAndBiogenic(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	out := filepath.Join(dir, "fuel.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), paths[0], out, Options{})
	must(t, err)
	if rep.Totals.TCO2e < rep.Totals.TCO2 {
		t.Errorf("total tCO2e %.6f < tCO2 %.6f: biogenic CO2 in the fossil total", rep.Totals.TCO2e, rep.Totals.TCO2)
	}
	wantBio := 2.4 * woodBioTPerT // 4.19328 t
	if !near(rep.Biogenic, wantBio) {
		t.Errorf("biogenic total %.9g t, want %.9g (2.4 t wood x 15.6 GJ/t x 112 kg/GJ)", rep.Biogenic, wantBio)
	}
	st := kindTotalOf(rep, KindStationary)
	if len(rep.ByKind) != 1 || !near(st.Biogenic, wantBio) || st.TCO2 != rep.Totals.TCO2 || st.TCO2e != rep.Totals.TCO2e {
		t.Errorf("totals by kind %+v, want one stationary total equal to the Scope 1 totals %+v", rep.ByKind, rep.Totals)
	}
	// 14 of 17 rows: "Natral gas" (C11), 250 kW (E15), 3.2 "ton" (E16): each left-out
	// row is named by the cell of its error.
	if st.Rows != 17 || st.Computed != 14 || !st.Incomplete || !rep.Incomplete ||
		!slices.Equal(st.LeftOut, []string{"Fuel log!C11", "Fuel log!E15", "Fuel log!E16"}) {
		t.Errorf("completeness %d of %d, incomplete %v, left out %v; want 14 of 17, incomplete, the cells of the errors of rows 11, 15, 16", st.Computed, st.Rows, st.Incomplete, st.LeftOut)
	}
	if w := rep.ByFuel["wood"]; w.TCO2 != 0 || !near(w.TCO2e, 2.4*woodCO2eTPerT) {
		t.Errorf("wood by fuel %+v, want tCO2 0 and tCO2e %.9g (CH4 and N2O only)", w, 2.4*woodCO2eTPerT)
	}
	// The data sheet: row 14 is the wood; tCO2 H, tCO2e I, tCO2_biogenic J.
	f, err := excelize.OpenFile(out)
	must(t, err)
	defer f.Close()
	get := func(c string) string {
		v, _ := f.GetCellValue("Fuel log", c, excelize.Options{RawCellValue: true})
		return v
	}
	if get("H4") != "tCO2" || get("J4") != BiogenicColumn || get("K4") != "source" {
		t.Errorf("computed headers %q %q %q, want tCO2, %s, source", get("H4"), get("J4"), get("K4"), BiogenicColumn)
	}
	if get("H14") != "0" || !nearText(get("J14"), wantBio) || get("J5") != "0" {
		t.Errorf("wood row: tCO2 %q, biogenic %q; gas row biogenic %q; want 0, %.9g, 0", get("H14"), get("J14"), get("J5"), wantBio)
	}
	// The summary: one line per kind, marked incomplete, linking to the rows left out.
	rows, err := f.GetRows(SheetSummary, excelize.Options{RawCellValue: true})
	must(t, err)
	found := false
	for i, r := range rows {
		if len(r) < 10 || r[0] != KindLabel(KindStationary) {
			continue
		}
		found = true
		if !nearText(r[5], wantBio) || r[6] != "14" || r[7] != "17" || r[8] != "incomplete: 3 rows left out" || r[9] != "Fuel log!C11" {
			t.Errorf("summary line %q", r)
		}
		ok, link, err := f.GetCellHyperLink(SheetSummary, cellRef(10, i+1))
		if err != nil || !ok || link != "'Fuel log'!C11" {
			t.Errorf("link of %s = %q, %v, %v; want 'Fuel log'!C11", cellRef(10, i+1), link, ok, err)
		}
	}
	if !found {
		t.Errorf("no line %q in the summary: %q", KindLabel(KindStationary), rows)
	}
	for _, r := range rows {
		if len(r) > 0 && r[0] == "Total" {
			t.Errorf("a grand total across kinds in the summary: %q", r)
		}
	}
}

func nearText(s string, want float64) bool {
	v, err := strconv.ParseFloat(s, 64)
	return err == nil && near(v, want)
}

// TestTotalsKeptByKind: a workbook of fuels, purchased electricity, a
// refrigerant top-up and a build plan gives four totals, each with its
// completeness; the Scope 1 total holds fuels and refrigerant only.
func TestTotalsKeptByKind(t *testing.T) {
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, [][]any{
		{"Fuel", "Quantity", "Unit"},
		{"Wood pellets", 2, "t"},
		{"diesel", 1000, "L"},
		{"Natral gas", 500, "kWh"},
	})
	addSheet(t, f, "Power")
	setRows(t, f, "Power", 1, [][]any{{"Month", "Electricity (kWh)"}, {"Jan 2025", 1000}, {"Feb 2025", 2000}})
	addSheet(t, f, "F-gas log")
	setRows(t, f, "F-gas log", 1, [][]any{{"Unit ID", "Refrigerant", "Top-up", "Unit"}, {"AC-01", "R-410A", 2, "kg"}})
	addSheet(t, f, "Equipment") // charges held: no emission, in no total and no kind
	setRows(t, f, "Equipment", 1, [][]any{{"Asset", "Refrigerant", "Full charge (kg)"}, {"Chiller 1", "R-134a", 120}})
	addSheet(t, f, "Build plan")
	setRows(t, f, "Build plan", 1, [][]any{{"Project", "Technology", "Capacity", "Unit"}, {"Fellside array", "pv_utility", 40, "MW"}})
	path := save(t, f, filepath.Join(t.TempDir(), "kinds.xlsx"))
	rep := scanFile(t, path, Options{Grid: "DE"})

	var kinds []string
	for _, k := range rep.ByKind {
		kinds = append(kinds, k.Kind)
	}
	if want := []string{KindStationary, KindFugitive, KindScope2, KindEmbodied}; !slices.Equal(kinds, want) {
		t.Fatalf("kinds %v, want %v; findings %s", kinds, want, listFindings(rep))
	}
	e := testEngine(t)
	diesel, err := e.CallValues("fuel_co2", "diesel", 1000.0, "L")
	must(t, err)
	st, fu, s2, emb := kindTotalOf(rep, KindStationary), kindTotalOf(rep, KindFugitive), kindTotalOf(rep, KindScope2), kindTotalOf(rep, KindEmbodied)
	if !near(st.TCO2, diesel.Value) || !near(st.Biogenic, 2*woodBioTPerT) {
		t.Errorf("stationary %+v, want tCO2 %.9g (diesel only) and biogenic %.9g (2 t wood)", st, diesel.Value, 2*woodBioTPerT)
	}
	if st.Rows != 3 || st.Computed != 2 || !st.Incomplete || !slices.Equal(st.LeftOut, []string{"Fuel log!A4"}) {
		t.Errorf("stationary completeness %+v, want 2 of 3, incomplete, left out Fuel log!A4", st)
	}
	// R-410A: GWP 2087.5 (AR5 Table 8.A.1, 50/50 HFC-32 and HFC-125, ASHRAE 34).
	if !near(fu.TCO2e, 2*gwpR410A/1000) || fu.TCO2 != 0 || fu.Incomplete {
		t.Errorf("fugitive %+v, want %.9g t CO2e, complete", fu, 2*gwpR410A/1000)
	}
	// Germany 424.9 g/kWh (EEA, 2014): 3000 kWh.
	if !near(s2.TCO2e, 3000*deKgPerKWh/1000) || s2.Rows != 2 || s2.Incomplete {
		t.Errorf("electricity %+v, want %.9g t CO2e from 2 of 2 rows", s2, 3000*deKgPerKWh/1000)
	}
	if emb.TCO2e <= 0 || emb.Rows != 1 || emb.Scope == "Scope 1" {
		t.Errorf("embodied %+v, want a positive total of its own", emb)
	}
	// Scope 1 is stationary plus fugitive: never Scope 2, embodied or biogenic.
	if !near(rep.Totals.TCO2e, st.TCO2e+fu.TCO2e) || !near(rep.Totals.TCO2, st.TCO2) {
		t.Errorf("Scope 1 totals %+v, want stationary %+v plus fugitive %+v only", rep.Totals, st, fu)
	}
	if rep.Totals.TCO2e < rep.Totals.TCO2 || math.Abs(rep.Biogenic-2*woodBioTPerT) > 1e-9 {
		t.Errorf("tCO2e %.9g < tCO2 %.9g or biogenic %.9g", rep.Totals.TCO2e, rep.Totals.TCO2, rep.Biogenic)
	}
}

// TestDemoMonthlyWoodBiogenic: the demo's monthly energy has a column of
// wood pellets (t), 85.8 t in the year: its CO2 is biogenic, in the column
// tCO2_biogenic and the biogenic total, never in tCO2 or tCO2e.
func TestDemoMonthlyWoodBiogenic(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	rep := scanFile(t, paths[1], Options{})
	want := 85.8 * woodBioTPerT // 149.91 t
	if !near(rep.Biogenic, want) || rep.ByFuel["wood"] != (Totals{}) {
		t.Errorf("biogenic %.9g t, want %.9g (85.8 t x 15.6 GJ/t x 112 kg/GJ); wood by fuel %+v, want none", rep.Biogenic, want, rep.ByFuel["wood"])
	}
	if st := kindTotalOf(rep, KindStationary); st.Rows != 12 || st.Computed != 12 || st.Incomplete || !near(st.Biogenic, want) {
		t.Errorf("stationary %+v", st)
	}
}

// TestBlendBiogenic: a blend's fossil share is in tCO2, its bio share's CO2
// in tCO2_biogenic. 100 gal E85 with pack epa2025: 15 gal x 0.125 MMBtu/gal
// x 70.22 kg/MMBtu (EPA GHG Emission Factors Hub 2025 Table 1, motor
// gasoline) = 0.1316625 t fossil; 85 gal x 0.084 MMBtu/gal x 68.44 kg/MMBtu
// (40 CFR 98 Table C-1, ethanol; from memory) = 0.4886616 t biogenic.
func TestBlendBiogenic(t *testing.T) {
	f := newBook(t, "Fleet fuel")
	setRows(t, f, "Fleet fuel", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"E85", 100, "gal"}, {"diesel", 10, "gal"}})
	rep := scanFile(t, save(t, f, filepath.Join(t.TempDir(), "e85.xlsx")), Options{Pack: "epa2025"})
	if !near(rep.Biogenic, 0.4886616) {
		t.Errorf("biogenic %.9g t, want 0.4886616 (the ethanol share of 100 gal E85); findings %s", rep.Biogenic, listFindings(rep))
	}
	if g := rep.ByFuel["motor_gasoline"]; !near(g.TCO2, 0.1316625) || rep.Totals.TCO2e < rep.Totals.TCO2 {
		t.Errorf("E85 tCO2 %.9g, want 0.1316625 (the fossil share only); totals %+v; by fuel %+v", g.TCO2, rep.Totals, rep.ByFuel)
	}
}

// TestSummaryKindsOpenpyxl reads the demo fuel log's Carbon summary back with
// openpyxl: the stationary line carries the fossil, CO2e and biogenic
// figures, 14 of 17 rows and "incomplete", and the data sheet's wood row has
// 0 fossil tCO2 and its biogenic CO2 (2.4 t x 15.6 GJ/t x 112 kg/GJ).
func TestSummaryKindsOpenpyxl(t *testing.T) {
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	out := filepath.Join(dir, "fuel.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), paths[0], out, Options{})
	must(t, err)
	sheets := calctest.Openpyxl(t, out)
	byName := map[string]calctest.Sheet{}
	for _, s := range sheets {
		byName[s.Name] = s
	}
	found := false
	for _, r := range byName[SheetSummary].Rows {
		if len(r) < 10 || r[0].Text != KindLabel(KindStationary) {
			continue
		}
		found = true
		if !near(r[1].Value, rep.Totals.TCO2) || !near(r[2].Value, rep.Totals.TCO2e) || r[2].Value < r[1].Value ||
			!near(r[3].Value, rep.Totals.Low) || !near(r[4].Value, rep.Totals.High) || !(r[3].Value < r[2].Value && r[2].Value < r[4].Value) ||
			!near(r[5].Value, 2.4*woodBioTPerT) || r[6].Value != 14 || r[7].Value != 17 || r[8].Text != "incomplete: 3 rows left out" {
			t.Errorf("openpyxl summary line %+v", r)
		}
	}
	if !found {
		t.Errorf("openpyxl: no %q line in %s", KindLabel(KindStationary), SheetSummary)
	}
	data := byName["Fuel log"].Rows
	if len(data) < 14 || len(data[13]) < 10 || data[3][9].Text != BiogenicColumn || data[13][7].Value != 0 || !near(data[13][9].Value, 2.4*woodBioTPerT) {
		t.Errorf("openpyxl: wood row %+v under %+v", data[13], data[3])
	}
}
