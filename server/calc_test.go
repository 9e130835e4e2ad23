package server

import (
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/calctest"
)

// TestCalcWebservice opens a workbook in a real LibreOffice Calc whose cells call the server
// with WEBSERVICE: the number alone, VALUE() arithmetic on it, arguments taken from other cells
// and through ENCODEURL, NUMBERVALUE and FILTERXML, an errors=inline cell that shows why, and
// cells that fail (bad unit without inline, wrong token). The server runs with a token, passed
// as token= in the URL as a sheet must. Skipped without LibreOffice (failed with
// FLUECELL_REQUIRE_CALC=1).
func TestCalcWebservice(t *testing.T) {
	const token = "calc-Token"
	ts := startServer(t, Config{Token: token})
	fn := func(name, query string) string {
		return ts.URL + "/v1/fn/" + name + "?" + query + "&token=" + token
	}
	gas := fn("fuel_co2", "fuel=natural_gas&amount=1000&unit=GJ")
	ws := func(u string) string { return `_xlfn.WEBSERVICE("` + u + `")` }

	cells := []struct {
		cell, label, formula, want string
	}{
		// IPCC 2006 Vol 2 Ch 1 Table 1.4: 56,100 kg CO2/TJ; 1000 GJ = 56.1 t CO2
		{"B1", "the number alone", ws(gas), "56.1"},
		{"B2", "VALUE arithmetic", "VALUE(" + ws(gas) + ")*2", "112.2"},
		{"B3", "sum of two calls", "VALUE(" + ws(gas) + ")+VALUE(" + ws(fn("fuel_co2", "fuel=natural_gas&amount=500&unit=GJ")) + ")", "84.15"},
		{"B4", "arguments from cells C4 and D4", `VALUE(_xlfn.WEBSERVICE("` + ts.URL + `/v1/fn/fuel_co2?fuel="&D4&"&amount="&C4&"&unit=GJ&token=` + token + `"))`, "56.1"},
		// NIST SP 811 Appendix B: 1 Btu (IT) = 1055.05585262 J
		{"B5", "ENCODEURL for a unit with a space", `ROUND(VALUE(_xlfn.WEBSERVICE("` + ts.URL + `/v1/fn/to_unit?value=1&from="&_xlfn.ENCODEURL("MMBtu HHV")&"&to="&_xlfn.ENCODEURL("GJ HHV")&"&token=` + token + `")),6)`, "1.055056"},
		{"B6", "errors=inline", ws(fn("fuel_co2", "fuel=natural_gas&amount=1000&unit=ton&errors=inline")),
			`#ERROR: fuel_co2: unit: ambiguous unit "ton": write t (tonne, 1000 kg), short_ton (2000 lb) or long_ton (2240 lb)`},
		{"B8", "NUMBERVALUE with a . separator", `_xlfn.NUMBERVALUE(` + ws(gas) + `,".")`, "56.1"},
		{"B9", "FILTERXML on format=xml", `VALUE(_xlfn.FILTERXML(` + ws(gas+"&format=xml") + `,"//value"))`, "56.1"},
		{"B12", "FILTERXML of the unit", `_xlfn.FILTERXML(` + ws(gas+"&format=xml") + `,"//unit")`, "t CO2"},
		{"B11", "CO2e of diesel by volume", "ROUND(VALUE(" + ws(fn("fuel_co2e", "fuel=diesel&amount=1000&unit=L")) + "),4)", "2.6613"},
	}
	failing := []struct{ cell, label, formula string }{
		{"B7", "a mistake without errors=inline", ws(fn("fuel_co2", "fuel=natural_gas&amount=1000&unit=ton"))},
		{"B10", "a wrong token", ws(ts.URL + "/v1/fn/fuel_co2?fuel=natural_gas&amount=1000&unit=GJ&token=guess")},
	}

	dir := t.TempDir()
	f := excelize.NewFile()
	defer f.Close()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(f.SetCellValue("Sheet1", "C4", 1000))
	must(f.SetCellValue("Sheet1", "D4", "natural_gas"))
	for _, c := range cells {
		must(f.SetCellValue("Sheet1", "A"+c.cell[1:], c.label))
		must(f.SetCellFormula("Sheet1", c.cell, c.formula))
	}
	for _, c := range failing {
		must(f.SetCellValue("Sheet1", "A"+c.cell[1:], c.label))
		must(f.SetCellFormula("Sheet1", c.cell, c.formula))
	}
	book := filepath.Join(dir, "webservice.xlsx")
	must(f.SaveAs(book))

	calc := calctest.Start(t, dir)
	var refs []string
	for _, c := range cells {
		refs = append(refs, c.cell)
	}
	for _, c := range failing {
		refs = append(refs, c.cell)
	}
	t0 := time.Now()
	got, err := calc.Cells(book, refs...)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("Calc opened and recalculated the workbook in %v", time.Since(t0).Round(time.Millisecond))
	for _, c := range cells {
		if got[c.cell] != c.want {
			t.Errorf("%s (%s): Calc shows %q, want %q", c.cell, c.label, got[c.cell], c.want)
		}
	}
	for _, c := range failing {
		if _, err := strconv.ParseFloat(got[c.cell], 64); err == nil || got[c.cell] == "" {
			t.Errorf("%s (%s): Calc shows %q, want an error value", c.cell, c.label, got[c.cell])
		} else {
			t.Logf("%s (%s): Calc shows %s", c.cell, c.label, got[c.cell])
		}
	}
	var hits, misses float64
	for _, fm := range ts.srv.metrics.byFn {
		hits += counterValue(t, fm.hit)
		misses += counterValue(t, fm.miss)
	}
	t.Logf("Calc made %v GET /v1/fn calls for %d WEBSERVICE calls in %d cells: %v computed, %v from the cache",
		hits+misses, strings.Count(strings.Join(formulas(cells, failing), ""), "WEBSERVICE"), len(refs), misses, hits)
	if hits == 0 {
		t.Errorf("no call was answered from the cache, although Calc repeats identical calls")
	}
	if !strings.Contains(ts.logs.String(), "token=REDACTED") || strings.Contains(ts.logs.String(), token) {
		t.Errorf("the log shows the token, or does not show it redacted")
	}
}

func formulas(cells []struct{ cell, label, formula, want string }, failing []struct{ cell, label, formula string }) []string {
	var out []string
	for _, c := range cells {
		out = append(out, c.formula)
	}
	for _, c := range failing {
		out = append(out, c.formula)
	}
	return out
}
