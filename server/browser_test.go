package server

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
	"github.com/xuri/excelize/v2"

	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/calctest"
	"github.com/fluecell/fluecell/importer/demo"
)

// browserToken is the token of the servers the browser tests start.
const browserToken = "page-Token-4417"

// startPageServer starts a server with a token and the workbook routes, for the page.
func startPageServer(t *testing.T) *testServer {
	t.Helper()
	e := newEngine(t)
	return startServer(t, Config{Token: browserToken, Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
}

// openPage opens the page and gives the token once, when the page asks for it.
func openPage(t *testing.T, b *tab, url string) {
	t.Helper()
	b.do(chromedp.Navigate(url+"/"),
		chromedp.WaitVisible(chromedp.ID("token-input")),
		chromedp.SendKeys(chromedp.ID("token-input"), browserToken+"\r")) // Enter submits
	b.waitTrue(`document.getElementById("token-box").hidden`)
	b.waitText("#fn-list", "fuel_co2")
}

// noTokenInURLs checks the server's request log: the token never travelled in an address
// (the log shows a token= query value as REDACTED) and no request went unauthorized after
// the page was given the token.
func noTokenInURLs(t *testing.T, ts *testServer) {
	t.Helper()
	logs := ts.logs.String()
	if strings.Contains(logs, browserToken) || strings.Contains(logs, "REDACTED") {
		t.Errorf("a request carried the token in its address: %s", logs)
	}
	for _, line := range strings.Split(strings.TrimSpace(logs), "\n") {
		var l struct{ Path, Query string }
		if err := json.Unmarshal([]byte(line), &l); err != nil {
			t.Fatalf("log line %q: %v", line, err)
		}
		if strings.Contains(l.Query, "token") || strings.Contains(l.Path, "token") {
			t.Errorf("a request named the token in its address: %s", line)
		}
	}
	if n := strings.Count(logs, `"status":401`); n != 1 {
		t.Errorf("%d requests were refused for the token, want 1 (the first, which makes the page ask once)", n)
	}
}

// TestPageWorkbook drives the page in chromium: it asks for the token once, reads the demo's
// fuel log and shows its findings at their cells, takes a changed role and a fuel name
// mapped by hand, reads again and shows what changed, and downloads the annotated workbook
// (checked with excelize and openpyxl), the report and the mapping file.
func TestPageWorkbook(t *testing.T) {
	b := startBrowser(t, 1280, 900)
	ts := startPageServer(t)
	paths, err := demo.Write(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	openPage(t, b, ts.URL)
	b.do(chromedp.SetUploadFiles(chromedp.ID("file-input"), []string{paths[0]}))
	b.waitText("#status", "14 of 17 rows computed")

	// The demo's misspelt fuel, C11 "Natral gas", is an error finding, highlighted at its cell.
	findings := b.text("#findings")
	for _, want := range []string{"fuel-unknown", `unknown fuel "Natral gas"`, "existing-mismatch", "unit-ambiguous"} {
		if !strings.Contains(findings, want) {
			t.Errorf("the findings table does not say %q: %.400s", want, findings)
		}
	}
	at := eval[map[string]string](b, `(() => { const o = {}; document.querySelectorAll("#tables td[data-finding]").forEach(td => {
		const tr = td.parentElement; o[tr.firstChild.textContent + ":" + td.textContent] = td.className + " " + td.getAttribute("data-finding"); }); return o; })()`)
	if got := at["11:Natral gas"]; !strings.Contains(got, "sev-error") || !strings.Contains(got, "fuel-unknown") {
		t.Errorf("cell C11 of the preview is marked %q, want sev-error fuel-unknown (marked cells: %v)", got, at)
	}
	if kinds := b.text("#kinds"); !strings.Contains(kinds, "14 of 17 rows computed: incomplete") {
		t.Errorf("totals by kind: %q", kinds)
	}
	if sheets := b.text("#sheets"); !strings.Contains(sheets, "Notes") || !strings.Contains(sheets, "no table") {
		t.Errorf("the skipped sheet Notes and its reason are not shown: %q", sheets)
	}
	// Every control is a native one with a name a screen reader and a keyboard user get.
	if unnamed := eval[[]string](b, `Array.from(document.querySelectorAll("input, select, textarea, button")).filter(e =>
		!(e.labels && e.labels.length) && !e.getAttribute("aria-label") && !(e.tagName === "BUTTON" && e.textContent.trim())).map(e => e.id || e.outerHTML.slice(0, 80))`); len(unnamed) > 0 {
		t.Errorf("controls without a label: %v", unnamed)
	}
	if clickable := eval[int](b, `document.querySelectorAll("div[onclick], span[onclick], [role=button]").length`); clickable != 0 {
		t.Errorf("%d clickable elements that are not buttons", clickable)
	}
	b.screenshot("page-workbook-1280.png")

	// Column G (Reported tCO2) is read as no role: its comparisons go; "Natral gas" is mapped
	// to natural_gas by typing the id (Tab leaves the field, as a person would).
	b.change(`select[aria-label="Role of column G"]`, "none")
	b.do(chromedp.SendKeys(chromedp.CSS(`input[aria-label="Fuel id for Natral gas"]`), "natural_gas\t"),
		chromedp.Click(chromedp.ID("rerun")))
	changes := b.waitText("#changes", "rows computed: 14 of 17 → 15 of 17")
	for _, want := range []string{"role of Fuel log!G4 (Reported tCO2): existing-carbon → none", `reading of "Natral gas": unknown → mapping natural_gas`} {
		if !strings.Contains(changes, want) {
			t.Errorf("what changed does not say %q: %s", want, changes)
		}
	}
	if f := b.text("#findings"); strings.Contains(f, "existing-mismatch") || strings.Contains(f, "fuel-unknown") {
		t.Errorf("findings after the fix still hold existing-mismatch or the unknown fuel: %.600s", f)
	}

	// Downloads: the annotated workbook, the report and the mapping file.
	b.do(chromedp.Click(chromedp.ID("dl-workbook")))
	book := b.download("kestrel-fuel-log-2026-w14.carbon.xlsx")
	checkAnnotated(t, book)
	b.do(chromedp.Click(chromedp.ID("dl-report")))
	var rep importer.Report
	readJSON(t, b.download("kestrel-fuel-log-2026-w14.report.json"), &rep)
	if rep.Computed != 15 || rep.Rows != 17 || rep.Mapping == nil {
		t.Errorf("downloaded report: %d of %d rows computed, mapping %v; want 15 of 17 with the page's mapping", rep.Computed, rep.Rows, rep.Mapping)
	}
	b.do(chromedp.Click(chromedp.ID("dl-mapping")))
	mpath := b.download("kestrel-fuel-log-2026-w14.mapping.json")
	var mf importer.MappingFile
	readJSON(t, mpath, &mf)
	if mf.Names["Natral gas"] != "natural_gas" || len(mf.Tables) != 1 || mf.Tables[0].Columns[6].Role != "none" {
		t.Errorf("downloaded mapping: names %v, tables %+v", mf.Names, mf.Tables)
	}
	if _, err := importer.LoadMapping(newEngine(t), mpath); err != nil {
		t.Errorf("the downloaded mapping is refused by LoadMapping: %v", err)
	}

	// Phone width: the same reading, laid out for 390 px.
	b.do(chromedp.EmulateViewport(390, 844))
	if eval[bool](b, `document.documentElement.scrollWidth > document.documentElement.clientWidth`) {
		t.Errorf("at 390 px the page is wider than the window (only tables may scroll, inside their boxes)")
	}
	b.screenshot("page-workbook-390.png")
	noTokenInURLs(t, ts)
}

// checkAnnotated checks the downloaded workbook with excelize and openpyxl: row 11, mapped
// by hand to natural gas, is computed. 12 000 kWh = 43.2 GJ (1 kWh = 3.6 MJ, NIST SP 811)
// x 56 100 kg CO2/TJ (IPCC 2006 Vol 2 Ch 1 Table 1.4) = 2.42352 t CO2.
func checkAnnotated(t *testing.T, path string) {
	t.Helper()
	const want = 12000 * 3.6e-3 * 56100 / 1e6
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if h, _ := f.GetCellValue("Fuel log", "H4"); h != "tCO2" {
		t.Errorf("Fuel log!H4 = %q, want the computed column tCO2", h)
	}
	v, _ := f.GetCellValue("Fuel log", "H11", excelize.Options{RawCellValue: true})
	if x, err := strconv.ParseFloat(v, 64); err != nil || math.Abs(x-want) > 1e-9 {
		t.Errorf("excelize: Fuel log!H11 = %q, want %v", v, want)
	}
	var summary bool
	for _, s := range f.GetSheetList() {
		summary = summary || s == importer.SheetSummary
	}
	if !summary {
		t.Errorf("no sheet %q in %v", importer.SheetSummary, f.GetSheetList())
	}
	for _, sh := range calctest.Openpyxl(t, path) {
		if sh.Name != "Fuel log" {
			continue
		}
		got := sh.Rows[10][7].Text // H11
		if x, err := strconv.ParseFloat(got, 64); err != nil || math.Abs(x-want) > 1e-9 {
			t.Errorf("openpyxl: Fuel log!H11 = %q, want %v", got, want)
		}
		return
	}
	t.Errorf("openpyxl finds no sheet Fuel log")
}

func readJSON(t *testing.T, path string, v any) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		t.Fatalf("%s: %v", filepath.Base(path), err)
	}
}

// TestPageShowsHTMLAsText uploads a workbook whose cells hold markup: the page shows the
// characters, runs nothing and makes no element of them.
func TestPageShowsHTMLAsText(t *testing.T) {
	b := startBrowser(t, 1280, 900)
	ts := startPageServer(t)
	script, img := `<script>alert(1)</script>`, `<img src=x onerror=alert(2)>`
	f := excelize.NewFile()
	rows := [][]any{{"Fuel", "Quantity", "Unit", "Note <b>bold</b>"}, {"Diesel", 100, "L", img}, {script, 50, "L", "x"}, {img, 20, "L", script}}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := f.SetSheetRow("Sheet1", cell, &r); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(t.TempDir(), "markup.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	openPage(t, b, ts.URL)
	b.do(chromedp.SetUploadFiles(chromedp.ID("file-input"), []string{path}))
	b.waitText("#status", "rows computed")
	for _, sel := range []string{"#names", "#tables"} {
		txt := b.text(sel)
		for _, want := range []string{script, img} {
			if !strings.Contains(txt, want) {
				t.Errorf("%s does not show %q as text: %.400s", sel, want, txt)
			}
		}
	}
	made := eval[struct{ Img, Script, B int }](b, `({Img: document.querySelectorAll("img").length, Script: document.querySelectorAll("body script").length, B: document.querySelectorAll("b").length})`)
	if made.Img != 0 || made.Script != 0 || made.B != 0 {
		t.Errorf("the workbook's markup became elements: %+v", made)
	}
	if n := b.dialogs.Load(); n != 0 {
		t.Errorf("%d dialogs opened", n)
	}
	checkCSP(t, b, ts)
	noTokenInURLs(t, ts)
}

// checkCSP checks the page's security headers and that the browser enforces its policy: an
// inline script added to the page does not run and is reported as a violation.
func checkCSP(t *testing.T, b *tab, ts *testServer) {
	t.Helper()
	r := do(t, "GET", ts.URL+"/", nil, "")
	if r.Status != 200 || r.Header.Get("Content-Security-Policy") != pageCSP || r.Header.Get("X-Content-Type-Options") != "nosniff" || r.Header.Get("Referrer-Policy") != "no-referrer" {
		t.Errorf("GET /: %d, headers %v", r.Status, r.Header)
	}
	res := eval[struct {
		Ran        bool
		Violations int
	}](b, `new Promise(done => {
		let v = 0;
		document.addEventListener("securitypolicyviolation", () => v++);
		const s = document.createElement("script");
		s.textContent = "window.inlineRan = true";
		document.body.append(s);
		const d = document.createElement("div");
		d.innerHTML = '<img src="x" onerror="window.inlineRan = true">';
		document.body.append(d);
		setTimeout(() => { d.remove(); s.remove(); done({Ran: !!window.inlineRan, Violations: v}); }, 500);
	})`)
	if res.Ran || res.Violations == 0 {
		t.Errorf("an inline script ran (%v) or no violation was reported (%d): the policy is not enforced", res.Ran, res.Violations)
	}
}

// TestPageLimits shows the server's refusals as messages in the page: a workbook over the
// upload limit (413) and a file that is not a workbook (400); the page stays usable and reads
// the next file, a CSV dropped on it.
func TestPageLimits(t *testing.T) {
	b := startBrowser(t, 1280, 900)
	e := newEngine(t)
	ts := startServer(t, Config{Token: browserToken, MaxUploadBytes: 4096, Annotate: AnnotateHandler(e, AnnotateConfig{TempDir: t.TempDir()})})
	paths, err := demo.Write(t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	openPage(t, b, ts.URL)
	b.do(chromedp.SetUploadFiles(chromedp.ID("file-input"), []string{paths[0]}))
	msg := b.waitText("#status", "Too large for this server")
	if !strings.Contains(msg, "4096 bytes") || !eval[bool](b, `document.getElementById("status").classList.contains("error")`) {
		t.Errorf("the message of a workbook over the limit: %q", msg)
	}
	fake := filepath.Join(t.TempDir(), "not-a-workbook.xlsx")
	if err := os.WriteFile(fake, []byte("PK\x03\x04 this is not a zip"), 0o644); err != nil {
		t.Fatal(err)
	}
	b.do(chromedp.SetUploadFiles(chromedp.ID("file-input"), []string{fake}))
	msg = b.waitText("#status", "not-a-workbook.xlsx: the workbook is a damaged or truncated zip")
	t.Logf("the page says: %s", msg)
	if eval[bool](b, `document.getElementById("file-input").disabled`) {
		t.Errorf("the file input stays disabled after a refusal")
	}
	// A CSV file dropped on the page (as a file manager drops it) is read under its own name.
	eval[bool](b, `(() => {
		const dt = new DataTransfer();
		dt.items.add(new File(["Site,Fuel,Quantity,Unit\nDepot,diesel,1200,L\nCreamery,natural_gas,40,MWh\n"], "week 14.csv", {type: "text/csv"}));
		return document.getElementById("drop").dispatchEvent(new DragEvent("drop", {dataTransfer: dt, bubbles: true, cancelable: true}));
	})()`)
	b.waitText("#status", "Read week 14.csv: 2 of 2 rows computed")
	if sheets := b.text("#sheets"); !strings.Contains(sheets, "week 14.csv") {
		t.Errorf("the CSV's sheet is not named after the file: %q", sheets)
	}
	noTokenInURLs(t, ts)
}
