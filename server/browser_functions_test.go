package server

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/chromedp"
	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer/calctest"
)

// TestPageFunctions drives the functions explorer in chromium: the list comes from the
// catalog, the form of fuel_co2 computes as it is typed in, and the cell formula it gives
// (copied through the clipboard) computes the same value in LibreOffice Calc against the
// server, as does its Python snippet. 500 GJ of natural gas x 56 100 kg CO2/TJ (IPCC 2006
// Vol 2 Ch 1 Table 1.4) = 28.05 t CO2.
func TestPageFunctions(t *testing.T) {
	b := startBrowser(t, 1280, 900)
	ts := startPageServer(t)
	openPage(t, b, ts.URL)
	// the list is the catalog's, in its order
	names := eval[[]string](b, `Array.from(document.querySelectorAll("#fn-list button")).map(b => b.dataset.fn)`)
	if len(names) != len(ts.srv.engine.Functions()) || names[0] != ts.srv.engine.Functions()[0].Name {
		t.Errorf("the list shows %d functions from %v, want the catalog's %d", len(names), names[:min(len(names), 3)], len(ts.srv.engine.Functions()))
	}
	b.do(chromedp.Click(chromedp.ID("tab-functions")),
		chromedp.Click(chromedp.CSS(`#fn-list button[data-fn="fuel_co2"]`)))
	// the form starts from the catalog's example: 1000 GJ gives 56.1 t CO2
	b.waitText("#fn-result", "56.1 t CO2")
	eval[string](b, `document.getElementById("fn-p-amount").value = ""`)
	b.do(chromedp.SendKeys(chromedp.ID("fn-p-amount"), "500"))
	b.waitText("#fn-result", "28.05 t CO2")
	if d := b.text("#fn-detail"); !strings.Contains(d, "IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.4") || !strings.Contains(d, "56100 kg CO2/TJ") {
		t.Errorf("the sources shown are %q", d)
	}
	want := `=VALUE(WEBSERVICE("` + ts.URL + `/v1/fn/fuel_co2?fuel=natural_gas&amount=500&unit=GJ&token=YOUR_TOKEN"))`
	formula := eval[string](b, `document.getElementById("fn-calc").value`)
	if formula != want {
		t.Errorf("the cell formula is %q, want %q", formula, want)
	}
	if imp := eval[string](b, `document.getElementById("fn-import").value`); !strings.HasPrefix(imp, `=IMPORTDATA("`+ts.URL+`/v1/fn/fuel_co2?fuel=natural_gas&amount=500&unit=GJ&token=YOUR_TOKEN")`) {
		t.Errorf("the IMPORTDATA formula is %q", imp)
	}
	// Copy: the clipboard receives the formula.
	b.do(chromedp.Func(func(ctx context.Context, _ *chromedp.Target) error {
		for _, name := range []string{"clipboard-read", "clipboard-write"} {
			if _, err := chromedp.CallBrowser(ctx, browser.SetPermission, browser.SetPermissionParams{
				Permission: &browser.PermissionDescriptor{Name: name, AllowWithoutSanitization: true}, Setting: browser.PermissionSettingGranted, Origin: ts.URL}); err != nil {
				return err
			}
		}
		return nil
	}), chromedp.Click(chromedp.CSS(`button[aria-label="Copy: Cell formula (LibreOffice Calc, Excel)"]`)))
	b.waitText("#status", "Copied")
	if got := eval[string](b, `navigator.clipboard.readText()`); got != formula {
		t.Errorf("the clipboard holds %q, want the formula %q", got, formula)
	}
	py := eval[string](b, `document.getElementById("fn-python").value`)
	// By keyboard alone: type in the filter, Tab to the first function it leaves, Enter.
	b.do(chromedp.SendKeys(chromedp.ID("fn-filter"), "co2e"), chromedp.KeyEvent("\t"), chromedp.KeyEvent("\r"))
	b.waitText("#fn-main h2", "fuel_co2e")
	if f := eval[string](b, `document.activeElement.dataset.fn || ""`); f != "fuel_co2e" {
		t.Errorf("after Enter the focus is on %q, want the function's button", f)
	}
	b.waitText("#fn-result", "t CO2e")
	b.screenshot("page-functions-1280.png")
	b.do(chromedp.EmulateViewport(390, 844))
	if eval[bool](b, `document.documentElement.scrollWidth > document.documentElement.clientWidth`) {
		t.Errorf("at 390 px the functions page is wider than the window")
	}
	b.screenshot("page-functions-390.png")
	noTokenInURLs(t, ts)

	t.Run("python", func(t *testing.T) {
		if _, err := os.Stat("/usr/bin/python3"); err != nil {
			t.Skip("no /usr/bin/python3")
		}
		cmd := exec.Command("/usr/bin/python3", "-c", py)
		cmd.Env = append(os.Environ(), "FLUECELL_TOKEN="+browserToken)
		out, err := cmd.CombinedOutput()
		if err != nil || strings.TrimSpace(string(out)) != "28.05 t CO2" {
			t.Errorf("the Python snippet printed %q (%v), want 28.05 t CO2:\n%s", out, err, py)
		}
	})
	t.Run("calc", func(t *testing.T) {
		// A cell cannot send a header: the token goes where the page says, in place of
		// YOUR_TOKEN. In the file a function newer than OOXML 1.0 carries its _xlfn. prefix.
		cell := strings.Replace(strings.TrimPrefix(formula, "="), "YOUR_TOKEN", browserToken, 1)
		cell = strings.Replace(cell, "WEBSERVICE(", "_xlfn.WEBSERVICE(", 1)
		dir := t.TempDir()
		f := excelize.NewFile()
		defer f.Close()
		if err := f.SetCellFormula("Sheet1", "B1", cell); err != nil {
			t.Fatal(err)
		}
		book := filepath.Join(dir, "formula.xlsx")
		if err := f.SaveAs(book); err != nil {
			t.Fatal(err)
		}
		calc := calctest.Start(t, dir)
		got, err := calc.Cells(book, "B1")
		if err != nil {
			t.Fatal(err)
		}
		server := do(t, "GET", ts.URL+"/v1/fn/fuel_co2?fuel=natural_gas&amount=500&unit=GJ", map[string]string{"Authorization": "Bearer " + browserToken}, "")
		if got["B1"] != "28.05" || strings.TrimSpace(server.Body) != "28.05" {
			t.Errorf("Calc shows %q and the server answers %q for the copied formula, want 28.05", got["B1"], server.Body)
		}
	})
}
