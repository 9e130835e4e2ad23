package importer

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer/demo"
)

// Published GWP-100 values: IPCC AR6 WG1 Ch 7 Table 7.15 (fossil CH4 29.8,
// non-fossil CH4 27.0, N2O 273) and IPCC AR5 WG1 Ch 8 Table 8.7 (CH4 28,
// N2O 265; AR5 gives no separate non-fossil value, so 28 for every fuel).
var publishedGWP = map[string]struct{ ch4Fossil, ch4NonFossil, n2o float64 }{
	"ar6": {29.8, 27.0, 273},
	"ar5": {28, 28, 265},
}

// demoFuelIDs are the fuels the demo fuel log's texts name (IPCC 2006 Vol 2
// Ch 1 Table 1.2 ids): gas oil, diesel and heating oil are one fuel there.
var demoFuelIDs = map[string]string{"Natural gas": "natural_gas", "Gas oil": "gas_diesel_oil", "Diesel": "gas_diesel_oil",
	"Heating oil": "gas_diesel_oil", "LPG": "lpg", "Wood pellets": "wood"}

// TestGWPSetDemoFuelLog annotates the demo fuel log with ar6 and with ar5 and
// checks every computed row: tCO2e = tCO2 + CH4 x GWP(CH4) + N2O x GWP(N2O),
// with CH4 and N2O worked out here from the row's energy (fuel_energy in TJ,
// NCV) and the pack's stationary factors (IPCC 2006 Vol 2 Ch 2 Table 2.2,
// kg/TJ), weighted with the published values above (non-fossil CH4 for
// wood, whose CO2 is biogenic and not in tCO2).
func TestGWPSetDemoFuelLog(t *testing.T) {
	e := testEngine(t)
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	totals := map[string]float64{}
	for _, set := range []string{"ar6", "ar5"} {
		out := filepath.Join(dir, set+".xlsx")
		rep, err := Annotate(context.Background(), e, paths[0], out, Options{GWPSet: strings.ToUpper(set)})
		must(t, err)
		if rep.GWPSet != set {
			t.Errorf("%s: report gwp_set %q", set, rep.GWPSet)
		}
		if want := "tCO2e = fuel_co2e(fuel, quantity, unit) (GWP set " + set + ")"; !containsStr(rep.Rules, want) {
			t.Errorf("%s: rules %q, want %q among them", set, rep.Rules, want)
		}
		totals[set] = rep.Totals.TCO2e
		g := publishedGWP[set]
		f, err := excelize.OpenFile(out)
		must(t, err)
		checked := 0
		for row := 5; row <= 21; row++ {
			get := func(col string) string {
				v, err := f.GetCellValue("Fuel log", col+strconv.Itoa(row), excelize.Options{RawCellValue: true})
				must(t, err)
				return v
			}
			co2, err1 := strconv.ParseFloat(get("H"), 64)
			co2e, err2 := strconv.ParseFloat(get("I"), 64)
			if err1 != nil || err2 != nil {
				continue // a row not computed: its cells say why
			}
			qtyText := get("D")
			if row == 20 {
				qtyText = "575" // =D8*0.5, with D8 = 1150 L
			}
			qty, err := strconv.ParseFloat(strings.ReplaceAll(qtyText, ",", ""), 64)
			must(t, err)
			fuel, ok := demoFuelIDs[get("C")]
			if !ok {
				t.Fatalf("row %d: fuel %q not in demoFuelIDs", row, get("C"))
			}
			energy, err := e.CallValues("fuel_energy", fuel, qty, get("E"), "TJ")
			must(t, err)
			ef := map[string]float64{}
			fs, err := e.Factors("ipcc2006", fuel)
			must(t, err)
			for _, x := range fs {
				ef[x.Quantity] = x.Value // kg/TJ
			}
			ch4GWP := g.ch4Fossil
			if fuel == "wood" {
				ch4GWP = g.ch4NonFossil
			}
			want := co2 + energy.Value*(ef["ch4_ef"]*ch4GWP+ef["n2o_ef"]*g.n2o)/1000
			if ef["ch4_ef"] == 0 || ef["n2o_ef"] == 0 || math.Abs(co2e-want) > 1e-9*math.Max(1, math.Abs(want)) {
				t.Errorf("%s row %d (%s %s %s): tCO2e %.12g, want %.12g = tCO2 %.12g + %.9g TJ x (%g kg CH4/TJ x %g + %g kg N2O/TJ x %g)",
					set, row, get("C"), qtyText, get("E"), co2e, want, co2, energy.Value, ef["ch4_ef"], ch4GWP, ef["n2o_ef"], g.n2o)
			}
			checked++
		}
		if checked != rep.Computed || checked < 10 {
			t.Errorf("%s: checked %d rows, the report computed %d", set, checked, rep.Computed)
		}
		sources, err := f.GetRows(SheetSources)
		must(t, err)
		if !rowsHave(sources, "GWP set "+set+" unless a rule names another") || !rowsHave(sources, "(GWP set "+set+")") {
			t.Errorf("%s: the %s sheet does not name the set", set, SheetSources)
		}
		f.Close()
	}
	if !(totals["ar6"] > totals["ar5"]) {
		t.Errorf("total tCO2e ar6 %.9g, ar5 %.9g: fossil CH4 29.8 > 28 and N2O 273 > 265 must raise it", totals["ar6"], totals["ar5"])
	}
}

func containsStr(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func rowsHave(rows [][]string, s string) bool {
	for _, r := range rows {
		for _, c := range r {
			if strings.Contains(c, s) {
				return true
			}
		}
	}
	return false
}

// TestGWPSetWideAndSector: the wide demo table's totals by fuel follow the
// set like its rows, and a table with a sector column (whose calls name the
// set themselves) takes the chosen one, not the default.
func TestGWPSetWideAndSector(t *testing.T) {
	e := testEngine(t)
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	must(t, err)
	for _, set := range []string{"ar4", "ar6"} {
		rep := scanFile(t, paths[1], Options{GWPSet: set})
		def := scanFile(t, paths[1], Options{})
		var sum float64
		for _, tot := range rep.ByFuel {
			sum += tot.TCO2e
		}
		if math.Abs(sum-rep.Totals.TCO2e) > 1e-9*rep.Totals.TCO2e || rep.Totals.TCO2e == def.Totals.TCO2e {
			t.Errorf("%s: by fuel %.9g, total %.9g, default-set total %.9g", set, sum, rep.Totals.TCO2e, def.Totals.TCO2e)
		}
	}

	f := newBook(t, "Boilers")
	setRows(t, f, "Boilers", 1, [][]any{{"Fuel", "Quantity", "Unit", "Sector"}, {"natural gas", 100, "GJ", "commercial"}})
	path := save(t, f, filepath.Join(dir, "sector.xlsx"))
	rep := scanFile(t, path, Options{GWPSet: "ar6"})
	want, err := e.CallValues("fuel_co2e", "natural_gas", 100.0, "GJ", "ar6", "ipcc2006", "commercial")
	must(t, err)
	if math.Abs(rep.Totals.TCO2e-want.Value) > 1e-12 || !strings.Contains(strings.Join(rep.Rules, "\n"), `"ar6"`) {
		t.Errorf("sector table with ar6: %.12g t CO2e, rules %q; want %.12g (fuel_co2e(..., \"ar6\", \"ipcc2006\", \"commercial\"))", rep.Totals.TCO2e, rep.Rules, want.Value)
	}
}

// TestGWPSetUserRuleAndErrors: a user rule without a set takes the chosen
// one, a rule naming its own keeps it; bad sets and a mapping that disagrees
// are errors naming the option and the accepted sets.
func TestGWPSetUserRuleAndErrors(t *testing.T) {
	e := testEngine(t)
	dir := t.TempDir()
	f := newBook(t, "Gas")
	setRows(t, f, "Gas", 1, [][]any{{"Fuel", "Amount", "Unit"}, {"natural_gas", 1, "TJ"}})
	path := save(t, f, filepath.Join(dir, "gas.xlsx"))
	for rule, want := range map[string]string{
		"tCO2e = fuel_co2e(fuel, amount, unit)":        `fuel_co2e("natural_gas", 1, "TJ", "ar6")`,
		`tCO2e = fuel_co2e(fuel, amount, unit, "ar4")`: `fuel_co2e("natural_gas", 1, "TJ", "ar4")`,
	} {
		rep := scanFile(t, path, Options{GWPSet: "ar6", Rules: []string{rule}})
		p, err := e.Compile(want)
		must(t, err)
		w, err := p.Eval(nil)
		must(t, err)
		var got float64
		for _, k := range rep.ByKind {
			got += k.TCO2e
		}
		if math.Abs(got-w.Value) > 1e-12 {
			t.Errorf("rule %s under ar6: %.12g t, want %.12g (%s); rules %q", rule, got, w.Value, want, rep.Rules)
		}
	}

	_, err := Scan(context.Background(), e, path, Options{GWPSet: "ar7"})
	if err == nil || !strings.Contains(err.Error(), "--gwp-set") || !strings.Contains(err.Error(), "gwp_set") || !strings.Contains(err.Error(), "ar4, ar5, ar6") {
		t.Errorf("GWPSet ar7: %v, want an error naming --gwp-set and gwp_set and listing ar4, ar5, ar6", err)
	}
	bad := filepath.Join(dir, "bad.json")
	must(t, os.WriteFile(bad, []byte(`{"fluecell_mapping": 1, "tables": [], "names": {}, "gwp_set": "AR7"}`), 0o644))
	if _, err := LoadMapping(e, bad); err == nil || !strings.Contains(err.Error(), "gwp_set: unknown GWP set") || !strings.Contains(err.Error(), "ar4, ar5, ar6") {
		t.Errorf("mapping gwp_set AR7: %v", err)
	}
	good := filepath.Join(dir, "good.json")
	must(t, os.WriteFile(good, []byte(`{"fluecell_mapping": 1, "tables": [], "names": {}, "gwp_set": "AR6"}`), 0o644))
	m, err := LoadMapping(e, good)
	must(t, err)
	viaMapping := scanFile(t, path, Options{Mapping: m})
	viaOption := scanFile(t, path, Options{GWPSet: "ar6"})
	if viaMapping.GWPSet != "ar6" || viaMapping.Totals.TCO2e != viaOption.Totals.TCO2e {
		t.Errorf("mapping gwp_set ar6: %s %.12g, option ar6: %.12g", viaMapping.GWPSet, viaMapping.Totals.TCO2e, viaOption.Totals.TCO2e)
	}
	if both := scanFile(t, path, Options{Mapping: m, GWPSet: "Ar6"}); both.GWPSet != "ar6" {
		t.Errorf("mapping and option agreeing: %q", both.GWPSet)
	}
	_, err = Scan(context.Background(), e, path, Options{Mapping: m, GWPSet: "ar5"})
	if err == nil || !strings.Contains(err.Error(), "ar5") || !strings.Contains(err.Error(), "says gwp_set ar6") {
		t.Errorf("mapping ar6 with option ar5: %v, want an error naming both", err)
	}

	// Inspect writes the chosen set into the mapping file, which reads back.
	ins, err := Inspect(context.Background(), e, path, Options{GWPSet: "ar6"})
	must(t, err)
	mf := ins.MappingFile()
	out := filepath.Join(dir, "written.json")
	must(t, mf.Write(out))
	back, err := LoadMapping(e, out)
	must(t, err)
	if mf.GWPSet != "ar6" || back.gwpSet != "ar6" {
		t.Errorf("mapping file gwp_set %q, read back %q", mf.GWPSet, back.gwpSet)
	}
	if ins, err := Inspect(context.Background(), e, path, Options{}); err != nil || ins.MappingFile().GWPSet != "" || ins.Report.GWPSet != funcs.DefaultGWPSet {
		t.Errorf("no set chosen: mapping file gwp_set %q, report %q, err %v", ins.MappingFile().GWPSet, ins.Report.GWPSet, err)
	}
}
