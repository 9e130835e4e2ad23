package server

import (
	"context"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/demo"
)

// TestPageGWPSet drives the page in chromium: the demo's fuel log is read with the default
// GWP set, then with AR6 chosen beside the pack and grid; the page says what changed, the
// total tCO2e follows the set (as the importer computes it with Options.GWPSet), and the
// downloaded report and mapping file name ar6.
func TestPageGWPSet(t *testing.T) {
	b := startBrowser(t, 1280, 900)
	ts := startPageServer(t)
	dir := t.TempDir()
	paths, err := demo.Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	e := newEngine(t)
	want := map[string]*importer.Report{}
	for _, set := range []string{"ar5", "ar6"} {
		if want[set], err = importer.Annotate(context.Background(), e, paths[0], filepath.Join(dir, set+".xlsx"), importer.Options{GWPSet: set}); err != nil {
			t.Fatal(err)
		}
	}
	if want["ar6"].Totals.TCO2e <= want["ar5"].Totals.TCO2e {
		t.Fatalf("the importer's ar6 total %.9g is not above ar5's %.9g", want["ar6"].Totals.TCO2e, want["ar5"].Totals.TCO2e)
	}

	openPage(t, b, ts.URL)
	if opts := eval[[]string](b, `Array.from(document.querySelectorAll("#opt-gwp option")).map(o => o.value + "=" + o.textContent)`); strings.Join(opts, ",") != "=the default (ar5),ar4=AR4,ar5=AR5,ar6=AR6" {
		t.Errorf("GWP set options %q", opts)
	}
	b.do(chromedp.SetUploadFiles(chromedp.ID("file-input"), []string{paths[0]}))
	b.waitText("#status", "14 of 17 rows computed")
	b.waitText("#sum-file", "GWP set AR5")

	b.change("#opt-gwp", "ar6")
	b.do(chromedp.Click(chromedp.ID("rerun")))
	changes := b.waitText("#changes", "GWP set: ar5 → ar6")
	line := "stationary_combustion tCO2e: " + fmtPage(want["ar5"].Totals.TCO2e) + " → " + fmtPage(want["ar6"].Totals.TCO2e)
	if !strings.Contains(changes, line) {
		t.Errorf("what changed does not say %q: %s", line, changes)
	}
	if c := b.text("#cautions"); !strings.Contains(c, "(GWP set ar6)") {
		t.Errorf("the rules shown do not name the set: %s", c)
	}
	b.waitText("#sum-file", "GWP set AR6")

	b.do(chromedp.Click(chromedp.ID("dl-report")))
	var rep importer.Report
	readJSON(t, b.download("kestrel-fuel-log-2026-w14.report.json"), &rep)
	if rep.GWPSet != "ar6" || math.Abs(rep.Totals.TCO2e-want["ar6"].Totals.TCO2e) > 1e-9*rep.Totals.TCO2e {
		t.Errorf("downloaded report: gwp_set %q, %.9g tCO2e; want ar6, %.9g", rep.GWPSet, rep.Totals.TCO2e, want["ar6"].Totals.TCO2e)
	}
	b.do(chromedp.Click(chromedp.ID("dl-mapping")))
	mpath := b.download("kestrel-fuel-log-2026-w14.mapping.json")
	var mf importer.MappingFile
	readJSON(t, mpath, &mf)
	if mf.GWPSet != "ar6" {
		t.Errorf("downloaded mapping: gwp_set %q, want ar6", mf.GWPSet)
	}
	m, err := importer.LoadMapping(e, mpath)
	if err != nil {
		t.Fatalf("the downloaded mapping is refused by LoadMapping: %v", err)
	}
	again, err := importer.Annotate(context.Background(), e, paths[0], filepath.Join(dir, "again.xlsx"), importer.Options{Mapping: m})
	if err != nil || again.GWPSet != "ar6" || again.Totals.TCO2e != want["ar6"].Totals.TCO2e {
		t.Errorf("annotating with the downloaded mapping: %v, gwp_set %q, %.9g tCO2e", err, again.GWPSet, again.Totals.TCO2e)
	}
	b.screenshot("page-gwp-set-1280.png")
	noTokenInURLs(t, ts)
}

// fmtPage writes x as the page does: at most three decimals, thousands separated by commas.
func fmtPage(x float64) string {
	s := strings.TrimRight(strings.TrimRight(strconv.FormatFloat(x, 'f', 3, 64), "0"), ".")
	whole, frac, _ := strings.Cut(s, ".")
	neg := strings.HasPrefix(whole, "-")
	whole = strings.TrimPrefix(whole, "-")
	var b strings.Builder
	for i, r := range whole {
		if i > 0 && (len(whole)-i)%3 == 0 {
			b.WriteByte(',')
		}
		b.WriteRune(r)
	}
	out := b.String()
	if neg {
		out = "-" + out
	}
	if frac != "" {
		out += "." + frac
	}
	return out
}
