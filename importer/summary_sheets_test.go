package importer

import (
	"context"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// The Carbon summary of the annotated copy lists every sheet and table
// with its status and reason: a price list beside a fuel log is skipped
// with why, not in silence. Names are invented.
func TestSummaryListsEverySheet(t *testing.T) {
	f := newBook(t, "Fuel log")
	setRows(t, f, "Fuel log", 1, [][]any{
		{"Fuel", "Quantity", "Unit"},
		{"diesel", 1200, "L"},
		{"natural gas", 40, "MWh"},
		{"gas oil", "pending", "L"},
	})
	addSheet(t, f, "Prices")
	setRows(t, f, "Prices", 1, [][]any{
		{"Retail fuel prices (pence per litre)"},
		{"Fuel", "Price"},
		{"diesel", 151.9},
		{"petrol", 139.9},
		{"LPG", 79.9},
	})
	dir := t.TempDir()
	in := save(t, f, filepath.Join(dir, "brackwater.xlsx"))
	out := filepath.Join(dir, "brackwater.carbon.xlsx")
	rep, err := Annotate(context.Background(), testEngine(t), in, out, Options{})
	must(t, err)
	if len(rep.Sheets) != 2 || rep.Sheets[0].Status != StatusPartial || rep.Sheets[1].Status != StatusSkipped {
		t.Fatalf("sheets %+v", rep.Sheets)
	}
	g, err := excelize.OpenFile(out)
	must(t, err)
	defer g.Close()
	rows, err := g.GetRows(SheetSummary)
	must(t, err)
	var got []string
	for _, r := range rows {
		got = append(got, strings.Join(r, "|"))
	}
	text := strings.Join(got, "\n")
	for _, want := range []string{
		"Fuel log|partial|3|2|computed 2 of 3 rows in 1 table",
		"Prices|skipped|0|0|",
		"pence per litre",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("summary lacks %q:\n%s", want, text)
		}
	}
}
