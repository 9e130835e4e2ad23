package importer

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestRightEdgeNeverOverwrites: a table whose columns, or whose rows'
// other cells, reach the last columns of the grid (XFB-XFD) leaves no room
// beside it; the computed columns go to a side sheet, every original cell
// is kept, and the report says so for that table.
func TestRightEdgeNeverOverwrites(t *testing.T) {
	const last = 16384 // XFD
	cases := []struct {
		name  string
		cells map[string]any
	}{
		{"table in XFB-XFD", map[string]any{
			cellRef(last-2, 1): "Fuel", cellRef(last-1, 1): "Quantity", cellRef(last, 1): "Unit",
			cellRef(last-2, 2): "diesel", cellRef(last-1, 2): 1000, cellRef(last, 2): "L",
			cellRef(last-2, 3): "natural_gas", cellRef(last-1, 3): 50, cellRef(last, 3): "MWh",
		}},
		{"note at XFD in a table row", map[string]any{
			"A1": "Fuel", "B1": "Quantity", "C1": "Unit",
			"A2": "diesel", "B2": 1000, "C2": "L", cellRef(last, 2): "checked by site office",
			"A3": "natural_gas", "B3": 50, "C3": "MWh", cellRef(last-3, 3): "meter 7",
		}},
	}
	e := testEngine(t)
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			f := newBook(t, "Log")
			for ref, v := range c.cells {
				must(t, f.SetCellValue("Log", ref, v))
			}
			in := save(t, f, filepath.Join(dir, "edge.xlsx"))
			out := filepath.Join(dir, "edge.carbon.xlsx")
			rep, err := Annotate(context.Background(), e, in, out, Options{})
			if err != nil {
				t.Fatal(err)
			}
			g, err := excelize.OpenFile(out)
			must(t, err)
			defer g.Close()
			for ref, v := range c.cells {
				got, err := g.GetCellValue("Log", ref)
				must(t, err)
				if want := strings.TrimSpace(toText(v)); got != want {
					t.Errorf("Log!%s = %q after annotation, want the original %q", ref, got, want)
				}
			}
			if len(rep.Tables) != 1 || rep.Computed != 2 {
				t.Fatalf("tables %+v, computed %d: want one table with 2 rows computed", rep.Tables, rep.Computed)
			}
			tb := rep.Tables[0]
			if tb.Layout != LayoutSideSheet || rep.Layout != LayoutSideSheet || !strings.HasPrefix(tb.Output, SheetColumns+"!") {
				t.Errorf("layout %s/%s, output %s: want the side sheet", tb.Layout, rep.Layout, tb.Output)
			}
			found := false
			for _, w := range rep.Warnings {
				if w.Code == CodeColumnsMoved && w.Sheet == "Log" && strings.Contains(w.Message, tb.Range) && strings.Contains(w.Message, SheetColumns) {
					found = true
				}
			}
			if !found {
				t.Errorf("no %s finding naming the table %s and the side sheet: %+v", CodeColumnsMoved, tb.Range, rep.Warnings)
			}
			if v, _ := g.GetCellValue(SheetColumns, "B2"); v == "" {
				t.Errorf("the side sheet holds no computed value at B2")
			}
		})
	}
}

func toText(v any) string {
	switch x := v.(type) {
	case string:
		return x
	case int:
		return itoaT(x)
	}
	return ""
}

// TestOccupancyReadOnce: the sheet is streamed for placement once, for
// all its tables (a sheet of many small tables was streamed once per
// table): the second look-up is served without the file.
func TestOccupancyReadOnce(t *testing.T) {
	dir := t.TempDir()
	in := smallLog(t, filepath.Join(dir, "log.xlsx"))
	res, err := Scan(context.Background(), testEngine(t), in, Options{})
	must(t, err)
	occs := map[string]*sheetOccupancy{}
	first, err := res.occupancy(occs, in, "Log")
	must(t, err)
	if first.right[2] != 3 || first.right[1] != 3 {
		t.Errorf("rightmost cells %v, want column C in rows 1 and 2", first.right)
	}
	must(t, os.Remove(in))
	again, err := res.occupancy(occs, in, "Log")
	if err != nil || again != first {
		t.Fatalf("second look-up: %v (read again?)", err)
	}
}
