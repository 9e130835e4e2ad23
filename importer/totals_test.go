package importer

import (
	"context"
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestTotalsOverflow: rows whose values are finite but whose sum exceeds
// the float64 range (about 1.8e308) give totals reported as not computable,
// with a finding naming the table, never +Inf: the report encodes as JSON,
// the summary sheet says so in words, and each row keeps its own value.
// Before, the JSON encoding failed (the CLI exited 1 with no report) and the
// summary showed +Inf.
func TestTotalsOverflow(t *testing.T) {
	dir := t.TempDir()
	f := newBook(t, "Log")
	setRows(t, f, "Log", 1, [][]any{{"Fuel", "Quantity", "Unit"}, {"diesel", 1.5e308, "kg"}, {"diesel", 1.5e308, "kg"}, {"petrol", 2, "kg"}})
	in := save(t, f, filepath.Join(dir, "big.xlsx"))
	out := filepath.Join(dir, "big.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{Rules: []string{"tCO2 = quantity", "tCO2e = quantity"}})
	if err != nil {
		t.Fatal(err)
	}
	js, err := json.Marshal(rep)
	if err != nil {
		t.Fatalf("the report does not encode: %v", err)
	}
	if strings.Contains(string(js), "Inf") || strings.Contains(string(js), "NaN") {
		t.Errorf("the JSON holds a non-number: %s", js)
	}
	finite := func(what string, v Totals) {
		if math.IsInf(v.TCO2, 0) || math.IsNaN(v.TCO2) || math.IsInf(v.TCO2e, 0) || math.IsNaN(v.TCO2e) {
			t.Errorf("%s = %+v, not finite", what, v)
		}
	}
	finite("Totals", rep.Totals)
	finite("Tables[0].Totals", rep.Tables[0].Totals)
	for k, v := range rep.ByFuel {
		finite("ByFuel["+k+"]", v)
	}
	if rep.Totals.NotComputable == "" || rep.Tables[0].Totals.NotComputable == "" {
		t.Errorf("totals %+v / %+v not marked as not computable", rep.Totals, rep.Tables[0].Totals)
	}
	if !strings.Contains(string(js), `"tCO2":null`) {
		t.Errorf("the JSON total is not null: %s", js)
	}
	found := false
	for _, w := range rep.Warnings {
		if w.Code == CodeTotalOverflow && strings.Contains(w.Message, "exceeds the float64 range") && strings.Contains(w.Message, rep.Tables[0].Range) {
			found = true
		}
	}
	if !found {
		t.Errorf("no %s finding naming the table: %+v", CodeTotalOverflow, rep.Warnings)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	rows, err := g.GetRows(SheetSummary)
	must(t, err)
	sawNote := false
	for _, r := range rows {
		for _, c := range r {
			if strings.Contains(c, "Inf") || strings.Contains(c, "NaN") {
				t.Errorf("summary cell %q", c)
			}
			sawNote = sawNote || strings.Contains(c, "not computable")
		}
	}
	if !sawNote {
		t.Errorf("the summary does not say the total is not computable: %q", rows)
	}
	v, err := g.GetCellValue("Log", "D2", excelize.Options{RawCellValue: true})
	must(t, err)
	if x, err := strconv.ParseFloat(v, 64); err != nil || x != 1.5e308 {
		t.Errorf("Log!D2 = %q, want the row's own 1.5e308", v)
	}
}
